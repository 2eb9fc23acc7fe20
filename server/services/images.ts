import { readFile, rm } from 'node:fs/promises'
import type { Readable } from 'node:stream'
import type { Db } from '../db/knex'
import {
  countImagesWithHash,
  countReadingsOfImage,
  deleteImage,
  findImage,
  findImageByHash,
  insertImage,
  listImagesOfVisit,
  updateImageCalibration,
  type FileKind,
  type ImageRow,
  type NewImage,
} from '../db/images'
import type { FileStore } from '../storage/file-store'
import { decodeFilm } from '../images/decode-film'
import { makeFilmRenditions, type FilmRenditions } from '../images/renditions'
import { isImageError } from '../images/image-error'
import type { DecodedFilm } from '../images/decoded-film'
import type { StreamedUpload } from '../middleware/upload'
import { asNotFound, badRequest, conflict, HttpError, notFound } from '../errors'
import { IMAGE_VIEWS, type ImageView } from '../../shared/types/domain'
import type { CalibrationInput, ImageRecord, PatientMismatch } from '../../shared/types/api'
import { actorIdentifies, audit, type Actor } from './audit'
import { loadVisibleVisit } from './visits'
import { comparePatient } from './patient-match'
import { toImageRecord } from './image-dto'

export type RenditionName = 'display' | 'preview' | 'thumbnail' | 'full-depth'

const EXTENSIONS: Record<FileKind, string> = { dicom: 'dcm', png: 'png', jpeg: 'jpg', tiff: 'tif' }

