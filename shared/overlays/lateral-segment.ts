import type { Point } from '../geometry/types'
import type { MeasurementResult, SegmentName } from '../types/measurement'
import { SEGMENT_NAMES } from '../measurement/landmark-names'
import type { OverlayPoints, OverlayShape } from './overlay-shapes'
import { overlayNumberText } from './overlay-labels'
import { differencePx, directionDeg, lengthPx, midpointPx, overlayLine } from './overlay-primitives'

/** The segments whose upper vertebra's `pi` and lower vertebra's `ps` are placed. */
export function overlaySegmentsOf(points: OverlayPoints): SegmentName[] {
  return SEGMENT_NAMES.filter((name) => {
    const [upper, lower] = name.split('-') as [string, string]
    return `${upper}.pi` in points && `${lower}.ps` in points
  })
}

/**
 * The slip offset of one segment U-W (image px): the foot of U.pi on W's superior endplate
 * (Taillard: d = (U.pi − W.ps)·a, a = unit(W.as − W.ps)), a solid line W.ps → foot and a dashed
 * drop U.pi → foot, so the solid line is as long as the slip. Its label, placed behind the
 * posterior wall and growing away from the spine, carries the engine's slip %.
 */
function slipOffset(
  segment: SegmentName,
  points: OverlayPoints,
  slipPercent: number | null | undefined,
  labelSmallSlips: boolean,
): OverlayShape[] {
  const [u, w] = segment.split('-') as [string, string]
  const uPi = points[`${u}.pi`]
  const wPs = points[`${w}.ps`]
  const wAs = points[`${w}.as`]
  if (!uPi || !wPs || !wAs) return []
  const along = differencePx(wAs, wPs)
  const depth = lengthPx(along)
  if (depth === 0) return []
  const a: Point = [along[0] / depth, along[1] / depth]
  const d = (uPi[0] - wPs[0]) * a[0] + (uPi[1] - wPs[1]) * a[1]
  const foot: Point = [wPs[0] + a[0] * d, wPs[1] + a[1] * d]
  const shapes = [
    overlayLine(`slip-${segment}`, 'wall', wPs, foot),
    overlayLine(`slip-drop-${segment}`, 'wall', uPi, foot, true),
  ]
  const text = overlayNumberText(slipPercent, 1, '%')
  // On a whole spine, a label on every aligned segment is noise; a slip of 1 % or more is not.
  if (text && slipPercent != null && (labelSmallSlips || Math.abs(slipPercent) >= 1)) {
    const outward: Point = [-a[0] * depth * 0.25, -a[1] * depth * 0.25]
    shapes.push({
      kind: 'label',
      id: `slip-label-${segment}`,
      category: 'wall',
      at: [wPs[0] + outward[0], wPs[1] + outward[1]],
      text: `slip ${text}`,
      anchor: a[0] > 0 ? 'end' : 'start',
    })
  }
  return shapes
}

/**
 * Segmental lordosis as a small protractor in front of the disc (image px): two rays parallel
 * to U's superior endplate and W's reference endplate (W's inferior, or S1's superior), from a
 * centre 0.35 endplate depths anterior of the disc's front, with the arc between them and the
 * engine's angle as its label. The endplate lines themselves rarely meet on the film at
 * lordotic angles, so the angle is drawn beside them.
 */
function lordosisProtractor(
  segment: SegmentName,
  points: OverlayPoints,
  lordosisDeg: number | null | undefined,
): OverlayShape[] {
  const [u, w] = segment.split('-') as [string, string]
  const uAs = points[`${u}.as`]
  const uPs = points[`${u}.ps`]
  const from = w === 'S1' ? points['S1.ps'] : points[`${w}.pi`]
  const to = w === 'S1' ? points['S1.as'] : points[`${w}.ai`]
  if (!uPs || !uAs || !from || !to || lordosisDeg === null || lordosisDeg === undefined) return []
  const upper = differencePx(uAs, uPs)
  const lower = differencePx(to, from)
  const depth = (lengthPx(upper) + lengthPx(lower)) / 2
  if (depth === 0 || lengthPx(upper) === 0 || lengthPx(lower) === 0) return []
  const anterior: Point = [
    (upper[0] / lengthPx(upper) + lower[0] / lengthPx(lower)) / 2,
    (upper[1] / lengthPx(upper) + lower[1] / lengthPx(lower)) / 2,
  ]
  const anteriorLength = lengthPx(anterior) || 1
  const ahead: Point = [anterior[0] / anteriorLength, anterior[1] / anteriorLength]
  const front = midpointPx(uAs, to)
  const center: Point = [front[0] + ahead[0] * depth * 0.35, front[1] + ahead[1] * depth * 0.35]
  const rayLength = depth * 0.45
  // Rays point forward, along each endplate from posterior to anterior.
  const ray = (v: Point): Point => [
    center[0] + (v[0] / lengthPx(v)) * rayLength,
    center[1] + (v[1] / lengthPx(v)) * rayLength,
  ]
  const a1 = directionDeg(uPs, uAs)
  const a2 = directionDeg(from, to)
  let sweep = a2 - a1
  while (sweep > 180) sweep -= 360
  while (sweep < -180) sweep += 360
  return [
    overlayLine(`lordosis-ray-u-${segment}`, 'endplate', center, ray(upper)),
    overlayLine(`lordosis-ray-w-${segment}`, 'endplate', center, ray(lower)),
    {
      kind: 'arc',
      id: `lordosis-arc-${segment}`,
      category: 'endplate',
      center,
      radiusPx: rayLength * 0.7,
      rotationDeg: sweep >= 0 ? a1 : a2,
      angleDeg: Math.max(0.5, Math.abs(sweep)),
    },
    {
      kind: 'label',
      id: `lordosis-label-${segment}`,
      category: 'endplate',
      at: [
        center[0] + ahead[0] * rayLength * 1.1,
        center[1] + ahead[1] * rayLength * 1.1 - depth * 0.08,
      ],
      text: `${segment} ${overlayNumberText(lordosisDeg, 1, '°')}`,
      anchor: ahead[0] >= 0 ? 'start' : 'end',
    },
  ]
}

/**
 * Overlays of one motion segment U-W, image px: the slip offset with its %, the anterior and
 * posterior disc height markers (U.ai–W.as, U.pi–W.ps, dashed) and the segmental lordosis
 * protractor. Values come from `results` (the engine result the results panel shows).
 */
export function lateralSegmentOverlays(
  segment: SegmentName,
  points: OverlayPoints,
  results: MeasurementResult | null,
  labelSmallSlips: boolean,
): OverlayShape[] {
  const [u, w] = segment.split('-') as [string, string]
  const measures = results?.segments[segment]
  const shapes = slipOffset(segment, points, measures?.slipPercent, labelSmallSlips)
  const uAi = points[`${u}.ai`]
  const uPi = points[`${u}.pi`]
  const wAs = points[`${w}.as`]
  const wPs = points[`${w}.ps`]
  if (uAi && wAs) shapes.push(overlayLine(`disc-a-${segment}`, 'disc', uAi, wAs, true))
  if (uPi && wPs) shapes.push(overlayLine(`disc-p-${segment}`, 'disc', uPi, wPs, true))
  shapes.push(...lordosisProtractor(segment, points, measures?.segmentalLordosisDeg))
  return shapes
}
