/**
 * Builds CONSTRUCTED (invented) lateral lumbar landmark sets for tests: rectangular-ish
 * vertebral bodies stacked from the S1 endplate upwards with chosen disc angles, wedge angles,
 * disc heights and slips, plus femoral heads at a chosen pelvic tilt. No patient data. The
 * builder never calls the engine; expected values are derived from its output separately.
 */

export type Xy = [number, number]

export interface SpineShape {
  /** mm per pixel (square) used to convert the mm geometry to image pixels. */
  mmPerPixel: number
  /** Sacral slope in degrees (anterior end of S1 lower on the film). */
  sacralSlopeDeg: number
  /** Pelvic tilt in degrees (hip axis anterior of the S1 midpoint). */
  pelvicTiltDeg: number
  /** Distance from the S1 endplate midpoint to the hip axis, mm. */
  hipDistanceMm: number
  /** Separation of the two femoral head centres along x, mm (0 = superimposed). */
  headSeparationMm: number
  /** Depth of every endplate, mm. */
  depthMm: number
  /** Posterior body height of every vertebra, mm. */
  bodyHeightMm: number
  /** Disc angles from L5-S1 up to L1-L2, degrees, lordosis positive. */
  discAnglesDeg: [number, number, number, number, number]
  /** Vertebral wedge angles from L5 up to L1, degrees, lordosis positive. */
  wedgeAnglesDeg: [number, number, number, number, number]
  /** Posterior disc heights from L5-S1 up to L1-L2, mm. */
  posteriorDiscHeightsMm: [number, number, number, number, number]
  /** Anterior slips of the upper vertebra from L5-S1 up, mm along the lower endplate. */
  slipsMm: [number, number, number, number, number]
  /** Sacral posterior wall: angle from the S1 endplate's cranial normal, degrees, and length mm. */
  sacralWallTiltDeg: number
  sacralWallMm: number
  /** Image position of S1.ps, px. */
  originPx: Xy
  /** Anterior to image-right (+1) or image-left (−1). */
  facing: 1 | -1
}

export const DEFAULT_SHAPE: SpineShape = {
  mmPerPixel: 0.139,
  sacralSlopeDeg: 38,
  pelvicTiltDeg: 14,
  hipDistanceMm: 95,
  headSeparationMm: 8,
  depthMm: 38,
  bodyHeightMm: 26,
  discAnglesDeg: [12, 10, 8, 6, 5],
  wedgeAnglesDeg: [6, 2, 1, 0, -1],
  posteriorDiscHeightsMm: [7, 8, 8.5, 8, 7.5],
  slipsMm: [6, 1.5, 0, -1, 0],
  sacralWallTiltDeg: 8,
  sacralWallMm: 30,
  originPx: [1500, 1900],
  facing: 1,
}

const VERTEBRAE = ['L5', 'L4', 'L3', 'L2', 'L1'] as const

function rad(deg: number): number {
  return (deg * Math.PI) / 180
}

/**
 * Landmarks of the shape, in image px (x right, y down). Geometry is built in an anatomical
 * frame (u anterior, v cranial, mm) and mapped to the image by x = origin + facing·u/s,
 * y = origin − v/s.
 */
export function constructSpinePoints(shape: SpineShape = DEFAULT_SHAPE): Record<string, Xy> {
  const anatomical: Record<string, Xy> = {}
  // S1 endplate descends anteriorly by SS: direction (cos SS, −sin SS) in (u, v).
  let direction = -rad(shape.sacralSlopeDeg)
  const s1Ps: Xy = [0, 0]
  const s1As: Xy = [shape.depthMm * Math.cos(direction), shape.depthMm * Math.sin(direction)]
  anatomical['S1.ps'] = s1Ps
  anatomical['S1.as'] = s1As
  // Posterior wall runs caudally from S1.ps, tilted from the endplate's caudal normal.
  const wallDirection = direction - rad(90) + rad(shape.sacralWallTiltDeg)
  anatomical['S1.pw'] = [
    shape.sacralWallMm * Math.cos(wallDirection),
    shape.sacralWallMm * Math.sin(wallDirection),
  ]
  let lowerPs = s1Ps
  VERTEBRAE.forEach((vertebra, i) => {
    const along: Xy = [Math.cos(direction), Math.sin(direction)]
    const normal: Xy = [-Math.sin(direction), Math.cos(direction)]
    const slip = shape.slipsMm[i] as number
    const discHeight = shape.posteriorDiscHeightsMm[i] as number
    const pi: Xy = [
      lowerPs[0] + slip * along[0] + discHeight * normal[0],
      lowerPs[1] + slip * along[1] + discHeight * normal[1],
    ]
    const inferior = direction + rad(shape.discAnglesDeg[i] as number)
    const ai: Xy = [
      pi[0] + shape.depthMm * Math.cos(inferior),
      pi[1] + shape.depthMm * Math.sin(inferior),
    ]
    const up: Xy = [-Math.sin(inferior), Math.cos(inferior)]
    const ps: Xy = [pi[0] + shape.bodyHeightMm * up[0], pi[1] + shape.bodyHeightMm * up[1]]
    const superior = inferior + rad(shape.wedgeAnglesDeg[i] as number)
    const as: Xy = [
      ps[0] + shape.depthMm * Math.cos(superior),
      ps[1] + shape.depthMm * Math.sin(superior),
    ]
    Object.assign(anatomical, {
      [`${vertebra}.pi`]: pi,
      [`${vertebra}.ai`]: ai,
      [`${vertebra}.ps`]: ps,
      [`${vertebra}.as`]: as,
    })
    lowerPs = ps
    direction = superior
  })
  // Hip axis: from the S1 midpoint, caudal and anterior by PT.
  const middle: Xy = [(s1Ps[0] + s1As[0]) / 2, (s1Ps[1] + s1As[1]) / 2]
  const hip: Xy = [
    middle[0] + shape.hipDistanceMm * Math.sin(rad(shape.pelvicTiltDeg)),
    middle[1] - shape.hipDistanceMm * Math.cos(rad(shape.pelvicTiltDeg)),
  ]
  const half = shape.headSeparationMm / 2
  anatomical['FH1'] = [hip[0] + half, hip[1] + half / 2]
  anatomical['FH2'] = [hip[0] - half, hip[1] - half / 2]

  const points: Record<string, Xy> = {}
  for (const [name, [u, v]] of Object.entries(anatomical)) {
    points[name] = [
      shape.originPx[0] + (shape.facing * u) / shape.mmPerPixel,
      shape.originPx[1] - v / shape.mmPerPixel,
    ]
  }
  return points
}

/** A full calibrated document of the shape. */
export function constructSpineDocument(shape: SpineShape = DEFAULT_SHAPE): {
  mmPerPixel: number
  points: Record<string, Xy>
} {
  return { mmPerPixel: shape.mmPerPixel, points: constructSpinePoints(shape) }
}
