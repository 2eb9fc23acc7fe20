import type { LandmarkDocument, PixelPoint } from '@shared/types/landmarks'
import { LUMBAR_LEVELS, phantomMmPerPixel, type PhantomParams } from './phantom-params'
import type { SpineGeometry } from './spine-geometry'
import { add, along, scale, type Vec2 } from './vec2'

/** Maps the anatomical frame (mm, u anterior, v cranial) to image pixels (x right, y down). */
export interface FilmPlacement {
  mmPerPixel: number
  toPixel(point: Vec2): PixelPoint
  /** Pixels per millimetre, for radii and stroke widths. */
  px(mm: number): number
}

/** The points that must be on the film, with a margin for what is drawn around them. */
function extentPoints(geometry: SpineGeometry, headRadiusMm: number): Vec2[] {
  const points: Vec2[] = [
    geometry.s1.as,
    geometry.s1.ps,
    along(geometry.s1.ps, geometry.sacralWall, 90),
  ]
  for (const level of LUMBAR_LEVELS) points.push(...Object.values(geometry.vertebrae[level]))
  for (const head of geometry.femoralHeads) {
    points.push(add(head, [headRadiusMm, headRadiusMm]), add(head, [-headRadiusMm, -headRadiusMm]))
  }
  return points
}

/**
 * Centres the lumbar spine, sacrum and hips on the film at the phantom's spacing, mirrored when
 * the patient faces left. Refuses a film too small to hold them.
 */
export function placeOnFilm(geometry: SpineGeometry, params: PhantomParams): FilmPlacement {
  const mmPerPixel = phantomMmPerPixel(params)
  const points = extentPoints(geometry, params.femoralHeadRadiusMm)
  const us = points.map((p) => p[0])
  const vs = points.map((p) => p[1])
  const centre: Vec2 = [
    (Math.min(...us) + Math.max(...us)) / 2,
    (Math.min(...vs) + Math.max(...vs)) / 2,
  ]
  const spanPx = [
    (Math.max(...us) - Math.min(...us)) / mmPerPixel,
    (Math.max(...vs) - Math.min(...vs)) / mmPerPixel,
  ]
  const [spanX = 0, spanY = 0] = spanPx
  if (spanX > params.widthPx * 0.94 || spanY > params.heightPx * 0.94) {
    throw new Error(
      `The spine spans ${Math.ceil(spanX)} × ${Math.ceil(spanY)} px at ${mmPerPixel.toFixed(4)} mm/px; ` +
        `the film is ${params.widthPx} × ${params.heightPx} px. Enlarge the film or the pixel size.`,
    )
  }
  const facing = params.facing === 'right' ? 1 : -1
  // Pixel centres sit at integer coordinates (reference §1), so the middle is (n − 1) / 2.
  const middle: Vec2 = [(params.widthPx - 1) / 2, (params.heightPx - 1) / 2]
  return {
    mmPerPixel,
    toPixel: (point) => {
      const d = scale([point[0] - centre[0], point[1] - centre[1]], 1 / mmPerPixel)
      return [middle[0] + facing * d[0], middle[1] - d[1]]
    },
    px: (mm) => mm / mmPerPixel,
  }
}

/** The ground truth: every drawn landmark in image pixels (reference §1 names). */
export function phantomLandmarks(
  geometry: SpineGeometry,
  placement: FilmPlacement,
): LandmarkDocument {
  const points: Record<string, PixelPoint> = {}
  const put = (name: string, point: Vec2) => {
    points[name] = placement.toPixel(point)
  }
  for (const level of LUMBAR_LEVELS) {
    const corners = geometry.vertebrae[level]
    put(`${level}.as`, corners.as)
    put(`${level}.ps`, corners.ps)
    put(`${level}.pi`, corners.pi)
    put(`${level}.ai`, corners.ai)
  }
  put('S1.as', geometry.s1.as)
  put('S1.ps', geometry.s1.ps)
  put('S1.pw', geometry.s1.pw)
  put('FH1', geometry.femoralHeads[0])
  put('FH2', geometry.femoralHeads[1])
  for (const implant of geometry.implants) {
    if (implant.kind === 'cage') {
      put(`cage.${implant.segment}.sup.p`, implant.supP)
      put(`cage.${implant.segment}.sup.a`, implant.supA)
      put(`cage.${implant.segment}.inf.p`, implant.infP)
      put(`cage.${implant.segment}.inf.a`, implant.infA)
    } else {
      put(`implant.${implant.segment}.marker`, implant.marker)
    }
  }
  return { mmPerPixel: placement.mmPerPixel, points }
}
