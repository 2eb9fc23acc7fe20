/**
 * Segment measures on constructed spines (support/constructed-spine; invented geometry) checked
 * against the construction itself and against mathjs re-derivations of the literature formulas.
 */
import { describe, expect, it } from 'vitest'
import { computeMeasurements } from '../../../shared/measurement/compute-measurements'
import {
  cobbDeg,
  distance,
  slipAngleReference,
  taillardSlip,
  type Xy,
} from '../support/reference-math'
import { constructSpineDocument, DEFAULT_SHAPE } from '../support/constructed-spine'

describe('segmental lordosis and disc angle', () => {
  const doc = constructSpineDocument()
  const p = doc.points as Record<string, Xy>
  const result = computeMeasurements(doc)

  it('equal the constructed disc angle plus the upper wedge at L5-S1 (12° + 6°)', () => {
    expect(result.segments['L5-S1']!.discAngleDeg).toBeCloseTo(DEFAULT_SHAPE.discAnglesDeg[0], 9)
    expect(result.segments['L5-S1']!.segmentalLordosisDeg).toBeCloseTo(12 + 6, 9)
  })
  it('use the lower vertebra inferior endplate above S1 (Cobb; IJSS definitions [V])', () => {
    // L4-L5: L4 superior to L5 inferior: disc 10° + L4 wedge 2° + L5 wedge 6° = 18°.
    const expected = cobbDeg([p['L4.ps']!, p['L4.as']!], [p['L5.pi']!, p['L5.ai']!], 1)
    expect(expected).toBeCloseTo(10 + 2 + 6, 9)
    expect(result.segments['L4-L5']!.segmentalLordosisDeg).toBeCloseTo(expected, 9)
  })
  it('read a kyphotic segment as negative', () => {
    const kyphotic = constructSpineDocument({ ...DEFAULT_SHAPE, discAnglesDeg: [12, -9, 8, 6, 5] })
    const segment = computeMeasurements(kyphotic).segments['L4-L5']!
    expect(segment.discAngleDeg).toBeCloseTo(-9, 9)
    expect(segment.segmentalLordosisDeg).toBeCloseTo(-9 + 2 + 6, 9)
  })
})

describe('slip', () => {
  it('reads the constructed slip in mm and as % of the lower endplate depth (Taillard [V])', () => {
    const segment = computeMeasurements(constructSpineDocument()).segments['L5-S1']!
    expect(segment.slipMm).toBeCloseTo(DEFAULT_SHAPE.slipsMm[0], 9)
    expect(segment.slipPercent).toBeCloseTo((100 * 6) / 38, 9)
    expect(segment.slipPx).toBeCloseTo(6 / 0.139, 9)
  })
  it('reads a retrolisthesis as negative with direction "retrolisthesis"', () => {
    const doc = constructSpineDocument({ ...DEFAULT_SHAPE, slipsMm: [-4, 0, 0, 0, 0] })
    const p = doc.points as Record<string, Xy>
    const segment = computeMeasurements(doc).segments['L5-S1']!
    const expected = taillardSlip(p['S1.ps']!, p['S1.as']!, p['L5.pi']!)
    expect(expected.percent).toBeCloseTo((100 * -4) / 38, 9)
    expect(segment.slipPercent).toBeCloseTo(expected.percent, 9)
    expect(segment.slipDirection).toBe('retrolisthesis')
    expect(segment.meyerdingGrade).toBeNull()
  })
  it('reads a spondyloptosis past the anterior corner as grade V', () => {
    const doc = constructSpineDocument({
      ...DEFAULT_SHAPE,
      slipsMm: [40, 0, 0, 0, 0],
      posteriorDiscHeightsMm: [-8, 8, 8.5, 8, 7.5],
    })
    const segment = computeMeasurements(doc).segments['L5-S1']!
    expect(segment.slipPercent).toBeCloseTo((100 * 40) / 38, 9)
    expect(segment.meyerdingGrade).toBe('V')
    expect(segment.highGrade).toBe(true)
  })
})

describe('slip angle (Boxall et al. 1979 [M])', () => {
  it('matches the literature formula for a film facing right and one facing left', () => {
    for (const facing of [1, -1] as const) {
      const doc = constructSpineDocument({ ...DEFAULT_SHAPE, facing })
      const p = doc.points as Record<string, Xy>
      const expected = slipAngleReference(
        p['S1.ps']!,
        p['S1.pw']!,
        p['L5.pi']!,
        p['L5.ai']!,
        facing,
      )
      expect(computeMeasurements(doc).segments['L5-S1']!.slipAngleDeg).toBeCloseTo(expected, 9)
    }
  })
  it('is negative for a normal lordotic lumbosacral junction and positive when kyphotic', () => {
    expect(
      computeMeasurements(constructSpineDocument()).segments['L5-S1']!.slipAngleDeg,
    ).toBeLessThan(0)
    const kyphotic = constructSpineDocument({ ...DEFAULT_SHAPE, discAnglesDeg: [-20, 10, 8, 6, 5] })
    expect(computeMeasurements(kyphotic).segments['L5-S1']!.slipAngleDeg).toBeGreaterThan(0)
  })
})

