import sharp, { type Metadata } from 'sharp'
import type { DecodedFilm } from '../decoded-film'
import { ImageError, MAX_FILM_PIXELS, tooManyPixels } from '../image-error'
import type { FilmFileType } from '../sniff-file-type'

type RasterType = Exclude<FilmFileType, 'dicom'>

// PNG §11.2.2: IHDR is the first chunk, width and height are its first two 4-byte fields.
function pngHeaderSize(bytes: Uint8Array): { width: number; height: number } | null {
  if (bytes.length < 24) return null
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength)
  return { width: view.getUint32(16), height: view.getUint32(20) }
}

function corrupt(type: RasterType, error: unknown): ImageError {
  const reason = error instanceof Error ? error.message.split('\n')[0] : String(error)
  return new ImageError(
    'corrupt-image',
    `The ${type.toUpperCase()} file cannot be decoded: ${reason}`,
  )
}

/**
 * Decodes a PNG, JPEG or TIFF upload to grey pixels with sharp. 16-bit files keep their depth
 * (grey16); everything else becomes 8-bit grey. Colour is reduced to luminance and alpha is
 * dropped over black, because films are greyscale and a transparent background is air.
 */
export async function decodeRaster(bytes: Uint8Array, type: RasterType): Promise<DecodedFilm> {
  const ihdr = type === 'png' ? pngHeaderSize(bytes) : null
  if (ihdr && (ihdr.width === 0 || ihdr.height === 0)) {
    throw new ImageError(
      'zero-size-image',
      `The PNG image is ${ihdr.width} × ${ihdr.height} pixels.`,
    )
  }
  // A PNG says its size up front: refuse an oversized one even before sharp opens it.
  if (ihdr && ihdr.width * ihdr.height > MAX_FILM_PIXELS)
    throw tooManyPixels(ihdr.width, ihdr.height)
  // failOn 'truncated' rejects cut-off files instead of padding them with grey.
  const open = () => sharp(bytes, { failOn: 'truncated' }).autoOrient()
  let metadata: Metadata
  try {
    metadata = await open().metadata()
  } catch (error) {
    throw corrupt(type, error)
  }
  if (!metadata.width || !metadata.height) {
    throw new ImageError('zero-size-image', `The ${type.toUpperCase()} image has no pixels.`)
  }
  // Checked from the header before any pixel is decoded.
  if (metadata.width * metadata.height > MAX_FILM_PIXELS)
    throw tooManyPixels(metadata.width, metadata.height)
  const sixteenBit = metadata.depth === 'ushort'
  try {
    const grey = open().flatten({ background: '#000000' })
    if (sixteenBit) {
      const { data, info } = await grey
        .toColourspace('grey16')
        .raw({ depth: 'ushort' })
        .toBuffer({ resolveWithObject: true })
      return film(
        type,
        info.width,
        info.height,
        new Uint16Array(data.buffer, data.byteOffset, data.length >> 1).slice(),
        16,
      )
    }
    const { data, info } = await grey.greyscale().raw().toBuffer({ resolveWithObject: true })
    return film(type, info.width, info.height, Uint16Array.from(data), 8)
  } catch (error) {
    throw corrupt(type, error)
  }
}

function film(
  fileType: RasterType,
  width: number,
  height: number,
  pixels: Uint16Array,
  bitsStored: number,
): DecodedFilm {
  return {
    fileType,
    width,
    height,
    pixels,
    bitsStored,
    window: null,
    toModality: { offset: 0, slope: 1 },
    header: null,
  }
}
