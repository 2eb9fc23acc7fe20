import { ImageError } from '../image-error'
import type { PixelEncoding } from './transfer-syntax'

type CompressedEncoding = Exclude<PixelEncoding, 'native-little-endian' | 'native-big-endian'>

/** The size a compressed frame declares in its own header, read before anything is decoded. */
export interface FrameHeaderSize {
  width: number
  height: number
  components: number
  precision: number
}

function corrupt(message: string): ImageError {
  return new ImageError('corrupt-dicom', message)
}

// ITU-T T.81 Table B.1: SOF0–SOF15 except DHT (C4), JPG (C8) and DAC (CC). ITU-T T.87 §C.2.2:
// JPEG-LS uses SOF55 (F7) with the same layout.
function isStartOfFrame(marker: number): boolean {
  return (
    (marker >= 0xc0 && marker <= 0xcf && marker !== 0xc4 && marker !== 0xc8 && marker !== 0xcc) ||
    marker === 0xf7
  )
}

/**
 * JPEG (T.81 §B.2.2) and JPEG-LS (T.87 §C.2.2) frame header: after SOI, marker segments
 * (FFxx + 2-byte length) up to the SOFn segment, whose fields are Lf(2) P(1) Y(2) X(2) Nf(1).
 */
function readJpegFrameHeader(bytes: Uint8Array): FrameHeaderSize {
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength)
  if (bytes.length < 4 || bytes[0] !== 0xff || bytes[1] !== 0xd8)
    throw corrupt('The compressed frame does not start with a JPEG SOI marker (FFD8).')
  let offset = 2
  while (offset + 4 <= bytes.length) {
    if (bytes[offset] !== 0xff) throw corrupt('The JPEG frame has a damaged marker segment.')
    const marker = bytes[offset + 1] as number
    // Fill bytes, and markers that stand alone without a length (T.81 §B.1.1.2–3).
    if (marker === 0xff) {
      offset += 1
      continue
    }
    if (marker === 0x01 || (marker >= 0xd0 && marker <= 0xd8)) {
      offset += 2
      continue
    }
    const length = view.getUint16(offset + 2)
    if (isStartOfFrame(marker)) {
      if (length < 8 || offset + 10 > bytes.length)
        throw corrupt('The JPEG frame header (SOF) is cut short.')
      return {
        precision: bytes[offset + 4] as number,
        height: view.getUint16(offset + 5),
        width: view.getUint16(offset + 7),
        components: bytes[offset + 9] as number,
      }
    }
    if (marker === 0xda || marker === 0xd9 || length < 2)
      throw corrupt('The JPEG frame has no frame header (SOF) before its scan.')
    offset += 2 + length
  }
  throw corrupt('The JPEG frame ends before its frame header (SOF).')
}

// ITU-T T.800 §A.5.1: SOC (FF4F) is followed at once by SIZ (FF51): Lsiz(2) Rsiz(2) Xsiz(4)
// Ysiz(4) XOsiz(4) YOsiz(4) XTsiz(4) YTsiz(4) XTOsiz(4) YTOsiz(4) Csiz(2), then per component
// Ssiz(1) XRsiz(1) YRsiz(1). A JP2 file (T.800 Annex I) wraps the codestream in boxes, so the
// SOC+SIZ pair is looked for within the first bytes.
const J2K_SEARCH_BYTES = 4096

function readJ2kFrameHeader(bytes: Uint8Array): FrameHeaderSize {
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength)
  const end = Math.min(bytes.length - 4, J2K_SEARCH_BYTES)
  for (let offset = 0; offset <= end; offset++) {
    if (
      bytes[offset] !== 0xff ||
      bytes[offset + 1] !== 0x4f ||
      bytes[offset + 2] !== 0xff ||
      bytes[offset + 3] !== 0x51
    )
      continue
    const siz = offset + 4
    if (siz + 41 > bytes.length) throw corrupt('The JPEG 2000 image header (SIZ) is cut short.')
    const width = view.getUint32(siz + 4) - view.getUint32(siz + 12)
    const height = view.getUint32(siz + 8) - view.getUint32(siz + 16)
    const components = view.getUint16(siz + 36)
    // Ssiz: bit depth − 1 in the low 7 bits, the sign in the high bit.
    const precision = ((bytes[siz + 38] as number) & 0x7f) + 1
    return { width, height, components, precision }
  }
  throw corrupt('The JPEG 2000 frame has no image header (SOC followed by SIZ).')
}

/** Reads the width, height and component count a compressed frame declares. */
export function readFrameHeader(
  encoding: CompressedEncoding,
  codestream: Uint8Array,
): FrameHeaderSize {
  return encoding === 'jpeg-2000' ? readJ2kFrameHeader(codestream) : readJpegFrameHeader(codestream)
}

/**
 * Refuses a compressed frame whose own header disagrees with Rows × Columns or is not one grey
 * component, before any decoder allocates its output: a small file cannot then make a codec
 * unpack a frame far larger than the DICOM header admits.
 */
export function checkFrameHeader(
  encoding: CompressedEncoding,
  codestream: Uint8Array,
  expected: { rows: number; columns: number },
): void {
  const header = readFrameHeader(encoding, codestream)
  // A JPEG frame with Y = 0 (its line count deferred to a DNL marker, T.81 §B.2.2) is refused
  // too: its size cannot be checked before decoding.
  if (
    header.height !== expected.rows ||
    header.width !== expected.columns ||
    header.components !== 1
  ) {
    throw corrupt(
      `The compressed frame's own header declares ${header.width} × ${header.height} with ${header.components} component(s); the DICOM header says ${expected.columns} × ${expected.rows} greyscale. The file is damaged or inconsistent.`,
    )
  }
}
