import type { ImageRow } from '../db/images'
import type { ImageRecord } from '../../shared/types/api'

/**
 * The API shape of a stored film. Researchers get no timestamps and no content hash; the
 * header's patient attributes go to clinicians only, and only with `withPatientAttributes`.
 */
export function toImageRecord(
  image: ImageRow,
  identified: boolean,
  withPatientAttributes = false,
): ImageRecord {
  const base = `/api/images/${image.id}/files`
  // Renditions of an image id never change (they come from its content), so the id versions them.
  const version = `v=${image.id}`
  const calibration = image.manualCalibration
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
      image.mmPerPixelRow !== null && image.mmPerPixelColumn !== null
        ? [image.mmPerPixelRow, image.mmPerPixelColumn]
        : null,
    spacingSource: image.spacingSource,
    spacingNote: image.spacingNote,
    manualCalibration:
      calibration && !identified
        ? { ...calibration, calibratedAt: null, calibratedBy: null }
        : calibration,
    window:
      image.windowCenter !== null && image.windowWidth !== null
        ? { center: image.windowCenter, width: image.windowWidth }
        : null,
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
          patientOrientation: dicom.patientOrientation ?? null,
          // Header identity only where it is asked for one film at a time, and audited there.
          ...(identified && withPatientAttributes ? { patient: dicom.patient } : {}),
        }
      : null,
    contentHash: identified ? image.contentHash : null,
    sizeBytes: image.sizeBytes,
    version: image.version,
    uploadedBy: identified ? image.uploadedBy : null,
    createdAt: identified ? image.createdAt : null,
    urls: {
      display: `${base}/display?${version}`,
      preview: `${base}/preview?${version}`,
      thumbnail: `${base}/thumbnail?${version}`,
      fullDepth: `${base}/full-depth?${version}`,
    },
    pixelReview: {
      burnedInAnnotation: image.burnedInAnnotation,
      cleared: image.pixelsClearedAt !== null,
      // Who cleared it, and when, is the clinicians' business (a time can betray a visit date).
      clearedBy: identified ? image.pixelsClearedBy : null,
      clearedByName: identified ? image.pixelsClearedByName : null,
      clearedAt: identified ? image.pixelsClearedAt : null,
    },
  }
}
