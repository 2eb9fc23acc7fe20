import type { Db } from '../db/knex'
import { findImage, type ImageRow } from '../db/images'
import { findVisit } from '../db/visits'
import {
  findConstructBaselines,
  findReading,
  insertReading,
  listReadingsOfImage,
  submitDraftReading,
  updateDraftReading,
  type ReadingComputation,
  type ReadingRecord,
} from '../db/readings'
import { asNotFound, badRequest, HttpError, notFound } from '../errors'
import { APP_VERSION } from '../version'
import { frontalImageRightSide, LandmarkDocumentError } from '../../shared/measurement/index'
import { readingActionRefusal, type ReadingAction } from '../../shared/readings/reading-status'
import {
  templateLandmarks,
  templateReadsFrontalFilm,
  TEMPLATE_LABELS,
  type TemplateOptions,
} from '../../shared/readings/templates'
import { submitRefusal } from '../../shared/readings/reading-rules'
import type { ReadingTemplate } from '../../shared/types/domain'
import type { PixelPoint } from '../../shared/types/landmarks'
import type { CreateReadingInput, PatchReadingInput, Reading } from '../../shared/types/readings'
import { actorIdentifies, audit, type Actor } from './audit'
import { loadVisibleImage } from './images'
import { calibrationOf, computeReadingResults, landmarkDocument } from './readings-results'
import { loadSiteSettings } from './site-settings'
import { notifyReadingSubmitted, reviewerFor } from './reading-notifications'

type Points = Record<string, PixelPoint>

/** A 409 that carries the reading as it now stands, so the client can show the conflict. */
export class ReadingConflictError extends HttpError {
  constructor(
    message: string,
    readonly current: Reading,
  ) {
    super(409, 'conflict', message, { version: [`version: current version is ${current.version}`] })
  }
}

/**
 * Researchers get no timestamps (readings are usually made on the visit day, so they would date
 * the visit) and no free text (a comment or reason may name the patient). Everyone else gets
 * the record as it is.
 */
export function toReadingDto(record: ReadingRecord, identified = true): Reading {
  if (identified) return { ...record }
  return {
    ...record,
    createdAt: null,
    updatedAt: null,
    submittedAt: null,
    signedAt: null,
    returnedAt: null,
    returnComment: null,
    supersedeReason: null,
  }
}

/** Loads a reading whose film the actor may see, with that film; anything else is a 404. */
export async function loadVisibleReading(
  db: Db,
  actor: Actor,
  id: number,
): Promise<{ reading: ReadingRecord; image: ImageRow }> {
  const reading = await findReading(db, id)
  if (!reading) throw notFound('reading')
  try {
    return { reading, image: await loadVisibleImage(db, actor, reading.imageId) }
  } catch (error) {
    return asNotFound(error, 'reading')
  }
}

/** Every landmark must belong to the template and lie on its film. */
function checkPoints(
  field: 'points' | 'pairedPoints',
  points: Points,
  template: ReadingTemplate,
  options: TemplateOptions,
  film: ImageRow,
): void {
  const allowed = new Set(templateLandmarks(template, options).map((spec) => spec.name))
  for (const [name, [x, y]] of Object.entries(points)) {
    if (!allowed.has(name)) {
      throw badRequest(
        `${field}.${name}: is not a landmark of the ${TEMPLATE_LABELS[template]} template`,
        {
          [`${field}.${name}`]: [`${field}.${name}: not a landmark of this template`],
        },
      )
    }
    if (x < 0 || y < 0 || x > film.width || y > film.height) {
      throw badRequest(
        `${field}.${name}: (${x}, ${y}) lies outside the ${film.width} × ${film.height} film`,
        {
          [`${field}.${name}`]: [`${field}.${name}: outside the film`],
        },
      )
    }
  }
}

interface ComputeContext {
  readingId: number | null
  template: ReadingTemplate
  options: TemplateOptions
  image: ImageRow
  pairedImage: ImageRow | null
  points: Points
  pairedPoints: Points | null
}

