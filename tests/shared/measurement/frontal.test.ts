/**
 * Implant centring on a frontal (AP) film. Definitions [D]: e = unit((U.ir − U.il) + (W.sr −
 * W.sl)); width w = mean of the two endplate lengths; midline m = mean of the four corners;
 * implant centre q = mid(tdr.l, tdr.r); offset = (q − m)·e (positive toward the r side) and
 * 100·offset/w; implant tilt = unsigned angle between e and tdr.r − tdr.l; segment coronal
 * angle = unsigned angle between U.il→U.ir and W.sl→W.sr; rotation = 100·((U.sp − mid(U.il,
 * U.ir))·e)/(w/2). Threshold: McAfee et al. 2005, Spine 30:1576, ideal placement within 3 mm
 * of the midline (from memory, verify). Every expected value below is worked by hand in the
 * comment beside it.
 */
import { describe, expect, it } from 'vitest'
import { computeMeasurements } from '../../../shared/measurement/compute-measurements'
import { computeUncertainty } from '../../../shared/measurement/uncertainty'
import {
  DEFAULT_IMPLANT_CENTRING_THRESHOLD_MM,
  frontalImageRightSide,
  frontalSideWords,
  isImplantOffCentre,
} from '../../../shared/measurement/implant-centring'
import { LandmarkDocumentError } from '../../../shared/measurement/landmark-document-error'
import type { LandmarkDocument, PixelPoint } from '../../../shared/types/landmarks'

/** Level endplates 200 px wide, 100 px apart; the implant 10 px right of the midline. */
const LEVEL: Record<string, PixelPoint> = {
  'L4.il': [100, 100],
  'L4.ir': [300, 100],
  'L5.sl': [100, 200],
  'L5.sr': [300, 200],
  'tdr.L4-L5.l': [130, 150],
  'tdr.L4-L5.r': [290, 150],
  'L4.sp': [230, 60],
}

