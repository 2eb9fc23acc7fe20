/**
 * A rater's side of a re-reading round: their assignments in stored order, starting the blinded
 * reading of one, and the film it shows. Nothing here carries the patient, the visit or a date.
 */
import type { Readable } from 'node:stream'
import type { Db } from '../db/knex'
import { findImage } from '../db/images'
import { insertReading } from '../db/readings'
import {
  findAssignment,
  findRound,
  listRaterAssignments,
  lockAssignment,
  setAssignmentReading,
  type AssignmentRow,
  type RoundRecord,
} from '../db/rounds'
import { TABLES } from '../db/tables'
import { HttpError, notFound } from '../errors'
import type { FileStore } from '../storage/file-store'
import type { Page } from '../../shared/types/api'
import type { Assignment, AssignmentFilm } from '../../shared/types/rounds'
import { audit, type Actor } from './audit'
import { openImageRendition, type RenditionName } from './images'
import { calibrationOf, computeReadingResults, landmarkDocument } from './readings-results'
import { loadSiteSettings } from './site-settings'
import { APP_VERSION } from '../version'
import { assertRoundOpen } from './blinded-readings'
import { assignmentStates, type AssignmentState } from './round-progress'

interface RaterView {
  assignment: AssignmentRow
  round: RoundRecord
  state: AssignmentState
}

/** The rater's assignments with their rounds and states; closed rounds keep only what was done. */
async function raterViews(db: Db, actor: Actor, now: Date): Promise<RaterView[]> {
  const rows = await listRaterAssignments(db, actor.user.id)
  const rounds = new Map<number, RoundRecord>()
  for (const roundId of new Set(rows.map((row) => row.roundId))) {
    const round = await findRound(db, roundId)
    if (round) rounds.set(roundId, round)
  }
  const views: RaterView[] = []
  for (const [roundId, round] of rounds) {
    const own = rows.filter((row) => row.roundId === roundId)
    const states = assignmentStates(own, round.options.gapDays ?? 0, now)
    for (const assignment of own) {
      const state = states.get(assignment.id)!
      if (round.status === 'closed' && state.status !== 'done') continue
      views.push({ assignment, round, state })
    }
  }
  return views
}

function toAssignment(view: RaterView): Assignment {
  return {
    id: view.assignment.id,
    roundId: view.round.id,
    roundName: view.round.name,
    template: view.round.template,
    templateOptions: view.round.templateOptions,
    blindCode: view.assignment.blindCode,
    repetition: view.assignment.repetition,
    position: view.assignment.position,
    status: view.state.status,
    availableFrom: view.state.availableFrom,
    readingId: view.assignment.readingId,
    showResultsBeforeSubmit: view.round.options.showResultsBeforeSubmit,
  }
}

export async function listAssignments(
  db: Db,
  actor: Actor,
  query: { status?: 'due' | 'done' | 'all'; offset?: number; limit?: number },
  now: Date,
): Promise<Page<Assignment>> {
  const status = query.status ?? 'all'
  // "due" lists what is to do: open now, or waiting for the gap (with the time it opens).
  const wanted = (view: RaterView) =>
    status === 'all' ||
    (status === 'done' ? view.state.status === 'done' : view.state.status !== 'done')
  const views = (await raterViews(db, actor, now)).filter(wanted)
  // Rounds oldest first; within a round, pass by pass in the rater's stored order.
  views.sort(
    (a, b) =>
      a.round.id - b.round.id ||
      a.assignment.repetition - b.assignment.repetition ||
      a.assignment.position - b.assignment.position,
  )
  const offset = query.offset ?? 0
  const limit = query.limit ?? 100
  return { items: views.slice(offset, offset + limit).map(toAssignment), total: views.length }
}

/** The actor's own assignment (anyone else's is not found), with its round and state. */
async function loadOwnAssignment(db: Db, actor: Actor, id: number, now: Date): Promise<RaterView> {
  const assignment = await findAssignment(db, id)
  if (!assignment || assignment.raterId !== actor.user.id) throw notFound('assignment')
  const round = await findRound(db, assignment.roundId)
  if (!round) throw notFound('assignment')
  const own = (await listRaterAssignments(db, actor.user.id)).filter(
    (row) => row.roundId === round.id,
  )
  const state = assignmentStates(own, round.options.gapDays ?? 0, now).get(id)!
  return { assignment, round, state }
}

