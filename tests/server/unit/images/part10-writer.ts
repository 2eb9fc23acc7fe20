import { constants, deflateRawSync } from 'node:zlib'

/**
 * A hand-written DICOM Part 10 file (PS3.10 §7.1: 128-byte preamble, "DICM", the group 2 meta
 * header in Explicit VR Little Endian; PS3.5 §7.1.2 element encoding), so tests can build the
 * damaged and hostile files that a conforming writer such as dcmjs refuses to produce.
 */
export interface RawElement {
  group: number
  element: number
  vr: string
  value: Buffer
}

const LONG_LENGTH_VRS = new Set(['OB', 'OW', 'OF', 'SQ', 'UT', 'UN'])

export function explicitElement({ group, element, vr, value }: RawElement): Buffer {
  const padded =
    value.length % 2 ? Buffer.concat([value, Buffer.from([vr === 'UI' ? 0 : 0x20])]) : value
  const long = LONG_LENGTH_VRS.has(vr)
  const header = Buffer.alloc(long ? 12 : 8)
  header.writeUInt16LE(group, 0)
  header.writeUInt16LE(element, 2)
  header.write(vr, 4, 'latin1')
  if (long) header.writeUInt32LE(padded.length, 8)
  else header.writeUInt16LE(padded.length, 6)
  return Buffer.concat([header, padded])
}

export const us = (group: number, element: number, value: number): RawElement => {
  const buffer = Buffer.alloc(2)
  buffer.writeUInt16LE(value)
  return { group, element, vr: 'US', value: buffer }
}

export const text = (group: number, element: number, vr: string, value: string): RawElement => ({
  group,
  element,
  vr,
  value: Buffer.from(value, 'latin1'),
})

/** Rows, Columns and the rest of a 16-bit MONOCHROME2 image pixel module (PS3.3 C.7.6.3). */
export function pixelModule(rows: number, columns: number, bits = 16): RawElement[] {
  return [
    us(0x0028, 0x0002, 1),
    text(0x0028, 0x0004, 'CS', 'MONOCHROME2'),
    us(0x0028, 0x0010, rows),
    us(0x0028, 0x0011, columns),
    us(0x0028, 0x0100, bits),
    us(0x0028, 0x0101, bits),
    us(0x0028, 0x0102, bits - 1),
    us(0x0028, 0x0103, 0),
  ]
}

/** Encapsulated Pixel Data (PS3.5 §A.4): an empty offset table, one fragment, the delimiter. */
export function encapsulatedPixelData(codestream: Buffer): Buffer {
  const item = (bytes: Buffer) => {
    const header = Buffer.alloc(8)
    header.writeUInt16LE(0xfffe, 0)
    header.writeUInt16LE(0xe000, 2)
    header.writeUInt32LE(bytes.length, 4)
    return Buffer.concat([header, bytes])
  }
  const even = codestream.length % 2 ? Buffer.concat([codestream, Buffer.from([0])]) : codestream
  const header = Buffer.alloc(12)
  header.writeUInt16LE(0x7fe0, 0)
  header.writeUInt16LE(0x0010, 2)
  header.write('OB', 4, 'latin1')
  header.writeUInt32LE(0xffffffff, 8)
  const delimiter = Buffer.alloc(8)
  delimiter.writeUInt16LE(0xfffe, 0)
  delimiter.writeUInt16LE(0xe0dd, 2)
  return Buffer.concat([header, item(Buffer.alloc(0)), item(even), delimiter])
}

/** The preamble, "DICM" and a meta header naming the transfer syntax, then the dataset bytes. */
export function part10(
  transferSyntaxUid: string,
  dataset: Buffer,
  options: { deflate?: boolean } = {},
): Buffer {
  const metaElements = Buffer.concat([
    explicitElement({ group: 0x0002, element: 0x0001, vr: 'OB', value: Buffer.from([0, 1]) }),
    explicitElement(text(0x0002, 0x0002, 'UI', '1.2.840.10008.5.1.4.1.1.1.1')),
    explicitElement(text(0x0002, 0x0003, 'UI', '2.25.1234')),
    explicitElement(text(0x0002, 0x0010, 'UI', transferSyntaxUid)),
    explicitElement(text(0x0002, 0x0012, 'UI', '2.25.1')),
  ])
  const groupLength = Buffer.alloc(4)
  groupLength.writeUInt32LE(metaElements.length)
  const meta = Buffer.concat([
    explicitElement({ group: 0x0002, element: 0x0000, vr: 'UL', value: groupLength }),
    metaElements,
  ])
  const body = options.deflate ? deflateRawSync(dataset) : dataset
  return Buffer.concat([Buffer.alloc(128), Buffer.from('DICM', 'latin1'), meta, body])
}

export const DEFLATED_EXPLICIT_LITTLE = '1.2.840.10008.1.2.1.99'

/**
 * A Deflated Explicit VR Little Endian file (PS3.5 §A.5) of a 4 × 3 film whose Pixel Data
 * element claims, and inflates to, `zeroBytes` bytes. Built from independent deflate blocks
 * (each ended by a full flush, RFC 1951 §3.2.4 stored-block alignment), so a few megabytes of
 * file stand for gigabytes without compressing them here.
 */
export function deflateBomb(zeroBytes: number): Buffer {
  const chunk = 64 * 2 ** 20
  const header = Buffer.concat([
    ...pixelModule(3, 4).map(explicitElement),
    // Pixel Data, OW, with an explicit 32-bit length (PS3.5 §7.1.2).
    Buffer.from([0xe0, 0x7f, 0x10, 0x00, 0x4f, 0x57, 0, 0]),
    (() => {
      const length = Buffer.alloc(4)
      length.writeUInt32LE(zeroBytes)
      return length
    })(),
  ])
  const flush = { finishFlush: constants.Z_FULL_FLUSH }
  const zeros = deflateRawSync(Buffer.alloc(chunk), flush)
  const parts = [deflateRawSync(header, flush)]
  for (let written = 0; written < zeroBytes; written += chunk) parts.push(zeros)
  // A final fixed-Huffman block holding only its end-of-block code (RFC 1951 §3.2.6).
  parts.push(Buffer.from([0x03, 0x00]))
  const file = part10(DEFLATED_EXPLICIT_LITTLE, Buffer.alloc(0))
  return Buffer.concat([file, ...parts])
}
