import type { Point } from '../geometry/types'
import type { MeasurementResult } from '../types/measurement'
import type { OverlayPoints, OverlayShape } from './overlay-shapes'
import { overlayNumberText } from './overlay-labels'
import { differencePx, lengthPx, midpointPx, overlayLine } from './overlay-primitives'

/**
 * Pelvic lines in image px (Legaye et al. 1998 construction): a ring at each femoral head
 * centre; the sacral plate S1.ps → S1.as extended by 0.3 of its length either way; its caudal
 * perpendicular from the plate's midpoint M (the normal with positive image y), as long as the
 * hip distance; M → hip axis H (H = FH1, or mid(FH1, FH2)); FH1–FH2 dashed. The label under H
 * carries the engine's PI, PT and SS.
 */
export function lateralPelvicOverlays(
  points: OverlayPoints,
  results: MeasurementResult | null,
): OverlayShape[] {
  const ps = points['S1.ps']
  const as = points['S1.as']
  const fh1 = points.FH1
  const fh2 = points.FH2
  const shapes: OverlayShape[] = []
  for (const [name, centre] of [
    ['FH1', fh1],
    ['FH2', fh2],
  ] as const) {
    if (centre)
      shapes.push({
        kind: 'ring',
        id: `head-${name}`,
        category: 'pelvic',
        center: centre,
        radiusPx: 0,
      })
  }
  if (!ps || !as || (!fh1 && !fh2)) return shapes
  const hip: Point = fh1 && fh2 ? midpointPx(fh1, fh2) : ((fh1 ?? fh2) as Point)
  const m = midpointPx(ps, as)
  const plate = differencePx(as, ps)
  const depth = lengthPx(plate)
  if (depth === 0) return shapes
  const a: Point = [plate[0] / depth, plate[1] / depth]
  shapes.push(
    overlayLine(
      'sacral-plate',
      'pelvic',
      [ps[0] - a[0] * depth * 0.3, ps[1] - a[1] * depth * 0.3],
      [as[0] + a[0] * depth * 0.3, as[1] + a[1] * depth * 0.3],
    ),
  )
  const normal: Point = [-a[1], a[0]]
  const caudal: Point = normal[1] >= 0 ? normal : [-normal[0], -normal[1]]
  const reach = lengthPx(differencePx(hip, m))
  shapes.push(
    overlayLine(
      'sacral-perpendicular',
      'pelvic',
      m,
      [m[0] + caudal[0] * reach, m[1] + caudal[1] * reach],
      true,
    ),
  )
  shapes.push(overlayLine('hip-axis-line', 'pelvic', m, hip))
  if (fh1 && fh2) shapes.push(overlayLine('hip-axis', 'pelvic', fh1, fh2, true))
  const pelvis = results?.pelvis
  const parts = [
    pelvis ? ['PI', overlayNumberText(pelvis.incidenceDeg, 1, '°')] : null,
    pelvis ? ['PT', overlayNumberText(pelvis.tiltDeg, 1, '°')] : null,
    pelvis ? ['SS', overlayNumberText(pelvis.sacralSlopeDeg, 1, '°')] : null,
  ]
    .filter((part): part is [string, string] => part !== null && part[1] !== null)
    .map(([name, value]) => `${name} ${value}`)
  if (parts.length) {
    shapes.push({
      kind: 'label',
      id: 'pelvic-label',
      category: 'pelvic',
      at: [hip[0], hip[1] + depth * 0.4],
      text: parts.join('  '),
      anchor: 'middle',
    })
  }
  return shapes
}
