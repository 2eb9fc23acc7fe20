/**
 * Corner suggestion for landmark placement: given where a rater clicked on a film, find the
 * corner they most likely meant, on the full-depth pixels.
 *
 * 1. Corner response: Shi & Tomasi's minimum eigenvalue of the local structure tensor
 *    (Shi J, Tomasi C. Good features to track. CVPR 1994:593–600): gradients of the image
 *    smoothed with a Gaussian of `derivativeSigmaPx`, their outer products averaged with a
 *    Gaussian of `integrationSigmaPx`, λmin = (a + c)/2 − √(((a − c)/2)² + b²).
 * 2. The pixel of highest response within `radiusPx` of the click.
 * 3. Sub-pixel refinement by the gradient method of Förstner & Gülch (Förstner W, Gülch E. A
 *    fast operator for detection and precise location of distinct points, corners and centres
 *    of circular features. ISPRS Intercommission Workshop, Interlaken 1987:281–305), the method
 *    of OpenCV's cornerSubPix: the corner q minimises Σ w·(∇I(p)·(p − q))² over a window, since
 *    every edge pixel's gradient is perpendicular to the line joining it to the corner; solved
 *    as (Σ w·g·gᵀ) q = Σ w·g·gᵀ·p and iterated with the window centred on q.
 *
 * Written here because no well-kept, dependency-free TypeScript library does this on 16-bit
 * pixels in a browser Worker (image libraries work on 8-bit canvases, OpenCV needs WASM). Pure:
 * no DOM, no Node, usable in a Worker and on the server. Coordinates are image pixels, x right,
 * y down, origin at the centre of the top-left pixel.
 */

/** A single-channel image, row by row: 16-bit film pixels, or any other grey values. */
export interface GreyPixels {
  readonly width: number
  readonly height: number
  readonly pixels: ArrayLike<number>
}

export interface CornerSearchOptions {
  /** How far from the click a corner is looked for, image px. */
  radiusPx: number
  /** Gaussian σ of the smoothing before the gradients, px (noise against detail). */
  derivativeSigmaPx?: number
  /** Gaussian σ over which the structure tensor is averaged, px. */
  integrationSigmaPx?: number
  /** Half-size of the sub-pixel refinement window, px. */
  refineRadiusPx?: number
  /**
   * Pixels closer than this to the corner are left out of the refinement: there the smoothed
   * gradients of the two edges mix and point past the corner (OpenCV's "zero zone").
   */
  refineZeroZonePx?: number
  /** Refinement stops when a step moves the corner less than this, px. */
  refineTolerancePx?: number
  /** Responses below this (intensities scaled to 0–1) are not corners: no suggestion. */
  minResponse?: number
}

export interface CornerSuggestion {
  /** The suggested corner, image px (sub-pixel). */
  x: number
  y: number
  /** Shi–Tomasi response at the strongest pixel (intensity² per px², intensities 0–1). */
  response: number
  /** Distance from the click, px. */
  distancePx: number
  /** False when the sub-pixel step failed and the strongest pixel itself is given. */
  refined: boolean
}

export const CORNER_SEARCH_DEFAULTS = {
  derivativeSigmaPx: 1,
  integrationSigmaPx: 1.5,
  refineRadiusPx: 6,
  refineZeroZonePx: 2.5,
  refineTolerancePx: 0.005,
  minResponse: 1e-6,
} as const

const MAX_REFINE_STEPS = 20

/** Normalised 1-D Gaussian kernel of σ (px), radius ⌈3σ⌉. */
function gaussianKernel(sigma: number): Float64Array {
  const radius = Math.max(1, Math.ceil(3 * sigma))
  const kernel = new Float64Array(2 * radius + 1)
  let sum = 0
  for (let i = -radius; i <= radius; i++) {
    const value = Math.exp(-(i * i) / (2 * sigma * sigma))
    kernel[i + radius] = value
    sum += value
  }
  for (let i = 0; i < kernel.length; i++) kernel[i] = (kernel[i] as number) / sum
  return kernel
}

