import { existsSync } from 'node:fs'
import { rm } from 'node:fs/promises'
import type { Readable } from 'node:stream'
import type { Db } from '../db/knex'
import {
  countReadingsOfImage,
  deleteImage,
  findImage,
  findImageByHash,
  insertImage,
  listImagesOfVisit,
  updateImageCalibration,
  updatePixelReview,
  type FileKind,
  type ImageRow,
  type NewImage,
} from '../db/images'
import type { FileStore } from '../storage/file-store'
import { ingestInWorker } from '../images/ingest/ingest-pool'
import type { IngestedFilm, RenditionKind } from '../images/ingest/ingest-film'
import { isImageError } from '../images/image-error'
import { isPlausibleSpacingMm, PLAUSIBLE_SPACING_MM } from '../images/dicom/pixel-spacing'
import { lockFilmContents } from '../db/film-files'
import { contentFolder, removeUnreferencedFiles } from './film-content'
import type { StreamedUpload } from '../middleware/upload'
import { asNotFound, badRequest, conflict, forbidden, HttpError, notFound } from '../errors'
import { mayManageFilm } from '../../shared/types/permissions'
import { IMAGE_VIEWS, type ImageView } from '../../shared/types/domain'
import type { CalibrationInput, ImageRecord, PatientMismatch } from '../../shared/types/api'
import { isReleasedToResearchers, type PixelReviewInput } from '../../shared/types/pixel-review'
import { actorIdentifies, audit, type Actor } from './audit'
import { loadVisibleVisit } from './visits'
import { comparePatient } from './patient-match'
import { toImageRecord } from './image-dto'

export type RenditionName = 'display' | 'preview' | 'thumbnail' | 'full-depth'

const EXTENSIONS: Record<FileKind, string> = { dicom: 'dcm', png: 'png', jpeg: 'jpg', tiff: 'tif' }

type ContentKeys = Record<'original' | RenditionKind, string>

/** Content-addressed keys: the same film uploaded twice is stored once. */
function keysFor(
  hash: string,
  kind: FileKind,
  renditions: IngestedFilm['renditions'],
): ContentKeys {
  const folder = contentFolder(hash)
  const ext = (mediaType: string) => (mediaType === 'image/webp' ? 'webp' : 'png')
  return {
    original: `${folder}original.${EXTENSIONS[kind]}`,
    display: `${folder}display.${ext(renditions.display.mediaType)}`,
    preview: `${folder}preview.${ext(renditions.preview.mediaType)}`,
    thumbnail: `${folder}thumbnail.${ext(renditions.thumbnail.mediaType)}`,
    fullDepth: `${folder}full-depth.png`,
  }
}

const FIELD_WORDS: Record<PatientMismatch['differences'][number]['field'], string> = {
  name: 'name',
  id: 'patient ID',
  birthDate: 'birth date',
  studyDate: 'study date',
}

const identifies = actorIdentifies

export interface UploadRequest {
  files: StreamedUpload[]
  /** One view per file in order, or one for all; empty entries fall back to the DICOM header. */
  views: Array<ImageView | ''>
  confirmPatientMismatch: boolean
  /** Where renditions wait, as temporary files, until they are filed (UPLOAD_DIR/tmp). */
  workDir: string
}

interface PreparedFilm {
  upload: StreamedUpload
  ingested: IngestedFilm
  view: ImageView
  keys: ContentKeys
}

/** Decodes one upload and makes its renditions in a worker thread; no database connection. */
async function ingestUpload(upload: StreamedUpload, workDir: string): Promise<IngestedFilm> {
  if (upload.size === 0) throw new HttpError(422, 'empty_file', `${upload.originalName} is empty.`)
  try {
    return await ingestInWorker({ path: upload.path, tmpDir: workDir })
  } catch (error) {
    if (isImageError(error)) {
      throw new HttpError(
        error.status,
        error.code.replace(/-/g, '_'),
        `${upload.originalName}: ${error.message}`,
      )
    }
    throw error
  }
}

function pickView(
  request: UploadRequest,
  index: number,
  film: IngestedFilm['film'],
  name: string,
): ImageView {
  const given = request.views.length === 1 ? request.views[0] : request.views[index]
  if (given) return given
  if (film.header?.view) return film.header.view
  throw badRequest(
    `${name}: choose a view (${IMAGE_VIEWS.join(', ')}); the file does not say which it is.`,
    {
      view: [`view: required for ${name}`],
    },
  )
}

