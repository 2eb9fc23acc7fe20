import type { Knex } from 'knex'
import type { Db } from './knex'
import { TABLES } from './tables'
import { parseJson, toIsoDateTime, toIsoDateTimeOrNull } from './rows'
import type { ImageView, SpacingSource } from '../../shared/types/domain'
import type { ManualCalibration } from '../../shared/types/api'
import type { BurnedInAnnotation } from '../../shared/types/pixel-review'

export type FileKind = 'dicom' | 'png' | 'jpeg' | 'tiff'

export interface StoredDicomAttributes {
  modality: string | null
  transferSyntax: string
  photometricInterpretation: string | null
  bitsAllocated: number | null
  bitsStored: number | null
  studyDate: string | null
  acquisitionDate: string | null
  patient: { name: string | null; id: string | null; birthDate: string | null; sex: string | null }
  /** Patient Orientation (0020,0020): row then column direction; absent in older records. */
  patientOrientation?: [row: string, column: string] | null
}

export interface ImageRow {
  id: number
  visitId: number
  view: ImageView
  fileKind: FileKind
  contentHash: string
  originalPath: string
  displayPath: string
  previewPath: string
  thumbnailPath: string
  fullDepthPath: string
  originalName: string | null
  sizeBytes: number
  width: number
  height: number
  bitsStored: number
  mmPerPixelRow: number | null
  mmPerPixelColumn: number | null
  spacingSource: SpacingSource
  spacingNote: string | null
  manualCalibration: ManualCalibration | null
  windowCenter: number | null
  windowWidth: number | null
  acquiredAt: string | null
  dicomAttributes: StoredDicomAttributes | null
  burnedInAnnotation: BurnedInAnnotation
  pixelsClearedBy: number | null
  pixelsClearedByName: string | null
  pixelsClearedAt: string | null
  version: number
  uploadedBy: number
  createdAt: string
}

type RawRow = Record<string, unknown>

function toImage(row: RawRow): ImageRow {
  return {
    id: row.id as number,
    visitId: row.visit_id as number,
    view: row.view as ImageView,
    fileKind: row.file_kind as FileKind,
    contentHash: row.content_hash as string,
    originalPath: row.original_path as string,
    displayPath: row.display_path as string,
    previewPath: row.preview_path as string,
    thumbnailPath: row.thumbnail_path as string,
    fullDepthPath: row.full_depth_path as string,
    originalName: row.original_name as string | null,
    sizeBytes: Number(row.size_bytes),
    width: row.width as number,
    height: row.height as number,
    bitsStored: row.bits_stored as number,
    mmPerPixelRow: row.mm_per_pixel_row as number | null,
    mmPerPixelColumn: row.mm_per_pixel_column as number | null,
    spacingSource: row.spacing_source as SpacingSource,
    spacingNote: row.spacing_note as string | null,
    manualCalibration: parseJson<ManualCalibration>(row.manual_calibration),
    windowCenter: row.window_center as number | null,
    windowWidth: row.window_width as number | null,
    acquiredAt: toIsoDateTimeOrNull(row.acquired_at as Date | null),
    dicomAttributes: parseJson<StoredDicomAttributes>(row.dicom_attributes),
    burnedInAnnotation: row.burned_in_annotation as BurnedInAnnotation,
    pixelsClearedBy: (row.pixels_cleared_by as number | null) ?? null,
    pixelsClearedByName: (row.pixels_cleared_by_name as string | null) ?? null,
    pixelsClearedAt: toIsoDateTimeOrNull(row.pixels_cleared_at as Date | null),
    version: row.version as number,
    uploadedBy: row.uploaded_by as number,
    createdAt: toIsoDateTime(row.created_at as Date),
  }
}

/**
 * Limits an image query (table alias `alias`) to the films held back from researchers: the rule
 * of isReleasedToResearchers (shared/types/pixel-review.ts) in SQL.
 */
export function whereHeldBack(query: Knex.QueryBuilder, alias: string): Knex.QueryBuilder {
  return query
    .whereNot(`${alias}.burned_in_annotation`, 'no')
    .whereNull(`${alias}.pixels_cleared_at`)
}

/** Limits an image query (alias `alias`) to the films released to researchers: not held back. */
export function whereReleased(query: Knex.QueryBuilder, alias: string): Knex.QueryBuilder {
  return query.where((released) =>
    released
      .where(`${alias}.burned_in_annotation`, 'no')
      .orWhereNotNull(`${alias}.pixels_cleared_at`),
  )
}

/** How many films of each visit are held back from researchers (visits without any are absent). */
export async function countHeldBackFilmsByVisit(
  db: Db,
  visitIds: readonly number[],
): Promise<Map<number, number>> {
  if (visitIds.length === 0) return new Map()
  const rows = (await whereHeldBack(
    db(`${TABLES.images} as i`).whereIn('i.visit_id', visitIds),
    'i',
  )
    .groupBy('i.visit_id')
    .select({ visitId: 'i.visit_id' })
    .count({ count: '*' })) as Array<{ visitId: number; count: number | string }>
  return new Map(rows.map((row) => [row.visitId, Number(row.count)]))
}

/** Image rows with the display name of the clinician who cleared their pixels, if any. */
function selectImages(db: Db) {
  return db(TABLES.images).select(
    `${TABLES.images}.*`,
    db(TABLES.users)
      .whereRaw('?? = ??', [`${TABLES.users}.id`, `${TABLES.images}.pixels_cleared_by`])
      .select('display_name')
      .as('pixels_cleared_by_name'),
  )
}

