import type { CompareSide } from './compare-table'
import type { DifferenceRow, FilmMeasures } from '../types/compare'
import type { SegmentName, ValueInterval } from '../types/measurement'
import { differenceWithInterval, valueWithInterval } from './difference-interval'

/** Reads one measure and its engine interval from a film's measures. */
export type Pick = (
  measures: FilmMeasures,
) => [value: number | null | undefined, interval: ValueInterval | null | undefined]

/** One row of the differences table: which measure, in which unit, from which source. */
export interface RowSpec {
  id: string
  segment: SegmentName | null
  label: string
  unit: DifferenceRow['unit']
  source: string
  pick: Pick
  /** Keep the row when neither film has a value (segment rows); global rows need one. */
  always: boolean
}

/** The row of `spec` on both films, or null when a global row has no value on either. */
export function differenceRow(
  spec: RowSpec,
  before: CompareSide,
  after: CompareSide,
): DifferenceRow | null {
  const read = (side: CompareSide) => {
    if (!side.measures) return null
    const [value, interval] = spec.pick(side.measures)
    return valueWithInterval(value, interval)
  }
  const b = read(before)
  const a = read(after)
  if (!spec.always && b === null && a === null) return null
  return {
    id: spec.id,
    segment: spec.segment,
    label: spec.label,
    unit: spec.unit,
    before: b,
    after: a,
    change: b && a ? differenceWithInterval(b, a) : null,
    calibration:
      spec.unit === 'mm' && before.measures && after.measures
        ? { before: before.measures.calibrationSource, after: after.measures.calibrationSource }
        : null,
    source: spec.source,
  }
}
