import sharp from 'sharp'
import { describe, expect, it } from 'vitest'
import type { DecodedFilm } from '../../../../server/images/decoded-film'
import { percentileWindow, windowLookupTable } from '../../../../server/images/display-window'
import { makeFilmRenditions } from '../../../../server/images/renditions'

function film(width: number, height: number, window: DecodedFilm['window'] = null): DecodedFilm {
  const pixels = new Uint16Array(width * height).map((_, i) => (i * 37) % 4096)
  return {
    fileType: 'dicom',
    width,
    height,
    pixels,
    bitsStored: 12,
    window,
    toModality: { offset: 0, slope: 1 },
    header: null,
  }
}

describe('windowing', () => {
  it('follows the LINEAR function of PS3.3 C.11.2.1.2.1 (hand values for c = 100.5, w = 11)', () => {
    const lut = windowLookupTable({ center: 100.5, width: 11 }, 'LINEAR', 256)
    // x ≤ c − 0.5 − (w − 1)/2 = 95 → 0; x > c − 0.5 + (w − 1)/2 = 105 → 255.
    expect(lut[95]).toBe(0)
    expect(lut[106]).toBe(255)
    // x = 100: ((100 − 100)/10 + 0.5)·255 = 127.5 → 128; x = 98: (−0.2 + 0.5)·255 = 76.5 → 77.
    expect(lut[100]).toBe(128)
    expect(lut[98]).toBe(77)
  })

  it('follows SIGMOID (PS3.3 C.11.2.1.3.1): 255 / (1 + e^(−4(x − c)/w))', () => {
    const lut = windowLookupTable({ center: 100, width: 40 }, 'SIGMOID', 256)
    expect(lut[100]).toBe(128)
    // x = 110: 255 / (1 + e^−1) = 186.4 → 186.
    expect(lut[110]).toBe(186)
  })

  it('takes the 1st and 99th percentiles when the film has no window', () => {
    // 0…99 once each: the 1st percentile is value 1, the 99th value 98 → width 98, centre 50.
    expect(percentileWindow(Uint16Array.from({ length: 100 }, (_, i) => i))).toEqual({
      center: 50,
      width: 98,
    })
  })
})

describe('makeFilmRenditions', () => {
  it('makes display, preview, thumbnail and a full-depth PNG with the right sizes', async () => {
    const source = film(600, 400)
    const renditions = await makeFilmRenditions(source, { previewSize: 300, thumbnailSize: 100 })
    expect(renditions.windowSource).toBe('percentile')
    expect(renditions.display).toMatchObject({ width: 600, height: 400, mediaType: 'image/png' })
    expect(renditions.preview).toMatchObject({ width: 300, height: 200, mediaType: 'image/webp' })
    expect(renditions.thumbnail).toMatchObject({ width: 100, height: 67 })
    expect((await sharp(renditions.thumbnail.buffer).metadata()).format).toBe('webp')
    expect((await sharp(renditions.display.buffer).metadata()).channels).toBe(1)
    const full = await sharp(renditions.fullDepth.buffer)
      .toColourspace('grey16')
      .raw({ depth: 'ushort' })
      .toBuffer()
    expect(Buffer.from(source.pixels.buffer).equals(full)).toBe(true)
    expect(renditions.fullDepth.bitsStored).toBe(12)
  })

  it('uses the header window when there is one and never enlarges a small film', async () => {
    const renditions = await makeFilmRenditions(film(200, 100, { center: 2048, width: 1000 }))
    expect(renditions.windowSource).toBe('header')
    expect(renditions.window).toEqual({ center: 2048, width: 1000 })
    expect(renditions.preview).toMatchObject({ width: 200, height: 100 })
    const display = await sharp(renditions.display.buffer).extractChannel(0).raw().toBuffer()
    // Pixel 0 is value 0, far below the window: black. Pixel 60 is 60·37 = 2220, inside it.
    expect(display[0]).toBe(0)
    expect(display[60]).toBe(Math.round(((2220 - 2047.5) / 999 + 0.5) * 255))
  })
})