/**
 * Files uploaded films against a visit, all or nothing. Every file is decoded and checked first,
 * in the ingest workers and without a database connection; then one short transaction locks
 * each film's content row, moves into place whichever of its files the store lacks, and writes
 * the image rows and their audit events. Temporary files are removed whatever happens.
 */
export async function uploadImages(
  db: Db,
  store: FileStore,
  actor: Actor,
  visitId: number,
  request: UploadRequest,
): Promise<ImageRecord[]> {
  const prepared: PreparedFilm[] = []
  const renditionFiles: string[] = []
  try {
    if (request.files.length === 0)
      throw badRequest('Attach at least one file in the field "file".', {
        file: ['file: required'],
      })
    if (request.views.length > 1 && request.views.length !== request.files.length) {
      throw badRequest(
        `Give one view per file (${request.files.length} files, ${request.views.length} views).`,
        { view: ['view: one per file'] },
      )
    }
    const { visit, patient } = await loadVisibleVisit(db, actor, visitId)
    const mismatches: PatientMismatch[] = []
    for (const [index, upload] of request.files.entries()) {
      const ingested = await ingestUpload(upload, request.workDir)
      renditionFiles.push(...Object.values(ingested.renditions).map((file) => file.path))
      const keys = keysFor(upload.sha256, ingested.film.fileType, ingested.renditions)
      const view = pickView(request, index, ingested.film, upload.originalName)
      prepared.push({ upload, ingested, keys, view })
      // Checked again under the lock; asked here too so a repeat is refused before the rest.
      if (await findImageByHash(db, visitId, upload.sha256)) throw alreadyFiled(upload)
      if (ingested.film.header) {
        const differences = comparePatient(ingested.film.header, patient, visit)
        if (differences.length > 0) mismatches.push({ file: upload.originalName, differences })
      }
    }
    if (mismatches.length > 0 && !request.confirmPatientMismatch) {
      // The answer quotes the header's name, id and birth date back: a read of identity.
      await audit(
        db,
        actor,
        'view',
        'visit',
        visitId,
        `Shown the DICOM header identity of ${mismatches.length} file(s) not matching patient ${patient.studyCode}`,
      )
      throw new HttpError(
        409,
        'patient_mismatch',
        "The DICOM header does not match this visit's patient. Check the film, then confirm to attach it anyway.",
        {
          mismatches: mismatches.flatMap((m) =>
            m.differences.map(
              (d) =>
                `${m.file}: ${FIELD_WORDS[d.field]} is "${d.inFile}" in the file, "${d.onRecord}" on record`,
            ),
          ),
        },
      )
    }
    return await fileFilms(db, store, actor, visitId, prepared, {
      mismatchConfirmed: mismatches.length > 0,
      studyCode: patient.studyCode,
    })
  } finally {
    const temporary = [...request.files.map((file) => file.path), ...renditionFiles]
    await Promise.all(temporary.map((path) => rm(path, { force: true })))
  }
}

function alreadyFiled(upload: StreamedUpload): HttpError {
  return conflict(`${upload.originalName} is already filed on this visit.`)
}

/**
 * The one transaction of an upload. Under the content rows' locks no deletion or sweep can
 * remove a film's files, so each file the store lacks is moved in from its temporary copy
 * (a rename, idempotent by key) before the image row that needs it is written.
 */
async function fileFilms(
  db: Db,
  store: FileStore,
  actor: Actor,
  visitId: number,
  prepared: PreparedFilm[],
  context: { mismatchConfirmed: boolean; studyCode: string },
): Promise<ImageRecord[]> {
  try {
    return await fileFilmsOnce(db, store, actor, visitId, prepared, context)
  } catch (error) {
    // All or nothing: files moved in for rows that were rolled back go again (under their
    // locks, so a film another request filed meanwhile keeps its files). If the database is
    // gone too, the start-up sweep removes them later.
    for (const hash of new Set(prepared.map(({ upload }) => upload.sha256)))
      await removeUnreferencedFiles(db, store, hash).catch(() => [])
    throw error
  }
}

