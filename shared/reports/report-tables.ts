import type { ComparisonTable } from '../types/compare'
import type { SegmentName } from '../types/measurement'
import type { PatientPlan, PlanSegment } from '../types/plans'
import type { ReportSignOff, ReportTable } from '../types/reports'
import type { ResultSection } from '../readings/result-rows'
import { sourceWords } from '../readings/source-words'
import { changeIntervalText, changeText, intervalText, measureText } from './measure-text'

/** A flag or remark with its source in plain words. */
function withSource(text: string, source: string | undefined): string {
  return source ? `${text} Source: ${sourceWords(source)}.` : text
}

/**
 * The results of a reading as report tables, one per section of the results panel: each value
 * with its unit, its 95 % interval (or, for a grade, its probability), the calibration of mm
 * values and a numbered reference to its source, listed in plain words under the table with the
 * section's flags and grading rule.
 */
export function resultTables(sections: readonly ResultSection[]): ReportTable[] {
  return sections.map((section) => {
    const sources: string[] = []
    const reference = (source: string) => {
      const plain = sourceWords(source)
      if (!sources.includes(plain)) sources.push(plain)
      return `[${sources.indexOf(plain) + 1}]`
    }
    const rows = section.rows.map((row) => ({
      cells: [
        row.label,
        row.value,
        row.interval ?? '',
        row.calibration ?? '',
        reference(row.source),
      ],
      emphasis: row.emphasis,
    }))
    return {
      id: `results-${section.id}`,
      title: section.title,
      columns: ['Measure', 'Value', '95 % interval or probability', 'Scale', 'Source'],
      widths: [27, 15, 18, 30, 10],
      rows,
      notes: [
        ...section.flags.map((flag) => withSource(flag.text, flag.source)),
        ...(section.rule ? [`Grade rule: ${section.rule}.`] : []),
        ...sources.map((source, index) => `[${index + 1}] ${source}`),
      ],
    }
  })
}

const TREATMENT_WORDS: Record<PlanSegment['treatment'], string> = {
  none: 'none',
  decompression: 'decompression',
  'disc-replacement': 'disc replacement',
  'interbody-fusion': 'interbody fusion',
  'posterior-fusion': 'posterior fusion',
}

function verdict(flagged: boolean | null): string {
  if (flagged === true) return 'flagged'
  if (flagged === false) return 'not flagged'
  return 'not recorded'
}

/**
 * The plan at the given segments: the planned treatment and implant, and at a disc replacement
 * every plan check with its result (flagged, not flagged, or not recorded) and its source. With
 * `withLordosis`, the target lordosis from PI beside the lordosis the plan expects. Null when the
 * plan treats none of the segments.
 */
export function planCheckTable(
  plan: PatientPlan,
  segments: readonly SegmentName[],
  withLordosis = false,
): ReportTable | null {
  const planned = plan.segments.filter(
    (segment) => segments.includes(segment.segment) && segment.treatment !== 'none',
  )
  if (planned.length === 0) return null
  const rows: ReportTable['rows'] = []
  for (const segment of planned) {
    const implant =
      segment.implantLordosisDeg !== null || segment.implantHeightMm !== null
        ? `, implant ${measureText(segment.implantLordosisDeg, '°')} / ${measureText(segment.implantHeightMm, 'mm')}`
        : ''
    rows.push({
      cells: [
        segment.segment,
        'Planned treatment',
        `${TREATMENT_WORDS[segment.treatment]}${implant}`,
        '',
      ],
      emphasis: true,
    })
    for (const check of segment.checks)
      rows.push({
        cells: [segment.segment, check.label, verdict(check.flagged), sourceWords(check.source)],
      })
    if (segment.recordedInstability)
      rows.push({
        cells: [
          segment.segment,
          segment.recordedInstability.label,
          verdict(segment.recordedInstability.flagged),
          sourceWords(segment.recordedInstability.source),
        ],
      })
  }
  if (withLordosis) {
    rows.push({
      cells: [
        'L1–S1',
        'Target lordosis (0.54·PI + 27.6) against the lordosis the plan expects',
        `${measureText(plan.lordosis.targetLordosisDeg, '°')} against ${measureText(plan.lordosis.expectedLordosisDeg, '°')} (an estimate)`,
        sourceWords(plan.lordosis.source),
      ],
    })
  }
  return {
    id: 'plan-checks',
    title: 'Plan and its checks',
    columns: ['Segment', 'Check', 'Result', 'Source'],
    widths: [10, 38, 20, 32],
    rows,
    notes: [plan.evidenceNote, 'Plan checks are decision support, never a decision.'],
  }
}

