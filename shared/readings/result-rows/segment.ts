import type { SegmentName } from '../../types/measurement'
import { MEYERDING_RULE, SOURCES } from '../../measurement/index'
import { SPACING_SOURCE_SHORT } from '../../format/spacing-source-labels'
import { discRows } from './disc-heights'
import { row } from './row-format'
import { gradeRows } from './slip-grade'
import type { FilmResults, ResultRow, ResultSection } from './types'

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
