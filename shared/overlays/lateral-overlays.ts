import type { MeasurementResult } from '../types/measurement'
import type { OverlayPoints, OverlayShape } from './overlay-shapes'
import { lateralImplantOverlays } from './lateral-implants'
import { lateralPelvicOverlays } from './lateral-pelvis'
import { lateralSegmentOverlays, overlaySegmentsOf } from './lateral-segment'
import { lateralVertebraLines } from './lateral-vertebrae'

/**
 * Every overlay of a lateral lumbar film from its landmarks (image px): endplate lines and
 * posterior walls, each segment's slip offset, disc height markers and lordosis protractor, the
 * pelvic lines and femoral head centres, and implant marks. Labels take their values from
 * `results` (the same engine result the results show), so picture and table never disagree;
 * with `results` null only unlabelled geometry is drawn. On a single segment even a slip under
 * 1 % is labelled.
 */
export function lateralOverlayShapes(
  points: OverlayPoints,
  results: MeasurementResult | null,
): OverlayShape[] {
  const shapes = lateralVertebraLines(points)
  const segments = overlaySegmentsOf(points)
  for (const segment of segments)
    shapes.push(...lateralSegmentOverlays(segment, points, results, segments.length === 1))
  shapes.push(...lateralPelvicOverlays(points, results))
  shapes.push(...lateralImplantOverlays(points))
  return shapes
}
