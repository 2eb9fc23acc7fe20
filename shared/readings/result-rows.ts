import type { SpacingSource } from '../types/domain'
import type {
  DiscHeights,
  FrontalImageRightSide,
  FrontalSegmentMeasurement,
  InstabilityCriterionId,
  IntervalTree,
  MeasurementResult,
  MeyerdingUncertainty,
  MotionSegmentResult,
  SegmentMeasurement,
  SegmentName,
  SubsidenceResult,
  UncertaintyResult,
  ValueInterval,
} from '../types/measurement'
import type { ReadingTemplate } from '../types/domain'
import type { TemplateOptions } from './templates'
import {
  DEFAULT_IMPLANT_CENTRING_THRESHOLD_MM,
  frontalSideWords,
  implantCentring,
  MEYERDING_RULE,
  SOURCES,
} from '../measurement/index'
import { sourceWords } from './source-words'

/** Where a film's mm scale comes from, in the words shown beside every mm value. */
export const SPACING_SOURCE_LABELS: Record<SpacingSource, string> = {
  'dicom-pixel-spacing': 'DICOM pixel spacing, calibrated in the patient',
  manual: 'manual calibration',
  'dicom-imager-spacing-magnification': 'imager spacing ÷ magnification (estimated)',
  'dicom-imager-spacing': 'imager spacing at the detector (magnified, typically 10–25 %)',
  none: 'no calibration',
}

/** The same, short enough to sit under each mm value. */
export const SPACING_SOURCE_SHORT: Record<SpacingSource, string> = {
  'dicom-pixel-spacing': 'DICOM spacing (in patient)',
  manual: 'manual calibration',
  'dicom-imager-spacing-magnification': 'estimated spacing',
  'dicom-imager-spacing': 'detector spacing, magnified',
  none: 'uncalibrated',
}

export interface ResultRow {
  id: string
  label: string
  /** The value with its unit, or '—' when it cannot be computed. */
  value: string
  /** '± 3.7 %' (95 % interval half-width), or null. */
  interval: string | null
  /** For mm values: the calibration source. */
  calibration: string | null
  source: string
  emphasis?: boolean
}

const ROM_DEFINITION =
  '|segmental lordosis on extension − on flexion|, the same endplates on both films'
const TRANSLATION_DEFINITION =
  '|slip on flexion − slip on extension| along the lower endplate (Taillard distance)'

export interface ResultFlag {
  id: string
  tone: 'warn' | 'info'
  text: string
  /** Where the rule comes from; a plain hint has none. */
  source?: string
}

export interface ResultSection {
  id: string
  title: string
  rows: ResultRow[]
  flags: ResultFlag[]
  /** The grading rule, when the section grades a slip. */
  rule?: string
}

export interface FilmResults {
  measurements: MeasurementResult | null
  uncertainty: UncertaintyResult | null
  spacingSource: SpacingSource
}

type SegmentIntervals = IntervalTree<SegmentMeasurement> | undefined

function fixed(value: number, digits: number): string {
  // −0.0 reads as a sign error; show 0.0.
  const text = value.toFixed(digits)
  return /^-0\.?0*$/.test(text) ? text.slice(1) : text.replace('-', '−')
}

function withUnit(value: number | null | undefined, digits: number, unit: string): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—'
  return unit === '°' ? `${fixed(value, digits)}°` : `${fixed(value, digits)} ${unit}`
}

function halfWidth(
  interval: ValueInterval | null | undefined,
  digits: number,
  unit: string,
): string | null {
  if (!interval) return null
  const half = (interval.high - interval.low) / 2
  return `± ${withUnit(half, digits, unit)}`
}

function row(
  id: string,
  label: string,
  value: number | null | undefined,
  interval: ValueInterval | null | undefined,
  unit: string,
  source: string,
  options: { digits?: number; calibration?: string | null; emphasis?: boolean } = {},
): ResultRow {
  const digits = options.digits ?? 1
  return {
    id,
    label,
    value: withUnit(value, digits, unit),
    interval: value === null || value === undefined ? null : halfWidth(interval, digits, unit),
    calibration: options.calibration ?? null,
    source,
    emphasis: options.emphasis,
  }
}

function percentText(probability: number): string {
  if (probability > 0.995) return '> 99 %'
  if (probability < 0.005) return '< 1 %'
  return `${Math.round(probability * 100)} %`
}