/** Runs the engine on a reading's landmarks; the engine's refusal is a 400 and stores nothing. */
async function compute(db: Db, context: ComputeContext): Promise<ReadingComputation> {
  const calibration = calibrationOf(context.image)
  const pairedCalibration = context.pairedImage ? calibrationOf(context.pairedImage) : null
  const document = landmarkDocument(context.points, calibration)
  const pairedDocument = pairedCalibration
    ? landmarkDocument(context.pairedPoints ?? {}, pairedCalibration)
    : null
  let baselines: Array<{ readingId: number; document: ReadingRecord['landmarks'] }> = []
  if (context.template === 'construct-check') {
    const visit = await findVisit(db, context.image.visitId)
    const found = visit
      ? await findConstructBaselines(db, visit.patientId, {
          readingId: context.readingId,
          visitId: visit.id,
          visitDate: visit.visitDate,
        })
      : []
    baselines = found.map((reading) => ({ readingId: reading.id, document: reading.landmarks }))
  }
  const settings = await loadSiteSettings(db)
  try {
    const results = computeReadingResults({
      template: context.template,
      options: context.options,
      document,
      pairedDocument,
      baselines,
      settings: {
        landmarkSigmaMm: settings.landmarkSigmaMm,
        subsidenceThresholdMm: settings.subsidenceThresholdMm,
        instabilityCriterion: settings.instabilityCriterion,
        implantCentringThresholdMm: settings.implantCentringThresholdMm,
      },
      imageRightSide: frontalImageRightSide(context.image.dicomAttributes?.patientOrientation),
    })
    return {
      landmarks: document,
      pairedLandmarks: pairedDocument,
      calibration,
      pairedCalibration,
      results,
      engineVersion: APP_VERSION,
    }
  } catch (error) {
    if (error instanceof LandmarkDocumentError)
      throw new HttpError(400, 'invalid_landmarks', error.message)
    throw error
  }
}

/** A motion pair is read on a flexion film against an extension film of the same visit. */
async function loadPairedImage(db: Db, image: ImageRow, pairedImageId: number): Promise<ImageRow> {
  if (image.view !== 'lateral-flexion') {
    throw badRequest(`A motion pair is started on the flexion film; this film is ${image.view}.`, {
      pairedImageId: ['pairedImageId: start the reading on the flexion film'],
    })
  }
  const paired = await findImage(db, pairedImageId)
  if (!paired || paired.visitId !== image.visitId || paired.id === image.id) {
    throw badRequest(`pairedImageId: film ${pairedImageId} is not another film of this visit.`, {
      pairedImageId: ['pairedImageId: must be another film of the same visit'],
    })
  }
  if (paired.view !== 'lateral-extension') {
    throw badRequest(
      `pairedImageId: film ${pairedImageId} is ${paired.view}; a motion pair needs the extension film.`,
      { pairedImageId: ['pairedImageId: must be the lateral-extension film'] },
    )
  }
  return paired
}

export async function reload(db: Db, id: number): Promise<ReadingRecord> {
  const reading = await findReading(db, id)
  if (!reading) throw notFound('reading')
  return reading
}

/**
 * The stored landmarks computed once more with the films' current calibration and the site
 * settings in force (at submission, at signature, when an amendment starts). `asReadingId`
 * is the reading the results will belong to (null for a reading not yet inserted).
 */
export async function recomputeStored(
  db: Db,
  reading: ReadingRecord,
  image: ImageRow,
  asReadingId: number | null,
): Promise<ReadingComputation> {
  const pairedImage =
    reading.pairedImageId !== null ? await findImage(db, reading.pairedImageId) : undefined
  return compute(db, {
    readingId: asReadingId,
    template: reading.template,
    options: reading.options,
    image,
    pairedImage: pairedImage ?? null,
    points: reading.landmarks.points,
    pairedPoints: reading.pairedLandmarks?.points ?? null,
  })
}

