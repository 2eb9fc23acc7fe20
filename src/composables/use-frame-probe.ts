/** One landmark drag step: the engine call, Konva's draw of the changing layers, and the whole
 * step (Vue's update of every panel included, the engine counted once). */
export interface FrameTiming {
  engineMs: number
  drawMs: number
  stepMs: number
}

/**
 * Frame timings for `npm run bench`: when the page defines `window.__endplateFrameTimes` (the
 * benchmark does, before the app loads), each landmark drag step records how long the engine
 * and Konva's draw took. Nothing is measured or kept otherwise.
 */
declare global {
  interface Window {
    __endplateFrameTimes?: FrameTiming[]
    __endplateFirstPaintMs?: number
    __endplateFullDepthPaintMs?: number
  }
}

export function frameProbeEnabled(): boolean {
  return Array.isArray(window.__endplateFrameTimes)
}

export function recordFrameTime(timing: FrameTiming): void {
  window.__endplateFrameTimes?.push(timing)
}

export function recordFirstPaint(milliseconds: number): void {
  if (frameProbeEnabled() && window.__endplateFirstPaintMs === undefined)
    window.__endplateFirstPaintMs = milliseconds
}

/** When the first full-depth (16-bit, windowed) picture of the film was drawn. */
export function recordFullDepthPaint(milliseconds: number): void {
  if (frameProbeEnabled() && window.__endplateFullDepthPaintMs === undefined)
    window.__endplateFullDepthPaintMs = milliseconds
}
