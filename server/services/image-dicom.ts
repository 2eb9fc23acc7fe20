import type { Db } from '../db/knex'
import type { FileStore } from '../storage/file-store'
import { HttpError } from '../errors'
import { DicomDeidentificationError, deidentifyDicom } from '../images/dicom/deidentify-dicom'
import { audit, type Actor } from './audit'
import { loadVisibleImage } from './images'
import { loadVisibleVisit } from './visits'

/**
 * The original DICOM of a film, de-identified (DICOM PS3.15 Annex E basic profile) with the
 * patient's study code as name and ID, whoever asks: the identified original never leaves
 * through this route. Audited as an export.
 */
export async function deidentifiedDicom(
  db: Db,
  store: FileStore,
  actor: Actor,
  imageId: number,
  uidSecret: string,
): Promise<{ bytes: Buffer; fileName: string }> {
  const image = await loadVisibleImage(db, actor, imageId)
  if (image.fileKind !== 'dicom') {
    throw new HttpError(
      409,
      'not_dicom',
      `Film ${imageId} was uploaded as ${image.fileKind.toUpperCase()}, not DICOM.`,
    )
  }
  const { patient } = await loadVisibleVisit(db, actor, image.visitId)
  const original = await store.read(image.originalPath)
  let bytes: Buffer
  try {
    bytes = deidentifyDicom(original, { studyCode: patient.studyCode, uidSecret })
  } catch (error) {
    if (error instanceof DicomDeidentificationError) {
      throw new HttpError(409, 'burned_in_annotation', error.message)
    }
    throw error
  }
  await audit(
    db,
    actor,
    'export',
    'image',
    imageId,
    `Downloaded film ${imageId} as de-identified DICOM (${bytes.length} bytes)`,
  )
  return { bytes, fileName: `${patient.studyCode}-film-${imageId}.dcm` }
}
