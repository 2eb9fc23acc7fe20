import type { MeyerdingUncertainty, SegmentMeasurement, SegmentName } from '../../types/measurement'
import { SOURCES } from '../../measurement/index'
import { percentText } from './row-format'
import { BORDERLINE_PROBABILITY, HIGH_GRADE_SLIP_PERCENT } from './thresholds'
import type { ResultFlag, ResultRow } from './types'

/** The Meyerding grade row with its probability, and the borderline, high-grade and retro flags. */
export function gradeRows(
  segmentName: SegmentName,
  segment: SegmentMeasurement,
  meyerding: MeyerdingUncertainty | null | undefined,
): { row: ResultRow; flags: ResultFlag[] } {
  const grade = segment.meyerdingGrade
  const probabilities = meyerding?.probabilities
  const probability = probabilities ? probabilities[grade ?? 'none'] : null
  const flags: ResultFlag[] = []
  if (meyerding?.borderline) {
    const order = ['none', 'I', 'II', 'III', 'IV', 'V'] as const
    const index = order.indexOf(grade ?? 'none')
    const neighbours = [order[index - 1], order[index + 1]]
      .filter(
        (name): name is (typeof order)[number] =>
          name !== undefined &&
          probabilities !== undefined &&
          probabilities[name] >= BORDERLINE_PROBABILITY,
      )
      .map(
        (name) =>
          `${name === 'none' ? 'no slip' : `grade ${name}`} ${percentText(probabilities?.[name] ?? 0)}`,
      )
    flags.push({
      id: `${segmentName}-borderline`,
      tone: 'warn',
      text: `Borderline grade: ${neighbours.join(', ')} within placement error. Check the corners at ${segmentName}.`,
      source: `Borderline when a neighbouring grade has at least ${BORDERLINE_PROBABILITY * 100} % probability under landmark placement error`,
    })
  }
  if (segment.highGrade) {
    flags.push({
      id: `${segmentName}-high-grade`,
      tone: 'warn',
      text: `High-grade slip at ${segmentName} (more than ${HIGH_GRADE_SLIP_PERCENT} %).`,
      source: SOURCES.highGrade,
    })
  }
  if (segment.slipDirection === 'retrolisthesis') {
    flags.push({
      id: `${segmentName}-retro`,
      tone: 'info',
      text: `Retrolisthesis at ${segmentName}: the upper vertebra sits behind the lower one.`,
      source: SOURCES.slip,
    })
  }
  return {
    row: {
      id: `${segmentName}-grade`,
      label: 'Meyerding grade',
      value:
        grade === null
          ? segment.slipPercent === null
            ? '—'
            : 'none (no anterior slip)'
          : `Grade ${grade}`,
      interval: probability === null ? null : `P ${percentText(probability)}`,
      calibration: null,
      source: SOURCES.meyerding,
      emphasis: true,
    },
    flags,
  }
}
