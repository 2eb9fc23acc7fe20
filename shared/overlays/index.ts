export {
  OVERLAY_COLOURS,
  type OverlayCategory,
  type OverlayPoints,
  type OverlayShape,
} from './overlay-shapes'
export { overlayNumberText } from './overlay-labels'
export { lateralOverlayShapes } from './lateral-overlays'
export { frontalOverlayShapes } from './frontal-overlays'
export { OVERLAY_BUILDERS, readingOverlayShapes, type OverlayBuilder } from './reading-overlays'
export type { OverlayFilmContext } from './overlay-shapes'
export { overlaySvg, type OverlaySvgOptions } from './overlay-svg'
