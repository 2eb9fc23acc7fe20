import { inflateRawSync } from 'node:zlib'
import dicomParser, { type DataSet } from 'dicom-parser'
import { ImageError } from '../image-error'

// Deflated Explicit VR Little Endian (PS3.5 §A.5) deflates everything after the meta header.
// dicom-parser hands us the bytes and the offset where the deflated stream starts and expects
// the whole file back, inflated.
function inflateDataset(bytes: Uint8Array, position: number): Uint8Array {
  let inflated: Buffer
  try {
    inflated = inflateRawSync(bytes.subarray(position))
  } catch (error) {
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