/** Separable Gaussian blur of a w × h patch, edges extended (clamped). */
function blur(source: Float64Array, w: number, h: number, sigma: number): Float64Array {
  const kernel = gaussianKernel(sigma)
  const radius = (kernel.length - 1) / 2
  const rows = new Float64Array(w * h)
  for (let y = 0; y < h; y++) {
    for (let x = 0; x < w; x++) {
      let sum = 0
      for (let k = -radius; k <= radius; k++) {
        const xx = Math.min(w - 1, Math.max(0, x + k))
        sum += (kernel[k + radius] as number) * (source[y * w + xx] as number)
      }
      rows[y * w + x] = sum
    }
  }
  const out = new Float64Array(w * h)
  for (let y = 0; y < h; y++) {
    for (let x = 0; x < w; x++) {
      let sum = 0
      for (let k = -radius; k <= radius; k++) {
        const yy = Math.min(h - 1, Math.max(0, y + k))
        sum += (kernel[k + radius] as number) * (rows[yy * w + x] as number)
      }
      out[y * w + x] = sum
    }
  }
  return out
}

/** The largest value of a typed pixel array's type, to scale intensities to 0–1. */
function fullScale(pixels: ArrayLike<number>): number {
  if (pixels instanceof Uint8Array || pixels instanceof Uint8ClampedArray) return 255
  if (pixels instanceof Uint16Array) return 65535
  return 1
}

/**
 * The corner nearest in strength to where the rater clicked: the Shi–Tomasi maximum within
 * `radiusPx` of `clickPx`, refined to sub-pixel (see the file comment). Null when the click is
 * off the image or nothing within the radius responds above `minResponse`.
 */
export function suggestCorner(
  image: GreyPixels,
  clickPx: readonly [x: number, y: number],
  options: CornerSearchOptions,
): CornerSuggestion | null {
  const settings = { ...CORNER_SEARCH_DEFAULTS, ...options }
  const [clickX, clickY] = clickPx
  if (!(settings.radiusPx > 0) || !Number.isFinite(clickX) || !Number.isFinite(clickY)) return null
  if (clickX < -0.5 || clickY < -0.5 || clickX > image.width - 0.5 || clickY > image.height - 0.5)
    return null

  // The patch holds the search disc, the refinement window and the filters' reach.
  const margin =
    Math.ceil(settings.radiusPx + settings.refineRadiusPx) +
    Math.ceil(3 * settings.derivativeSigmaPx) +
    Math.ceil(3 * settings.integrationSigmaPx) +
    2
  const x0 = Math.max(0, Math.floor(clickX) - margin)
  const y0 = Math.max(0, Math.floor(clickY) - margin)
  const x1 = Math.min(image.width - 1, Math.ceil(clickX) + margin)
  const y1 = Math.min(image.height - 1, Math.ceil(clickY) + margin)
  const w = x1 - x0 + 1
  const h = y1 - y0 + 1
  if (w < 3 || h < 3) return null

  const scale = 1 / fullScale(image.pixels)
  const patch = new Float64Array(w * h)
  for (let y = 0; y < h; y++) {
    for (let x = 0; x < w; x++) {
      patch[y * w + x] = (image.pixels[(y0 + y) * image.width + x0 + x] as number) * scale
    }
  }
  const smooth = blur(patch, w, h, settings.derivativeSigmaPx)
  // Central differences on the smoothed patch: derivatives of the Gaussian-smoothed image.
  const gx = new Float64Array(w * h)
  const gy = new Float64Array(w * h)
  for (let y = 0; y < h; y++) {
    for (let x = 0; x < w; x++) {
      const left = smooth[y * w + Math.max(0, x - 1)] as number
      const right = smooth[y * w + Math.min(w - 1, x + 1)] as number
      const up = smooth[Math.max(0, y - 1) * w + x] as number
      const down = smooth[Math.min(h - 1, y + 1) * w + x] as number
      gx[y * w + x] = (right - left) / 2
      gy[y * w + x] = (down - up) / 2
    }
  }
  const xx = new Float64Array(w * h)
  const yy = new Float64Array(w * h)
  const xy = new Float64Array(w * h)
  for (let i = 0; i < w * h; i++) {
    const a = gx[i] as number
    const b = gy[i] as number
    xx[i] = a * a
    yy[i] = b * b
    xy[i] = a * b
  }
  const a = blur(xx, w, h, settings.integrationSigmaPx)
  const c = blur(yy, w, h, settings.integrationSigmaPx)
  const b = blur(xy, w, h, settings.integrationSigmaPx)

  // Strongest Shi–Tomasi response inside the search disc (pixels away from the patch border,
  // where the clamped filters would invent structure, are skipped unless at the image edge).
  const inner = Math.ceil(3 * settings.derivativeSigmaPx) + 1
  let best = -Infinity
  let bestX = -1
  let bestY = -1
  const radius2 = settings.radiusPx * settings.radiusPx
  for (let y = 0; y < h; y++) {
    const imageY = y0 + y
    if ((y < inner && y0 > 0) || (y >= h - inner && y1 < image.height - 1)) continue
    for (let x = 0; x < w; x++) {
      const imageX = x0 + x
      if ((x < inner && x0 > 0) || (x >= w - inner && x1 < image.width - 1)) continue
      const dx = imageX - clickX
      const dy = imageY - clickY
      if (dx * dx + dy * dy > radius2) continue
      const i = y * w + x
      const ai = a[i] as number
      const ci = c[i] as number
      const bi = b[i] as number
      const half = (ai - ci) / 2
      const response = (ai + ci) / 2 - Math.sqrt(half * half + bi * bi)
      if (response > best) {
        best = response
        bestX = imageX
        bestY = imageY
      }
    }
  }
  if (bestX < 0 || !(best >= settings.minResponse)) return null

  const refined = refineCornerForstner(
    { gx, gy, w, h, x0, y0 },
    [bestX, bestY],
    settings.refineRadiusPx,
    settings.refineZeroZonePx,
    settings.refineTolerancePx,
  )
  const [x, y] = refined ?? [bestX, bestY]
  return {
    x,
    y,
    response: best,
    distancePx: Math.hypot(x - clickX, y - clickY),
    refined: refined !== null,
  }
}