describe('disc heights', () => {
  it('are point-to-point in px and mm, mean = (anterior + posterior)/2', () => {
    const doc = constructSpineDocument()
    const p = doc.points as Record<string, Xy>
    const heights = computeMeasurements(doc).segments['L3-L4']!
    const anterior = distance(p['L3.ai']!, p['L4.as']!)
    const posterior = distance(p['L3.pi']!, p['L4.ps']!)
    expect(heights.discHeightPx.anterior).toBeCloseTo(anterior, 9)
    expect(heights.discHeightPx.posterior).toBeCloseTo(posterior, 9)
    expect(heights.discHeightPx.mean).toBeCloseTo((anterior + posterior) / 2, 9)
    expect(heights.discHeightMm?.posterior).toBeCloseTo(posterior * 0.139, 9)
  })
})

describe('an uncalibrated document', () => {
  it('gives angles and percentages but null for every mm value', () => {
    const { mmPerPixel: _spacing, ...uncalibrated } = constructSpineDocument()
    const result = computeMeasurements(uncalibrated)
    const calibrated = computeMeasurements(constructSpineDocument())
    for (const name of ['L1-L2', 'L4-L5', 'L5-S1'] as const) {
      const segment = result.segments[name]!
      expect(segment.slipMm).toBeNull()
      expect(segment.discHeightMm).toBeNull()
      expect(segment.slipPercent).toBeCloseTo(
        calibrated.segments[name]!.slipPercent ?? Number.NaN,
        9,
      )
      expect(segment.discHeightPx.mean).toBeCloseTo(
        calibrated.segments[name]!.discHeightPx.mean ?? Number.NaN,
        9,
      )
    }
    expect(result.calibration).toBeNull()
    expect(result.lumbarLordosisDeg).toBeCloseTo(calibrated.lumbarLordosisDeg ?? Number.NaN, 9)
  })
})

describe('anisotropic spacing', () => {
  // Geometry built in mm with known angles, then converted to px with column 0.2 mm and row
  // 0.1 mm: x_px = x_mm / 0.2, y_px = y_mm / 0.1. Angles must come from the mm geometry.
  const toPx = ([x, y]: Xy): Xy => [x / 0.2, y / 0.1]
  const mm: Record<string, Xy> = {
    'S1.ps': [100, 200],
    'S1.as': [140, 210], // slope atan2(10, 40) = 14.04°
    'L5.pi': [104, 190],
    'L5.ai': [144, 190],
    'L5.ps': [104, 162],
    'L5.as': [144, 158],
  }
  const points = Object.fromEntries(Object.entries(mm).map(([name, point]) => [name, toPx(point)]))
  const result = computeMeasurements({ mmPerPixel: [0.1, 0.2], points })

  it('takes angles in mm, not on raw pixels', () => {
    const expected = cobbDeg([mm['L5.ps']!, mm['L5.as']!], [mm['S1.ps']!, mm['S1.as']!], 1)
    const onRawPixels = cobbDeg(
      [points['L5.ps']!, points['L5.as']!],
      [points['S1.ps']!, points['S1.as']!],
      1,
    )
    expect(result.segments['L5-S1']!.segmentalLordosisDeg).toBeCloseTo(expected, 9)
    expect(Math.abs(expected - onRawPixels)).toBeGreaterThan(1)
    expect(result.pelvis?.sacralSlopeDeg).toBeCloseTo((Math.atan2(10, 40) * 180) / Math.PI, 9)
  })
  it('takes slip % and mm from mm geometry and disc height px from the pixel grid', () => {
    const slip = taillardSlip(mm['S1.ps']!, mm['S1.as']!, mm['L5.pi']!)
    expect(result.segments['L5-S1']!.slipPercent).toBeCloseTo(slip.percent, 9)
    expect(result.segments['L5-S1']!.slipMm).toBeCloseTo(slip.d, 9)
    expect(result.segments['L5-S1']!.discHeightMm?.anterior).toBeCloseTo(
      distance(mm['L5.ai']!, mm['S1.as']!),
      9,
    )
    expect(result.segments['L5-S1']!.discHeightPx.anterior).toBeCloseTo(
      distance(points['L5.ai']!, points['S1.as']!),
      9,
    )
  })
})
