import sharp, { type Sharp } from 'sharp'
import type { DecodedFilm, WindowLevel } from './decoded-film'
import { percentileWindow, windowLookupTable } from './display-window'

export type RenditionFormat = 'webp' | 'png'

export interface Rendition {
  buffer: Buffer
  width: number
  height: number
  mediaType: 'image/webp' | 'image/png'
}

export interface FilmRenditions {
  /** Full size, 8-bit, windowed. */
  display: Rendition
  /** At most 2048 px on the long side, 8-bit, windowed. */
  preview: Rendition
  /** At most 256 px on the long side, 8-bit, windowed. */
  thumbnail: Rendition
  /** Full size, every bit of the film as a 16-bit grey PNG, for the client's window/level. */
  fullDepth: Rendition & { bitsStored: number }
  window: WindowLevel
  windowSource: 'header' | 'percentile'
}

export interface RenditionOptions {
  /** Full-size display: PNG by default (lossless, and 4× faster to encode than WebP at 7.5 MP). */
  displayFormat?: RenditionFormat
  /** Preview and thumbnail: WebP by default (small, and lossy is fine at these sizes). */
  reducedFormat?: RenditionFormat
  previewSize?: number
  thumbnailSize?: number
}

// Effort and compression levels were picked against the ingest benchmark
// (server/bench/ingest.bench.ts): higher settings cost 2–4× the time for 5–15 % smaller files,
// and the ingest must stay within 1.5× of sharp's own decode and resize.
function encode(image: Sharp, format: RenditionFormat): Sharp {
  // Without b-w, sharp widens one grey channel to sRGB: three times the bytes to compress.
  const grey = image.toColourspace('b-w')
  return format === 'webp'
    ? grey.webp({ quality: 90, effort: 0 })
    : grey.png({ compressionLevel: 1, adaptiveFiltering: false })
}

async function rendition(image: Sharp, format: RenditionFormat): Promise<Rendition> {
  const { data, info } = await encode(image, format).toBuffer({ resolveWithObject: true })
  return {
    buffer: data,
    width: info.width,
    height: info.height,
    mediaType: format === 'webp' ? 'image/webp' : 'image/png',
  }
}

function windowed(film: DecodedFilm, window: WindowLevel): Uint8Array {
  const lut = windowLookupTable(window, film.header?.voiLutFunction ?? 'LINEAR')
  const out = new Uint8Array(film.pixels.length)
  for (let i = 0; i < out.length; i++) out[i] = lut[film.pixels[i] as number] as number
  return out
}

/**
 * Makes the stored renditions of a decoded film. The caller stores them by content hash. All
 * encodes run at once: sharp works off the main thread, so they share the machine's cores.
 */
export async function makeFilmRenditions(
  film: DecodedFilm,
  options: RenditionOptions = {},
): Promise<FilmRenditions> {
  const displayFormat = options.displayFormat ?? 'png'
  const reducedFormat = options.reducedFormat ?? 'webp'
  const window = film.window ?? percentileWindow(film.pixels)
  const raw = { raw: { width: film.width, height: film.height, channels: 1 as const } }
  const grey8 = windowed(film, window)
  const fit = (size: number) =>
    sharp(grey8, raw).resize(size, size, { fit: 'inside', withoutEnlargement: true })

  const [display, preview, thumbnail, fullDepth] = await Promise.all([
    rendition(sharp(grey8, raw), displayFormat),
    rendition(fit(options.previewSize ?? 2048), reducedFormat),
    rendition(fit(options.thumbnailSize ?? 256), reducedFormat),
    sharp(film.pixels, raw)
      .toColourspace('grey16')
      .png({ compressionLevel: 1, adaptiveFiltering: false })
      .toBuffer({ resolveWithObject: true }),
  ])
  return {
    display,
    preview,
    thumbnail,
    fullDepth: {
      buffer: fullDepth.data,
      width: fullDepth.info.width,
      height: fullDepth.info.height,
      mediaType: 'image/png',
      bitsStored: film.bitsStored,
    },
    window,
    windowSource: film.window ? 'header' : 'percentile',
  }
}
