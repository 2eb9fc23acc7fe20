import type { OverlayPoints, OverlayShape } from './overlay-shapes'
import { overlayLine } from './overlay-primitives'

/**
 * Each vertebra's endplates (posterior → anterior corner) and posterior wall (ps → pi) from its
 * corners `V.as`, `V.ps`, `V.pi`, `V.ai`, and the sacrum's posterior wall (`S1.ps` → `S1.pw`).
 * Image px; a line is drawn only when both of its landmarks are placed.
 */
export function lateralVertebraLines(points: OverlayPoints): OverlayShape[] {
  const shapes: OverlayShape[] = []
  const vertebrae = new Set(Object.keys(points).map((name) => name.split('.')[0] as string))
  for (const v of vertebrae) {
    const as = points[`${v}.as`]
    const ps = points[`${v}.ps`]
    const pi = points[`${v}.pi`]
    const ai = points[`${v}.ai`]
    if (ps && as) shapes.push(overlayLine(`endplate-sup-${v}`, 'endplate', ps, as))
    if (pi && ai) shapes.push(overlayLine(`endplate-inf-${v}`, 'endplate', pi, ai))
    if (ps && pi) shapes.push(overlayLine(`wall-${v}`, 'wall', ps, pi))
  }
  const wall = points['S1.pw']
  const s1ps = points['S1.ps']
  if (wall && s1ps) shapes.push(overlayLine('wall-S1', 'wall', s1ps, wall))
  return shapes
}
