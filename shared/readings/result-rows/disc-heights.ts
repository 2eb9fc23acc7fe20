import type { DiscHeights, SegmentMeasurement } from '../../types/measurement'
import { SOURCES } from '../../measurement/index'
import { UNCALIBRATED_LABEL } from './labels'
import { row } from './row-format'
import type { ResultRow, SegmentIntervals } from './types'

/** Anterior, middle, posterior and mean disc height of one segment: mm, or px when uncalibrated. */
export function discRows(
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
        calibration: inMm ? calibration : UNCALIBRATED_LABEL,
      },
    ),
  )
}
