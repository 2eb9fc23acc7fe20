import { inflateRawSync } from 'node:zlib'
import dicomParser, { type DataSet } from 'dicom-parser'
import { ImageError, MAX_FILM_PIXELS } from '../image-error'

/**
 * The most a deflated dataset may inflate to: the pixels of the largest film Endplate accepts
 * (MAX_FILM_PIXELS at 16 bits) plus room for the attributes around them, which are small.
 * A few megabytes of deflate can otherwise stand for gigabytes.
 */
export const MAX_INFLATED_BYTES = MAX_FILM_PIXELS * 2 + 16 * 2 ** 20

// Deflated Explicit VR Little Endian (PS3.5 §A.5) deflates everything after the meta header.
// dicom-parser hands us the bytes and the offset where the deflated stream starts and expects
// the whole file back, inflated. zlib stops at maxOutputLength instead of growing further.
function inflateDataset(bytes: Uint8Array, position: number): Uint8Array {
  let inflated: Buffer
  try {
    inflated = inflateRawSync(bytes.subarray(position), { maxOutputLength: MAX_INFLATED_BYTES })
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code === 'ERR_BUFFER_TOO_LARGE') {
      throw new ImageError(
        'corrupt-dicom',
        `The deflated DICOM dataset inflates to more than ${Math.round(MAX_INFLATED_BYTES / 2 ** 20)} MB, more than a film of at most ${MAX_FILM_PIXELS / 1e6} million pixels can hold.`,
      )
    }
    throw new ImageError(
      'corrupt-dicom',
      `The deflated DICOM dataset cannot be inflated: ${String(error)}`,
    )
  }
  const whole = new Uint8Array(position + inflated.length)
  whole.set(bytes.subarray(0, position), 0)
  whole.set(inflated, position)
  return whole
}

/** Parses Part 10 bytes with dicom-parser; a damaged file becomes a `corrupt-dicom` error. */
export function parseDicomDataset(bytes: Uint8Array): DataSet {
  try {
    return dicomParser.parseDicom(bytes, { inflater: inflateDataset })
  } catch (error) {
    if (error instanceof ImageError) throw error
    // dicom-parser throws strings, or an object with the exception and the partial dataset.
    const reason =
      typeof error === 'string'
        ? error
        : error instanceof Error
          ? error.message
          : String((error as { exception?: unknown }).exception ?? error)
    throw new ImageError('corrupt-dicom', `The DICOM file cannot be read: ${reason}`)
  }
}