function assertOpenNow(view: RaterView): void {
  assertRoundOpen(view.round)
  if (view.state.status === 'waiting') {
    const when = view.state.availableFrom
    throw new HttpError(
      409,
      'assignment_waiting',
      when
        ? `This repeat opens on ${when.slice(0, 10)}, after the round's gap of ${view.round.options.gapDays} days since your previous pass.`
        : 'This repeat opens once you have finished the previous pass and the round’s gap has passed.',
    )
  }
}

/**
 * Starts the blinded reading of an assignment: empty landmarks, the round's template, blinded and
 * tied to the round. Starting again answers the reading already made.
 */
export async function startAssignment(
  db: Db,
  actor: Actor,
  id: number,
  now: Date,
): Promise<{ readingId: number; created: boolean }> {
  const view = await loadOwnAssignment(db, actor, id, now)
  if (view.assignment.readingId !== null)
    return { readingId: view.assignment.readingId, created: false }
  assertOpenNow(view)
  const image = await findImage(db, view.assignment.imageId)
  if (!image) throw notFound('assignment')
  const settings = await loadSiteSettings(db)
  const calibration = calibrationOf(image)
  const document = landmarkDocument({}, calibration)
  const results = computeReadingResults({
    template: view.round.template,
    options: view.round.templateOptions,
    document,
    pairedDocument: null,
    baselines: [],
    settings: {
      landmarkSigmaMm: settings.landmarkSigmaMm,
      subsidenceThresholdMm: settings.subsidenceThresholdMm,
      instabilityCriterion: settings.instabilityCriterion,
      implantCentringThresholdMm: settings.implantCentringThresholdMm,
    },
    imageRightSide: 'unknown',
  })
  return db.transaction(async (trx) => {
    const existing = await lockAssignment(trx, id)
    if (existing !== null) return { readingId: existing, created: false }
    const readingId = await insertReading(trx, {
      imageId: image.id,
      pairedImageId: null,
      raterId: actor.user.id,
      template: view.round.template,
      options: view.round.templateOptions,
      landmarks: document,
      pairedLandmarks: null,
      calibration,
      pairedCalibration: null,
      results,
      engineVersion: APP_VERSION,
    })
    await trx(TABLES.readings)
      .where({ id: readingId })
      .update({ blinded: true, round_id: view.round.id })
    await setAssignmentReading(trx, id, readingId)
    await audit(
      trx,
      actor,
      'create',
      'reading',
      readingId,
      `Started blinded reading ${readingId} for assignment ${id} of round ${view.round.id} (pass ${view.assignment.repetition})`,
    )
    return { readingId, created: true }
  })
}

/** The film of an assignment that is open (or done): size, scale and where its renditions are. */
export async function assignmentFilm(
  db: Db,
  actor: Actor,
  id: number,
  now: Date,
): Promise<AssignmentFilm> {
  const view = await loadOwnAssignment(db, actor, id, now)
  if (view.state.status !== 'done') assertOpenNow(view)
  const image = await findImage(db, view.assignment.imageId)
  if (!image) throw notFound('assignment')
  const calibration = calibrationOf(image)
  const base = `/api/assignments/${id}/film`
  return {
    width: image.width,
    height: image.height,
    spacingMm: calibration.mmPerPixel
      ? { row: calibration.mmPerPixel[0], column: calibration.mmPerPixel[1] }
      : null,
    calibrationSource: calibration.source,
    bitsStored: image.bitsStored,
    window:
      image.windowCenter !== null && image.windowWidth !== null
        ? { center: image.windowCenter, width: image.windowWidth }
        : null,
    urls: {
      display: `${base}/display`,
      preview: `${base}/preview`,
      thumbnail: `${base}/thumbnail`,
      fullDepth: `${base}/full-depth`,
    },
  }
}

export async function openAssignmentRendition(
  db: Db,
  store: FileStore,
  actor: Actor,
  id: number,
  name: RenditionName,
  now: Date,
): Promise<{ stream: Readable; mediaType: string; etag: string }> {
  const view = await loadOwnAssignment(db, actor, id, now)
  if (view.state.status !== 'done') assertOpenNow(view)
  const image = await findImage(db, view.assignment.imageId)
  if (!image) throw notFound('assignment')
  const opened = await openImageRendition(store, image, name)
  // The clinical tag names the film's row; the assignment's own tag names nothing else.
  return { ...opened, etag: `"assignment-${id}-${name}"` }
}
