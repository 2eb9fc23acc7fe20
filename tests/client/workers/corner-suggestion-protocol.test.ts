import { describe, expect, it } from 'vitest'
import sharp from 'sharp'
import { createCornerSuggestionHandler } from '../../../src/workers/corner-suggestion-protocol'

/**
 * The worker's answers for a bright quadrant whose corner sits exactly between pixels: each
 * pixel (x, y) covers [x − ½, x + ½] × [y − ½, y + ½], so the quadrant x ≥ 20.5, y ≥ 14.5 is
 * lit by whole pixels and its corner is at (20.5, 14.5) exactly.
 */
function quadrant(width: number, height: number): Uint16Array {
  const pixels = new Uint16Array(width * height)
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) pixels[y * width + x] = x >= 21 && y >= 15 ? 50000 : 10000
  }
  return pixels
}

describe('corner suggestion worker messages', () => {
  it('takes the film once, then answers each click with its id and the corner', () => {
    const handle = createCornerSuggestionHandler()
    expect(handle({ type: 'film', width: 48, height: 40, pixels: quadrant(48, 40) })).toEqual({
      type: 'ready',
      width: 48,
      height: 40,
    })
    const answer = handle({ type: 'suggest', id: 7, x: 24, y: 11.5, radiusPx: 8 })
    expect(answer.type).toBe('suggestion')
    if (answer.type !== 'suggestion') return
    expect(answer.id).toBe(7)
    expect(Math.hypot(answer.suggestion!.x - 20.5, answer.suggestion!.y - 14.5)).toBeLessThan(0.25)
    expect(answer.suggestion!.distancePx).toBeCloseTo(
      Math.hypot(answer.suggestion!.x - 24, answer.suggestion!.y - 11.5),
      9,
    )
  })

  it('answers a click before any film, or a film of the wrong size, with a failure', () => {
    const handle = createCornerSuggestionHandler()
    expect(handle({ type: 'suggest', id: 1, x: 3, y: 3, radiusPx: 4 })).toEqual({
      type: 'failed',
      id: 1,
      message: 'No film sent yet',
    })
    expect(handle({ type: 'film', width: 4, height: 4, pixels: new Uint16Array(3) })).toMatchObject(
      {
        type: 'failed',
        id: null,
      },
    )
  })

  it('answers null where there is no corner to suggest', () => {
    const handle = createCornerSuggestionHandler()
    handle({ type: 'film', width: 30, height: 30, pixels: new Uint16Array(900).fill(30000) })
    expect(handle({ type: 'suggest', id: 2, x: 15, y: 15, radiusPx: 6 })).toEqual({
      type: 'suggestion',
      id: 2,
      suggestion: null,
    })
  })

  // The workspace sends the server's full-depth PNG as it came; sharp (libvips) writes it here,
  // an encoder independent of the fast-png decoder the worker uses.
  it('decodes a 16-bit grey PNG film in the worker and finds the same corner', async () => {
    const png = await sharp(quadrant(48, 40), { raw: { width: 48, height: 40, channels: 1 } })
      .toColourspace('grey16')
      .png()
      .toBuffer()
    const handle = createCornerSuggestionHandler()
    const buffer = png.buffer.slice(png.byteOffset, png.byteOffset + png.byteLength) as ArrayBuffer
    expect(handle({ type: 'film-png', buffer })).toEqual({ type: 'ready', width: 48, height: 40 })
    const answer = handle({ type: 'suggest', id: 3, x: 24, y: 11.5, radiusPx: 8 })
    if (answer.type !== 'suggestion') throw new Error(`unexpected ${answer.type}`)
    expect(Math.hypot(answer.suggestion!.x - 20.5, answer.suggestion!.y - 14.5)).toBeLessThan(0.25)
  })
})
