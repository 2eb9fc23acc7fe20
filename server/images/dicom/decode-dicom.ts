import type { DecodedFilm } from '../decoded-film'
import { ImageError, MAX_FILM_PIXELS, tooManyPixels } from '../image-error'
import { decompressFrame } from './codecs'
import { readDicomHeader, type DicomHeader, type PixelModule } from './dicom-header'
import { encapsulatedFrameBytes, nativeFrameBytes } from './frame-bytes'
import { checkFrameHeader } from './frame-header'
import { parseDicomDataset } from './parse-dicom-dataset'
import { applyPixelValueMapping, buildPixelValueMapping } from './pixel-value-lut'
import { pixelEncodingOf, type PixelEncoding } from './transfer-syntax'
import type { DataSet } from 'dicom-parser'

function checkPixelModule(pixel: PixelModule): void {
  const refuse = (message: string) => {
    throw new ImageError('unsupported-pixel-format', message, {
      photometricInterpretation: pixel.photometricInterpretation,
      samplesPerPixel: pixel.samplesPerPixel,
      bitsAllocated: pixel.bitsAllocated,
    })
  }
  const photometric = pixel.photometricInterpretation
  if (
    pixel.samplesPerPixel !== 1 ||
    (photometric !== 'MONOCHROME1' && photometric !== 'MONOCHROME2')
  ) {
    refuse(
      `Only greyscale films are read; this one is ${photometric} with ${pixel.samplesPerPixel} samples per pixel.`,
    )
  }
  if (pixel.bitsAllocated !== 8 && pixel.bitsAllocated !== 16) {
    refuse(`Bits Allocated ${pixel.bitsAllocated} is not supported (8 or 16 only).`)
  }
  if (
    pixel.bitsStored < 1 ||
    pixel.bitsStored > pixel.bitsAllocated ||
    pixel.highBit >= pixel.bitsAllocated ||
    pixel.highBit < pixel.bitsStored - 1
  ) {
    throw new ImageError(
      'corrupt-dicom',
      `Bits Stored ${pixel.bitsStored} and High Bit ${pixel.highBit} do not fit in Bits Allocated ${pixel.bitsAllocated}.`,
    )
  }
}

function nativeSamples(bytes: Uint8Array, bitsAllocated: number): Uint8Array | Uint16Array {
  if (bitsAllocated === 8) return bytes
  // A 16-bit view needs an even byte offset; dicom-parser's offsets are often odd, so copy then.
  const aligned = bytes.byteOffset % 2 === 0 ? bytes : bytes.slice()
  return new Uint16Array(aligned.buffer, aligned.byteOffset, aligned.length >> 1)
}

interface FrameSamples {
  samples: Uint8Array | Uint16Array
  wordBits: 8 | 16
  /** Native words keep High Bit alignment; codecs hand back the sample values themselves. */
  native: boolean
}

async function readFrameSamples(
  dataSet: DataSet,
  header: DicomHeader,
  encoding: PixelEncoding,
): Promise<FrameSamples> {
  const { pixel } = header
  if (encoding === 'native-little-endian' || encoding === 'native-big-endian') {
    const samples = nativeSamples(nativeFrameBytes(dataSet, pixel), pixel.bitsAllocated)
    return { samples, wordBits: pixel.bitsAllocated === 8 ? 8 : 16, native: true }
  }
  const codestream = encapsulatedFrameBytes(dataSet, pixel)
  checkFrameHeader(encoding, codestream, pixel)
  const frame = await decompressFrame(encoding, codestream)
  if (frame.width !== pixel.columns || frame.height !== pixel.rows || frame.components !== 1) {
    throw new ImageError(
      'corrupt-dicom',
      `The compressed frame is ${frame.width} × ${frame.height} with ${frame.components} components; the header says ${pixel.columns} × ${pixel.rows} greyscale.`,
    )
  }
  return {
    samples: frame.samples,
    wordBits: frame.samples instanceof Uint16Array ? 16 : 8,
    native: false,
  }
}

/**
 * Decodes the first frame of a DICOM Part 10 file into unsigned grey pixels (see DecodedFilm),
 * keeping the header attributes Endplate uses.
 */
export async function decodeDicom(bytes: Uint8Array): Promise<DecodedFilm> {
  const dataSet = parseDicomDataset(bytes)
  const header = readDicomHeader(dataSet)
  const encoding = pixelEncodingOf(header.transferSyntaxUid)
  const { pixel } = header
  checkPixelModule(pixel)
  if (pixel.rows * pixel.columns > MAX_FILM_PIXELS) throw tooManyPixels(pixel.columns, pixel.rows)
  const frame = await readFrameSamples(dataSet, header, encoding)
  const mapping = buildPixelValueMapping(
    {
      wordBits: frame.wordBits,
      bitsStored: Math.min(pixel.bitsStored, frame.wordBits),
      highBit: frame.native ? pixel.highBit : Math.min(pixel.bitsStored, frame.wordBits) - 1,
      signed: pixel.pixelRepresentation === 1,
      swapBytes: encoding === 'native-big-endian' && frame.wordBits === 16,
    },
    header.rescale,
    pixel.photometricInterpretation,
  )
  const count = pixel.rows * pixel.columns
  const firstWindow = header.windows[0]
  return {
    fileType: 'dicom',
    width: pixel.columns,
    height: pixel.rows,
    pixels: applyPixelValueMapping(frame.samples, mapping.lut, count),
    bitsStored: mapping.bitsStored,
    window: firstWindow ? mapping.toPixelWindow(firstWindow) : null,
    toModality: mapping.toModality,
    header,
  }
}
