import { ImageError } from './image-error'

export type FilmFileType = 'dicom' | 'png' | 'jpeg' | 'tiff'

const PNG_SIGNATURE = [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]
// PS3.10 §7.1: a Part 10 file is a 128-byte preamble followed by the four bytes "DICM".
const DICOM_MAGIC_OFFSET = 128
const DICOM_MAGIC = [0x44, 0x49, 0x43, 0x4d]

function startsWith(bytes: Uint8Array, signature: number[], offset = 0): boolean {
  if (bytes.length < offset + signature.length) return false
  return signature.every((byte, i) => bytes[offset + i] === byte)
}

/**
 * Decides the kind of film from its bytes, never from the file name or the client's media type:
 * a text file named .dcm is refused here.
 */
export function sniffFileType(bytes: Uint8Array): FilmFileType {
  if (bytes.length === 0) throw new ImageError('empty-file', 'The file is empty.')
  if (startsWith(bytes, DICOM_MAGIC, DICOM_MAGIC_OFFSET)) return 'dicom'
  if (startsWith(bytes, PNG_SIGNATURE)) return 'png'
  // JPEG: SOI marker followed by the start of any marker segment (JFIF, Exif, DQT...).
  if (startsWith(bytes, [0xff, 0xd8, 0xff])) return 'jpeg'
  // TIFF 6.0 §2 header: "II" + 42 little-endian or "MM" + 42 big-endian (43 is BigTIFF).
  if (startsWith(bytes, [0x49, 0x49, 0x2a, 0x00]) || startsWith(bytes, [0x4d, 0x4d, 0x00, 0x2a])) {
    return 'tiff'
  }
  if (startsWith(bytes, [0x49, 0x49, 0x2b, 0x00]) || startsWith(bytes, [0x4d, 0x4d, 0x00, 0x2b])) {
    return 'tiff'
  }
  throw new ImageError(
    'unsupported-file-type',
    'This file is not a DICOM, PNG, JPEG or TIFF image. DICOM files need the "DICM" marker ' +
      'after the 128-byte preamble (DICOM PS3.10 §7.1).',
    { firstBytes: hexPrefix(bytes) },
  )
}

function hexPrefix(bytes: Uint8Array): string {
  return Array.from(bytes.subarray(0, 8), (b) => b.toString(16).padStart(2, '0')).join(' ')
}
