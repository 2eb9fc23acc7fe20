/**
 * Motion pair (measurement-reference §6) on constructed flexion and extension films. Criteria:
 * White & Panjabi 1990 [M], Dupuis et al. 1985 [M for the numbers], IDE > 5 mm [V].
 */
import { describe, expect, it } from 'vitest'
import { computeMotionPair, instabilityCriteria } from '../../../shared/measurement/motion-pair'
import {
  constructSpineDocument,
  DEFAULT_SHAPE,
  type SpineShape,
} from '../support/constructed-spine'

const extensionShape: SpineShape = {
  ...DEFAULT_SHAPE,
  discAnglesDeg: [16, 14, 12, 10, 9],
  slipsMm: [5, 1, 0, -1, 0],
}
const flexionShape: SpineShape = {
  ...DEFAULT_SHAPE,
  discAnglesDeg: [-6, 2, 0, -2, -3],
  slipsMm: [10.5, 2, 0, -1, 0],
}

describe('computeMotionPair', () => {
  const motion = computeMotionPair(
    constructSpineDocument(flexionShape),
    constructSpineDocument(extensionShape),
  )

  it('reads ROM as |Δ segmental lordosis| and translation in mm and %', () => {
    const segment = motion.segments['L5-S1']!
    // Segmental = disc + wedge (6°): 16 + 6 vs −6 + 6: ROM = 22°. ΔT = 10.5 − 5 = 5.5 mm of 38 mm.
    expect(segment.rangeOfMotionDeg).toBeCloseTo(22, 9)
    expect(segment.translationMm).toBeCloseTo(5.5, 9)
    expect(segment.translationPercent).toBeCloseTo((100 * 5.5) / 38, 9)
  })
  it('applies level-specific angulation thresholds: 25° at L5-S1, 20° at L4-L5, 15° above', () => {
    const threshold = (name: 'L5-S1' | 'L4-L5' | 'L1-L2') =>
      motion.segments[name]!.criteria.find((c) => c.id === 'white-panjabi-1990')
        ?.angulationThresholdDeg
    expect(threshold('L5-S1')).toBe(25)
    expect(threshold('L4-L5')).toBe(20)
    expect(threshold('L1-L2')).toBe(15)
  })
  it('flags L5-S1 under Dupuis (> 10°, > 4 mm) and IDE (> 5 mm) but not White & Panjabi', () => {
    const byId = Object.fromEntries(motion.segments['L5-S1']!.criteria.map((c) => [c.id, c]))
    // 22° ≤ 25°, 5.5 mm > 4.5 mm: White & Panjabi flags by translation.
    expect(byId['white-panjabi-1990']?.angulationFlagged).toBe(false)
    expect(byId['white-panjabi-1990']?.translationFlagged).toBe(true)
    expect(byId['dupuis-1985']?.flagged).toBe(true)
    expect(byId['ide-translation-5mm']?.flagged).toBe(true)
    expect(byId['ide-translation-5mm']?.source).toMatch(/IDE/)
    expect(byId['white-panjabi-1990']?.source).toMatch(/White & Panjabi 1990.*\[M\]/)
  })
  it('leaves mm-based parts unknown (null) when a film is uncalibrated', () => {
    const { mmPerPixel: _spacing, ...uncalibrated } = constructSpineDocument(flexionShape)
    const segment = computeMotionPair(uncalibrated, constructSpineDocument(extensionShape))
      .segments['L3-L4']!
    expect(segment.translationMm).toBeNull()
    expect(segment.translationPercent).not.toBeNull()
    const ide = segment.criteria.find((c) => c.id === 'ide-translation-5mm')
    expect(ide?.flagged).toBeNull()
  })
  it('reports only the segments measured on both films', () => {
    // Without L1's corners L1-L2 cannot be measured on the flexion film (§3), so it has no motion.
    const flexion = constructSpineDocument(flexionShape)
    const points = Object.fromEntries(
      Object.entries(flexion.points).filter(([name]) => !name.startsWith('L1.')),
    )
    const partial = computeMotionPair(
      { ...flexion, points },
      constructSpineDocument(extensionShape),
    )
    expect(partial.segments['L1-L2']).toBeUndefined()
    expect(partial.segments['L5-S1']!.rangeOfMotionDeg).toBeCloseTo(22, 9)
  })
})

describe('instabilityCriteria', () => {
  it('is true when any part is exceeded even if another is unknown', () => {
    const criteria = instabilityCriteria('L4-L5', null, 16, 3)
    expect(criteria.find((c) => c.id === 'white-panjabi-1990')?.flagged).toBe(true)
  })
  it('uses strict "greater than" thresholds: exactly 4.5 mm and 15 % do not flag', () => {
    const criteria = instabilityCriteria('L4-L5', 4.5, 15, 20)
    expect(criteria.find((c) => c.id === 'white-panjabi-1990')?.flagged).toBe(false)
  })
})
