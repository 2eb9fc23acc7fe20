import type { ImageRecord } from '@shared/types/api'
import type { AssignmentFilm } from '@shared/types/rounds'
import type { SpacingSource } from '@shared/types/domain'
import { SPACING_SOURCES } from '@shared/types/domain'

/**
 * The workspace draws films from an image record; a blinded assignment's film answers only its
 * size, scale and window, so the record carries those and nothing that could date or name it.
 */
export function blindedFilmRecord(imageId: number, film: AssignmentFilm): ImageRecord {
  const source = (SPACING_SOURCES as readonly string[]).includes(film.calibrationSource)
    ? (film.calibrationSource as SpacingSource)
    : 'none'
  return {
    id: imageId,
    visitId: 0,
    view: 'lateral-neutral',
    fileKind: 'png',
    width: film.width,
    height: film.height,
    bitsStored: film.bitsStored,
    mmPerPixel: film.spacingMm ? [film.spacingMm.row, film.spacingMm.column] : null,
    spacingSource: source,
    spacingNote: null,
    manualCalibration: null,
    window: film.window,
    acquiredAt: null,
    dicom: null,
    contentHash: null,
    sizeBytes: 0,
    version: 0,
    createdAt: null,
    // Nobody manages a round's film from the blinded workspace.
    uploadedBy: null,
    urls: film.urls,
    // A rater reads whatever film the round gives; the review is not shown in the blinded workspace.
    pixelReview: {
      burnedInAnnotation: 'unknown',
      cleared: false,
      clearedBy: null,
      clearedByName: null,
      clearedAt: null,
    },
  }
}