async function fileFilmsOnce(
  db: Db,
  store: FileStore,
  actor: Actor,
  visitId: number,
  prepared: PreparedFilm[],
  context: { mismatchConfirmed: boolean; studyCode: string },
): Promise<ImageRecord[]> {
  return db.transaction(
    async (trx) => {
      await lockFilmContents(
        trx,
        prepared.map(({ upload }) => upload.sha256),
      )
      const records: ImageRecord[] = []
      for (const film of prepared) {
        if (await findImageByHash(trx, visitId, film.upload.sha256)) throw alreadyFiled(film.upload)
        await storeMissingFiles(store, film)
        const id = await insertImage(trx, newImageRow(visitId, actor, film))
        await audit(
          trx,
          actor,
          'create',
          'image',
          id,
          `Uploaded a ${film.view} film to visit ${visitId} of patient ${context.studyCode}${context.mismatchConfirmed ? ' (patient mismatch confirmed)' : ''}`,
        )
        const stored = await findImage(trx, id)
        if (stored) records.push(toImageRecord(stored, identifies(actor), true))
      }
      return records
    },
    { isolationLevel: 'read committed' },
  )
}

async function storeMissingFiles(store: FileStore, film: PreparedFilm): Promise<void> {
  const sources: Array<[key: string, path: string]> = [
    [film.keys.original, film.upload.path],
    [film.keys.display, film.ingested.renditions.display.path],
    [film.keys.preview, film.ingested.renditions.preview.path],
    [film.keys.thumbnail, film.ingested.renditions.thumbnail.path],
    [film.keys.fullDepth, film.ingested.renditions.fullDepth.path],
  ]
  for (const [key, path] of sources) {
    if (await store.exists(key)) continue
    // Each temporary file is moved in at most once, under the lock; a missing one is lost.
    if (!existsSync(path)) throw new Error(`The temporary file for ${key} is missing`)
    await store.putFile(key, path)
  }
}

function newImageRow(visitId: number, actor: Actor, prepared: PreparedFilm): NewImage {
  const { upload, ingested, view, keys } = prepared
  const film = ingested.film
  const header = film.header
  const spacing = header?.spacing
  return {
    visitId,
    view,
    fileKind: film.fileType,
    contentHash: upload.sha256,
    originalPath: keys.original,
    displayPath: keys.display,
    previewPath: keys.preview,
    thumbnailPath: keys.thumbnail,
    fullDepthPath: keys.fullDepth,
    originalName: upload.originalName,
    sizeBytes: upload.size,
    width: film.width,
    height: film.height,
    bitsStored: film.bitsStored,
    mmPerPixelRow: spacing?.mmPerPixel?.[0] ?? null,
    mmPerPixelColumn: spacing?.mmPerPixel?.[1] ?? null,
    spacingSource: spacing?.spacingSource ?? 'none',
    spacingNote:
      spacing?.note ??
      (header
        ? null
        : 'No spacing in an ordinary image file: calibrate on a marker of known size.'),
    windowCenter: ingested.window.center,
    windowWidth: ingested.window.width,
    acquiredAt: header?.acquisitionDate ?? header?.studyDate ?? null,
    // Ordinary image files make no claim about their pixels.
    burnedInAnnotation: header?.burnedInAnnotation ?? 'unknown',
    dicomAttributes: header
      ? {
          modality: header.modality ?? null,
          transferSyntax: header.transferSyntaxName,
          photometricInterpretation: header.pixel.photometricInterpretation,
          bitsAllocated: header.pixel.bitsAllocated,
          bitsStored: header.pixel.bitsStored,
          studyDate: header.studyDate,
          acquisitionDate: header.acquisitionDate,
          patientOrientation: header.patientOrientation,
          patient: {
            name: header.patient.name
              ? [header.patient.name.family, header.patient.name.given].filter(Boolean).join(', ')
              : null,
            id: header.patient.id,
            birthDate: header.patient.birthDate,
            sex: header.patient.sex,
          },
        }
      : null,
    uploadedBy: actor.user.id,
  }
}

/**
 * Whether a film is held back from the actor: whoever may not see identity (researchers) is
 * served only films whose header says NO burned-in annotation or that a clinician has cleared.
 */
export function heldBackFrom(actor: Actor, image: ImageRow): boolean {
  return !identifies(actor) && !isReleasedToResearchers(image)
}

/**
 * Loads an image whose visit the actor may see and that is not held back from them; anything
 * else is a 404, so a held-back film looks absent.
 */