/** Content-addressed keys: the same film uploaded twice is stored once. */
function keysFor(hash: string, kind: FileKind, renditions: FilmRenditions) {
  const folder = `films/${hash.slice(0, 2)}/${hash}`
  const ext = (mediaType: string) => (mediaType === 'image/webp' ? 'webp' : 'png')
  return {
    original: `${folder}/original.${EXTENSIONS[kind]}`,
    display: `${folder}/display.${ext(renditions.display.mediaType)}`,
    preview: `${folder}/preview.${ext(renditions.preview.mediaType)}`,
    thumbnail: `${folder}/thumbnail.${ext(renditions.thumbnail.mediaType)}`,
    fullDepth: `${folder}/full-depth.png`,
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
}

interface PreparedFilm {
  upload: StreamedUpload
  /** Kept only for a one-file upload; with several, pixels are decoded again one at a time. */
  film: DecodedFilm | null
  view: ImageView
}

async function decodeUpload(upload: StreamedUpload): Promise<DecodedFilm> {
  if (upload.size === 0) throw new HttpError(422, 'empty_file', `${upload.originalName} is empty.`)
  try {
    return await decodeFilm(await readFile(upload.path))
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
  film: DecodedFilm,
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
 * Files uploaded films against a visit, all or nothing: every file is decoded and checked before
 * anything is stored, and a failure after storing removes what this request wrote.
 */
export async function uploadImages(
  db: Db,
  store: FileStore,
  actor: Actor,
  visitId: number,
  request: UploadRequest,
): Promise<ImageRecord[]> {
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
    const prepared: PreparedFilm[] = []
    const mismatches: PatientMismatch[] = []
    for (const [index, upload] of request.files.entries()) {
      const film = await decodeUpload(upload)
      const view = pickView(request, index, film, upload.originalName)
      if (await findImageByHash(db, visitId, upload.sha256)) {
        throw conflict(`${upload.originalName} is already filed on this visit.`)
      }
      if (film.header) {
        const differences = comparePatient(film.header, patient, visit)
        if (differences.length > 0) mismatches.push({ file: upload.originalName, differences })
      }
      // Several films of 3000 × 2500 × 16 bits would sit in memory together: keep only the
      // checks' results and decode each again when it is stored.
      prepared.push({ upload, film: request.files.length === 1 ? film : null, view })
    }
    if (mismatches.length > 0 && !request.confirmPatientMismatch) {
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
    return await withContentLocks(
      db,
      prepared.map(({ upload }) => upload.sha256),
      () =>
        storeAndRecord(
          db,
          store,
          actor,
          visitId,
          prepared,
          mismatches.length > 0,
          patient.studyCode,
        ),
    )
  } finally {
    await Promise.all(request.files.map((file) => rm(file.path, { force: true })))
  }
}

/**
 * Serialises everything that writes or deletes the shared, content-addressed files of the given
 * hashes (MariaDB named locks, taken in a fixed order so two uploads cannot deadlock): without
 * it one request could remove files another has just decided to reuse.
 */
async function withContentLocks<T>(db: Db, hashes: string[], work: () => Promise<T>): Promise<T> {
  const names = [...new Set(hashes)].sort().map((hash) => `endplate-film-${hash.slice(0, 40)}`)
  // The locks belong to one connection, held for the duration by this transaction.
  return db.transaction(async (lockHolder) => {
    for (const name of names) {
      const [rows] = (await lockHolder.raw('SELECT GET_LOCK(?, 60) AS ok', [name])) as [
        Array<{ ok: number | null }>,
      ]
      if (rows[0]?.ok !== 1)
        throw new HttpError(
          503,
          'busy',
          'The same film is being filed by someone else right now. Try again in a minute.',
        )
    }
    try {
      return await work()
    } finally {
      for (const name of names) await lockHolder.raw('SELECT RELEASE_LOCK(?)', [name])
    }
  })
}

async function storeAndRecord(
  db: Db,
  store: FileStore,
  actor: Actor,
  visitId: number,
  prepared: PreparedFilm[],
  mismatchConfirmed: boolean,
  studyCode: string,
): Promise<ImageRecord[]> {
  const written: string[] = []
  try {
    const rows: NewImage[] = []
    for (const { upload, film: kept, view } of prepared) {
      const film = kept ?? (await decodeUpload(upload))
      const renditions = await makeFilmRenditions(film)
      const keys = keysFor(upload.sha256, film.fileType, renditions)
      if (!(await store.exists(keys.original))) {
        await store.putFile(keys.original, upload.path)
        written.push(keys.original)
      }
      for (const [key, rendition] of [
        [keys.display, renditions.display],
        [keys.preview, renditions.preview],
        [keys.thumbnail, renditions.thumbnail],
        [keys.fullDepth, renditions.fullDepth],
      ] as const) {
        if (await store.exists(key)) continue
        await store.put(key, rendition.buffer)
        written.push(key)
      }
      rows.push(newImageRow(visitId, actor, upload, film, view, keys, renditions))
    }
    return await db.transaction(async (trx) => {
      const records: ImageRecord[] = []
      for (const row of rows) {
        const id = await insertImage(trx, row)
        await audit(
          trx,
          actor,
          'create',
          'image',
          id,
          `Uploaded a ${row.view} film to visit ${visitId} of patient ${studyCode}${mismatchConfirmed ? ' (patient mismatch confirmed)' : ''}`,
        )
        const stored = await findImage(trx, id)
        if (stored) records.push(toImageRecord(stored, identifies(actor), true))
      }
      return records
    })
  } catch (error) {
    await Promise.all(written.map((key) => store.remove(key)))
    throw error
  }
}

function newImageRow(
  visitId: number,
  actor: Actor,
  upload: StreamedUpload,
  film: DecodedFilm,
  view: ImageView,
  keys: ReturnType<typeof keysFor>,
  renditions: FilmRenditions,
): NewImage {
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
    windowCenter: renditions.window.center,
    windowWidth: renditions.window.width,
    acquiredAt: header?.acquisitionDate ?? header?.studyDate ?? null,
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

/** Loads an image whose visit the actor may see; anything else is a 404. */
export async function loadVisibleImage(db: Db, actor: Actor, imageId: number): Promise<ImageRow> {
  const image = await findImage(db, imageId)
  if (!image) throw notFound('image')
  try {
    await loadVisibleVisit(db, actor, image.visitId)
  } catch (error) {
    return asNotFound(error, 'image')
  }
  return image
}

export async function listVisitImages(
  db: Db,
  actor: Actor,
  visitId: number,
): Promise<ImageRecord[]> {
  await loadVisibleVisit(db, actor, visitId)
  return (await listImagesOfVisit(db, visitId)).map((image) =>
    toImageRecord(image, identifies(actor)),
  )
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
  const image = await loadVisibleImage(db, actor, imageId)
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
      `The ${name} rendition of film ${imageId} is missing from storage.`,
    )
  return { stream, mediaType, etag: `"${image.id}-${name}"` }
}

export async function removeImage(
  db: Db,
  store: FileStore,
  actor: Actor,
  imageId: number,
): Promise<void> {
  const image = await loadVisibleImage(db, actor, imageId)
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
  // Files are shared by content hash; remove them only when no other image uses them.
  await withContentLocks(db, [image.contentHash], async () => {
    if ((await countImagesWithHash(db, image.contentHash)) > 0) return
    await Promise.all(
      [
        image.originalPath,
        image.displayPath,
        image.previewPath,
        image.thumbnailPath,
        image.fullDepthPath,
      ].map((key) => store.remove(key)),
    )
  })
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
