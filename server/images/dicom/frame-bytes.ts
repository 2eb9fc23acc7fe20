import dicomParser, { type DataSet, type Element } from 'dicom-parser'
import { ImageError } from '../image-error'
import type { PixelModule } from './dicom-header'

function pixelDataElement(dataSet: DataSet): Element {
  const element = dataSet.elements.x7fe00010
  if (!element)
    throw new ImageError('corrupt-dicom', 'The DICOM file has no Pixel Data (7FE0,0010).')
  return element
}

/**
 * The bytes of the first frame of native (uncompressed) pixel data. A view into the dataset's
 * bytes; callers copy before reinterpreting, since the offset may be odd.
 */
export function nativeFrameBytes(dataSet: DataSet, pixel: PixelModule): Uint8Array {
  const element = pixelDataElement(dataSet)
  if (element.encapsulatedPixelData) {
    throw new ImageError(
      'corrupt-dicom',
      'The pixel data is encapsulated but the transfer syntax is native.',
    )
  }
  const frameLength = pixel.rows * pixel.columns * pixel.samplesPerPixel * (pixel.bitsAllocated / 8)
  const available = Math.min(element.length, dataSet.byteArray.length - element.dataOffset)
  if (available < frameLength) {
    throw new ImageError(
      'corrupt-dicom',
      `The pixel data holds ${Math.max(0, available)} bytes; Rows × Columns × Bits Allocated needs ${frameLength}. The file is truncated or its header is wrong.`,
      { available: Math.max(0, available), expected: frameLength },
    )
  }
  return dataSet.byteArray.subarray(element.dataOffset, element.dataOffset + frameLength)
}

/** The compressed codestream of the first frame of encapsulated pixel data (PS3.5 §A.4). */
export function encapsulatedFrameBytes(dataSet: DataSet, pixel: PixelModule): Uint8Array {
  const element = pixelDataElement(dataSet)
  if (!element.encapsulatedPixelData || !element.fragments?.length) {
    throw new ImageError(
      'corrupt-dicom',
      'The transfer syntax is compressed but the pixel data holds no fragments.',
    )
  }
  try {
    // One frame owns every fragment; only multi-frame files need the offset table.
    if (pixel.numberOfFrames === 1) {
      return dicomParser.readEncapsulatedPixelDataFromFragments(
        dataSet,
        element,
        0,
        element.fragments.length,
      )
    }
    const table = element.basicOffsetTable?.length
      ? element.basicOffsetTable
      : dicomParser.createJPEGBasicOffsetTable(dataSet, element)
    return dicomParser.readEncapsulatedImageFrame(dataSet, element, 0, table)
  } catch (error) {
    throw new ImageError('corrupt-dicom', `The compressed frame cannot be read: ${String(error)}`)
  }
}
