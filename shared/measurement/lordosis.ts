import { angleWrapDeg } from '../geometry/angle'
import type { Point } from '../geometry/types'
import { cornerName, type LumbarVertebra } from './landmark-names'
import { frameLineAngleDeg, lookUpFrame } from './frame'

/**
 * Lordosis from the superior endplate of `upper` to the superior endplate of S1, in degrees,
 * lordosis positive: θ(U.as − U.ps) − θ(S1.as − S1.ps) in the U-over-S1 frame (measurement-
 * reference §4). L1 gives lumbar lordosis L1–S1 (Polly et al. 1996, Spine 21:1530 [V]); L4 gives
 * distal lordosis L4–S1 (Yukawa et al. 2019, Asian Spine J 13:663 [V]). Points in mm (px when
 * uncalibrated). Null without U.as, U.ps, S1.as or S1.ps.
 */
export function lordosisToSacrumDeg(
  points: Readonly<Record<string, Point>>,
  upper: LumbarVertebra,
): number | null {
  const upperPs = points[cornerName(upper, 'ps')]
  const upperAs = points[cornerName(upper, 'as')]
  const sacrumPs = points['S1.ps']
  const sacrumAs = points['S1.as']
  if (upperPs === undefined || upperAs === undefined) return null
  if (sacrumPs === undefined || sacrumAs === undefined) return null
  const lookup = lookUpFrame(points, upper, 'S1')
  if (lookup.kind !== 'frame') return null
  return angleWrapDeg(
    frameLineAngleDeg(lookup.frame, upperPs, upperAs) -
      frameLineAngleDeg(lookup.frame, sacrumPs, sacrumAs),
  )
}
