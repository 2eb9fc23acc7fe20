import type { PiLlBand } from '../types/measurement'

/**
 * Target lumbar lordosis L1–S1 in degrees from pelvic incidence in degrees: 0.54·PI + 27.6
 * (Le Huec & Hasegawa 2016, Eur Spine J 25:3630 [V]). Show it with the mismatch band.
 */
export function targetLordosisDeg(pelvicIncidenceDeg: number): number {
  return 0.54 * pelvicIncidenceDeg + 27.6
}

/**
 * SRS-Schwab PI−LL modifier of a signed mismatch PI − LL in degrees: '0' below 10°, '+' from 10°
 * to 20° inclusive, '++' above 20° (Schwab et al. 2012, Spine 37:1077 [V-sec]). The reference
 * bands are signed, so a negative mismatch (more lordosis than incidence) reads '0'.
 */
export function piLlBandFromMismatchDeg(mismatchDeg: number): PiLlBand {
  if (mismatchDeg < 10) return '0'
  if (mismatchDeg <= 20) return '+'
  return '++'
}
