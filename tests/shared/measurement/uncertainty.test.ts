/**
 * Uncertainty (measurement-reference §8): 95 % intervals from landmark placement SD σ by
 * first-order propagation, checked against hand-derived first-order formulas
 * (measurement-literature §10) and by a seeded Monte Carlo coverage run.
 */
import { describe, expect, it } from 'vitest'
import { erf } from 'mathjs'
import { computeMeasurements } from '../../../shared/measurement/compute-measurements'
import { computeUncertainty, meyerdingUncertainty } from '../../../shared/measurement/uncertainty'
import type { LandmarkDocument } from '../../../shared/types/landmarks'
import { constructSpineDocument, DEFAULT_SHAPE } from '../support/constructed-spine'
import { mulberry32, normalSource } from '../support/seeded-random'
import type { Xy } from '../support/reference-math'

const DEG_PER_RAD = 180 / Math.PI

// A 40 mm S1 endplate at 0.1 mm/px (400 px), with L5 placed so that its posterior-inferior
// corner sits at s = 0.25 of the depth (d = 10 mm) and h = 10 mm above the endplate.
const sacrumDoc: LandmarkDocument = {
  mmPerPixel: 0.1,
  points: {
    'S1.ps': [1000, 2000],
    'S1.as': [1400, 2000],
    'L5.pi': [1100, 1900],
    'L5.ai': [1500, 1880],
    'L5.ps': [1110, 1640],
    'L5.as': [1500, 1640],
  },
}

describe('computeUncertainty magnitudes', () => {
  const result = computeUncertainty(sacrumDoc)

  it('gives one line of 40 mm an angle SD of √2·σ/L = 2.03° at σ = 1 mm (literature §10 [D])', () => {
    const expected = ((Math.SQRT2 * 1) / 40) * DEG_PER_RAD
    expect(result.measurements.pelvis?.sacralSlopeDeg?.standardDeviation).toBeCloseTo(expected, 4)
    expect(expected).toBeCloseTo(2.0, 1)
  })
  it('gives the exact first-order slip SD, below the rough 3.75 % of literature §10', () => {
    // s = d/L with d = (Q − P)·e: δs·L = δQ·e + (s − 1)δP·e − s·δA·e + (h/L)(δA − δP)·n, so
    // SD = (100σ/L)·√(1 + (1 − s)² + s² + 2(h/L)²) = 2.5·√1.75 = 3.31 % for s = h/L = 0.25.
    // The literature's 3.75 % treats P in d and in L as independent, so it is a little larger.
    const expected = (100 / 40) * Math.sqrt(1 + 0.75 ** 2 + 0.25 ** 2 + 2 * 0.25 ** 2)
    const slip = result.measurements.segments['L5-S1']!.slipPercent
    expect(slip?.value).toBeCloseTo(25, 9)
    expect(slip?.standardDeviation).toBeCloseTo(expected, 4)
    expect(slip?.standardDeviation).toBeLessThan(3.75)
  })
  it('gives a difference of two 40 mm lines an SD of 2σ/L = 2.86° (segmental lordosis)', () => {
    const shape = { ...DEFAULT_SHAPE, depthMm: 40 }
    const doc = constructSpineDocument(shape)
    const sd =
      computeUncertainty(doc).measurements.segments['L4-L5']!.segmentalLordosisDeg
        ?.standardDeviation
    expect(sd).toBeCloseTo((2 / 40) * DEG_PER_RAD, 4)
  })
  it('builds every interval as value ± 1.96 SD', () => {
    const slip = result.measurements.segments['L5-S1']!.slipPercent
    expect((slip?.high ?? 0) - (slip?.value ?? 0)).toBeCloseTo(
      1.959963984540054 * (slip?.standardDeviation ?? 0),
      12,
    )
    expect((slip?.value ?? 0) - (slip?.low ?? 0)).toBeCloseTo(
      1.959963984540054 * (slip?.standardDeviation ?? 0),
      12,
    )
  })
  it('uses 3 px per coordinate on an uncalibrated film', () => {
    const { mmPerPixel: _spacing, ...uncalibrated } = sacrumDoc
    const px = computeUncertainty(uncalibrated)
    expect(px.sigma).toEqual({ value: 3, unit: 'px' })
    expect(px.measurements.pelvis?.sacralSlopeDeg?.standardDeviation).toBeCloseTo(
      ((Math.SQRT2 * 3) / 400) * DEG_PER_RAD,
      4,
    )
    expect(px.measurements.segments['L5-S1']!.slipMm).toBeNull()
  })
  it('takes σ from the options', () => {
    const half = computeUncertainty(sacrumDoc, { sigmaMm: 0.5 })
    expect(half.sigma).toEqual({ value: 0.5, unit: 'mm' })
    expect(half.measurements.pelvis?.sacralSlopeDeg?.standardDeviation).toBeCloseTo(
      ((Math.SQRT2 * 0.5) / 40) * DEG_PER_RAD,
      4,
    )
    expect(() => computeUncertainty(sacrumDoc, { sigmaMm: -1 })).toThrow(RangeError)
  })
})

