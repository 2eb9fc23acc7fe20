import type { DicomHeader } from './dicom/dicom-header'
import type { FilmFileType } from './sniff-file-type'

/** A window in the film's own pixel units (after the shift and inversion below). */
export interface WindowLevel {
  center: number
  width: number
}

/**
 * Grey pixels ready for display and measurement: one sample per pixel, row by row from the top
 * left, unsigned, larger = brighter (MONOCHROME1 already inverted).
 */
export interface DecodedFilm {
  fileType: FilmFileType
  width: number
  height: number
  pixels: Uint16Array
  /** Significant bits of `pixels`; every value is below 2 ** bitsStored. */
  bitsStored: number
  /** The film's own default window (DICOM's first Window Center/Width pair), if any. */
  window: WindowLevel | null
  /** Modality value (after Rescale Slope/Intercept) = offset + slope × pixel. */
  toModality: { offset: number; slope: number }
  header: DicomHeader | null
}
