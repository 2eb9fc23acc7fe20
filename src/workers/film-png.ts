import { decode } from 'fast-png'

/** A decoded greyscale film: one value per pixel, row by row, every bit kept. */
export interface GreyImage {
  width: number
  height: number
  bitDepth: 8 | 16
  pixels: Uint16Array
}

/**
 * Decodes the server's full-depth rendition (a greyscale PNG of 8 or 16 bits) with fast-png,
 * keeping every bit, which a browser canvas would not. Colour or palette PNGs are refused with
 * a message: the workspace windows grey films only.
 */
export function decodeFilmPng(bytes: Uint8Array): GreyImage {
  const png = decode(bytes)
  if (png.channels !== 1 || png.palette) {
    throw new Error('Only greyscale PNG films can be windowed here')
  }
  if (png.depth !== 8 && png.depth !== 16) {
    throw new Error(`Unsupported PNG bit depth ${png.depth}`)
  }
  const pixels =
    png.data instanceof Uint16Array ? png.data : Uint16Array.from(png.data as ArrayLike<number>)
  return { width: png.width, height: png.height, bitDepth: png.depth, pixels }
}