describe('computeUncertainty result shape', () => {
  const doc = constructSpineDocument()
  const result = computeUncertainty(doc)
  const plain = computeMeasurements(doc)

  it('gives an interval for every number of the plain result and keeps nulls and labels', () => {
    const segment = result.measurements.segments['L5-S1']!
    expect(segment.discHeightMm?.mean?.value).toBeCloseTo(
      plain.segments['L5-S1']!.discHeightMm?.mean ?? Number.NaN,
      12,
    )
    expect(segment.slipAngleDeg?.standardDeviation).toBeGreaterThan(0)
    expect(segment.meyerdingGrade).toBe(plain.segments['L5-S1']!.meyerdingGrade)
    expect(segment.cageLordosisDeg).toBeNull()
    expect(result.measurements.piLlMismatchDeg?.standardDeviation).toBeGreaterThan(0)
    expect(result.measurements.targetLordosisDeg?.standardDeviation).toBeGreaterThan(0)
    expect(JSON.stringify(result)).not.toMatch(/NaN|Infinity/)
  })
  it('states its method', () => {
    expect(result.method).toMatch(/first-order propagation/)
    expect(result.sigma).toEqual({ value: 1, unit: 'mm' })
  })
  it('is deterministic: two runs give identical numbers', () => {
    // Same inputs through the same code: exact equality is the property under test here.
    expect(computeUncertainty(doc)).toStrictEqual(result)
  })
})

describe('Meyerding grade probabilities', () => {
  const phi = (z: number) => 0.5 * (1 + erf(z / Math.SQRT2))

  it('follow the normal approximation on the rounding-aware boundaries (B + 0.05 %)', () => {
    const { probabilities } = meyerdingUncertainty(25, 3.75)
    expect(probabilities.I).toBeCloseTo(phi((25.05 - 25) / 3.75) - phi((0.05 - 25) / 3.75), 6)
    expect(probabilities.II).toBeCloseTo(phi((50.05 - 25) / 3.75) - phi((25.05 - 25) / 3.75), 6)
    const total = Object.values(probabilities).reduce((sum, p) => sum + p, 0)
    expect(total).toBeCloseTo(1, 6)
  })
  it('mark a slip at a boundary borderline and one mid-grade not', () => {
    expect(meyerdingUncertainty(25, 3.75).borderline).toBe(true)
    expect(meyerdingUncertainty(12.5, 1).borderline).toBe(false)
  })
  it('mark borderline when the neighbouring grade reaches 10 %', () => {
    // P(II) = 1 − Φ((25.05 − μ)/σ) = 0.10 when μ = 25.05 − 1.2816·σ.
    const sd = 3
    const atTenPercent = 25.05 - 1.2815515655446004 * sd
    expect(meyerdingUncertainty(atTenPercent + 0.01, sd).borderline).toBe(true)
    expect(meyerdingUncertainty(atTenPercent - 0.05, sd).borderline).toBe(false)
  })
  it('appear per segment in computeUncertainty', () => {
    const result = computeUncertainty(sacrumDoc)
    expect(result.meyerding['L5-S1']?.borderline).toBe(true)
    // L4-L5 has no corners in this document, so neither its intervals nor its grade appear.
    expect(result.measurements.segments['L4-L5']).toBeUndefined()
    expect('L4-L5' in result.meyerding).toBe(false)
  })
})

describe('coverage of the 95 % intervals', () => {
  it('covers the true slip %, L5-S1 segmental lordosis and PI in 93–97 % of 1000 noisy readings', () => {
    // Constructed truth: L5-S1 slip 6 mm of a 38 mm endplate; segmental = disc 12° + wedge
    // 6°; PI = SS + PT = 38° + 14°. Noise: σ = 1 mm per coordinate (7.19 px at 0.139 mm/px).
    const truth = { slip: (100 * 6) / 38, segmental: 12 + 6, incidence: 38 + 14 }
    const doc = constructSpineDocument()
    const sigmaPx = 1 / doc.mmPerPixel
    const gauss = normalSource(mulberry32(20240601))
    const trials = 1000
    let slipHits = 0
    let segmentalHits = 0
    let incidenceHits = 0
    const covers = (interval: { low: number; high: number } | null | undefined, value: number) =>
      interval !== null && interval !== undefined && interval.low <= value && value <= interval.high
    for (let trial = 0; trial < trials; trial += 1) {
      const points: Record<string, Xy> = {}
      for (const [name, [x, y]] of Object.entries(doc.points)) {
        points[name] = [x + sigmaPx * gauss(), y + sigmaPx * gauss()]
      }
      const result = computeUncertainty({ mmPerPixel: doc.mmPerPixel, points })
      const segment = result.measurements.segments['L5-S1']!
      if (covers(segment.slipPercent, truth.slip)) slipHits += 1
      if (covers(segment.segmentalLordosisDeg, truth.segmental)) segmentalHits += 1
      if (covers(result.measurements.pelvis?.incidenceDeg, truth.incidence)) incidenceHits += 1
    }
    for (const hits of [slipHits, segmentalHits, incidenceHits]) {
      expect(hits / trials).toBeGreaterThanOrEqual(0.93)
      expect(hits / trials).toBeLessThanOrEqual(0.97)
    }
  }, 60_000)
})
