import { ImageError } from '../image-error'

/** How the pixel data of a transfer syntax is laid out, and so which decoder reads it. */
export type PixelEncoding =
  | 'native-little-endian'
  | 'native-big-endian'
  | 'jpeg-baseline'
  | 'jpeg-lossless'
  | 'jpeg-ls'
  | 'jpeg-2000'

interface TransferSyntax {
  name: string
  encoding: PixelEncoding | null
}

// UIDs and names from DICOM PS3.6 Annex A. Deflate (…1.2.1.99) wraps the whole dataset, which
// dicom-parser inflates while parsing, so its pixel data is native little endian afterwards.
const TRANSFER_SYNTAXES: Record<string, TransferSyntax> = {
  '1.2.840.10008.1.2': { name: 'Implicit VR Little Endian', encoding: 'native-little-endian' },
  '1.2.840.10008.1.2.1': { name: 'Explicit VR Little Endian', encoding: 'native-little-endian' },
  '1.2.840.10008.1.2.1.99': {
    name: 'Deflated Explicit VR Little Endian',
    encoding: 'native-little-endian',
  },
  '1.2.840.10008.1.2.2': { name: 'Explicit VR Big Endian', encoding: 'native-big-endian' },
  '1.2.840.10008.1.2.4.50': { name: 'JPEG Baseline (Process 1)', encoding: 'jpeg-baseline' },
  '1.2.840.10008.1.2.4.51': { name: 'JPEG Extended (Process 2 & 4)', encoding: null },
  '1.2.840.10008.1.2.4.57': { name: 'JPEG Lossless (Process 14)', encoding: 'jpeg-lossless' },
  '1.2.840.10008.1.2.4.70': {
    name: 'JPEG Lossless, First-Order Prediction (Process 14 SV1)',
    encoding: 'jpeg-lossless',
  },
  '1.2.840.10008.1.2.4.80': { name: 'JPEG-LS Lossless', encoding: 'jpeg-ls' },
  '1.2.840.10008.1.2.4.81': { name: 'JPEG-LS Near-Lossless', encoding: 'jpeg-ls' },
  '1.2.840.10008.1.2.4.90': { name: 'JPEG 2000 (Lossless Only)', encoding: 'jpeg-2000' },
  '1.2.840.10008.1.2.4.91': { name: 'JPEG 2000', encoding: 'jpeg-2000' },
  '1.2.840.10008.1.2.4.100': { name: 'MPEG2 Main Profile', encoding: null },
  '1.2.840.10008.1.2.4.201': { name: 'High-Throughput JPEG 2000 (Lossless Only)', encoding: null },
  '1.2.840.10008.1.2.4.202': {
    name: 'High-Throughput JPEG 2000 with RPCL Options (Lossless Only)',
    encoding: null,
  },
  '1.2.840.10008.1.2.4.203': { name: 'High-Throughput JPEG 2000', encoding: null },
  '1.2.840.10008.1.2.5': { name: 'RLE Lossless', encoding: null },
}

/** The transfer syntax's name from PS3.6, or the bare UID when we do not know it. */
export function transferSyntaxName(uid: string): string {
  return TRANSFER_SYNTAXES[uid]?.name ?? `transfer syntax ${uid}`
}

/** The pixel encoding Endplate decodes for this UID; refuses the others, naming them. */
export function pixelEncodingOf(uid: string): PixelEncoding {
  const encoding = TRANSFER_SYNTAXES[uid]?.encoding
  if (!encoding) {
    throw new ImageError(
      'unsupported-transfer-syntax',
      `${transferSyntaxName(uid)} (${uid}) is not supported. Export the film uncompressed, or ` +
        'as JPEG Lossless, JPEG-LS, JPEG 2000 or JPEG Baseline.',
      { transferSyntaxUid: uid, transferSyntaxName: transferSyntaxName(uid) },
    )
  }
  return encoding
}