function discRows(
  prefix: string,
  segment: SegmentMeasurement,
  intervals: SegmentIntervals,
  calibration: string,
): ResultRow[] {
  const inMm = segment.discHeightMm !== null
  const heights: DiscHeights = segment.discHeightMm ?? segment.discHeightPx
  const tree = (inMm ? intervals?.discHeightMm : intervals?.discHeightPx) ?? null
  const unit = inMm ? 'mm' : 'px'
  const parts = ['anterior', 'middle', 'posterior', 'mean'] as const
  return parts.map((part) =>
    row(
      `${prefix}-disc-${part}`,
      `Disc height, ${part}`,
      heights[part],
      tree?.[part],
      unit,
      SOURCES.discHeight,
      {
        calibration: inMm ? calibration : 'uncalibrated: film pixels',
      },
    ),
  )
}

function gradeRows(
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
          name !== undefined && probabilities !== undefined && probabilities[name] >= 0.1,
      )
      .map(
        (name) =>
          `${name === 'none' ? 'no slip' : `grade ${name}`} ${percentText(probabilities?.[name] ?? 0)}`,
      )
    flags.push({
      id: `${segmentName}-borderline`,
      tone: 'warn',
      text: `Borderline grade: ${neighbours.join(', ')} within placement error. Check the corners at ${segmentName}.`,
      source:
        'Borderline when a neighbouring grade has at least 10 % probability under landmark placement error',
    })
  }
  if (segment.highGrade) {
    flags.push({
      id: `${segmentName}-high-grade`,
      tone: 'warn',
      text: `High-grade slip at ${segmentName} (more than 50 %).`,
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

/** Slip, grade, angles and disc heights of one segment. */
export function segmentSection(
  segmentName: SegmentName,
  film: FilmResults,
  title = `Segment ${segmentName}`,
  options: { discs?: boolean; implant?: 'cage' | 'disc-replacement' } = {},
): ResultSection {
  const segment = film.measurements?.segments[segmentName]
  const calibration = SPACING_SOURCE_SHORT[film.spacingSource]
  if (!segment) {
    return {
      id: segmentName,
      title,
      rows: [],
      flags: [
        {
          id: `${segmentName}-missing`,
          tone: 'info',
          text: `Place the corners of ${segmentName} to see its measures.`,
        },
      ],
    }
  }
  const intervals = film.uncertainty?.measurements.segments[segmentName]
  const grade = gradeRows(segmentName, segment, film.uncertainty?.meyerding[segmentName])
  const rows: ResultRow[] = [
    row(
      `${segmentName}-slip`,
      'Slip',
      segment.slipPercent,
      intervals?.slipPercent,
      '%',
      SOURCES.slip,
      { emphasis: true },
    ),
    grade.row,
    row(
      `${segmentName}-slip-mm`,
      'Slip distance',
      segment.slipMm,
      intervals?.slipMm,
      'mm',
      SOURCES.slip,
      { calibration },
    ),
  ]
  if (segment.slipAngleDeg !== undefined) {
    rows.push(
      row(
        `${segmentName}-slip-angle`,
        'Slip angle (kyphosis +)',
        segment.slipAngleDeg,
        intervals?.slipAngleDeg,
        '°',
        SOURCES.slipAngle,
      ),
    )
  }
  rows.push(
    row(
      `${segmentName}-lordosis`,
      'Segmental lordosis',
      segment.segmentalLordosisDeg,
      intervals?.segmentalLordosisDeg,
      '°',
      SOURCES.segmentalLordosis,
    ),
    row(
      `${segmentName}-disc-angle`,
      'Disc angle',
      segment.discAngleDeg,
      intervals?.discAngleDeg,
      '°',
      SOURCES.segmentalLordosis,
    ),
  )
  if (options.implant === 'cage') {
    rows.push(
      row(
        `${segmentName}-cage`,
        'Cage lordosis',
        segment.cageLordosisDeg,
        intervals?.cageLordosisDeg,
        '°',
        SOURCES.cageLordosis,
        { emphasis: true },
      ),
    )
  } else if (options.implant === 'disc-replacement') {
    rows.push(
      row(
        `${segmentName}-implant-position`,
        'Implant position (from posterior)',
        segment.implantPositionPercent,
        intervals?.implantPositionPercent,
        '%',
        SOURCES.implantPosition,
        { emphasis: true },
      ),
      row(
        `${segmentName}-implant-offset`,
        'Implant offset from centre (− posterior)',
        segment.implantOffsetMm,
        intervals?.implantOffsetMm,
        'mm',
        SOURCES.implantPosition,
        { calibration },
      ),
    )
  }
  if (options.discs !== false) rows.push(...discRows(segmentName, segment, intervals, calibration))
  return { id: segmentName, title, rows, flags: grade.flags, rule: MEYERDING_RULE }
}

function alignmentSection(film: FilmResults): ResultSection {
  const m = film.measurements
  const u = film.uncertainty?.measurements
  const rows = [
    row(
      'll',
      'Lumbar lordosis L1–S1',
      m?.lumbarLordosisDeg,
      u?.lumbarLordosisDeg,
      '°',
      SOURCES.lumbarLordosis,
      { emphasis: true },
    ),
    row(
      'dl',
      'Distal lordosis L4–S1',
      m?.distalLordosisDeg,
      u?.distalLordosisDeg,
      '°',
      SOURCES.distalLordosis,
    ),
    row(
      'pi',
      'Pelvic incidence',
      m?.pelvis?.incidenceDeg,
      u?.pelvis?.incidenceDeg,
      '°',
      SOURCES.pelvis,
      { emphasis: true },
    ),
    row('pt', 'Pelvic tilt', m?.pelvis?.tiltDeg, u?.pelvis?.tiltDeg, '°', SOURCES.pelvis),
    row(
      'ss',
      'Sacral slope',
      m?.pelvis?.sacralSlopeDeg,
      u?.pelvis?.sacralSlopeDeg,
      '°',
      SOURCES.pelvis,
    ),
    row('pi-ll', 'PI − LL mismatch', m?.piLlMismatchDeg, u?.piLlMismatchDeg, '°', SOURCES.piLlBand),
    row(
      'target',
      'Target lordosis (0.54·PI + 27.6)',
      m?.targetLordosisDeg,
      u?.targetLordosisDeg,
      '°',
      SOURCES.targetLordosis,
    ),
  ]
  const flags: ResultFlag[] = []
  const band = m?.piLlBand
  if (band === '+' || band === '++') {
    flags.push({
      id: 'pi-ll',
      tone: 'warn',
      text:
        band === '++'
          ? 'PI − LL above 20°: marked mismatch (band ++).'
          : 'PI − LL between 10° and 20°: moderate mismatch (band +).',
      source: SOURCES.piLlBand,
    })
  } else if (band === '0') {
    flags.push({
      id: 'pi-ll',
      tone: 'info',
      text: 'PI − LL below 10° (band 0).',
      source: SOURCES.piLlBand,
    })
  }
  return { id: 'alignment', title: 'Alignment and pelvis', rows, flags }
}

function segmentsSummary(film: FilmResults): ResultSection {
  const rows: ResultRow[] = []
  const flags: ResultFlag[] = []
  for (const name of ['L1-L2', 'L2-L3', 'L3-L4', 'L4-L5', 'L5-S1'] as const) {
    const segment = film.measurements?.segments[name]
    if (!segment) continue
    const intervals = film.uncertainty?.measurements.segments[name]
    const grade = segment.meyerdingGrade ? ` · grade ${segment.meyerdingGrade}` : ''
    rows.push({
      ...row(
        `${name}-slip`,
        `${name} slip`,
        segment.slipPercent,
        intervals?.slipPercent,
        '%',
        SOURCES.slip,
      ),
      value: `${withUnit(segment.slipPercent, 1, '%')}${grade}`,
    })
    rows.push(
      row(
        `${name}-lordosis`,
        `${name} segmental lordosis`,
        segment.segmentalLordosisDeg,
        intervals?.segmentalLordosisDeg,
        '°',
        SOURCES.segmentalLordosis,
      ),
    )
    if (segment.highGrade)
      flags.push({
        id: `${name}-high`,
        tone: 'warn',
        text: `High-grade slip at ${name} (more than 50 %).`,
        source: SOURCES.highGrade,
      })
  }
  return {
    id: 'segments',
    title: 'Segments',
    rows,
    flags,
    rule: rows.length ? MEYERDING_RULE : undefined,
  }
}

function motionSection(
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

/** Subsidence against the first post-op reading, as the server stored it with the draft. */
function subsidenceSection(
  stored: Record<string, SubsidenceResult>,
  baselineId: number | null,
): ResultSection {
  const rows: ResultRow[] = []
  const flags: ResultFlag[] = []
  let source: string = SOURCES.subsidence
  for (const result of Object.values(stored)) {
    source = result.source
    for (const [name, segment] of Object.entries(result.segments)) {
      if (!segment) continue
      for (const part of ['anterior', 'posterior', 'mean'] as const) {
        rows.push(
          row(
            `${name}-subsidence-${part}`,
            `${name} height loss, ${part}`,
            segment.lossMm[part],
            null,
            'mm',
            result.source,
          ),
        )
      }
      if (segment.subsided) {
        flags.push({
          id: `${name}-subsided`,
          tone: 'warn',
          text: `${name}: disc height lost by ${result.thresholdMm} mm or more since the baseline.`,
          source: result.source,
        })
      }
    }
  }
  return {
    id: 'subsidence',
    title:
      baselineId === null
        ? 'Subsidence (saved results)'
        : `Subsidence against reading ${baselineId} (saved results)`,
    rows,
    flags: rows.length
      ? flags
      : [
          {
            id: 'subsidence-none',
            tone: 'info',
            text: 'No earlier post-op reading of these segments to compare with.',
            source,
          },
        ],
  }
}

/** "2.1 mm toward patient left": the size of a signed offset and the side it points to. */
function offsetText(
  value: number | null,
  digits: number,
  unit: string,
  side: FrontalImageRightSide,
): string {
  if (value === null || !Number.isFinite(value)) return '—'
  const size = withUnit(Math.abs(value), digits, unit)
  if (Number(Math.abs(value).toFixed(digits)) === 0) return `${size} (centred)`
  return `${size} toward ${frontalSideWords(side, value > 0 ? 'r' : 'l')}`
}

/** Implant centring of one segment on the frontal film, with its threshold and rotation notes. */
export function centringSection(
  segmentName: SegmentName,
  film: FilmResults,
  imageRightSide: FrontalImageRightSide,
  thresholdMm: number = DEFAULT_IMPLANT_CENTRING_THRESHOLD_MM,
): ResultSection {
  const title = `${segmentName} · disc replacement, frontal`
  const segment: FrontalSegmentMeasurement | undefined = film.measurements?.frontal[segmentName]
  if (!segment) {
    return {
      id: `${segmentName}-frontal`,
      title,
      rows: [],
      flags: [
        {
          id: `${segmentName}-frontal-missing`,
          tone: 'info',
          text: `Place the endplate corners above and below ${segmentName} to see its centring.`,
        },
      ],
    }
  }
  const intervals = film.uncertainty?.measurements.frontal?.[segmentName]
  const calibration = SPACING_SOURCE_SHORT[film.spacingSource]
  const offsetSource = sourceWords(SOURCES.frontalOffset)
  const offsetMm = row(
    `${segmentName}-frontal-offset`,
    'Offset from midline',
    segment.lateralOffsetMm,
    intervals?.lateralOffsetMm,
    'mm',
    offsetSource,
    { calibration, emphasis: true },
  )
  const offsetPercent = row(
    `${segmentName}-frontal-offset-percent`,
    'Offset (of endplate width)',
    segment.lateralOffsetPercent,
    intervals?.lateralOffsetPercent,
    '%',
    offsetSource,
  )
  const rows: ResultRow[] = [
    { ...offsetMm, value: offsetText(segment.lateralOffsetMm, 1, 'mm', imageRightSide) },
    { ...offsetPercent, value: offsetText(segment.lateralOffsetPercent, 1, '%', imageRightSide) },
    row(
      `${segmentName}-frontal-tilt`,
      'Implant coronal tilt',
      segment.implantTiltDeg,
      intervals?.implantTiltDeg,
      '°',
      sourceWords(SOURCES.frontalTilt),
    ),
    row(
      `${segmentName}-frontal-segment-angle`,
      'Segment coronal angle',
      segment.segmentCoronalAngleDeg,
      intervals?.segmentCoronalAngleDeg,
      '°',
      sourceWords(SOURCES.frontalSegmentAngle),
    ),
    row(
      `${segmentName}-frontal-width`,
      'Endplate width',
      segment.endplateWidthMm,
      intervals?.endplateWidthMm,
      'mm',
      sourceWords(SOURCES.frontalOffset),
      { calibration },
    ),
  ]
  const centring = implantCentring(
    { frontal: { [segmentName]: segment } },
    { imageRightSide, thresholdMm },
  )
  const offCentre = centring?.segments[segmentName]?.offCentre ?? null
  const flags: ResultFlag[] = []
  if (offCentre === true) {
    flags.push({
      id: `${segmentName}-off-centre`,
      tone: 'warn',
      text: `The disc replacement at ${segmentName} sits more than ${centring?.thresholdMm} mm off the body midline.`,
      source: offsetSource,
    })
  } else if (offCentre === null && segment.lateralOffsetPercent !== null) {
    flags.push({
      id: `${segmentName}-off-centre-unknown`,
      tone: 'info',
      text: `The ${centring?.thresholdMm} mm centring check needs a calibrated film.`,
      source: offsetSource,
    })
  }
  if (segment.rotationPercent !== null) {
    const side = frontalSideWords(imageRightSide, segment.rotationPercent > 0 ? 'r' : 'l')
    flags.push({
      id: `${segmentName}-rotation`,
      tone: 'info',
      text: `Film rotation check: the ${segmentName.split('-')[0]} spinous process lies ${fixed(Math.abs(segment.rotationPercent), 0)} % of the half-width toward ${side}. A large value means a rotated film; read the offset with care.`,
      source: sourceWords(SOURCES.frontalRotation),
    })
  }
  return { id: `${segmentName}-frontal`, title, rows, flags }
}

/** How the sides of a frontal film are named, from its Patient Orientation when it has one. */
function frontalSidesSection(imageRightSide: FrontalImageRightSide): ResultSection {
  return {
    id: 'frontal-sides',
    title: 'Sides',
    rows: [],
    flags: [
      {
        id: 'frontal-sides',
        tone: 'info',
        text:
          imageRightSide === 'unknown'
            ? 'The file gives no patient orientation: sides are named as seen on the image (image right, image left).'
            : `Sides from the file's Patient Orientation: the image's right edge is the ${imageRightSide === 'patient-left' ? "patient's left" : "patient's right"}.`,
      },
    ],
  }
}

export interface WorkspaceResultsInput {
  template: ReadingTemplate
  options: TemplateOptions
  primary: FilmResults
  paired: FilmResults | null
  motion: Partial<Record<SegmentName, MotionSegmentResult>> | null
  /** The instability criterion of the site settings, shown first on a motion pair. */
  instabilityCriterion?: InstabilityCriterionId
  /** Implant centring: which patient side the image's right edge shows (default unknown). */
  imageRightSide?: FrontalImageRightSide
  /** Implant centring: the site's off-centre threshold (mm; default the published 3 mm). */
  centringThresholdMm?: number
  /** Construct check: the server's subsidence results of the last saved draft. */
  subsidence?: {
    results: Record<string, SubsidenceResult> | null
    baselineReadingId: number | null
  }
}

/** The sections the results panel shows for a template, in reading order. */
export function workspaceResultSections(input: WorkspaceResultsInput): ResultSection[] {
  const segment = input.options.segment ?? 'L5-S1'
  switch (input.template) {
    case 'slip-grade':
      return [segmentSection(segment, input.primary)]
    case 'lumbar-alignment':
      return [alignmentSection(input.primary), segmentsSummary(input.primary)]
    case 'construct-check':
      return [
        ...(input.options.construct ?? []).map(({ segment: treated, implant }) =>
          segmentSection(
            treated,
            input.primary,
            `${treated} · ${implant === 'cage' ? 'interbody cage' : 'disc replacement'}`,
            { implant },
          ),
        ),
        subsidenceSection(
          input.subsidence?.results ?? {},
          input.subsidence?.baselineReadingId ?? null,
        ),
      ]
    case 'motion-pair':
      return [
        motionSection(
          segment,
          input.motion?.[segment],
          input.primary.spacingSource,
          input.instabilityCriterion,
        ),
        segmentSection(segment, input.primary, `Flexion film ${segment}`, { discs: false }),
        ...(input.paired
          ? [segmentSection(segment, input.paired, `Extension film ${segment}`, { discs: false })]
          : []),
      ]
    case 'implant-centring':
      return [
        ...(input.options.discReplacements ?? []).map((treated) =>
          centringSection(
            treated,
            input.primary,
            input.imageRightSide ?? 'unknown',
            input.centringThresholdMm,
          ),
        ),
        frontalSidesSection(input.imageRightSide ?? 'unknown'),
      ]
  }
}
