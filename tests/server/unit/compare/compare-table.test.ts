import { describe, expect, it } from 'vitest'
import { compareTable, type CompareSide } from '@shared/compare/index'
import { computeMeasurements, computeUncertainty } from '@shared/measurement/index'
import type { LandmarkDocument, PixelPoint } from '@shared/types/landmarks'
import type { PatientPlan, PlanSegment } from '@shared/types/plans'
import type { ReadingResults } from '@shared/types/readings'
import { phantomGroundTruth } from '../../../../server/phantom/generate-phantom'
import type { PhantomParamsInput } from '../../../../server/phantom/phantom-params'
import { mulberry32, normalSource } from '../../../shared/support/seeded-random'

// Invented course: L4-L5 has 19° of segmental lordosis and a 12 % slip before surgery; after an
// interbody fusion it has 27° (a gain of 8°) and 3 %. Both films at 0.13 mm/px.
const PRE_OP: PhantomParamsInput = {
  segments: { 'L4-L5': { segmentalAngleDeg: 19, slipPercent: 12, posteriorDiscHeightMm: 5 } },
}
const POST_OP: PhantomParamsInput = {
  segments: { 'L4-L5': { segmentalAngleDeg: 27, slipPercent: 3, posteriorDiscHeightMm: 8 } },
  implants: [{ kind: 'disc-replacement', segment: 'L4-L5', positionPercent: 46 }],
}
const GAIN_DEG = 8
const SIGMA_MM = 1
const L4_L5_NAMES = ['L4.as', 'L4.ps', 'L4.pi', 'L4.ai', 'L5.as', 'L5.ps', 'L5.pi', 'L5.ai']

function documentOf(params: PhantomParamsInput, names?: string[]): LandmarkDocument {
  const { landmarks } = phantomGroundTruth(params)
  if (!names) return landmarks
  const points: Record<string, PixelPoint> = {}
  for (const name of names) points[name] = landmarks.points[name] as PixelPoint
  return { mmPerPixel: landmarks.mmPerPixel ?? null, points }
}

/** Each coordinate moved by an independent normal error of SD σ (the engine's error model, §8). */
function placedByHand(doc: LandmarkDocument, normal: () => number): LandmarkDocument {
  const sigmaPx = SIGMA_MM / (doc.mmPerPixel as number)
  const points: Record<string, PixelPoint> = {}
  for (const [name, [x, y]] of Object.entries(doc.points))
    points[name] = [x + normal() * sigmaPx, y + normal() * sigmaPx]
  return { ...doc, points }
}

function side(
  doc: LandmarkDocument,
  visitKind: CompareSide['visitKind'],
  visitId: number,
  id = visitId,
  results: Partial<ReadingResults> = {},
): CompareSide {
  const measurements = computeMeasurements(doc)
  return {
    visitId,
    visitKind,
    view: 'lateral-neutral',
    measures: {
      measurements,
      uncertainty: computeUncertainty(doc, { sigmaMm: SIGMA_MM }),
      calibrationSource: 'dicom-pixel-spacing',
    },
    reading: {
      id,
      results: {
        measurements,
        uncertainty: null,
        motion: null,
        subsidence: null,
        subsidenceBaselineReadingId: null,
        ...results,
      },
    },
  }
}

const rowOf = (table: ReturnType<typeof compareTable>, id: string) => {
  const row = table.rows.find((candidate) => candidate.id === id)
  if (!row) throw new Error(`no row ${id}`)
  return row
}

