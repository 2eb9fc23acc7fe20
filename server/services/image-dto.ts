import type { ImageRow } from '../db/images'
import type { ImageRecord } from '../../shared/types/api'

/** The API shape of a stored film. Patient attributes from the header go to clinicians only. */
export function toImageRecord(image: ImageRow, identified: boolean): ImageRecord {
  const base = `/api/images/${image.id}/files`
  const version = `v=${image.contentHash.slice(0, 16)}`
  const dicom = image.dicomAttributes
  return {
    id: image.id,
    visitId: image.visitId,
    view: image.view,
    fileKind: image.fileKind,
    width: image.width,
    height: image.height,
    bitsStored: image.bitsStored,
    mmPerPixel:
      image.mmPerPixelRow !== null && image.mmPerPixelColumn !== null ? [image.mmPerPixelRow, image.mmPerPixelColumn] : null,
    spacingSource: image.spacingSource,
    spacingNote: image.spacingNote,
    manualCalibration: image.manualCalibration,
    window: image.windowCenter !== null && image.windowWidth !== null ? { center: image.windowCenter, width: image.windowWidth } : null,
    acquiredAt: identified ? image.acquiredAt : null,
    dicom: dicom
      ? {
          modality: dicom.modality,
          transferSyntax: dicom.transferSyntax,
          photometricInterpretation: dicom.photometricInterpretation,
          bitsAllocated: dicom.bitsAllocated,
          bitsStored: dicom.bitsStored,
          studyDate: identified ? dicom.studyDate : null,
          acquisitionDate: identified ? dicom.acquisitionDate : null,
          ...(identified ? { patient: dicom.patient } : {}),
        }
      : null,
    contentHash: image.contentHash,
    sizeBytes: image.sizeBytes,
    version: image.version,
    createdAt: image.createdAt,
    urls: {
      display: `${base}/display?${version}`,
      preview: `${base}/preview?${version}`,
      thumbnail: `${base}/thumbnail?${version}`,
      fullDepth: `${base}/full-depth?${version}`,
    },
  }
}
