import { MEYERDING_RULE, SOURCES } from '../../measurement/index'
import { row, withUnit } from './row-format'
import { HIGH_GRADE_SLIP_PERCENT } from './thresholds'
import type { FilmResults, ResultFlag, ResultRow, ResultSection } from './types'

/** Slip and segmental lordosis of every lumbar segment placed, for the alignment template. */
export function segmentsSummary(film: FilmResults): ResultSection {
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
        text: `High-grade slip at ${name} (more than ${HIGH_GRADE_SLIP_PERCENT} %).`,
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
