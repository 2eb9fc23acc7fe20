import { angleRadToDeg } from '../geometry/angle'
import { pointMidpoint } from '../geometry/point'
import type { Point, Vector } from '../geometry/types'
import { vectorDot, vectorSubtract, vectorUnit } from '../geometry/vector'
import type { PelvisMeasurement } from '../types/measurement'

/**
 * Sacral slope, pelvic tilt and pelvic incidence in degrees (Legaye, Duval-Beaupère, Hecquet,
 * Marty 1998, Eur Spine J 7:99 [V]; measurement-reference §4). Measured against the image's own
 * horizontal and vertical, the film being assumed upright; points in mm (px when uncalibrated),
 * y down. The anterior sign f comes from the S1 endplate: f = sign((S1.as − S1.ps).x).
 *
 * - SS = atan2(a.y, |a.x|), a = unit(S1.as − S1.ps): positive when the anterior corner is lower.
 * - PT = atan2(f·v.x, v.y), v = H − mid(S1.ps, S1.as): positive when H is anterior of M.
 * - PI = the angle from the caudal normal n of the sacral plate (n ⟂ a, n.y > 0) to v, measured
 *   like PT (positive towards anterior). PI = PT + SS holds to rounding.
 *
 * Returns null for a zero-length endplate. Tilt and incidence are null without a hip axis, when
 * H coincides with M, or when the endplate is exactly vertical (f undefined).
 */
export function pelvicParameters(
  sacrumPs: Point,
  sacrumAs: Point,
  hip: Point | null,
): PelvisMeasurement | null {
  const anterior = vectorUnit(vectorSubtract(sacrumAs, sacrumPs))
  if (anterior === null) return null
  const sacralSlopeDeg = angleRadToDeg(Math.atan2(anterior[1], Math.abs(anterior[0])))
  const facing = Math.sign(anterior[0])
  const v = hip === null ? null : vectorSubtract(hip, pointMidpoint(sacrumPs, sacrumAs))
  if (v === null || facing === 0 || (v[0] === 0 && v[1] === 0)) {
    return { incidenceDeg: null, tiltDeg: null, sacralSlopeDeg }
  }
  const tiltDeg = angleRadToDeg(Math.atan2(facing * v[0], v[1]))
  // (−a.y, a.x) has y = a.x; flip it to the caudal side (positive y).
  const normal: Vector = anterior[0] > 0 ? [-anterior[1], anterior[0]] : [anterior[1], -anterior[0]]
  // The quarter turn that takes the vertical (0, 1) to the anterior horizontal (f, 0), applied
  // to n, gives the "anterior" side of n, so PI is measured exactly as PT is.
  const normalAnterior: Vector = [facing * normal[1], -facing * normal[0]]
  const incidenceDeg = angleRadToDeg(Math.atan2(vectorDot(v, normalAnterior), vectorDot(v, normal)))
  return { incidenceDeg, tiltDeg, sacralSlopeDeg }
}