export async function loadVisibleImage(db: Db, actor: Actor, imageId: number): Promise<ImageRow> {
  const image = await findImage(db, imageId)
  if (!image || heldBackFrom(actor, image)) throw notFound('image')
  try {
    await loadVisibleVisit(db, actor, image.visitId)
  } catch (error) {
    return asNotFound(error, 'image')
  }
  return image
}

/** A film by id for a path that already checked its visit, or undefined when held back. */
export async function findServedImage(
  db: Db,
  actor: Actor,
  imageId: number,
): Promise<ImageRow | undefined> {
  const image = await findImage(db, imageId)
  return image && !heldBackFrom(actor, image) ? image : undefined
}

/** The films of a visit the actor is served (held-back films are left out). */
export async function listServedImagesOfVisit(
  db: Db,
  actor: Actor,
  visitId: number,
): Promise<ImageRow[]> {
  return (await listImagesOfVisit(db, visitId)).filter((image) => !heldBackFrom(actor, image))
}

export async function listVisitImages(
  db: Db,
  actor: Actor,
  visitId: number,
): Promise<ImageRecord[]> {
  await loadVisibleVisit(db, actor, visitId)
  return (await listServedImagesOfVisit(db, actor, visitId)).map((image) =>
    toImageRecord(image, identifies(actor)),
  )
}

/**
 * A clinician's confirmation, after looking at the film, that its pixels show no identity (or
 * its withdrawal). A film whose header says YES declares burned-in text: clearing it needs the
 * explicit `confirmHeaderSaysYes`, and its DICOM stays refused for download whatever the review.
 */
export async function reviewFilmPixels(
  db: Db,
  actor: Actor,
  imageId: number,
  input: PixelReviewInput,
): Promise<ImageRecord> {
  const image = await loadVisibleImage(db, actor, imageId)
  if (input.cleared && image.burnedInAnnotation === 'yes' && input.confirmHeaderSaysYes !== true) {
    throw badRequest(
      "confirmHeaderSaysYes: this film's DICOM header says its pixels carry burned-in annotation; confirm that you have looked and found no identity despite the header's claim",
      {
        confirmHeaderSaysYes: [
          'confirmHeaderSaysYes: required to clear a film whose header says YES',
        ],
      },
    )
  }
  await db.transaction(async (trx) => {
    const changed = await updatePixelReview(trx, imageId, input.cleared ? actor.user.id : null)
    if (!changed) return
    await audit(
      trx,
      actor,
      'update',
      'image',
      imageId,
      input.cleared
        ? `Confirmed no identity in the pixels of film ${imageId} (header: burned-in annotation ${image.burnedInAnnotation})`
        : `Withdrew the confirmation of no identity in the pixels of film ${imageId}`,
    )
  })
  const updated = await findImage(db, imageId)
  if (!updated) throw notFound('image')
  return toImageRecord(updated, identifies(actor))
}

/** One film; clinicians also get the header's patient attributes, and that view is audited. */
export async function getImage(db: Db, actor: Actor, imageId: number): Promise<ImageRecord> {
  const image = await loadVisibleImage(db, actor, imageId)
  if (identifies(actor) && image.dicomAttributes) {
    await audit(
      db,
      actor,
      'view',
      'image',
      imageId,
      `Viewed the DICOM header identity of film ${imageId}`,
    )
  }
  return toImageRecord(image, identifies(actor), true)
}

export async function openRendition(
  db: Db,
  store: FileStore,
  actor: Actor,
  imageId: number,
  name: RenditionName,
): Promise<{ stream: Readable; mediaType: string; etag: string }> {
  return openImageRendition(store, await loadVisibleImage(db, actor, imageId), name)
}

/** One rendition of a film already checked visible (the clinical route, or a rater's assignment). */
export async function openImageRendition(
  store: FileStore,
  image: ImageRow,
  name: RenditionName,
): Promise<{ stream: Readable; mediaType: string; etag: string }> {
  const key = {
    display: image.displayPath,
    preview: image.previewPath,
    thumbnail: image.thumbnailPath,
    'full-depth': image.fullDepthPath,
  }[name]
  const mediaType = key.endsWith('.webp') ? 'image/webp' : 'image/png'
  const stream = await store.open(key)
  if (!stream)
    throw new HttpError(
      404,
      'not_found',
      `The ${name} rendition of this film is missing from storage.`,
    )
  return { stream, mediaType, etag: `"${image.id}-${name}"` }
}

