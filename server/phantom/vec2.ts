/** A point or direction in millimetres in the phantom's anatomical frame: u anterior, v cranial. */
export type Vec2 = [u: number, v: number]

export const add = (a: Vec2, b: Vec2): Vec2 => [a[0] + b[0], a[1] + b[1]]
export const sub = (a: Vec2, b: Vec2): Vec2 => [a[0] - b[0], a[1] - b[1]]
export const scale = (a: Vec2, k: number): Vec2 => [a[0] * k, a[1] * k]
export const dot = (a: Vec2, b: Vec2): number => a[0] * b[0] + a[1] * b[1]
export const length = (a: Vec2): number => Math.hypot(a[0], a[1])
export const unit = (a: Vec2): Vec2 => scale(a, 1 / length(a))
export const mid = (a: Vec2, b: Vec2): Vec2 => [(a[0] + b[0]) / 2, (a[1] + b[1]) / 2]
/** Direction at `radians` counter-clockwise from anterior (u) toward cranial (v). */
export const direction = (radians: number): Vec2 => [Math.cos(radians), Math.sin(radians)]
export const angleOf = (a: Vec2): number => Math.atan2(a[1], a[0])
/** Rotated a quarter turn toward cranial when `a` points anterior. */
export const perpendicular = (a: Vec2): Vec2 => [-a[1], a[0]]
/** p + s·d, the point `s` along a line. */
export const along = (p: Vec2, d: Vec2, s: number): Vec2 => [p[0] + d[0] * s, p[1] + d[1] * s]
export const degToRad = (deg: number): number => (deg * Math.PI) / 180

/** Where the line p + s·d meets the line q + t·e (they must not be parallel). */
export function intersect(p: Vec2, d: Vec2, q: Vec2, e: Vec2): Vec2 {
  const det = d[0] * -e[1] - d[1] * -e[0]
  const r = sub(q, p)
  const s = (r[0] * -e[1] - r[1] * -e[0]) / det
  return along(p, d, s)
}
