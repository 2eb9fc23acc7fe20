import type { Vector } from './types'

const DEGREES_PER_RADIAN = 180 / Math.PI

/** Radians to degrees. Exact up to floating-point rounding. */
export function angleRadToDeg(radians: number): number {
  return radians * DEGREES_PER_RADIAN
}

/** Degrees to radians. Exact up to floating-point rounding. */
export function angleDegToRad(degrees: number): number {
  return degrees / DEGREES_PER_RADIAN
}

/**
 * Maps an angle in degrees to the half-open interval (−180°, 180°], the normalisation every
 * angle difference uses (measurement-literature §0.2). Non-finite input is returned unchanged so
 * callers can detect it. No tolerance: −180 maps to +180.
 */
export function angleWrapDeg(degrees: number): number {
  if (!Number.isFinite(degrees)) return degrees
  const wrapped = degrees - 360 * Math.floor((degrees + 180) / 360)
  // floor() puts exactly −180 at −180; the interval is closed at +180, not −180.
  return wrapped === -180 ? 180 : wrapped
}

/**
 * The signed difference a − b of two angles in degrees, wrapped to (−180°, 180°]. Use for any
 * difference of directions so a pair straddling ±180° does not read as a ~360° change.
 */
export function angleDifferenceDeg(a: number, b: number): number {
  return angleWrapDeg(a - b)
}

/**
 * Direction of `v` in degrees, atan2(dy, dx), in (−180°, 180°], measured from +x towards +y.
 * With y down that is clockwise on screen. atan2(0, 0) is 0 by definition of Math.atan2.
 */
export function vectorAngleDeg(v: Vector): number {
  return angleRadToDeg(Math.atan2(v[1], v[0]))
}
