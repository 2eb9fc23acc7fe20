/**
 * Global measures (measurement-reference §4) on constructed spines: lordosis L1–S1 (Polly et al.
 * 1996 [V]) and L4–S1 (Yukawa et al. 2019 [V]), pelvic parameters (Legaye et al. 1998 [V]),
 * PI−LL bands (Schwab et al. 2012 [V-sec]) and target lordosis (Le Huec & Hasegawa 2016 [V]).
 */
import { describe, expect, it } from 'vitest'
import fc from 'fast-check'
import { computeMeasurements } from '../../../shared/measurement/compute-measurements'
import { piLlBandFromMismatchDeg, targetLordosisDeg } from '../../../shared/measurement/alignment'
import { cobbDeg, pelvisReference, type Xy } from '../support/reference-math'
import { constructSpineDocument, DEFAULT_SHAPE } from '../support/constructed-spine'

describe('lumbar lordosis', () => {
  it('L1–S1 equals the sum of the constructed disc and wedge angles, facing either way', () => {
    // Σ discs 12 + 10 + 8 + 6 + 5 = 41°, Σ wedges 6 + 2 + 1 + 0 − 1 = 8°.
    for (const facing of [1, -1] as const) {
      const doc = constructSpineDocument({ ...DEFAULT_SHAPE, facing })
      const p = doc.points as Record<string, Xy>
      const expected = cobbDeg([p['L1.ps']!, p['L1.as']!], [p['S1.ps']!, p['S1.as']!], facing)
      expect(expected).toBeCloseTo(41 + 8, 9)
      expect(computeMeasurements(doc).lumbarLordosisDeg).toBeCloseTo(expected, 9)
    }
  })
  it('L4–S1 uses the L4 superior endplate: 12 + 10 + 6 + 2 = 30°', () => {
    expect(computeMeasurements(constructSpineDocument()).distalLordosisDeg).toBeCloseTo(30, 9)
  })
  it('needs only the L1 superior corners besides S1', () => {
    const p = constructSpineDocument().points
    const doc = {
      points: {
        'L1.ps': p['L1.ps']!,
        'L1.as': p['L1.as']!,
        'S1.ps': p['S1.ps']!,
        'S1.as': p['S1.as']!,
      },
    }
    expect(computeMeasurements(doc).lumbarLordosisDeg).toBeCloseTo(49, 9)
  })
})

describe('pelvic parameters', () => {
  it('satisfy PI = PT + SS to 1e-9 over random pelves facing either way (Legaye et al. 1998 [V])', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 5, max: 60, noNaN: true }),
        fc.double({ min: -10, max: 40, noNaN: true }),
        fc.double({ min: 60, max: 140, noNaN: true }),
        fc.double({ min: 0, max: 40, noNaN: true }),
        fc.constantFrom<1 | -1>(1, -1),
        (sacralSlopeDeg, pelvicTiltDeg, hipDistanceMm, headSeparationMm, facing) => {
          const doc = constructSpineDocument({
            ...DEFAULT_SHAPE,
            sacralSlopeDeg,
            pelvicTiltDeg,
            hipDistanceMm,
            headSeparationMm,
            facing,
          })
          const pelvis = computeMeasurements(doc).pelvis
          const sum = (pelvis?.tiltDeg ?? Number.NaN) + (pelvis?.sacralSlopeDeg ?? Number.NaN)
          expect(Math.abs((pelvis?.incidenceDeg ?? Number.NaN) - sum)).toBeLessThan(1e-9)
        },
      ),
    )
  })
  it('match the literature formulas with the facing made explicit', () => {
    for (const facing of [1, -1] as const) {
      const doc = constructSpineDocument({ ...DEFAULT_SHAPE, facing })
      const p = doc.points as Record<string, Xy>
      const hip: Xy = [(p['FH1']![0] + p['FH2']![0]) / 2, (p['FH1']![1] + p['FH2']![1]) / 2]
      const reference = pelvisReference(p['S1.ps']!, p['S1.as']!, hip, facing)
      const pelvis = computeMeasurements(doc).pelvis
      expect(pelvis?.sacralSlopeDeg).toBeCloseTo(reference.ss, 9)
      expect(pelvis?.tiltDeg).toBeCloseTo(reference.pt, 9)
      expect(pelvis?.incidenceDeg).toBeCloseTo(reference.pi, 9)
    }
  })
  it('read a negative pelvic tilt when the hip axis is posterior of the S1 midpoint', () => {
    const pelvis = computeMeasurements(
      constructSpineDocument({ ...DEFAULT_SHAPE, pelvicTiltDeg: -5 }),
    ).pelvis
    expect(pelvis?.tiltDeg).toBeCloseTo(-5, 9)
    expect(pelvis?.incidenceDeg).toBeCloseTo(38 - 5, 9)
  })
})

describe('PI−LL mismatch and target lordosis', () => {
  it('computes PI − LL(L1–S1) from the same result', () => {
    const result = computeMeasurements(constructSpineDocument())
    // PI = SS + PT = 38 + 14 = 52°, LL = 49°.
    expect(result.piLlMismatchDeg).toBeCloseTo(52 - 49, 9)
    expect(result.piLlBand).toBe('0')
    expect(result.targetLordosisDeg).toBeCloseTo(0.54 * 52 + 27.6, 9)
  })
  it('bands < 10° as "0", 10–20° inclusive as "+", > 20° as "++"', () => {
    expect(piLlBandFromMismatchDeg(-15)).toBe('0')
    expect(piLlBandFromMismatchDeg(9.999)).toBe('0')
    expect(piLlBandFromMismatchDeg(10)).toBe('+')
    expect(piLlBandFromMismatchDeg(20)).toBe('+')
    expect(piLlBandFromMismatchDeg(20.001)).toBe('++')
  })
  it('targets 0.54·PI + 27.6: PI 49.75° gives 54.465° (literature Example 7)', () => {
    expect(targetLordosisDeg(49.75)).toBeCloseTo(0.54 * 49.75 + 27.6, 12)
    expect(targetLordosisDeg(49.75)).toBeCloseTo(54.47, 2)
  })
})
