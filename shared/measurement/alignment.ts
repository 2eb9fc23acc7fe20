import type { PiLlBand } from '../types/measurement'

/**
 * Target lumbar lordosis L1–S1 in degrees from pelvic incidence in degrees: 0.54·PI + 27.6
 * (Le Huec & Hasegawa 2016, Eur Spine J 25:3630 [V]). Show it with the mismatch band.
 */
export function targetLordosisDeg(pelvicIncidenceDeg: number): number {
  return 0.54 * pelvicIncidenceDeg + 27.6
}

/** PI − LL from which the mismatch is moderate (band '+'), degrees (Schwab et al. 2012 [V-sec]). */
export const PI_LL_MODERATE_MISMATCH_DEG = 10
/** PI − LL above which the mismatch is marked (band '++'), degrees (Schwab et al. 2012 [V-sec]). */
export const PI_LL_MARKED_MISMATCH_DEG = 20

/**
 * SRS-Schwab PI−LL modifier of a signed mismatch PI − LL in degrees: '0' below 10°, '+' from 10°
 * to 20° inclusive, '++' above 20° (Schwab et al. 2012, Spine 37:1077 [V-sec]). The reference
 * bands are signed, so a negative mismatch (more lordosis than incidence) reads '0'.
 */
export function piLlBandFromMismatchDeg(mismatchDeg: number): PiLlBand {
  if (mismatchDeg < PI_LL_MODERATE_MISMATCH_DEG) return '0'
  if (mismatchDeg <= PI_LL_MARKED_MISMATCH_DEG) return '+'
  return '++'
}