/**
 * The differences of two films as report tables: each measure on both films with its 95 %
 * interval and the change (later − earlier) with the combined interval; the plan beside what was
 * achieved; motion and subsidence as the readings that measured them stored them.
 */
export function comparisonTables(
  table: ComparisonTable,
  beforeLabel: string,
  afterLabel: string,
): ReportTable[] {
  const tables: ReportTable[] = [
    {
      id: 'changes',
      title: `Changes, ${beforeLabel} → ${afterLabel}`,
      columns: ['Measure', beforeLabel, afterLabel, 'Change (95 %)'],
      widths: [34, 22, 22, 22],
      rows: table.rows.map((row) => ({
        cells: [
          row.segment ? `${row.segment} · ${row.label}` : row.label,
          intervalText(row.before, row.unit),
          intervalText(row.after, row.unit),
          changeIntervalText(row.change, row.unit),
        ],
        emphasis: row.segment === null,
      })),
      notes: [...table.notes, `Interval of a change: ${table.intervalMethod}.`],
    },
  ]
  if (table.plan.length) {
    tables.push({
      id: 'plan-achieved',
      title: 'Plan against achieved',
      columns: ['Measure', 'Planned', 'Achieved', 'Achieved − planned'],
      widths: [22, 28, 30, 20],
      rows: table.plan.map((row) => ({
        cells: [
          row.label,
          `${measureText(row.planned, '°')} (${row.plannedLabel})`,
          `${intervalText(row.achieved, '°')} (${row.achievedLabel})`,
          changeText(row.differenceDeg, '°'),
        ],
      })),
      notes: [...new Set(table.plan.map((row) => sourceWords(row.source)))],
    })
  }
  if (table.motion.length) {
    tables.push({
      id: 'motion',
      title: 'Motion (from the motion-pair reading)',
      columns: ['Segment', 'Range of motion', 'Translation', 'Criteria met'],
      widths: [14, 20, 26, 40],
      rows: table.motion.map((row) => ({
        cells: [
          `${row.segment} (reading ${row.readingId})`,
          measureText(row.rangeOfMotionDeg, '°'),
          `${measureText(row.translationMm, 'mm')} · ${measureText(row.translationPercent, '%')}`,
          row.flaggedBy.length ? row.flaggedBy.map(sourceWords).join('; ') : 'none',
        ],
      })),
      notes: [],
    })
  }
  if (table.subsidence.length) {
    tables.push({
      id: 'subsidence',
      title: 'Subsidence (from the construct-check readings)',
      columns: ['Segment', 'Loss, anterior', 'Loss, posterior', 'Loss, mean', 'Flag'],
      widths: [26, 16, 16, 16, 26],
      rows: table.subsidence.map((row) => ({
        cells: [
          `${row.segment} (reading ${row.readingId} against ${row.baselineReadingId})`,
          measureText(row.lossMm.anterior, 'mm'),
          measureText(row.lossMm.posterior, 'mm'),
          measureText(row.lossMm.mean, 'mm'),
          row.subsided === true
            ? `subsided (≥ ${measureText(row.thresholdMm, 'mm')})`
            : row.subsided === false
              ? 'below threshold'
              : 'not assessable (no mm scale)',
        ],
      })),
      notes: [...new Set(table.subsidence.map((row) => sourceWords(row.source)))],
    })
  }
  return tables
}

/** Who made and who signed a reading, as a one-row table ("not signed" until it is). */
export function signOffTable(signOff: ReportSignOff): ReportTable {
  return {
    id: 'sign-off',
    title: 'Rater and sign-off',
    columns: ['Rater', 'Status', 'Submitted', 'Signed by', 'Signed'],
    widths: [24, 20, 18, 20, 18],
    rows: [
      {
        cells: [
          signOff.rater,
          signOff.status,
          signOff.submittedAt ?? '—',
          signOff.signer ?? 'not signed',
          signOff.signedAt ?? '—',
        ],
      },
    ],
    notes: [],
  }
}
