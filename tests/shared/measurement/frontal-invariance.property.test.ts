/**
 * The implant's lateral offset on a frontal film belongs to the anatomy, not to how the film
 * was taken [D]: a rotation of the image leaves it unchanged, and a left–right mirror (the film
 * hung the other way round, so the rater names the ends the other way: l ↔ r) flips its sign
 * and keeps its magnitude. Percent, tilt and segment angle keep their values in both. The
 * transforms are written with mathjs in support/transforms, apart from the engine.
 */
import { describe, expect, it } from 'vitest'
import fc from 'fast-check'
import { computeMeasurements } from '../../../shared/measurement/compute-measurements'
import type { FrontalSegmentMeasurement } from '../../../shared/types/measurement'
import { mirrorDocument, rotateDocument, type TestDocument } from '../support/transforms'
import type { Xy } from '../support/reference-math'

const number = (min: number, max: number) =>
  fc.double({ min, max, noNaN: true, noDefaultInfinity: true })

interface FrontalShape {
  widthPx: number
  gapPx: number
  segmentAngleDeg: number
  offsetPx: number
  tiltDeg: number
  spinousPx: number
}

const shape: fc.Arbitrary<FrontalShape> = fc.record({
  widthPx: number(250, 450),
  gapPx: number(60, 120),
  segmentAngleDeg: number(-10, 10),
  offsetPx: number(-60, 60),
  tiltDeg: number(-12, 12),
  spinousPx: number(-50, 50),
})

/** An upright frontal segment L4-L5 built from its shape, centred on (1500, 1200). */
function frontalDocument(s: FrontalShape): TestDocument {
  const half = s.widthPx / 2
  const turn = (deg: number, [x, y]: Xy): Xy => {
    const r = (deg * Math.PI) / 180
    return [x * Math.cos(r) - y * Math.sin(r), x * Math.sin(r) + y * Math.cos(r)]
  }
  const at = ([x, y]: Xy): Xy => [1500 + x, 1200 + y]
  const lower = (x: number): Xy => at(turn(s.segmentAngleDeg, [x, 0]))
  const implant = (x: number): Xy => {
    const [dx, dy] = turn(s.tiltDeg, [x, 0])
    return at([s.offsetPx + dx, -s.gapPx / 2 + dy])
  }
  return {
    mmPerPixel: 0.14,
    points: {
      'L4.il': at([-half, -s.gapPx]),
      'L4.ir': at([half, -s.gapPx]),
      'L4.sp': at([s.spinousPx, -s.gapPx - 40]),
      'L5.sl': lower(-half),
      'L5.sr': lower(half),
      'tdr.L4-L5.l': implant(-0.4 * s.widthPx),
      'tdr.L4-L5.r': implant(0.4 * s.widthPx),
    },
  }
}

/** After a mirror the end nearer the image's left edge is the one that was on the right. */
function relabelMirrored(doc: TestDocument): TestDocument {
  const swap: Record<string, string> = {
    'L4.il': 'L4.ir',
    'L4.ir': 'L4.il',
    'L5.sl': 'L5.sr',
    'L5.sr': 'L5.sl',
    'tdr.L4-L5.l': 'tdr.L4-L5.r',
    'tdr.L4-L5.r': 'tdr.L4-L5.l',
  }
  const points: Record<string, Xy> = {}
  for (const [name, point] of Object.entries(doc.points)) points[swap[name] ?? name] = point
  return { ...doc, points }
}

const measure = (doc: TestDocument): FrontalSegmentMeasurement =>
  computeMeasurements(doc).frontal['L4-L5']!

describe('frontal implant centring invariance', () => {
  it('keeps offset, tilt and segment angle under any rotation of the film', () => {
    fc.assert(
      fc.property(shape, number(-45, 45), (s, deg) => {
        const doc = frontalDocument(s)
        const before = measure(doc)
        const after = measure(rotateDocument(doc, deg, [800, 900]))
        expect(after.lateralOffsetMm!).toBeCloseTo(before.lateralOffsetMm!, 8)
        expect(after.lateralOffsetPercent!).toBeCloseTo(before.lateralOffsetPercent!, 8)
        expect(after.implantTiltDeg!).toBeCloseTo(before.implantTiltDeg!, 8)
        expect(after.segmentCoronalAngleDeg!).toBeCloseTo(before.segmentCoronalAngleDeg!, 8)
        expect(after.rotationPercent!).toBeCloseTo(before.rotationPercent!, 8)
      }),
      { numRuns: 200 },
    )
  })

  it('keeps the magnitude of the offset under a mirror, with its side named the other way', () => {
    fc.assert(
      fc.property(shape, number(-45, 45), (s, deg) => {
        const doc = rotateDocument(frontalDocument(s), deg, [1500, 1200])
        const before = measure(doc)
        const after = measure(relabelMirrored(mirrorDocument(doc, 1000)))
        expect(Math.abs(after.lateralOffsetMm!)).toBeCloseTo(Math.abs(before.lateralOffsetMm!), 8)
        expect(after.lateralOffsetMm!).toBeCloseTo(-before.lateralOffsetMm!, 8)
        expect(after.lateralOffsetPercent!).toBeCloseTo(-before.lateralOffsetPercent!, 8)
        expect(after.implantTiltDeg!).toBeCloseTo(before.implantTiltDeg!, 8)
        expect(after.segmentCoronalAngleDeg!).toBeCloseTo(before.segmentCoronalAngleDeg!, 8)
      }),
      { numRuns: 200 },
    )
  })

  it('finds the offset it was built with when the endplates are level and parallel', () => {
    fc.assert(
      fc.property(shape, (s) => {
        const level = measure(frontalDocument({ ...s, segmentAngleDeg: 0 }))
        // Construction: the implant centre sits offsetPx along e from the four-corner mean.
        expect(level.lateralOffsetPx!).toBeCloseTo(s.offsetPx, 8)
        expect(level.implantTiltDeg!).toBeCloseTo(Math.abs(s.tiltDeg), 8)
      }),
      { numRuns: 100 },
    )
  })
})
