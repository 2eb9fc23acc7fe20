import type { ReadingTemplate } from '../types/domain'
import type { MeasurementResult } from '../types/measurement'
import type { OverlayFilmContext, OverlayPoints, OverlayShape } from './overlay-shapes'
import { lateralOverlayShapes } from './lateral-overlays'
import { frontalOverlayShapes } from './frontal-overlays'

/** Builds the overlays of one film of a reading from its landmarks (image px) and results. */
export type OverlayBuilder = (
  points: OverlayPoints,
  results: MeasurementResult | null,
  context: OverlayFilmContext,
) => OverlayShape[]

/**
 * The overlay builder of each reading template: the lateral one for templates read on a lateral
 * film, the frontal one for implant centring on an AP film. A new template adds its builder here.
 */
export const OVERLAY_BUILDERS: Record<ReadingTemplate, OverlayBuilder> = {
  'slip-grade': lateralOverlayShapes,
  'lumbar-alignment': lateralOverlayShapes,
  'construct-check': lateralOverlayShapes,
  'motion-pair': lateralOverlayShapes,
  'implant-centring': frontalOverlayShapes,
}

/**
 * The overlays drawn over one film of a reading of `template`: image px (x right, y down), from
 * the landmarks placed on that film and the engine result computed from them. The canvas, the
 * printed page and the PDF all draw this one list.
 */
export function readingOverlayShapes(
  template: ReadingTemplate,
  points: OverlayPoints,
  results: MeasurementResult | null,
  context: OverlayFilmContext = {},
): OverlayShape[] {
  return OVERLAY_BUILDERS[template](points, results, context)
}