describe('frontal implant centring, hand-computed cases', () => {
  it('measures level endplates with a centred-right implant (0.2 mm/px)', () => {
    const frontal = computeMeasurements({ mmPerPixel: 0.2, points: LEVEL }).frontal['L4-L5']!
    // e = (1, 0); m = ((100+300+100+300)/4, (100+100+200+200)/4) = (200, 150);
    // q = ((130+290)/2, 150) = (210, 150); offset = 10 px = 2 mm; w = 200 px = 40 mm; 5 %.
    expect(frontal.lateralOffsetPx).toBeCloseTo(10, 12)
    expect(frontal.lateralOffsetMm).toBeCloseTo(2, 12)
    expect(frontal.endplateWidthMm).toBeCloseTo(40, 12)
    expect(frontal.lateralOffsetPercent).toBeCloseTo(5, 12)
    // Implant parallel to the endplates, endplates parallel to each other.
    expect(frontal.implantTiltDeg).toBeCloseTo(0, 12)
    expect(frontal.segmentCoronalAngleDeg).toBeCloseTo(0, 12)
    // Spinous process: (230 − 200)·1 / (200/2) = 30 % toward the r side.
    expect(frontal.rotationPercent).toBeCloseTo(30, 12)
  })

  it('measures a wedged segment with a level implant', () => {
    const points = {
      ...LEVEL,
      'L5.sr': [300, 220] as PixelPoint,
      'tdr.L4-L5.l': [130, 160] as PixelPoint,
      'tdr.L4-L5.r': [290, 160] as PixelPoint,
    }
    const frontal = computeMeasurements({ points }).frontal['L4-L5']!
    // U line (200, 0), W line (200, 20): sum (400, 20), |sum| = √160400 = 400.49969.
    const norm = Math.sqrt(400 * 400 + 20 * 20)
    // m = (200, (100+100+200+220)/4) = (200, 155); q = (210, 160); q − m = (10, 5).
    // offset = (10·400 + 5·20)/400.49969 = 4100/400.49969 = 10.23721 px.
    expect(frontal.lateralOffsetPx).toBeCloseTo(4100 / norm, 10)
    // w = (200 + √(200² + 20²))/2 = (200 + 200.99751)/2 = 200.49876 px.
    const width = (200 + Math.sqrt(200 * 200 + 20 * 20)) / 2
    expect(frontal.lateralOffsetPercent).toBeCloseTo((100 * 4100) / norm / width, 10)
    // Segment angle between (200, 0) and (200, 20): atan(20/200) = 5.71059°.
    expect(frontal.segmentCoronalAngleDeg).toBeCloseTo((Math.atan(0.1) * 180) / Math.PI, 10)
    // Implant (160, 0) against e ∝ (400, 20): atan(20/400) = 2.86241°.
    expect(frontal.implantTiltDeg).toBeCloseTo((Math.atan(0.05) * 180) / Math.PI, 10)
    // Uncalibrated: no mm values.
    expect(frontal.lateralOffsetMm).toBeNull()
    expect(frontal.endplateWidthMm).toBeNull()
  })

  it('measures a film rotated by 30°: the same offset, a tilted implant reads as tilt', () => {
    // Endplates along (cos 30°, sin 30°) = (0.866025, 0.5), 200 px long; the implant 8 px toward
    // r along them and turned 4° further.
    const c = Math.cos(Math.PI / 6)
    const s = Math.sin(Math.PI / 6)
    const at = (u: number, v: number): PixelPoint => [1000 + u * c - v * s, 1000 + u * s + v * c]
    const t = (34 * Math.PI) / 180
    const half = 80
    const centre = at(8, 50)
    const points: Record<string, PixelPoint> = {
      'L3.il': at(-100, 0),
      'L3.ir': at(100, 0),
      'L4.sl': at(-100, 100),
      'L4.sr': at(100, 100),
      'tdr.L3-L4.l': [centre[0] - half * Math.cos(t), centre[1] - half * Math.sin(t)],
      'tdr.L3-L4.r': [centre[0] + half * Math.cos(t), centre[1] + half * Math.sin(t)],
    }
    const frontal = computeMeasurements({ mmPerPixel: 0.1, points }).frontal['L3-L4']!
    // m = at(0, 50); q = at(8, 50): offset 8 px = 0.8 mm, 8/200 = 4 %; tilt 34° − 30° = 4°.
    expect(frontal.lateralOffsetMm).toBeCloseTo(0.8, 10)
    expect(frontal.lateralOffsetPercent).toBeCloseTo(4, 10)
    expect(frontal.implantTiltDeg).toBeCloseTo(4, 10)
    expect(frontal.rotationPercent).toBeNull()
  })

  it('reads a negative offset toward the l side, and uses non-square pixels in mm', () => {
    // Row spacing 0.2 mm, column spacing 0.1 mm: the 200 px endplates are 20 mm wide, the
    // 100 px gap is 20 mm high; the implant centre 20 px left of the midline = −2 mm, −10 %.
    const points = {
      ...LEVEL,
      'tdr.L4-L5.l': [110, 150] as PixelPoint,
      'tdr.L4-L5.r': [250, 150] as PixelPoint,
    }
    const frontal = computeMeasurements({ mmPerPixel: [0.2, 0.1], points }).frontal['L4-L5']!
    expect(frontal.lateralOffsetPx).toBeCloseTo(-20, 12)
    expect(frontal.lateralOffsetMm).toBeCloseTo(-2, 12)
    expect(frontal.endplateWidthMm).toBeCloseTo(20, 12)
    expect(frontal.lateralOffsetPercent).toBeCloseTo(-10, 12)
  })

  it('gives the segment without implant values until both implant ends are placed', () => {
    const { 'tdr.L4-L5.r': _r, ...points } = LEVEL
    const frontal = computeMeasurements({ mmPerPixel: 0.2, points }).frontal['L4-L5']!
    expect(frontal.endplateWidthMm).toBeCloseTo(40, 12)
    expect(frontal.lateralOffsetMm).toBeNull()
    expect(frontal.lateralOffsetPercent).toBeNull()
    expect(frontal.implantTiltDeg).toBeNull()
    expect(frontal.segmentCoronalAngleDeg).toBeCloseTo(0, 12)
  })

  it('leaves a segment out without its four endplate corners, and a lateral film has {}', () => {
    const { 'L5.sl': _corner, ...points } = LEVEL
    expect(computeMeasurements({ points }).frontal).toEqual({})
    const lateral = computeMeasurements({
      points: { 'L5.ps': [0, 0], 'L5.as': [300, 0], 'S1.ps': [0, 100], 'S1.as': [300, 120] },
    })
    expect(lateral.frontal).toEqual({})
  })

  it('measures L5-S1 from the S1 superior endplate corners', () => {
    const points: Record<string, PixelPoint> = {
      'L5.il': [100, 100],
      'L5.ir': [300, 100],
      'S1.sl': [100, 200],
      'S1.sr': [300, 200],
      'tdr.L5-S1.l': [120, 150],
      'tdr.L5-S1.r': [280, 150],
    }
    const frontal = computeMeasurements({ points }).frontal
    expect(Object.keys(frontal)).toEqual(['L5-S1'])
    expect(frontal['L5-S1']!.lateralOffsetPx).toBeCloseTo(0, 12)
  })
})

