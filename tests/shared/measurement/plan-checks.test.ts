/**
 * Plan checks (measurement-reference §9): flags for a planned disc replacement with their
 * sources (Huang et al. 2004, Spine 29:2538; Büttner-Janz et al. 2014, Int J Spine Surg 8:12
 * [V]), and the plan's expected lordosis beside the target (Le Huec & Hasegawa 2016 [V]).
 */
import { describe, expect, it } from 'vitest'
import { checkSegmentPlan, estimatePlannedLordosis } from '../../../shared/measurement/plan-checks'

const clean = {
  treatment: 'disc replacement' as const,
  parsDefect: false,
  slipPercent: 10,
  facetDegeneration: false,
  dynamicTranslationMm: 2,
  osteoporosis: false,
  residualDiscHeightMm: 8,
}

function flagsOf(input: Parameters<typeof checkSegmentPlan>[0]): Record<string, boolean | null> {
  return Object.fromEntries(checkSegmentPlan(input).map((flag) => [flag.id, flag.flagged]))
}

describe('checkSegmentPlan', () => {
  it('raises no flag for a clean disc replacement level, and every flag names its source', () => {
    const flags = checkSegmentPlan(clean)
    expect(flags.map((flag) => flag.flagged)).toEqual([false, false, false, false, false, false])
    for (const flag of flags) expect(flag.source).toMatch(/\[V\]/)
  })
  it.each([
    ['pars-defect', { parsDefect: true }],
    ['slip-grade-ii-or-more', { slipPercent: 25.1 }],
    ['facet-degeneration', { facetDegeneration: true }],
    ['dynamic-translation-over-5mm', { dynamicTranslationMm: 5.1 }],
    ['osteoporosis', { osteoporosis: true }],
    ['residual-disc-height-under-3mm', { residualDiscHeightMm: 2.9 }],
  ])('flags %s', (id, change) => {
    const flags = flagsOf({ ...clean, ...change })
    expect(flags[id]).toBe(true)
    expect(Object.values(flags).filter(Boolean)).toHaveLength(1)
  })
  it('keeps the boundaries: grade I at 25.0 %, 5.0 mm translation and 3.0 mm height pass', () => {
    const flags = flagsOf({
      ...clean,
      slipPercent: 25,
      dynamicTranslationMm: 5,
      residualDiscHeightMm: 3,
    })
    expect(flags['slip-grade-ii-or-more']).toBe(false)
    expect(flags['dynamic-translation-over-5mm']).toBe(false)
    expect(flags['residual-disc-height-under-3mm']).toBe(false)
  })
  it('reads an unrecorded finding as unknown (null), never as not flagged', () => {
    const flags = flagsOf({ treatment: 'disc replacement' })
    expect(Object.values(flags).every((flag) => flag === null)).toBe(true)
  })
  it('does not check segments planned for other treatments', () => {
    expect(checkSegmentPlan({ ...clean, treatment: 'interbody fusion', parsDefect: true })).toEqual(
      [],
    )
  })
})

describe('estimatePlannedLordosis', () => {
  it('adds planned minus current angles at fused segments only, beside 0.54·PI + 27.6', () => {
    const estimate = estimatePlannedLordosis({
      currentLordosisDeg: 40,
      pelvicIncidenceDeg: 55,
      segments: [
        {
          segment: 'L5-S1',
          treatment: 'interbody fusion',
          plannedImplantAngleDeg: 20,
          currentSegmentalLordosisDeg: 12,
        },
        {
          segment: 'L4-L5',
          treatment: 'disc replacement',
          plannedImplantAngleDeg: 10,
          currentSegmentalLordosisDeg: 6,
        },
        {
          segment: 'L3-L4',
          treatment: 'posterior fusion',
          plannedImplantAngleDeg: null,
          currentSegmentalLordosisDeg: 9,
        },
      ],
    })
    // 40 + (20 − 12) = 48°; target 0.54·55 + 27.6 = 57.3°.
    expect(estimate.expectedLordosisDeg).toBeCloseTo(48, 12)
    expect(estimate.targetLordosisDeg).toBeCloseTo(0.54 * 55 + 27.6, 12)
    expect(estimate.differenceDeg).toBeCloseTo(48 - (0.54 * 55 + 27.6), 12)
    expect(estimate.isEstimate).toBe(true)
    expect(estimate.source).toMatch(/estimate/)
  })
  it('is null when a fused segment has no current angle', () => {
    const estimate = estimatePlannedLordosis({
      currentLordosisDeg: 40,
      pelvicIncidenceDeg: null,
      segments: [
        {
          segment: 'L5-S1',
          treatment: 'interbody fusion',
          plannedImplantAngleDeg: 20,
          currentSegmentalLordosisDeg: null,
        },
      ],
    })
    expect(estimate.expectedLordosisDeg).toBeNull()
    expect(estimate.targetLordosisDeg).toBeNull()
  })
})