interface GradientPatch {
  gx: Float64Array
  gy: Float64Array
  w: number
  h: number
  /** Image coordinates of the patch's first pixel. */
  x0: number
  y0: number
}

/**
 * Förstner's sub-pixel corner (see the file comment) from `startPx`, image px; null when the
 * normal equations are singular (a straight edge or a flat patch) or the iteration wanders
 * further than the window from where it started.
 */
function refineCornerForstner(
  patch: GradientPatch,
  startPx: readonly [number, number],
  radiusPx: number,
  zeroZonePx: number,
  tolerancePx: number,
): [number, number] | null {
  let [qx, qy] = startPx
  // Gaussian window weights, σ = half the window, as in OpenCV's cornerSubPix.
  const sigma = radiusPx / 2
  for (let step = 0; step < MAX_REFINE_STEPS; step++) {
    let s11 = 0
    let s12 = 0
    let s22 = 0
    let t1 = 0
    let t2 = 0
    const cx = Math.round(qx) - patch.x0
    const cy = Math.round(qy) - patch.y0
    const r = Math.ceil(radiusPx)
    for (let dy = -r; dy <= r; dy++) {
      const py = cy + dy
      if (py < 0 || py >= patch.h) continue
      for (let dx = -r; dx <= r; dx++) {
        const px = cx + dx
        if (px < 0 || px >= patch.w) continue
        const imageX = patch.x0 + px
        const imageY = patch.y0 + py
        const ox = imageX - qx
        const oy = imageY - qy
        const distance2 = ox * ox + oy * oy
        if (distance2 > radiusPx * radiusPx || distance2 < zeroZonePx * zeroZonePx) continue
        const weight = Math.exp(-distance2 / (2 * sigma * sigma))
        const g1 = patch.gx[py * patch.w + px] as number
        const g2 = patch.gy[py * patch.w + px] as number
        const a11 = weight * g1 * g1
        const a12 = weight * g1 * g2
        const a22 = weight * g2 * g2
        s11 += a11
        s12 += a12
        s22 += a22
        t1 += a11 * imageX + a12 * imageY
        t2 += a12 * imageX + a22 * imageY
      }
    }
    const determinant = s11 * s22 - s12 * s12
    // A straight edge or flat patch gives (nearly) rank-deficient normal equations.
    if (!(determinant > 1e-12 * (s11 + s22) * (s11 + s22))) return null
    const nx = (s22 * t1 - s12 * t2) / determinant
    const ny = (s11 * t2 - s12 * t1) / determinant
    const moved = Math.hypot(nx - qx, ny - qy)
    qx = nx
    qy = ny
    if (Math.hypot(qx - startPx[0], qy - startPx[1]) > radiusPx) return null
    if (moved < tolerancePx) break
  }
  return [qx, qy]
}
