import type { DecodedFilm } from './decoded-film'
import { decodeDicom } from './dicom/decode-dicom'
import { decodeRaster } from './raster/decode-raster'
import { sniffFileType } from './sniff-file-type'

/** Decodes any upload Endplate accepts, choosing the decoder from the bytes. */
export async function decodeFilm(bytes: Uint8Array): Promise<DecodedFilm> {
  const type = sniffFileType(bytes)
  return type === 'dicom' ? decodeDicom(bytes) : decodeRaster(bytes, type)
}