describe('compareTable on phantoms with known parameters', () => {
  it('gives the lordosis gain and slip reduction the phantoms were drawn with', () => {
    const table = compareTable({
      before: side(documentOf(PRE_OP), 'pre-op', 1),
      after: side(documentOf(POST_OP), 'post-op', 2),
      plan: null,
    })
    expect(table.kind).toBe('pre-op-post-op')
    expect(table.segments).toEqual(['L1-L2', 'L2-L3', 'L3-L4', 'L4-L5', 'L5-S1'])
    const lordosis = rowOf(table, 'L4-L5-lordosis')
    expect(lordosis.unit).toBe('°')
    expect(lordosis.before?.value).toBeCloseTo(19, 6)
    expect(lordosis.after?.value).toBeCloseTo(27, 6)
    expect(lordosis.change?.value).toBeCloseTo(GAIN_DEG, 6)
    // The change's interval is the two intervals in quadrature (differenceWithInterval).
    expect(lordosis.change?.halfWidth95).toBeCloseTo(
      Math.hypot(lordosis.before!.halfWidth95!, lordosis.after!.halfWidth95!),
      12,
    )
    expect(rowOf(table, 'L4-L5-slip').change?.value).toBeCloseTo(3 - 12, 6)
    // Posterior disc height point to point (reference §3): |U.pi − W.ps| = √(h² + d²), with h
    // the perpendicular height the phantom was drawn with and d the slip along L5's superior
    // endplate (12 % before, 3 % after). The phantom's L5 is 38 mm deep with walls of 24 and
    // 28.5 mm at right angles to its inferior endplate, so its superior endplate is √(38² + 4.5²).
    const endplateMm = Math.hypot(38, 28.5 - 24)
    const posterior = rowOf(table, 'L4-L5-disc-posterior')
    expect(posterior.before?.value).toBeCloseTo(Math.hypot(5, 0.12 * endplateMm), 6)
    expect(posterior.after?.value).toBeCloseTo(Math.hypot(8, 0.03 * endplateMm), 6)
    expect(rowOf(table, 'L4-L5-disc-mean').calibration).toEqual({
      before: 'dicom-pixel-spacing',
      after: 'dicom-pixel-spacing',
    })
    // Implant position only where a film has a marker; the earlier one has none.
    const implant = rowOf(table, 'L4-L5-implant-position')
    expect(implant.before).toBeNull()
    expect(implant.after?.value).toBeCloseTo(46, 6)
    expect(implant.change).toBeNull()
    // Untouched segments do not change.
    expect(rowOf(table, 'L2-L3-lordosis').change?.value).toBeCloseTo(0, 6)
  })

  it('covers the true gain in about 95 % of hand placements on both films', () => {
    // 300 simulated pairs of readings of L4-L5, every coordinate off by N(0, 1 mm) on both films:
    // the stated 95 % interval of the change must hold the true 8° about 95 % of the time.
    const normal = normalSource(mulberry32(41))
    const pre = documentOf(PRE_OP, L4_L5_NAMES)
    const post = documentOf(POST_OP, L4_L5_NAMES)
    const runs = 300
    let covered = 0
    for (let run = 0; run < runs; run++) {
      const table = compareTable({
        before: side(placedByHand(pre, normal), 'pre-op', 1),
        after: side(placedByHand(post, normal), 'post-op', 2),
        plan: null,
      })
      const change = rowOf(table, 'L4-L5-lordosis').change!
      if (Math.abs(change.value - GAIN_DEG) <= change.halfWidth95!) covered += 1
    }
    // Binomial SD of the coverage at n = 300 is 1.3 %: 95 % ± 4 SD.
    expect(covered / runs).toBeGreaterThan(0.9)
    expect(covered / runs).toBeLessThan(0.995)
  })

  it('sets the plan beside what the later film achieved', () => {
    const planned = (
      segment: PlanSegment['segment'],
      treatment: PlanSegment['treatment'],
      deg: number | null,
    ) => ({ segment, treatment, implantLordosisDeg: deg }) as PlanSegment
    const plan = {
      patientId: 1,
      segments: [
        planned('L3-L4', 'none', null),
        planned('L4-L5', 'interbody-fusion', 10),
        planned('L5-S1', 'disc-replacement', null),
      ],
      lordosis: { targetLordosisDeg: 55.4, expectedLordosisDeg: 50 },
    } as unknown as PatientPlan
    const table = compareTable({
      before: side(documentOf(PRE_OP), 'pre-op', 1),
      after: side(documentOf(POST_OP), 'post-op', 2),
      plan,
    })
    const byId = Object.fromEntries(table.plan.map((row) => [row.id, row]))
    expect(Object.keys(byId)).toEqual([
      'L4-L5-implant-lordosis',
      'L5-S1-implant-lordosis',
      'target-lordosis',
      'expected-lordosis',
    ])
    expect(byId['L4-L5-implant-lordosis']).toMatchObject({ planned: 10 })
    expect(byId['L4-L5-implant-lordosis']!.achieved?.value).toBeCloseTo(27, 6)
    expect(byId['L4-L5-implant-lordosis']!.differenceDeg).toBeCloseTo(17, 6)
    // No implant angle planned at L5-S1: the measured value stands alone.
    expect(byId['L5-S1-implant-lordosis']!.planned).toBeNull()
    expect(byId['L5-S1-implant-lordosis']!.differenceDeg).toBeNull()
    const measuredLordosis = computeMeasurements(documentOf(POST_OP)).lumbarLordosisDeg!
    expect(byId['target-lordosis']!.planned).toBe(55.4)
    expect(byId['target-lordosis']!.achieved?.value).toBeCloseTo(measuredLordosis, 9)
    expect(byId['target-lordosis']!.differenceDeg).toBeCloseTo(measuredLordosis - 55.4, 9)
    // A pre-op pair gets no plan rows.
    expect(
      compareTable({
        before: side(documentOf(PRE_OP), 'pre-op', 1),
        after: side(documentOf(PRE_OP), 'pre-op', 3),
        plan,
      }).plan,
    ).toEqual([])
  })

  it('compares only segments measured on both films, and says which were left out', () => {
    const table = compareTable({
      before: side(documentOf(PRE_OP), 'pre-op', 1),
      after: side(documentOf(POST_OP, L4_L5_NAMES), 'post-op', 2),
      plan: null,
    })
    expect(table.segments).toEqual(['L4-L5'])
    expect(table.notes.join(' ')).toContain('L1-L2, L2-L3, L3-L4, L5-S1')
    // L1–S1 lordosis only on the earlier film: shown, without a change.
    const lordosis = rowOf(table, 'lumbar-lordosis')
    expect(lordosis.before).not.toBeNull()
    expect(lordosis.after).toBeNull()
    expect(lordosis.change).toBeNull()
  })

  it('takes motion and subsidence from the readings that stored them, once per reading', () => {
    const pre = documentOf(PRE_OP)
    const motion: ReadingResults['motion'] = {
      segments: {
        'L4-L5': {
          rangeOfMotionDeg: 14,
          translationMm: 5.2,
          translationPercent: 14,
          criteria: [
            {
              id: 'white-panjabi-1990',
              source: 'White & Panjabi 1990',
              translationThresholdMm: 4.5,
              translationThresholdPercent: 15,
              angulationThresholdDeg: 20,
              translationFlagged: true,
              angulationFlagged: false,
              flagged: true,
            },
          ],
        },
      },
    }
    const flexion = side(pre, 'pre-op', 1, 9, { motion })
    const extension = {
      ...side(pre, 'pre-op', 1, 9, { motion }),
      view: 'lateral-extension' as const,
    }
    const table = compareTable({
      before: { ...flexion, view: 'lateral-flexion' },
      after: extension,
      plan: null,
    })
    expect(table.kind).toBe('flexion-extension')
    expect(table.motion).toEqual([
      {
        readingId: 9,
        segment: 'L4-L5',
        rangeOfMotionDeg: 14,
        translationMm: 5.2,
        translationPercent: 14,
        calibrationSource: 'dicom-pixel-spacing',
        flaggedBy: ['White & Panjabi 1990'],
      },
    ])
    const subsidence: ReadingResults['subsidence'] = {
      'L4-L5': {
        thresholdMm: 2,
        source: 'Rao et al. 2017',
        baselineReadingId: 4,
        segments: {
          'L4-L5': {
            lossMm: { anterior: 2.5, middle: 1, posterior: 0.5, mean: 1.5 },
            anteriorFlagged: true,
            posteriorFlagged: false,
            meanFlagged: false,
            subsided: true,
          },
        },
      },
    }
    const followUp = compareTable({
      before: side(documentOf(POST_OP), 'post-op', 2, 4),
      after: side(documentOf(POST_OP), 'follow-up', 3, 5, { subsidence }),
      plan: null,
    })
    expect(followUp.kind).toBe('follow-ups')
    expect(followUp.subsidence).toEqual([
      expect.objectContaining({
        readingId: 5,
        baselineReadingId: 4,
        segment: 'L4-L5',
        subsided: true,
      }),
    ])
  })

  it('warns when the two films take their mm scale from different sources', () => {
    const before = side(documentOf(PRE_OP), 'pre-op', 1)
    const after = side(documentOf(POST_OP), 'post-op', 2)
    after.measures!.calibrationSource = 'dicom-imager-spacing'
    expect(compareTable({ before, after, plan: null }).notes.join(' ')).toMatch(/scales differ/)
  })
})
