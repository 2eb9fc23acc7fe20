import type { Point } from '@shared/geometry/types'
import type { PixelPoint } from '@shared/types/landmarks'
import type { PendingSuggestion } from '@/composables/use-suggestion-choice'

/**
 * The Konva node settings of the workspace canvas's interactive marks: landmarks, the rater's
 * calibration line, a corner suggestion and the selected landmark's name. Positions are image px;
 * `px` turns a size in screen px into image px at the current zoom, so marks keep their size on
 * screen whatever the zoom.
 */
export type ScreenToImagePx = (css: number) => number

/** A dark edge under light strokes, so marks read on bright bone and on dark soft tissue alike. */
export const HALO = 'rgba(6, 8, 10, 0.85)'
const SUGGESTION = '#ffb547'
const CALIBRATION = '#ffd166'
const SELECTED = '#2c7f78'
const FONT = 'Inter, system-ui, sans-serif'
const NOTE_TAG = { fill: 'rgba(10, 12, 14, 0.82)', listening: false }

/** The line being drawn for a calibration: dashed over a halo. */
export function calibrationLineConfigs(
  line: { from: Point; to: Point } | null,
  px: ScreenToImagePx,
) {
  if (!line) return []
  const points = [line.from[0], line.from[1], line.to[0], line.to[1]]
  const base = { listening: false, strokeScaleEnabled: false, points, lineCap: 'round' }
  return [
    { id: 'cal-halo', ...base, stroke: HALO, strokeWidth: 5 },
    { id: 'cal', ...base, stroke: CALIBRATION, strokeWidth: 2, dash: [px(8), px(4)] },
  ]
}

/**
 * One dot per placed landmark (the node's name carries the landmark, for the layer's events), the
 * selected one larger with a dashed ring around it.
 */
export function landmarkNodeConfigs(
  points: Readonly<Record<string, PixelPoint>>,
  options: { selectedName: string | null; draggable: boolean; px: ScreenToImagePx },
) {
  const { selectedName, draggable, px } = options
  return Object.entries(points).map(([name, [x, y]]) => {
    const selected = selectedName === name
    return {
      name,
      selected,
      config: {
        name: `landmark:${name}`,
        x,
        y,
        radius: px(selected ? 6 : 4.5),
        fill: selected ? '#ffffff' : '#f4f6f8',
        stroke: selected ? SELECTED : '#0c0e10',
        strokeWidth: selected ? 2.5 : 1.5,
        strokeScaleEnabled: false,
        hitStrokeWidth: 14,
        draggable,
        perfectDrawEnabled: false,
      },
      ring: {
        x,
        y,
        radius: px(11),
        stroke: '#ffffff',
        strokeWidth: 1.5,
        strokeScaleEnabled: false,
        listening: false,
        dash: [px(3), px(3)],
      },
    }
  })
}

/**
 * A corner suggestion: an open amber diamond at the corner, joined by a dashed line to the
 * rater's point, with a short note of the two keys. It moves nothing until the rater accepts.
 */
export function suggestionNodeConfigs(offer: PendingSuggestion | null, px: ScreenToImagePx) {
  if (!offer) return null
  const [fx, fy] = offer.from
  const [ax, ay] = offer.at
  const line = { points: [fx, fy, ax, ay], strokeScaleEnabled: false, listening: false }
  return {
    halo: { ...line, stroke: HALO, strokeWidth: 4 },
    line: { ...line, stroke: SUGGESTION, strokeWidth: 1.5, dash: [px(4), px(3)] },
    mark: {
      name: 'corner-suggestion',
      x: ax,
      y: ay,
      sides: 4,
      radius: px(8),
      stroke: SUGGESTION,
      strokeWidth: 2,
      strokeScaleEnabled: false,
      fill: 'rgba(255, 181, 71, 0.18)',
      hitStrokeWidth: 16,
      perfectDrawEnabled: false,
    },
    centre: { x: ax, y: ay, radius: px(1.6), fill: SUGGESTION, listening: false },
    label: { x: ax + px(12), y: ay + px(6), listening: false },
    tag: { ...NOTE_TAG, cornerRadius: px(3) },
    text: {
      text: 'Corner here? Enter accepts · Esc keeps yours',
      fontFamily: FONT,
      fontSize: px(11),
      padding: px(3),
      fill: SUGGESTION,
      listening: false,
    },
  }
}

/** The selected landmark's name beside it, up and to the right. */
export function selectedLabelConfigs(
  selected: { name: string; point: PixelPoint } | null,
  px: ScreenToImagePx,
) {
  if (!selected) return null
  const [x, y] = selected.point
  return {
    label: { x: x + px(14), y: y - px(10), listening: false },
    tag: { ...NOTE_TAG, cornerRadius: px(3) },
    text: {
      text: selected.name,
      fontFamily: FONT,
      fontSize: px(12),
      padding: px(3),
      fill: '#ffffff',
      listening: false,
    },
  }
}