export async function createReading(
  db: Db,
  actor: Actor,
  imageId: number,
  input: CreateReadingInput,
): Promise<Reading> {
  const image = await loadVisibleImage(db, actor, imageId)
  const options = input.options ?? {}
  const pairedImage =
    input.template === 'motion-pair' && input.pairedImageId !== undefined
      ? await loadPairedImage(db, image, input.pairedImageId)
      : null
  const points = input.points ?? {}
  checkPoints('points', points, input.template, options, image)
  const postOpOnly = input.template === 'construct-check' || input.template === 'implant-centring'
  if (postOpOnly && (await findVisit(db, image.visitId))?.kind === 'pre-op') {
    throw badRequest(
      `template: ${input.template === 'construct-check' ? 'a construct check' : 'implant centring'} reads a film taken after surgery; this film belongs to a pre-op visit`,
      {
        template: [`template: ${input.template} needs a post-op or follow-up film`],
      },
    )
  }
  if (templateReadsFrontalFilm(input.template) !== (image.view === 'ap')) {
    throw badRequest(
      templateReadsFrontalFilm(input.template)
        ? `template: implant centring is read on a frontal (AP) film; this film is ${image.view}`
        : `template: the ${TEMPLATE_LABELS[input.template]} template reads a lateral film; this film is AP`,
      { template: [`template: ${input.template} does not read a ${image.view} film`] },
    )
  }
  return db.transaction(async (trx) => {
    const computation = await compute(trx, {
      readingId: null,
      template: input.template,
      options,
      image,
      pairedImage,
      points,
      pairedPoints: null,
    })
    const id = await insertReading(trx, {
      imageId,
      pairedImageId: pairedImage?.id ?? null,
      raterId: actor.user.id,
      template: input.template,
      options,
      ...computation,
    })
    const segment = options.segment ? ` at ${options.segment}` : ''
    await audit(
      trx,
      actor,
      'create',
      'reading',
      id,
      `Started a ${input.template} reading${segment} on film ${imageId} with ${Object.keys(points).length} landmarks`,
    )
    return toReadingDto(await reload(trx, id))
  })
}

export async function getReading(db: Db, actor: Actor, id: number): Promise<Reading> {
  return toReadingDto((await loadVisibleReading(db, actor, id)).reading, actorIdentifies(actor))
}

export async function listImageReadings(db: Db, actor: Actor, imageId: number): Promise<Reading[]> {
  await loadVisibleImage(db, actor, imageId)
  return (await listReadingsOfImage(db, imageId)).map((reading) =>
    toReadingDto(reading, actorIdentifies(actor)),
  )
}

const STALE_MESSAGES: Record<ReadingAction, string> = {
  edit: 'This reading was saved elsewhere since you opened it. Nothing was overwritten: compare with the current landmarks and save again.',
  submit:
    'This reading was saved elsewhere since you opened it. Nothing was submitted: look at the current landmarks and submit again.',
  sign: 'This reading changed since you opened it. Nothing was signed: look at the current version and sign again.',
  return:
    'This reading changed since you opened it. Nothing was returned: look at the current version first.',
  amend: 'This reading changed since you opened it.',
}

/**
 * The reading's rules for the action (status, role, rater; see reading-status.ts), then the
 * version the actor last saw: a stale one is a 409 carrying the reading as it now stands.
 */
export function assertCan(
  action: ReadingAction,
  reading: ReadingRecord,
  actor: Actor,
  version?: number,
): void {
  const refusal = readingActionRefusal(action, reading, actor.user)
  if (refusal) throw new HttpError(refusal.status, refusal.code, refusal.message)
  if (version !== undefined && reading.version !== version)
    throw new ReadingConflictError(STALE_MESSAGES[action], toReadingDto(reading))
}

/** Counts landmarks added, moved and removed between two point sets. */
function changeCount(
  before: Points,
  after: Points,
): { added: number; moved: number; removed: number } {
  let added = 0
  let moved = 0
  for (const [name, [x, y]] of Object.entries(after)) {
    const old = before[name]
    if (old === undefined) added += 1
    else if (old[0] !== x || old[1] !== y) moved += 1
  }
  const removed = Object.keys(before).filter((name) => !(name in after)).length
  return { added, moved, removed }
}

/** Thrown inside a transaction whose guarded write matched no row; answered after rollback. */
export class GuardedWriteRefused extends Error {}

/**
 * Runs a write transaction; when its guarded UPDATE is refused, answers the 409 from a fresh
 * read after the rollback (inside the transaction the snapshot predates the competing write).
 */
