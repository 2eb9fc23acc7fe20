import type { OverlayPoints, OverlayShape } from './overlay-shapes'
import { overlayLine } from './overlay-primitives'

/**
 * Implant marks in image px: each cage surface as a line from its posterior to its anterior
 * point (`cage.<segment>.sup|inf.p` → `.a`), and a ring at each disc replacement marker
 * (`implant.<segment>.marker`).
 */
export function lateralImplantOverlays(points: OverlayPoints): OverlayShape[] {
  const shapes: OverlayShape[] = []
  for (const [name, point] of Object.entries(points)) {
    const cage = /^cage\.(.+)\.(sup|inf)\.p$/.exec(name)
    if (cage) {
      const anterior = points[`cage.${cage[1]}.${cage[2]}.a`]
      if (anterior)
        shapes.push(overlayLine(`cage-${cage[1]}-${cage[2]}`, 'implant', point, anterior))
    }
    if (/^implant\..+\.marker$/.test(name)) {
      shapes.push({
        kind: 'ring',
        id: `marker-${name}`,
        category: 'implant',
        center: point,
        radiusPx: 0,
      })
    }
  }
  return shapes
}