function assertMayManageFilm(actor: Actor, image: ImageRow, what: string): void {
  if (!mayManageFilm(actor.user, image))
    throw forbidden(`Only the one who uploaded this film, or a surgeon, may ${what} it.`)
}

export async function removeImage(
  db: Db,
  store: FileStore,
  actor: Actor,
  imageId: number,
): Promise<void> {
  const image = await loadVisibleImage(db, actor, imageId)
  assertMayManageFilm(actor, image, 'delete')
  await db.transaction(async (trx) => {
    if ((await countReadingsOfImage(trx, imageId)) > 0) {
      throw conflict(
        'This film has readings; it is kept so that they can be traced. Supersede the readings instead.',
      )
    }
    await deleteImage(trx, imageId)
    await audit(
      trx,
      actor,
      'delete',
      'image',
      imageId,
      `Deleted a ${image.view} film from visit ${image.visitId}`,
    )
  })
  // Files are shared by content hash; removed only when no other image uses them.
  await removeUnreferencedFiles(db, store, image.contentHash)
}

/** Default true length of the calibration object: a 25 mm sphere (common practice). */
export const DEFAULT_CALIBRATION_LENGTH_MM = 25

export async function calibrateImage(
  db: Db,
  actor: Actor,
  imageId: number,
  input: CalibrationInput,
): Promise<ImageRecord> {
  const image = await loadVisibleImage(db, actor, imageId)
  assertMayManageFilm(actor, image, 'recalibrate')
  const [[x1, y1], [x2, y2]] = input.line
  for (const [x, y] of input.line) {
    if (x < 0 || y < 0 || x > image.width || y > image.height) {
      throw badRequest(
        `line: the point (${x}, ${y}) lies outside the ${image.width} × ${image.height} film`,
        { line: ['line: outside the film'] },
      )
    }
  }
  const lengthMm = input.lengthMm ?? DEFAULT_CALIBRATION_LENGTH_MM
  const dx = x2 - x1
  const dy = y2 - y1
  const lengthPx = Math.hypot(dx, dy)
  if (lengthPx < 5)
    throw badRequest('line: the calibration line must be at least 5 pixels long', {
      line: ['line: too short'],
    })
  // Keep the film's own pixel aspect (row/column spacing ratio) when it has one, so that a
  // calibration on a film with non-square pixels scales both axes alike.
  const aspect =
    image.mmPerPixelRow !== null && image.mmPerPixelColumn !== null
      ? image.mmPerPixelRow / image.mmPerPixelColumn
      : 1
  const columnMm = lengthMm / Math.hypot(dx, dy * aspect)
  const rowMm = columnMm * aspect
  if (!isPlausibleSpacingMm(columnMm) || !isPlausibleSpacingMm(rowMm)) {
    const { min, max } = PLAUSIBLE_SPACING_MM
    throw badRequest(
      `line: ${lengthMm} mm over ${lengthPx.toFixed(1)} px gives ${columnMm.toPrecision(3)} mm per pixel, outside the ${min}–${max} mm of radiographs; check the marker's length and the line's ends`,
      { line: ['line: gives an implausible spacing'] },
    )
  }
  const changed = await db.transaction(async (trx) => {
    const ok = await updateImageCalibration(trx, imageId, input.version, {
      mmPerPixelRow: rowMm,
      mmPerPixelColumn: columnMm,
      manual: {
        line: input.line,
        lengthMm,
        lengthPx,
        calibratedAt: new Date().toISOString(),
        calibratedBy: actor.user.id,
      },
      note: `Manual calibration: ${lengthMm} mm over ${lengthPx.toFixed(1)} px at the depth of the marker`,
    })
    if (ok)
      await audit(
        trx,
        actor,
        'update',
        'image',
        imageId,
        `Calibrated film: ${lengthMm} mm = ${lengthPx.toFixed(1)} px (${columnMm.toFixed(4)} mm/px)`,
      )
    return ok
  })
  if (!changed)
    throw conflict(
      'Someone else changed this film since you opened it. Reload and calibrate again.',
      { version: [`version: current version is ${image.version}`] },
    )
  return getImage(db, actor, imageId)
}
