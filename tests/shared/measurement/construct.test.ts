/**
 * Construct measures (measurement-reference §7): cage lordosis [D], implant position [D],
 * subsidence against a baseline (Rao et al. 2017, J Spine Surg [V]; default ≥ 2 mm).
 */
import { describe, expect, it } from 'vitest'
import { computeMeasurements } from '../../../shared/measurement/compute-measurements'
import { computeSubsidence } from '../../../shared/measurement/subsidence'
import { cobbDeg, type Xy } from '../support/reference-math'
import { constructSpineDocument, DEFAULT_SHAPE } from '../support/constructed-spine'

function withCage(facing: 1 | -1) {
  const doc = constructSpineDocument({ ...DEFAULT_SHAPE, facing })
  const p = doc.points as Record<string, Xy>
  // A cage between L5 and S1: superior surface 2 px below L5's endplate, inferior surface 2 px
  // above S1's, each inset 20 px from the corners (invented placement).
  const inset = (from: Xy, to: Xy, t: number, dy: number): Xy => [
    from[0] + (to[0] - from[0]) * t,
    from[1] + (to[1] - from[1]) * t + dy,
  ]
  return {
    ...doc,
    points: {
      ...p,
      'cage.L5-S1.sup.p': inset(p['L5.pi']!, p['L5.ai']!, 0.1, 2),
      'cage.L5-S1.sup.a': inset(p['L5.pi']!, p['L5.ai']!, 0.9, 2),
      'cage.L5-S1.inf.p': inset(p['S1.ps']!, p['S1.as']!, 0.1, -2),
      'cage.L5-S1.inf.a': inset(p['S1.ps']!, p['S1.as']!, 0.9, -2),
    },
  }
}

describe('cage lordosis', () => {
  it('is the superior minus inferior surface angle, lordosis positive, facing either way', () => {
    for (const facing of [1, -1] as const) {
      const doc = withCage(facing)
      const p = doc.points
      const expected = cobbDeg(
        [p['cage.L5-S1.sup.p'], p['cage.L5-S1.sup.a']],
        [p['cage.L5-S1.inf.p'], p['cage.L5-S1.inf.a']],
        facing,
      )
      const cage = computeMeasurements(doc).segments['L5-S1']!.cageLordosisDeg
      expect(cage).toBeCloseTo(expected, 9)
      // The surfaces run along the endplates (shifted by 2 px), so the angle is the 12° disc angle.
      expect(cage).toBeCloseTo(12, 0)
    }
  })
  it('is null without all four cage points', () => {
    const { 'cage.L5-S1.inf.a': _dropped, ...points } = withCage(1).points
    expect(
      computeMeasurements({ mmPerPixel: 0.139, points }).segments['L5-S1']!.cageLordosisDeg,
    ).toBeNull()
  })
})

describe('implant position', () => {
  it('is the marker projection on the lower endplate as % of depth from its posterior edge', () => {
    const doc = constructSpineDocument()
    const p = doc.points as Record<string, Xy>
    // A marker at 40 % along L5's superior endplate, 30 px above it.
    const ps = p['L5.ps']!
    const as = p['L5.as']!
    const marker: Xy = [ps[0] + 0.4 * (as[0] - ps[0]), ps[1] + 0.4 * (as[1] - ps[1]) - 30]
    const lifted = { ...doc, points: { ...p, 'implant.L4-L5.marker': marker } }
    const segment = computeMeasurements(lifted).segments['L4-L5']!
    // The 30 px lift is along −y, not the endplate normal, so it moves the projection slightly.
    const depth = Math.hypot(as[0] - ps[0], as[1] - ps[1])
    const along =
      ((marker[0] - ps[0]) * (as[0] - ps[0]) + (marker[1] - ps[1]) * (as[1] - ps[1])) / depth
    expect(segment.implantPositionPercent).toBeCloseTo((100 * along) / depth, 9)
    expect(segment.implantOffsetMm).toBeCloseTo((along - depth / 2) * 0.139, 9)
  })
})

describe('computeSubsidence', () => {
  const baseline = constructSpineDocument()
  it('flags a posterior height loss of about 2.5 mm at the 2 mm default, and not at 3 mm', () => {
    const current = constructSpineDocument({
      ...DEFAULT_SHAPE,
      posteriorDiscHeightsMm: [7, 8, 8.5, 5.5, 7.5],
    })
    const result = computeSubsidence(current, baseline)
    const segment = result.segments['L2-L3']!
    // Point-to-point heights include the constructed −1 mm slip: √(8² + 1²) − √(5.5² + 1²).
    expect(segment.lossMm.posterior).toBeCloseTo(Math.hypot(8, 1) - Math.hypot(5.5, 1), 9)
    expect(segment.posteriorFlagged).toBe(true)
    expect(segment.subsided).toBe(true)
    expect(result.segments['L3-L4']!.subsided).toBe(false)
    expect(result.thresholdMm).toBe(2)
    expect(result.source).toMatch(/Rao et al. 2017/)
    expect(
      computeSubsidence(current, baseline, { thresholdMm: 3 }).segments['L2-L3']!.subsided,
    ).toBe(false)
  })
  it('flags a loss of exactly the threshold (≥, Rao et al. 2017)', () => {
    // L3-L4 has no constructed slip, so its posterior height is the constructed 8.5 → 6.5 mm.
    const current = constructSpineDocument({
      ...DEFAULT_SHAPE,
      posteriorDiscHeightsMm: [7, 8, 6.5, 8, 7.5],
    })
    const segment = computeSubsidence(current, baseline).segments['L3-L4']!
    expect(segment.lossMm.posterior).toBeCloseTo(2, 9)
    expect(segment.posteriorFlagged).toBe(true)
  })
  it('reports only the segments measured on both readings', () => {
    // A baseline without L5's corners has no L4-L5 or L5-S1 segment (§3): no loss can be formed.
    const points = Object.fromEntries(
      Object.entries(baseline.points).filter(([name]) => !name.startsWith('L5.')),
    )
    const result = computeSubsidence(constructSpineDocument(), { ...baseline, points })
    expect(result.segments['L5-S1']).toBeUndefined()
    expect(result.segments['L4-L5']).toBeUndefined()
    expect(result.segments['L3-L4']!.lossMm.mean).toBeCloseTo(0, 9)
  })
  it('is unknown (null) when either film is uncalibrated', () => {
    const { mmPerPixel: _spacing, ...uncalibrated } = baseline
    const segment = computeSubsidence(uncalibrated, baseline).segments['L4-L5']!
    expect(segment.lossMm.mean).toBeNull()
    expect(segment.subsided).toBeNull()
  })
  it('refuses a negative threshold', () => {
    expect(() => computeSubsidence(baseline, baseline, { thresholdMm: -1 })).toThrow(RangeError)
  })
})
