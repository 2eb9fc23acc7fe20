import type { Point } from '../geometry/types'
import { angleWrapDeg } from '../geometry/angle'
import { vectorDot, vectorSubtract, vectorUnit } from '../geometry/vector'
import { frameAngleDeg, frameLineAngleDeg, type SegmentFrame } from './frame'

/**
 * Boxall slip angle at L5-S1 in degrees, kyphosis positive (normal adults are negative):
 * w = unit(S1.ps − S1.pw), cranial along the posterior sacral wall; p = the perpendicular to w
 * with p·a > 0 (anterior); slip angle = θ(p) − θ(L5.ai − L5.pi) in the L5-S1 frame (Boxall et
 * al. 1979, J Bone Joint Surg Am 61:479 [M]; measurement-reference §3). Points in mm (or px when
 * uncalibrated), same space as the frame. Null when the wall is degenerate or parallel to the
 * sacral endplate, where the anterior side of p is undefined.
 */
export function slipAngleDeg(
  frame: SegmentFrame,
  sacrumPs: Point,
  sacrumPw: Point,
  l5Pi: Point,
  l5Ai: Point,
): number | null {
  const wall = vectorUnit(vectorSubtract(sacrumPs, sacrumPw))
  if (wall === null) return null
  const candidate: readonly [number, number] = [-wall[1], wall[0]]
  const side = vectorDot(candidate, frame.anterior)
  if (side === 0) return null
  const perpendicular: readonly [number, number] =
    side > 0 ? candidate : [-candidate[0], -candidate[1]]
  return angleWrapDeg(frameAngleDeg(frame, perpendicular) - frameLineAngleDeg(frame, l5Pi, l5Ai))
}
