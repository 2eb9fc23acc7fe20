import type { ImageView, SpacingSource, VisitKind } from '../types/domain'
import type {
  ComparisonTable,
  DifferenceRow,
  FilmMeasures,
  MotionRow,
  SubsidenceRow,
} from '../types/compare'
import type { FrontalImageRightSide, SegmentName } from '../types/measurement'
import type { PatientPlan } from '../types/plans'
import type { ReadingResults } from '../types/readings'
import { SEGMENT_NAMES } from '../measurement/landmark-names'
import { SOURCES } from '../measurement/sources'
import { comparisonKindOf } from './comparison-kind'
import { DIFFERENCE_INTERVAL_METHOD } from './difference-interval'
import { differenceRow, type RowSpec } from './difference-row'
import { frontalSegmentsOf, frontalSpecs } from './frontal-rows'
import { planAchievedRows } from './plan-achieved'

/** One film of the pair as the table needs it. */
export interface CompareSide {
  visitId: number
  visitKind: VisitKind
  view: ImageView
  /** Null when the film has no reading. */
  measures: FilmMeasures | null
  /** The reading the measures come from (its stored motion and subsidence results). */
  reading: { id: number; results: ReadingResults } | null
}

export interface CompareTableInput {
  /** The earlier film (the flexion film of a flexion/extension pair). */
  before: CompareSide
  after: CompareSide
  /** The patient's plan, for the planned-against-achieved rows; null without one. */
  plan: PatientPlan | null
}

function segmentSpecs(segment: SegmentName): RowSpec[] {
  const of = (m: FilmMeasures) => m.measurements.segments[segment]
  const band = (m: FilmMeasures) => m.uncertainty?.measurements.segments[segment]
  const disc = (part: 'anterior' | 'posterior' | 'mean'): RowSpec => ({
    id: `${segment}-disc-${part}`,
    segment,
    label: `Disc height, ${part}`,
    unit: 'mm',
    source: SOURCES.discHeight,
    pick: (m) => [of(m)?.discHeightMm?.[part], band(m)?.discHeightMm?.[part]],
    always: true,
  })
  return [
    {
      id: `${segment}-slip`,
      segment,
      label: 'Slip',
      unit: '%',
      source: SOURCES.slip,
      pick: (m) => [of(m)?.slipPercent, band(m)?.slipPercent],
      always: true,
    },
    {
      id: `${segment}-slip-mm`,
      segment,
      label: 'Slip distance',
      unit: 'mm',
      source: SOURCES.slip,
      pick: (m) => [of(m)?.slipMm, band(m)?.slipMm],
      always: true,
    },
    {
      id: `${segment}-lordosis`,
      segment,
      label: 'Segmental lordosis',
      unit: '°',
      source: SOURCES.segmentalLordosis,
      pick: (m) => [of(m)?.segmentalLordosisDeg, band(m)?.segmentalLordosisDeg],
      always: true,
    },
    disc('anterior'),
    disc('posterior'),
    disc('mean'),
    {
      id: `${segment}-implant-position`,
      segment,
      label: 'Implant position (from posterior)',
      unit: '%',
      source: SOURCES.implantPosition,
      pick: (m) => [of(m)?.implantPositionPercent, band(m)?.implantPositionPercent],
      always: false,
    },
  ]
}

const GLOBAL_SPECS: RowSpec[] = [
  {
    id: 'lumbar-lordosis',
    segment: null,
    label: 'Lumbar lordosis L1–S1',
    unit: '°',
    source: SOURCES.lumbarLordosis,
    pick: (m) => [m.measurements.lumbarLordosisDeg, m.uncertainty?.measurements.lumbarLordosisDeg],
    always: false,
  },
  {
    id: 'pi-ll',
    segment: null,
    label: 'PI − LL mismatch',
    unit: '°',
    source: SOURCES.piLlBand,
    pick: (m) => [m.measurements.piLlMismatchDeg, m.uncertainty?.measurements.piLlMismatchDeg],
    always: false,
  },
]

/** Motion rows of every motion-pair reading among the two (one reading serves both films of a pair). */
function motionRows(sides: CompareSide[]): MotionRow[] {
  const rows: MotionRow[] = []
  const seen = new Set<number>()
  for (const side of sides) {
    const reading = side.reading
    if (!reading?.results.motion || seen.has(reading.id)) continue
    seen.add(reading.id)
    for (const segment of SEGMENT_NAMES) {
      const motion = reading.results.motion.segments[segment]
      if (!motion) continue
      rows.push({
        readingId: reading.id,
        segment,
        rangeOfMotionDeg: motion.rangeOfMotionDeg,
        translationMm: motion.translationMm,
        translationPercent: motion.translationPercent,
        calibrationSource: side.measures?.calibrationSource ?? 'none',
        flaggedBy: motion.criteria
          .filter((criterion) => criterion.flagged === true)
          .map((c) => c.source),
      })
    }
  }
  return rows
}

/** Subsidence rows as stored by each construct-check reading of the two (against its baseline). */
function subsidenceRows(sides: CompareSide[]): SubsidenceRow[] {
  const rows: SubsidenceRow[] = []
  const seen = new Set<number>()
  for (const side of sides) {
    const reading = side.reading
    if (!reading?.results.subsidence || seen.has(reading.id)) continue
    seen.add(reading.id)
    for (const segment of SEGMENT_NAMES) {
      const stored = reading.results.subsidence[segment]
      const result = stored?.segments[segment]
      if (!stored || !result) continue
      rows.push({
        readingId: reading.id,
        baselineReadingId: stored.baselineReadingId,
        segment,
        lossMm: result.lossMm,
        thresholdMm: stored.thresholdMm,
        subsided: result.subsided,
        source: stored.source,
      })
    }
  }
  return rows
}