export async function findImage(db: Db, id: number): Promise<ImageRow | undefined> {
  const row = (await selectImages(db).where(`${TABLES.images}.id`, id).first()) as
    RawRow | undefined
  return row ? toImage(row) : undefined
}

export async function listImagesOfVisit(db: Db, visitId: number): Promise<ImageRow[]> {
  const rows = (await selectImages(db)
    .where(`${TABLES.images}.visit_id`, visitId)
    .orderBy(`${TABLES.images}.id`)) as RawRow[]
  return rows.map(toImage)
}

export async function findImageByHash(
  db: Db,
  visitId: number,
  contentHash: string,
): Promise<ImageRow | undefined> {
  const row = (await selectImages(db)
    .where(`${TABLES.images}.visit_id`, visitId)
    .where(`${TABLES.images}.content_hash`, contentHash)
    .first()) as RawRow | undefined
  return row ? toImage(row) : undefined
}

/** How many stored images still point at a content hash (files are shared across visits). */
export async function countImagesWithHash(db: Db, contentHash: string): Promise<number> {
  const [{ count }] = (await db(TABLES.images)
    .where({ content_hash: contentHash })
    .count({ count: '*' })) as [{ count: number | string }]
  return Number(count)
}

const STORED_PATH_COLUMNS = [
  'original_path',
  'display_path',
  'preview_path',
  'thumbnail_path',
  'full_depth_path',
] as const

/** Every stored key that image rows reference, by content hash (all hashes, or the given one). */
export async function referencedKeysByHash(
  db: Db,
  contentHash?: string,
): Promise<Map<string, Set<string>>> {
  const query = db(TABLES.images).select('content_hash', ...STORED_PATH_COLUMNS)
  if (contentHash !== undefined) query.where({ content_hash: contentHash })
  const keys = new Map<string, Set<string>>()
  for (const row of (await query) as Array<Record<string, string>>) {
    const set = keys.get(row.content_hash as string) ?? new Set<string>()
    for (const column of STORED_PATH_COLUMNS) set.add(row[column] as string)
    keys.set(row.content_hash as string, set)
  }
  return keys
}

export type NewImage = Omit<
  ImageRow,
  | 'id'
  | 'version'
  | 'createdAt'
  | 'manualCalibration'
  | 'pixelsClearedBy'
  | 'pixelsClearedByName'
  | 'pixelsClearedAt'
>

export async function insertImage(db: Db, image: NewImage): Promise<number> {
  const [id] = await db(TABLES.images).insert({
    visit_id: image.visitId,
    view: image.view,
    file_kind: image.fileKind,
    content_hash: image.contentHash,
    original_path: image.originalPath,
    display_path: image.displayPath,
    preview_path: image.previewPath,
    thumbnail_path: image.thumbnailPath,
    full_depth_path: image.fullDepthPath,
    original_name: image.originalName,
    size_bytes: image.sizeBytes,
    width: image.width,
    height: image.height,
    bits_stored: image.bitsStored,
    mm_per_pixel_row: image.mmPerPixelRow,
    mm_per_pixel_column: image.mmPerPixelColumn,
    spacing_source: image.spacingSource,
    spacing_note: image.spacingNote,
    window_center: image.windowCenter,
    window_width: image.windowWidth,
    acquired_at: image.acquiredAt ? new Date(image.acquiredAt) : null,
    dicom_attributes: image.dicomAttributes ? JSON.stringify(image.dicomAttributes) : null,
    burned_in_annotation: image.burnedInAnnotation,
    uploaded_by: image.uploadedBy,
  })
  return id as number
}

export async function updateImageCalibration(
  db: Db,
  id: number,
  expectedVersion: number,
  calibration: {
    mmPerPixelRow: number
    mmPerPixelColumn: number
    manual: ManualCalibration
    note: string
  },
): Promise<boolean> {
  const changed = await db(TABLES.images)
    .where({ id, version: expectedVersion })
    .update({
      mm_per_pixel_row: calibration.mmPerPixelRow,
      mm_per_pixel_column: calibration.mmPerPixelColumn,
      spacing_source: 'manual',
      spacing_note: calibration.note,
      manual_calibration: JSON.stringify(calibration.manual),
      version: db.raw('version + 1'),
      updated_at: new Date(),
    })
  return changed === 1
}

/**
 * Records a clinician's confirmation that the film's pixels show no identity, or withdraws it
 * (`clearedBy` null). Leaves the film's version alone: the review changes nothing a reading or
 * a calibration rests on. Answers whether the row changed (a repeat changes nothing).
 */
export async function updatePixelReview(
  db: Db,
  id: number,
  clearedBy: number | null,
): Promise<boolean> {
  const query = db(TABLES.images).where({ id })
  if (clearedBy === null) query.whereNotNull('pixels_cleared_at')
  else query.whereNull('pixels_cleared_at')
  const now = new Date()
  const changed = await query.update({
    pixels_cleared_by: clearedBy,
    pixels_cleared_at: clearedBy === null ? null : now,
    updated_at: now,
  })
  return changed === 1
}

export async function countReadingsOfImage(db: Db, imageId: number): Promise<number> {
  const [{ count }] = (await db(TABLES.readings)
    .where({ image_id: imageId })
    .orWhere({ paired_image_id: imageId })
    .count({ count: '*' })) as [{ count: number | string }]
  return Number(count)
}

export async function deleteImage(db: Db, id: number): Promise<void> {
  await db(TABLES.images).where({ id }).delete()
}
