/**
 * Frame timings for `npm run bench`: when the page defines `window.__endplateFrameTimes` (the
 * benchmark does, before the app loads), each landmark drag step records how long the engine
 * and Konva's draw took. Nothing is measured or kept otherwise.
 */
declare global {
  interface Window {
    __endplateFrameTimes?: number[]
    __endplateFirstPaintMs?: number
  }
}

export function frameProbeEnabled(): boolean {
  return Array.isArray(window.__endplateFrameTimes)
}

export function recordFrameTime(milliseconds: number): void {
  window.__endplateFrameTimes?.push(milliseconds)
}

export function recordFirstPaint(milliseconds: number): void {
  if (frameProbeEnabled() && window.__endplateFirstPaintMs === undefined)
    window.__endplateFirstPaintMs = milliseconds
}
