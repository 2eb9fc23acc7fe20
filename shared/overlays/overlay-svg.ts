import type { OverlayPoints, OverlayShape } from './overlay-shapes'
import { OVERLAY_COLOURS } from './overlay-shapes'

const HALO = 'rgba(6,8,10,0.85)'

export interface OverlaySvgOptions {
  /** Film size, image px: the SVG's user space is the film's pixel grid. */
  widthPx: number
  heightPx: number
  /** Size of the SVG element, output px (defaults to the film size). */
  outputWidthPx?: number
  outputHeightPx?: number
  /**
   * Image px per output px: strokes, dashes, rings and text are this many image px per output
   * px, so they keep one size in the output whatever the film size.
   */
  unitPx: number
  /** Draw the labels (text) too; a renderer that sets text itself leaves them out. */
  labels: boolean
  /** Landmark dots, image px; none when omitted. */
  points?: OverlayPoints
  /**
   * Show only these whole pixels (columns x … x + width − 1, rows y … y + height − 1) instead of
   * the whole film.
   */
  crop?: { x: number; y: number; width: number; height: number }
}

const number = (value: number): string => (Math.round(value * 100) / 100).toString()

function escapeText(text: string): string {
  return text.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;')
}

function strokeOf(shape: OverlayShape, unit: number, pass: 'halo' | 'colour'): string {
  const width = shape.category === 'disc' ? 1.25 : 2
  const colour = pass === 'halo' ? HALO : OVERLAY_COLOURS[shape.category]
  const dashed = shape.kind === 'line' && shape.dashed && pass === 'colour'
  return [
    `stroke="${colour}"`,
    `stroke-width="${number((pass === 'halo' ? width + 3 : width) * unit)}"`,
    dashed ? `stroke-dasharray="${number(6 * unit)} ${number(4 * unit)}"` : '',
  ]
    .filter(Boolean)
    .join(' ')
}

/** An arc as an SVG path: from rotationDeg, sweeping angleDeg clockwise on screen (y down). */
function arcPath(shape: Extract<OverlayShape, { kind: 'arc' }>): string {
  const start = (shape.rotationDeg * Math.PI) / 180
  const end = ((shape.rotationDeg + shape.angleDeg) * Math.PI) / 180
  const [cx, cy] = shape.center
  const r = shape.radiusPx
  const large = shape.angleDeg > 180 ? 1 : 0
  return `M ${number(cx + r * Math.cos(start))} ${number(cy + r * Math.sin(start))} A ${number(r)} ${number(r)} 0 ${large} 1 ${number(cx + r * Math.cos(end))} ${number(cy + r * Math.sin(end))}`
}

function geometry(shape: OverlayShape, unit: number): string {
  if (shape.kind === 'line') {
    const [x1, y1, x2, y2] = shape.points.map(number)
    return `<line x1="${x1}" y1="${y1}" x2="${x2}" y2="${y2}"`
  }
  if (shape.kind === 'arc') return `<path d="${arcPath(shape)}"`
  if (shape.kind === 'ring') {
    const [x, y] = shape.center
    const r = shape.radiusPx > 0 ? shape.radiusPx : 11 * unit
    const c = 4 * unit
    return `<path d="M ${number(x + r)} ${number(y)} A ${number(r)} ${number(r)} 0 1 1 ${number(x - r)} ${number(y)} A ${number(r)} ${number(r)} 0 1 1 ${number(x + r)} ${number(y)} M ${number(x - c)} ${number(y)} L ${number(x + c)} ${number(y)} M ${number(x)} ${number(y - c)} L ${number(x)} ${number(y + c)}"`
  }
  return ''
}

/**
 * The overlays as one SVG document over the film (or the cropped part of it): the user space is
 * the film's pixel grid (the viewBox runs from the crop's first pixel edge, x − 0.5, so pixel
 * centres sit on integer coordinates as landmarks do), strokes over a dark halo in the colour of their kind, rings with a cross, landmark dots,
 * and with `labels` the text over a dark outline. The same drawing rules as the canvas, for the
 * printed page and the composited report film. No script, no external reference.
 */
export function overlaySvg(shapes: readonly OverlayShape[], options: OverlaySvgOptions): string {
  const unit = options.unitPx
  const crop = options.crop ?? { x: 0, y: 0, width: options.widthPx, height: options.heightPx }
  const width = options.outputWidthPx ?? crop.width
  const height = options.outputHeightPx ?? crop.height
  const parts: string[] = [
    `<svg xmlns="http://www.w3.org/2000/svg" width="${number(width)}" height="${number(height)}" viewBox="${number(crop.x - 0.5)} ${number(crop.y - 0.5)} ${crop.width} ${crop.height}">`,
    '<g fill="none" stroke-linecap="round" stroke-linejoin="round">',
  ]
  for (const pass of ['halo', 'colour'] as const) {
    for (const shape of shapes) {
      if (shape.kind === 'label') continue
      parts.push(`${geometry(shape, unit)} ${strokeOf(shape, unit, pass)}/>`)
    }
  }
  parts.push('</g>')
  if (options.points) {
    parts.push(`<g fill="#f4f6f8" stroke="#0c0e10" stroke-width="${number(1.5 * unit)}">`)
    for (const [x, y] of Object.values(options.points))
      parts.push(`<circle cx="${number(x)}" cy="${number(y)}" r="${number(3.5 * unit)}"/>`)
    parts.push('</g>')
  }
  if (options.labels) {
    parts.push(
      `<g font-family="Inter, sans-serif" font-weight="500" font-size="${number(12 * unit)}" dominant-baseline="middle" stroke="${HALO}" stroke-width="${number(2.4 * unit)}" stroke-linejoin="round" paint-order="stroke">`,
    )
    for (const shape of shapes) {
      if (shape.kind !== 'label') continue
      const anchor = shape.anchor === 'start' ? 'start' : shape.anchor === 'end' ? 'end' : 'middle'
      parts.push(
        `<text x="${number(shape.at[0])}" y="${number(shape.at[1])}" text-anchor="${anchor}" fill="${OVERLAY_COLOURS[shape.category]}">${escapeText(shape.text)}</text>`,
      )
    }
    parts.push('</g>')
  }
  parts.push('</svg>')
  return parts.join('')
}
