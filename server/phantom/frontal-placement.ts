import type { LandmarkDocument, PixelPoint } from '@shared/types/landmarks'
import { LUMBAR_LEVELS, phantomMmPerPixel, type PhantomParams } from './phantom-params'
import type { FilmPlacement } from './film-placement'
import type { FrontalGeometry } from './frontal-geometry'
import { add, degToRad, type Vec2 } from './vec2'

/** How far the pelvis reaches beside and below the S1 endplate, drawn around the spine (mm). */
export const FRONTAL_PELVIS_EXTENT = { lateralMm: 115, caudalMm: 95 }

function extentPoints(geometry: FrontalGeometry): Vec2[] {
  const points: Vec2[] = [geometry.s1.sl, geometry.s1.sr]
  for (const level of LUMBAR_LEVELS) {
    const v = geometry.vertebrae[level]
    // Transverse processes reach about a body width beyond the midline on each side.
    points.push(v.il, v.ir, v.sl, v.sr, add(v.sl, [-22, 0]), add(v.sr, [22, 0]))
  }
  const { lateralMm, caudalMm } = FRONTAL_PELVIS_EXTENT
  points.push([-lateralMm, -caudalMm], [lateralMm, -caudalMm], [-lateralMm, 40], [lateralMm, 40])
  return points
}

/**
 * Centres the frontal spine and pelvis on the film at the phantom's spacing, turned by the
 * film's in-plane rotation (clockwise as seen). Refuses a film too small to hold them.
 */
export function placeFrontalOnFilm(
  geometry: FrontalGeometry,
  params: PhantomParams,
): FilmPlacement {
  const mmPerPixel = phantomMmPerPixel(params)
  const points = extentPoints(geometry)
  const xs = points.map((p) => p[0])
  const ys = points.map((p) => p[1])
  const centre: Vec2 = [
    (Math.min(...xs) + Math.max(...xs)) / 2,
    (Math.min(...ys) + Math.max(...ys)) / 2,
  ]
  const spanX = (Math.max(...xs) - Math.min(...xs)) / mmPerPixel
  const spanY = (Math.max(...ys) - Math.min(...ys)) / mmPerPixel
  if (spanX > params.widthPx * 0.98 || spanY > params.heightPx * 0.94) {
    throw new Error(
      `The frontal spine spans ${Math.ceil(spanX)} × ${Math.ceil(spanY)} px at ${mmPerPixel.toFixed(4)} mm/px; ` +
        `the film is ${params.widthPx} × ${params.heightPx} px. Enlarge the film or the pixel size.`,
    )
  }
  // Clockwise as seen on a film whose y runs down is counter-clockwise in the y-up frame.
  const r = -degToRad(params.frontal.rotationDeg)
  const cos = Math.cos(r)
  const sin = Math.sin(r)
  const middle: Vec2 = [(params.widthPx - 1) / 2, (params.heightPx - 1) / 2]
  return {
    mmPerPixel,
    toPixel: (point) => {
      const dx = point[0] - centre[0]
      const dy = point[1] - centre[1]
      const x = (dx * cos - dy * sin) / mmPerPixel
      const y = (dx * sin + dy * cos) / mmPerPixel
      return [middle[0] + x, middle[1] - y]
    },
    px: (mm) => mm / mmPerPixel,
  }
}

/** The frontal ground truth: every drawn landmark in image pixels (measurement-reference §11). */
export function frontalLandmarks(
  geometry: FrontalGeometry,
  placement: FilmPlacement,
): LandmarkDocument {
  const points: Record<string, PixelPoint> = {}
  const put = (name: string, point: Vec2) => {
    points[name] = placement.toPixel(point)
  }
  for (const level of LUMBAR_LEVELS) {
    const v = geometry.vertebrae[level]
    put(`${level}.il`, v.il)
    put(`${level}.ir`, v.ir)
    // L1 is never the lower vertebra of a segment: its superior endplate has no landmark name.
    if (level !== 'L1') {
      put(`${level}.sl`, v.sl)
      put(`${level}.sr`, v.sr)
    }
    put(`${level}.sp`, v.sp)
  }
  put('S1.sl', geometry.s1.sl)
  put('S1.sr', geometry.s1.sr)
  for (const implant of geometry.implants) {
    if (implant.kind !== 'disc-replacement') continue
    put(`tdr.${implant.segment}.l`, implant.lowerPlate[0])
    put(`tdr.${implant.segment}.r`, implant.lowerPlate[1])
  }
  return { mmPerPixel: placement.mmPerPixel, points }
}