const CALIBRATION_WORDS: Record<SpacingSource, string> = {
  'dicom-pixel-spacing': 'calibrated in the patient',
  manual: 'manually calibrated',
  'dicom-imager-spacing-magnification': 'estimated from the detector spacing',
  'dicom-imager-spacing': 'at the detector (magnified)',
  none: 'uncalibrated',
}

const SIDE_WORDS: Record<FrontalImageRightSide, string> = {
  'patient-left': "the patient's left",
  'patient-right': "the patient's right",
  unknown: 'not named by the file',
}

/** How to read the sign of a frontal offset change, and a warning when the films disagree. */
function frontalNotes(before: CompareSide, after: CompareSide): string[] {
  const b = before.reading?.results.centring?.imageRightSide ?? 'unknown'
  const a = after.reading?.results.centring?.imageRightSide ?? 'unknown'
  if (b === a)
    return [
      `Frontal offsets are signed: positive toward the image's right edge (${SIDE_WORDS[a]}); a change of sign means the implant crossed the midline.`,
    ]
  return [
    `The frontal films name the image's right edge differently (earlier: ${SIDE_WORDS[b]}; later: ${SIDE_WORDS[a]}): compare the offsets' sizes, not their signs.`,
  ]
}

function calibrationNotes(before: CompareSide, after: CompareSide): string[] {
  const b = before.measures?.calibrationSource
  const a = after.measures?.calibrationSource
  if (!b || !a) return []
  const notes: string[] = []
  if (b === 'none' || a === 'none')
    notes.push('One film has no mm scale: its mm values and their changes are left out.')
  else if (b !== a)
    notes.push(
      `The two scales differ (earlier: ${CALIBRATION_WORDS[b]}; later: ${CALIBRATION_WORDS[a]}): a change in mm also carries the difference in magnification. Percentages and angles do not depend on the scale.`,
    )
  else if (a === 'dicom-imager-spacing')
    notes.push(
      'Both scales are detector spacing, magnified by typically 10–25 %: mm changes are only as comparable as the two magnifications.',
    )
  return notes
}

/**
 * The differences table of two films of one patient from their readings' measures: per segment
 * measured on both films, slip % and mm, segmental lordosis, disc heights (anterior, posterior,
 * mean) and implant position; L1–S1 lordosis and PI − LL when either film has them. Each row has
 * both values with their 95 % half-widths and the change after − before with the interval of
 * `differenceWithInterval`. Motion and subsidence are taken as the readings that measured them
 * stored them (never recomputed across the pair), and, after surgery, the plan's targets stand
 * beside what the later film achieved. Degrees, %, mm as each row's unit says.
 */
export function compareTable(input: CompareTableInput): ComparisonTable {
  const { before, after } = input
  const kind = comparisonKindOf(before, after, before.visitId === after.visitId)
  const measured = (side: CompareSide) =>
    new Set(Object.keys(side.measures?.measurements.segments ?? {}))
  const inBefore = measured(before)
  const inAfter = measured(after)
  const segments = SEGMENT_NAMES.filter((s) => inBefore.has(s) && inAfter.has(s))
  const rows: DifferenceRow[] = []
  for (const segment of segments) {
    for (const spec of segmentSpecs(segment)) {
      const row = differenceRow(spec, before, after)
      if (row) rows.push(row)
    }
  }
  const frontalBefore = frontalSegmentsOf(before.measures)
  const frontalAfter = frontalSegmentsOf(after.measures)
  const frontalSegments = SEGMENT_NAMES.filter((s) => frontalBefore.has(s) && frontalAfter.has(s))
  for (const segment of frontalSegments) {
    for (const spec of frontalSpecs(segment)) {
      const row = differenceRow(spec, before, after)
      if (row) rows.push(row)
    }
  }
  for (const spec of GLOBAL_SPECS) {
    const row = differenceRow(spec, before, after)
    if (row) rows.push(row)
  }
  const notes = calibrationNotes(before, after)
  if (frontalSegments.length) notes.push(...frontalNotes(before, after))
  if (!before.measures) notes.push('The earlier film has no reading yet.')
  if (!after.measures) notes.push('The later film has no reading yet.')
  const onlyOne = SEGMENT_NAMES.filter(
    (s) => inBefore.has(s) !== inAfter.has(s) || frontalBefore.has(s) !== frontalAfter.has(s),
  )
  if (before.measures && after.measures && onlyOne.length)
    notes.push(`Measured on one film only, so not compared: ${onlyOne.join(', ')}.`)
  return {
    kind,
    segments,
    frontalSegments,
    rows,
    plan:
      // The plan's targets are lordosis angles, read on a lateral film: a frontal film has none.
      input.plan &&
      after.visitKind !== 'pre-op' &&
      kind !== 'flexion-extension' &&
      after.view !== 'ap'
        ? planAchievedRows(input.plan, after.measures)
        : [],
    motion: motionRows([before, after]),
    subsidence: subsidenceRows([before, after]),
    intervalMethod: DIFFERENCE_INTERVAL_METHOD,
    notes,
  }
}