describe('frontal landmarks refused with a message', () => {
  /** The error a document is refused with, or null when it is measured. */
  const refusal = (points: Record<string, PixelPoint>): unknown => {
    try {
      computeMeasurements({ points } satisfies LandmarkDocument)
      return null
    } catch (error) {
      return error
    }
  }
  it('refuses endplate lines whose l and r are swapped on one vertebra', () => {
    const error = refusal({ ...LEVEL, 'L5.sl': [300, 200], 'L5.sr': [100, 200] })
    expect(error).toBeInstanceOf(LandmarkDocumentError)
    expect((error as Error).message).toMatch(/opposite directions/)
  })
  it('refuses an implant whose ends are swapped', () => {
    const error = refusal({ ...LEVEL, 'tdr.L4-L5.l': [290, 150], 'tdr.L4-L5.r': [130, 150] })
    expect((error as LandmarkDocumentError).code).toBe('crossed-frontal-lines')
    expect((error as Error).message).toMatch(/swapped/)
  })
  it('refuses a zero-length frontal endplate', () => {
    expect((refusal({ ...LEVEL, 'L4.ir': [100, 100] }) as Error).message).toMatch(
      /zero-length L4 inferior endplate/,
    )
  })
  it('refuses names outside the vocabulary', () => {
    expect((refusal({ 'L1.sl': [0, 0] }) as Error).message).toMatch(/unknown landmark name "L1.sl"/)
    expect((refusal({ 'tdr.L4-L5.marker': [0, 0] }) as Error).message).toMatch(
      /unknown landmark name/,
    )
  })
})

describe('frontal uncertainty (first-order propagation at σ = 1 mm)', () => {
  it('gives a level implant a tilt interval of real width, clipped at 0°', () => {
    const result = computeUncertainty({ mmPerPixel: 0.2, points: LEVEL })
    const tilt = result.measurements.frontal['L4-L5']!.implantTiltDeg!
    // The implant line is 160 px = 32 mm long; σ = 1 mm on each end coordinate across the line
    // gives a line angle SD of √2·1/32 rad = 2.53°, and e adds a little: well above 1°.
    expect(tilt.value).toBeCloseTo(0, 12)
    expect(tilt.standardDeviation).toBeGreaterThan(2.5)
    expect(tilt.standardDeviation).toBeLessThan(3.5)
    expect(tilt.low).toBe(0)
    expect(tilt.high).toBeCloseTo(1.959963984540054 * tilt.standardDeviation, 9)
  })
  it('gives the offset an SD near the hand estimate', () => {
    const offset = computeUncertainty({ mmPerPixel: 0.2, points: LEVEL }).measurements.frontal[
      'L4-L5'
    ]!.lateralOffsetMm!
    // Along e, q − m = (tdr.l + tdr.r)/2 − (four corners)/4: variance σ²(2/4 + 4/16) = 0.75σ²,
    // so SD ≈ 0.87 mm; the tilt of e moves it a little more through the y offsets, which are 0.
    expect(offset.standardDeviation).toBeCloseTo(Math.sqrt(0.75), 2)
  })
})

describe('implant centring threshold and side naming', () => {
  it('flags an offset above 3 mm only', () => {
    expect(DEFAULT_IMPLANT_CENTRING_THRESHOLD_MM).toBe(3)
    expect(isImplantOffCentre({ lateralOffsetMm: 3 })).toBe(false)
    expect(isImplantOffCentre({ lateralOffsetMm: -3.1 })).toBe(true)
    expect(isImplantOffCentre({ lateralOffsetMm: 2.9 }, 2.5)).toBe(true)
    expect(isImplantOffCentre({ lateralOffsetMm: null })).toBeNull()
    expect(() => isImplantOffCentre({ lateralOffsetMm: 1 }, -1)).toThrow(RangeError)
  })
  it('reads the image-right side from Patient Orientation (DICOM PS3.3 C.7.6.1.1.1)', () => {
    // An AP film seen as if facing the patient: rows run toward the patient's left, columns to the feet.
    expect(frontalImageRightSide(['L', 'F'])).toBe('patient-left')
    expect(frontalImageRightSide(['R', 'F'])).toBe('patient-right')
    // The first letter is the major direction of an oblique value.
    expect(frontalImageRightSide(['LH', 'F'])).toBe('patient-left')
    // A lateral film's rows run anterior or posterior: no left/right to name.
    expect(frontalImageRightSide(['A', 'F'])).toBe('unknown')
    expect(frontalImageRightSide(null)).toBe('unknown')
    expect(frontalSideWords('patient-left', 'r')).toBe('patient left')
    expect(frontalSideWords('patient-left', 'l')).toBe('patient right')
    expect(frontalSideWords('unknown', 'r')).toBe('image right')
  })
})
