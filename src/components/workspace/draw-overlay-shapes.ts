import { OVERLAY_COLOURS, type OverlayShape } from '@shared/overlays'

const HALO = 'rgba(6, 8, 10, 0.85)'
const LABEL_BACKGROUND = 'rgba(10, 12, 14, 0.82)'
const FONT_FAMILY = 'Inter, system-ui, sans-serif'

/**
 * Draws every overlay in one pass onto a 2-D context that already carries the view transform
 * (image px → canvas). `cssPx` is the length in image px of one CSS px, so strokes, dashes and
 * labels keep their on-screen size at every zoom. Each stroke is laid over a dark halo so it
 * reads on any window setting. One canvas pass instead of one scene-graph node per line keeps
 * a drag step cheap.
 */
export function drawOverlayShapes(
  context: CanvasRenderingContext2D,
  shapes: readonly OverlayShape[],
  cssPx: number,
): void {
  context.save()
  context.lineCap = 'round'
  context.lineJoin = 'round'
  for (const pass of ['halo', 'colour'] as const) {
    for (const shape of shapes) {
      if (shape.kind === 'label') continue
      const width = shape.category === 'disc' ? 1.25 : 2
      context.strokeStyle = pass === 'halo' ? HALO : OVERLAY_COLOURS[shape.category]
      context.lineWidth = (pass === 'halo' ? width + 3 : width) * cssPx
      const dashed = shape.kind === 'line' && shape.dashed && pass === 'colour'
      context.setLineDash(dashed ? [6 * cssPx, 4 * cssPx] : [])
      context.beginPath()
      if (shape.kind === 'line') {
        const [x1, y1, x2, y2] = shape.points as [number, number, number, number]
        context.moveTo(x1, y1)
        context.lineTo(x2, y2)
      } else if (shape.kind === 'arc') {
        const start = (shape.rotationDeg * Math.PI) / 180
        context.arc(
          shape.center[0],
          shape.center[1],
          shape.radiusPx,
          start,
          start + (shape.angleDeg * Math.PI) / 180,
        )
      } else {
        context.arc(shape.center[0], shape.center[1], 11 * cssPx, 0, Math.PI * 2)
        context.moveTo(shape.center[0] - 4 * cssPx, shape.center[1])
        context.lineTo(shape.center[0] + 4 * cssPx, shape.center[1])
        context.moveTo(shape.center[0], shape.center[1] - 4 * cssPx)
        context.lineTo(shape.center[0], shape.center[1] + 4 * cssPx)
      }
      context.stroke()
    }
  }
  context.setLineDash([])
  const fontPx = 12 * cssPx
  const padding = 3 * cssPx
  context.font = `500 ${fontPx}px ${FONT_FAMILY}`
  context.textBaseline = 'middle'
  for (const shape of shapes) {
    if (shape.kind !== 'label') continue
    const width = context.measureText(shape.text).width + 2 * padding
    const height = fontPx + 2 * padding
    const left =
      shape.anchor === 'end'
        ? shape.at[0] - width
        : shape.anchor === 'middle'
          ? shape.at[0] - width / 2
          : shape.at[0]
    const top = shape.at[1] - height / 2
    context.fillStyle = LABEL_BACKGROUND
    context.beginPath()
    context.roundRect(left, top, width, height, 3 * cssPx)
    context.fill()
    context.fillStyle = OVERLAY_COLOURS[shape.category]
    context.fillText(shape.text, left + padding, shape.at[1])
  }
  context.restore()
}
