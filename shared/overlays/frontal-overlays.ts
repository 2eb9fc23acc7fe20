import type { Point } from '../geometry/types'
import type { MeasurementResult } from '../types/measurement'
import { SEGMENT_NAMES } from '../measurement/landmark-names'
import { frontalSideWords } from '../measurement/implant-centring'
import type { OverlayFilmContext, OverlayPoints, OverlayShape } from './overlay-shapes'
import { overlayNumberText } from './overlay-labels'
import { overlayLine } from './overlay-primitives'

/**
 * Overlays of a frontal (AP) film read for implant centring, image px (measurement-reference
 * §11 landmarks): each segment's endplate lines U.il → U.ir and W.sl → W.sr, the implant's line
 * tdr.l → tdr.r, the body midline (dashed, through the mean m of the four corners, at right
 * angles to e = unit((U.ir − U.il) + (W.sr − W.sl)), as long as the disc is high), a ring at the
 * implant's centre and at the spinous process tip. Two labels carry the engine's results: the
 * lateral offset in mm and % of the endplate width beside the endplates' right ends (its sign
 * says the side: positive toward the image's right edge, named as the patient's side when the
 * film's Patient Orientation says which it is; mm only on a calibrated film),
 * and the implant's coronal tilt beside the implant's left end.
 */
export function frontalOverlayShapes(
  points: OverlayPoints,
  results: MeasurementResult | null,
  context: OverlayFilmContext = {},
): OverlayShape[] {
  const side = context.imageRightSide ?? 'unknown'
  const shapes: OverlayShape[] = []
  for (const segment of SEGMENT_NAMES) {
    const [u, w] = segment.split('-') as [string, string]
    const uil = points[`${u}.il`]
    const uir = points[`${u}.ir`]
    const wsl = points[`${w}.sl`]
    const wsr = points[`${w}.sr`]
    const tl = points[`tdr.${segment}.l`]
    const tr = points[`tdr.${segment}.r`]
    if (uil && uir) shapes.push(overlayLine(`frontal-upper-${segment}`, 'endplate', uil, uir))
    if (wsl && wsr) shapes.push(overlayLine(`frontal-lower-${segment}`, 'endplate', wsl, wsr))
    if (tl && tr) {
      shapes.push(overlayLine(`frontal-implant-${segment}`, 'implant', tl, tr))
      shapes.push({
        kind: 'ring',
        id: `frontal-implant-centre-${segment}`,
        category: 'implant',
        center: [(tl[0] + tr[0]) / 2, (tl[1] + tr[1]) / 2],
        radiusPx: 0,
      })
    }
    const sp = points[`${u}.sp`]
    if (sp)
      shapes.push({
        kind: 'ring',
        id: `frontal-spinous-${u}`,
        category: 'wall',
        center: sp,
        radiusPx: 0,
      })
    if (!uil || !uir || !wsl || !wsr) continue
    const sum: Point = [uir[0] - uil[0] + wsr[0] - wsl[0], uir[1] - uil[1] + wsr[1] - wsl[1]]
    const length = Math.hypot(sum[0], sum[1])
    if (length === 0) continue
    const e: Point = [sum[0] / length, sum[1] / length]
    const m: Point = [
      (uil[0] + uir[0] + wsl[0] + wsr[0]) / 4,
      (uil[1] + uir[1] + wsl[1] + wsr[1]) / 4,
    ]
    const upperMid: Point = [(uil[0] + uir[0]) / 2, (uil[1] + uir[1]) / 2]
    const lowerMid: Point = [(wsl[0] + wsr[0]) / 2, (wsl[1] + wsr[1]) / 2]
    const half =
      Math.max(Math.hypot(upperMid[0] - lowerMid[0], upperMid[1] - lowerMid[1]), 1) * 0.75
    const normal: Point = [-e[1], e[0]]
    shapes.push(
      overlayLine(
        `frontal-midline-${segment}`,
        'wall',
        [m[0] - normal[0] * half, m[1] - normal[1] * half],
        [m[0] + normal[0] * half, m[1] + normal[1] * half],
        true,
      ),
    )
    const offset = results?.frontal?.[segment]
    const magnitude = (value: number | null | undefined) =>
      value === null || value === undefined ? null : Math.abs(value)
    const text = [
      overlayNumberText(magnitude(offset?.lateralOffsetMm), 1, 'mm'),
      overlayNumberText(magnitude(offset?.lateralOffsetPercent), 1, '%'),
    ]
      .filter((part): part is string => part !== null)
      .join(' / ')
    const signed = offset?.lateralOffsetMm ?? offset?.lateralOffsetPercent ?? null
    const tilt = overlayNumberText(offset?.implantTiltDeg, 1, '°')
    if (tl && tr && tilt) {
      // Left of the leftmost corner of the segment, so the text never covers a landmark.
      const left = tl[0] <= tr[0] ? tl : tr
      const leftmostX = Math.min(left[0], uil[0], uir[0], wsl[0], wsr[0])
      shapes.push({
        kind: 'label',
        id: `frontal-tilt-label-${segment}`,
        category: 'implant',
        at: [leftmostX - length * 0.08, left[1]],
        text: `tilt ${tilt}`,
        anchor: 'end',
      })
    }
    if (text && signed !== null) {
      // The same side words as the results panel: the patient's side when the file names it.
      const towards =
        Math.abs(signed) < 0.05 ? 'centred' : `to ${frontalSideWords(side, signed > 0 ? 'r' : 'l')}`
      const right = uir[0] >= uil[0] ? uir : uil
      shapes.push({
        kind: 'label',
        id: `frontal-offset-label-${segment}`,
        category: 'implant',
        at: [right[0] + length * 0.08, (right[1] + (wsr[0] >= wsl[0] ? wsr : wsl)[1]) / 2],
        text: `${segment} offset ${text} ${towards}`,
        anchor: 'start',
      })
    }
  }
  return shapes
}
