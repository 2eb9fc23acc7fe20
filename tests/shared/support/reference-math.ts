/**
 * Independent re-derivations of the measures for test expectations, written with mathjs from
 * the formulas of measurement-literature (§0.2 anatomical frame with an explicit facing s_a,
 * §1 slip, §3.1 slip angle, §4 Cobb angles, §6 pelvis). They deliberately take a different
 * route from the engine, which builds its frame from the labels: here the facing is given by
 * the test, and angles are measured from the image horizontal. Nothing here imports the engine.
 */
import { atan2, divide, dot, norm, pi, subtract } from 'mathjs'

export type Xy = [number, number]

/** Degrees from radians, through mathjs's pi. */
export function degrees(radians: number): number {
  return (radians * 180) / pi
}

/** mathjs atan2 in degrees (mathjs's generic typing returns a literal type; widen it). */
export function atan2Deg(y: number, x: number): number {
  return degrees(Number(atan2(y, x)))
}

/** |b − a| with mathjs. */
export function distance(a: Xy, b: Xy): number {
  return Number(norm(subtract(b, a)))
}

/** Wraps degrees to (−180, 180]. */
export function wrapDeg(deg: number): number {
  let value = deg
  while (value <= -180) value += 360
  while (value > 180) value -= 360
  return value
}

/** θ(P, A) = atan2(y_P − y_A, s_a·(x_A − x_P)) in degrees (measurement-literature §0.2). */
export function endplateThetaDeg(posterior: Xy, anterior: Xy, facing: 1 | -1): number {
  return atan2Deg(posterior[1] - anterior[1], facing * (anterior[0] - posterior[0]))
}

/** Cobb-type angle between two endplates, upper minus lower, lordosis positive (§4). */
export function cobbDeg(upper: [Xy, Xy], lower: [Xy, Xy], facing: 1 | -1): number {
  return wrapDeg(
    endplateThetaDeg(upper[0], upper[1], facing) - endplateThetaDeg(lower[0], lower[1], facing),
  )
}

/** Taillard slip: d = (Q − P)·e, e = (A − P)/|A − P|; percent = 100·d/L (§1). */
export function taillardSlip(
  posterior: Xy,
  anterior: Xy,
  corner: Xy,
): { d: number; percent: number } {
  const length = distance(posterior, anterior)
  const e = divide(subtract(anterior, posterior), length) as number[]
  const d = Number(dot(subtract(corner, posterior), e))
  return { d, percent: (100 * d) / length }
}

/** Anatomical frame of §0.2: u = s_a·x, v = −y. */
function anatomical(point: Xy, facing: 1 | -1): Xy {
  return [facing * point[0], -point[1]]
}

/**
 * SS, PT and PI of §6: SS = atan2(y_AS − y_PS, s_a·(x_AS − x_PS)); PT = atan2(s_a·(x_H − x_M),
 * y_H − y_M); PI computed directly from the caudal normal in the anatomical frame.
 */
export function pelvisReference(
  sacrumPs: Xy,
  sacrumAs: Xy,
  hip: Xy,
  facing: 1 | -1,
): { ss: number; pt: number; pi: number } {
  const middle: Xy = [(sacrumPs[0] + sacrumAs[0]) / 2, (sacrumPs[1] + sacrumAs[1]) / 2]
  const ss = atan2Deg(sacrumAs[1] - sacrumPs[1], facing * (sacrumAs[0] - sacrumPs[0]))
  const pt = atan2Deg(facing * (hip[0] - middle[0]), hip[1] - middle[1])
  const ps = anatomical(sacrumPs, facing)
  const as = anatomical(sacrumAs, facing)
  const length = distance(ps, as)
  const e = divide(subtract(as, ps), length) as number[]
  const eu = e[0] as number
  const ev = e[1] as number
  const candidate: Xy = [ev, -eu]
  const normal: Xy = candidate[1] < 0 ? candidate : [-candidate[0], -candidate[1]]
  const h = subtract(anatomical(hip, facing), anatomical(middle, facing)) as number[]
  const hu = h[0] as number
  const hv = h[1] as number
  const piDeg = atan2Deg(normal[0] * hv - normal[1] * hu, normal[0] * hu + normal[1] * hv)
  return { ss, pt, pi: piDeg }
}

/**
 * Boxall slip angle of §3.1 in the anatomical frame: b = unit(PS_S1 − PW_S1), p = (b_v, −b_u),
 * SA = wrap(θp − θ(PI_L5, AI_L5)), kyphosis positive.
 */
export function slipAngleReference(
  sacrumPs: Xy,
  sacrumPw: Xy,
  l5Pi: Xy,
  l5Ai: Xy,
  facing: 1 | -1,
): number {
  const top = anatomical(sacrumPs, facing)
  const bottom = anatomical(sacrumPw, facing)
  const length = distance(bottom, top)
  const b = divide(subtract(top, bottom), length) as number[]
  const p: Xy = [b[1] as number, -(b[0] as number)]
  const thetaP = atan2Deg(p[1], p[0])
  return wrapDeg(thetaP - endplateThetaDeg(l5Pi, l5Ai, facing))
}