export async function guardedWrite<T>(
  db: Db,
  action: ReadingAction,
  id: number,
  actor: Actor,
  version: number,
  work: (trx: Db) => Promise<T>,
): Promise<T> {
  try {
    return await db.transaction(work)
  } catch (error) {
    if (error instanceof GuardedWriteRefused) return refusedWrite(db, action, id, actor, version)
    throw error
  }
}

/** After a refused guarded write, the 409 that says why (status or version). */
async function refusedWrite(
  db: Db,
  action: ReadingAction,
  id: number,
  actor: Actor,
  version: number,
): Promise<never> {
  assertCan(action, await reload(db, id), actor, version)
  throw new ReadingConflictError(
    'This reading was saved elsewhere since you opened it. Nothing was overwritten.',
    toReadingDto(await reload(db, id)),
  )
}

export async function patchReading(
  db: Db,
  actor: Actor,
  id: number,
  patch: PatchReadingInput,
): Promise<Reading> {
  const { reading, image } = await loadVisibleReading(db, actor, id)
  assertCan('edit', reading, actor, patch.version)
  if (patch.pairedPoints !== undefined && reading.template !== 'motion-pair') {
    throw badRequest('pairedPoints: apply to motion-pair readings only', {
      pairedPoints: ['pairedPoints: motion-pair readings only'],
    })
  }
  const pairedImage =
    reading.pairedImageId !== null ? await findImage(db, reading.pairedImageId) : undefined
  checkPoints('points', patch.points, reading.template, reading.options, image)
  const pairedPoints = patch.pairedPoints ?? reading.pairedLandmarks?.points ?? null
  if (pairedImage && patch.pairedPoints)
    checkPoints('pairedPoints', patch.pairedPoints, reading.template, reading.options, pairedImage)
  return guardedWrite(db, 'edit', id, actor, patch.version, async (trx) => {
    const computation = await compute(trx, {
      readingId: id,
      template: reading.template,
      options: reading.options,
      image,
      pairedImage: pairedImage ?? null,
      points: patch.points,
      pairedPoints,
    })
    if (!(await updateDraftReading(trx, id, patch.version, computation)))
      throw new GuardedWriteRefused()
    const main = changeCount(reading.landmarks.points, patch.points)
    const paired = changeCount(reading.pairedLandmarks?.points ?? {}, pairedPoints ?? {})
    const total = (c: typeof main) => c.added + c.moved + c.removed
    const pairedNote =
      reading.template === 'motion-pair' ? `; ${total(paired)} on the extension film` : ''
    await audit(
      trx,
      actor,
      'update',
      'reading',
      id,
      `Saved ${reading.template} reading ${id}: ${total(main)} landmarks changed (${main.added} added, ${main.moved} moved, ${main.removed} removed)${pairedNote}`,
    )
    return toReadingDto(await reload(trx, id))
  })
}

export async function submitReading(
  db: Db,
  actor: Actor,
  id: number,
  version: number,
): Promise<Reading> {
  const { reading, image } = await loadVisibleReading(db, actor, id)
  assertCan('submit', reading, actor, version)
  const refusal = submitRefusal({
    template: reading.template,
    options: reading.options,
    points: reading.landmarks.points,
    pairedPoints: reading.pairedLandmarks?.points ?? null,
  })
  if (refusal !== null) throw badRequest(refusal.message, refusal.details)
  const names = templateLandmarks(reading.template, reading.options).map((spec) => spec.name)
  const placed = names.filter((name) => name in reading.landmarks.points)
  return guardedWrite(db, 'submit', id, actor, version, async (trx) => {
    // Recomputed with the films' current calibration, so the submitted results match what is shown.
    const computation = await recomputeStored(trx, reading, image, id)
    const reviewerId = await reviewerFor(trx, image.visitId, actor.user.id)
    if (!(await submitDraftReading(trx, id, version, computation, reviewerId)))
      throw new GuardedWriteRefused()
    const again = reading.status === 'returned' ? ' again after its return' : ''
    await audit(
      trx,
      actor,
      'submit',
      'reading',
      id,
      `Submitted ${reading.template} reading ${id}${again} with ${placed.length} of ${names.length} landmarks placed`,
    )
    const submitted = await reload(trx, id)
    await notifyReadingSubmitted(trx, submitted, actor)
    return toReadingDto(submitted)
  })
}
