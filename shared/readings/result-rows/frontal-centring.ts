import type {
  FrontalImageRightSide,
  FrontalSegmentMeasurement,
  SegmentName,
} from '../../types/measurement'
import {
  DEFAULT_IMPLANT_CENTRING_THRESHOLD_MM,
  frontalSideWords,
  implantCentring,
  SOURCES,
} from '../../measurement/index'
import { numberText } from '../../format/number-text'
import { SPACING_SOURCE_SHORT } from '../../format/spacing-source-labels'
import { sourceWords } from '../source-words'
import { row, withUnit } from './row-format'
import type { FilmResults, ResultFlag, ResultRow, ResultSection } from './types'

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
      text: `Film rotation check: the ${segmentName.split('-')[0]} spinous process lies ${numberText(Math.abs(segment.rotationPercent), 0)} % of the half-width toward ${side}. A large value means a rotated film; read the offset with care.`,
      source: sourceWords(SOURCES.frontalRotation),
    })
  }
  return { id: `${segmentName}-frontal`, title, rows, flags }
}

/** How the sides of a frontal film are named, from its Patient Orientation when it has one. */
export function frontalSidesSection(imageRightSide: FrontalImageRightSide): ResultSection {
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
