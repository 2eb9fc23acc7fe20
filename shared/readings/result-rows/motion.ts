import type { SpacingSource } from '../../types/domain'
import type {
  InstabilityCriterionId,
  MotionSegmentResult,
  SegmentName,
} from '../../types/measurement'
import { SPACING_SOURCE_SHORT } from '../../format/spacing-source-labels'
import { ROM_DEFINITION, TRANSLATION_DEFINITION } from './labels'
import { row } from './row-format'
import type { ResultFlag, ResultSection } from './types'

/** Range of motion and translation between flexion and extension, with the instability criteria. */
export function motionSection(
  segmentName: SegmentName,
  motion: MotionSegmentResult | null | undefined,
  spacingSource: SpacingSource,
  siteCriterion: InstabilityCriterionId | undefined,
): ResultSection {
  const calibration = SPACING_SOURCE_SHORT[spacingSource]
  const rows = [
    row('rom', 'Angular range of motion', motion?.rangeOfMotionDeg, null, '°', ROM_DEFINITION, {
      emphasis: true,
    }),
    row(
      'translation-mm',
      'Translation',
      motion?.translationMm,
      null,
      'mm',
      TRANSLATION_DEFINITION,
      {
        calibration,
      },
    ),
    row(
      'translation-percent',
      'Translation (of endplate depth)',
      motion?.translationPercent,
      null,
      '%',
      TRANSLATION_DEFINITION,
    ),
  ]
  // The criterion the site goes by comes first; the other published ones follow for context.
  const criteria = [...(motion?.criteria ?? [])].sort(
    (a, b) => Number(b.id === siteCriterion) - Number(a.id === siteCriterion),
  )
  const flags: ResultFlag[] = criteria.map((criterion) => {
    const limits = [
      criterion.translationThresholdMm !== null ? `> ${criterion.translationThresholdMm} mm` : null,
      criterion.translationThresholdPercent !== null
        ? `> ${criterion.translationThresholdPercent} %`
        : null,
      criterion.angulationThresholdDeg !== null ? `> ${criterion.angulationThresholdDeg}°` : null,
    ]
      .filter(Boolean)
      .join(' or ')
    const verdict =
      criterion.flagged === true
        ? 'meets the instability criterion'
        : criterion.flagged === false
          ? 'below the criterion'
          : 'not assessable (calibration or landmarks missing)'
    const role =
      siteCriterion === undefined
        ? ''
        : criterion.id === siteCriterion
          ? 'Site criterion: '
          : 'Also published: '
    return {
      id: criterion.id,
      tone: criterion.flagged === true ? 'warn' : 'info',
      text: `${role}${segmentName} ${verdict} (${limits}).`,
      source: criterion.source,
    }
  })
  return { id: 'motion', title: `Motion ${segmentName}, flexion → extension`, rows, flags }
}
