import { describe, expect, it } from 'vitest'
import sharp from 'sharp'
import { decodeFilmPng } from '../../../src/workers/film-png'
import { windowLookupTableLinear } from '../../../src/workers/window-lookup'

/** A deterministic 16-bit ramp with noise, so every PNG filter type gets used by the encoder. */
function testPixels(width: number, height: number): Uint16Array {
  const pixels = new Uint16Array(width * height)
  let state = 12345
  for (let i = 0; i < pixels.length; i++) {
    state = (state * 1103515245 + 12345) & 0x7fffffff
    pixels[i] = ((i % width) * 211 + Math.floor(i / width) * 97 + (state % 4096)) & 0xffff
  }
  return pixels
}

describe('decodeFilmPng (fast-png)', () => {
  // sharp (libvips/libspng) is the independent encoder and decoder: what it writes and reads
  // back, fast-png must read identically.
  it('reads every bit of a 16-bit grey PNG written by sharp, as sharp reads it', async () => {
    const width = 97
    const height = 61
    const pixels = testPixels(width, height)
    for (const adaptiveFiltering of [false, true]) {
      const png = await sharp(pixels, { raw: { width, height, channels: 1 } })
        .toColourspace('grey16')
        .png({ adaptiveFiltering, compressionLevel: 6 })
        .toBuffer()
      const bySharp = await sharp(png).toColourspace('grey16').raw({ depth: 'ushort' }).toBuffer()
      const decoded = decodeFilmPng(new Uint8Array(png))
      expect(decoded).toMatchObject({ width, height, bitDepth: 16 })
      expect(Array.from(decoded.pixels)).toEqual(Array.from(pixels))
      expect(Array.from(decoded.pixels)).toEqual(
        Array.from(new Uint16Array(bySharp.buffer, bySharp.byteOffset, bySharp.length / 2)),
      )
    }
  })

  it('reads an 8-bit grey PNG', async () => {
    const grey = new Uint8Array(40 * 30).map((_, i) => (i * 7) & 0xff)
    const png = await sharp(grey, { raw: { width: 40, height: 30, channels: 1 } })
      .toColourspace('b-w')
      .png()
      .toBuffer()
    const decoded = decodeFilmPng(new Uint8Array(png))
    expect(decoded.bitDepth).toBe(8)
    expect(Array.from(decoded.pixels)).toEqual(Array.from(grey))
  })

  it('refuses colour PNGs and other files with a message', async () => {
    const rgb = await sharp({ create: { width: 4, height: 4, channels: 3, background: '#ff0000' } })
      .png()
      .toBuffer()
    expect(() => decodeFilmPng(new Uint8Array(rgb))).toThrow('greyscale')
    expect(() => decodeFilmPng(new Uint8Array([1, 2, 3, 4, 5, 6, 7, 8, 9]))).toThrow()
  })
})

describe('windowLookupTableLinear (DICOM PS3.3 C.11.2.1.2.1, LINEAR)', () => {
  it('is black at and below c − 0.5 − (w − 1)/2, white above c − 0.5 + (w − 1)/2', () => {
    // c = 2048, w = 4096: the thresholds are 0 and 4095 (the standard's formula, worked by hand).
    const lut = windowLookupTableLinear(2048, 4096)
    expect(lut[0]).toBe(0)
    expect(lut[4095]).toBe(255)
    expect(lut[4096]).toBe(255)
    // Mid-window: ((2047.5 − 2047.5)/4095 + 0.5)·255 = 127.5, rounded to 128.
    expect(lut[2048]).toBe(128)
  })

  it('is monotone non-decreasing, and inverting mirrors it', () => {
    const lut = windowLookupTableLinear(30000, 12000)
    const inverted = windowLookupTableLinear(30000, 12000, true)
    const drops = Array.from(lut).filter((value, x) => x > 0 && value < lut[x - 1]!)
    expect(drops).toHaveLength(0)
    expect(inverted[30000]).toBe(255 - lut[30000]!)
  })

  it('treats a width below 1 as 1: a hard threshold at the centre', () => {
    const lut = windowLookupTableLinear(100, 0)
    expect(lut[99]).toBe(0)
    expect(lut[100]).toBe(255)
  })
})
