import type { Db } from '../db/knex'
import { findStudy } from '../db/studies'
import {
  activeUserRoles,
  findRound,
  insertRound,
  insertRoundMembers,
  listRoundAssignments,
  listRoundImageCodes,
  listRoundRaters,
  listStudyLateralFilms,
  listStudyRounds,
  studyFilms,
  updateRoundStatus,
  type RoundRecord,
} from '../db/rounds'
import { badRequest, conflict, notFound } from '../errors'
import type { RoundFilmCandidate } from '../../shared/types/round-films'
import type { Page } from '../../shared/types/api'
import type {
  CreateRoundInput,
  RoundDetail,
  RoundPatch,
  RoundSummary,
} from '../../shared/types/rounds'
import { audit, type Actor } from './audit'
import { assignmentStates, isDone, raterProgress } from './round-progress'
import { blindCodes, codeKey, newRoundSeed, raterOrder } from './round-order'

/** Default passes of an intra-rater round: a first reading and one repeat. */
export const DEFAULT_INTRA_REPEATS = 2

/** The study, if the actor may see it (researchers: only studies they belong to). */
async function loadStudyFor(db: Db, actor: Actor, studyId: number): Promise<void> {
  const memberId = actor.user.role === 'researcher' ? actor.user.id : undefined
  if (!(await findStudy(db, studyId, memberId))) throw notFound('study')
}

/** The lateral films of a study's patients that a new round may include. */
export async function listRoundFilmCandidates(
  db: Db,
  actor: Actor,
  studyId: number,
): Promise<Page<RoundFilmCandidate>> {
  await loadStudyFor(db, actor, studyId)
  const items = await listStudyLateralFilms(db, studyId)
  return { items, total: items.length }
}

/** A round the actor may see: its study must be visible to them. */
export async function loadVisibleRound(db: Db, actor: Actor, id: number): Promise<RoundRecord> {
  const round = await findRound(db, id)
  if (!round) throw notFound('round')
  try {
    await loadStudyFor(db, actor, round.studyId)
  } catch {
    throw notFound('round')
  }
  return round
}

async function toSummary(db: Db, round: RoundRecord): Promise<RoundSummary> {
  const assignments = await listRoundAssignments(db, round.id)
  return {
    id: round.id,
    studyId: round.studyId,
    name: round.name,
    kind: round.kind,
    template: round.template,
    templateOptions: round.templateOptions,
    options: round.options,
    status: round.status,
    imageCount: round.imageCount,
    raterCount: round.raterCount,
    repeats: round.repeats,
    assignmentsDone: assignments.filter(isDone).length,
    assignmentsTotal: round.assignmentsTotal,
    seed: round.seed,
    createdAt: round.createdAt,
    version: round.version,
  }
}

function fieldError(field: string, message: string): never {
  throw badRequest(`${field}: ${message}`, { [field]: [`${field}: ${message}`] })
}

/** Films must be lateral films of the study's patients; raters active fellows or surgeons. */
async function checkMembers(db: Db, studyId: number, input: CreateRoundInput): Promise<void> {
  const films = await studyFilms(db, studyId, input.imageIds)
  const outside = input.imageIds.filter((id) => !films.has(id))
  if (outside.length > 0)
    fieldError(
      'imageIds',
      `${outside.slice(0, 10).join(', ')} ${outside.length === 1 ? 'is not a film' : 'are not films'} of this study's patients`,
    )
  const frontal = input.imageIds.filter((id) => films.get(id) === 'ap')
  if (frontal.length > 0)
    fieldError(
      'imageIds',
      `${frontal.slice(0, 10).join(', ')} ${frontal.length === 1 ? 'is a frontal (AP) film' : 'are frontal (AP) films'}; the ${input.template} template reads lateral films`,
    )
  const roles = await activeUserRoles(db, input.raterIds)
  const refused = input.raterIds.filter((id) => {
    const role = roles.get(id)
    return role !== 'fellow' && role !== 'surgeon'
  })
  if (refused.length > 0)
    fieldError(
      'raterIds',
      `${refused.join(', ')} ${refused.length === 1 ? 'is not an active fellow or surgeon' : 'are not active fellows or surgeons'}`,
    )
}

/**
 * Every rater gets every film in each pass, in an order drawn per rater and pass from the seed;
 * a repeat pass never keeps the previous pass's order when another order exists.
 */
export function planAssignments(
  imageIds: readonly number[],
  raterIds: readonly number[],
  repeats: number,
  seed: string,
) {
  const codes = blindCodes(imageIds, repeats, seed)
  const assignments: Array<{
    imageId: number
    raterId: number
    repetition: number
    position: number
    blindCode: string
  }> = []
  for (const raterId of raterIds) {
    let previous: number[] | null = null
    for (let repetition = 1; repetition <= repeats; repetition += 1) {
      let order = raterOrder(imageIds, seed, raterId, repetition)
      for (let attempt = 1; previous && sameOrder(order, previous) && attempt <= 20; attempt += 1)
        order = raterOrder(imageIds, `${seed}#${attempt}`, raterId, repetition)
      order.forEach((imageId, index) =>
        assignments.push({
          imageId,
          raterId,
          repetition,
          position: index + 1,
          blindCode: codes.get(codeKey(imageId, repetition))!,
        }),
      )
      previous = order
    }
  }
  return {
    images: imageIds.map((imageId) => ({ imageId, blindCode: codes.get(codeKey(imageId, 1))! })),
    raters: raterIds.map((userId, index) => ({ userId, raterCode: `R${index + 1}` })),
    assignments,
  }
}

const sameOrder = (a: readonly number[], b: readonly number[]) => a.every((id, i) => id === b[i])

export async function createRound(
  db: Db,
  actor: Actor,
  studyId: number,
  input: CreateRoundInput,
): Promise<RoundSummary> {
  await loadStudyFor(db, actor, studyId)
  await checkMembers(db, studyId, input)
  const repeats = input.kind === 'intra' ? (input.repeats ?? DEFAULT_INTRA_REPEATS) : 1
  const seed = input.seed ?? newRoundSeed()
  const templateOptions =
    input.template === 'slip-grade' ? { segment: input.templateOptions?.segment ?? 'L5-S1' } : {}
  return db.transaction(async (trx) => {
    const id = await insertRound(trx, {
      studyId,
      name: input.name,
      kind: input.kind,
      template: input.template,
      templateOptions,
      options: {
        showResultsBeforeSubmit: input.options.showResultsBeforeSubmit,
        ...(input.kind === 'intra' ? { gapDays: input.options.gapDays } : {}),
      },
      repeats,
      seed,
      createdBy: actor.user.id,
    })
    const plan = planAssignments(input.imageIds, input.raterIds, repeats, seed)
    await insertRoundMembers(trx, id, plan)
    await audit(
      trx,
      actor,
      'create',
      'round',
      id,
      `Started ${input.kind}-rater round ${id} in study ${studyId}: ${input.imageIds.length} films, raters ${input.raterIds.join(', ')}, ${repeats} pass${repeats === 1 ? '' : 'es'}, ${plan.assignments.length} assignments`,
    )
    return toSummary(trx, (await findRound(trx, id))!)
  })
}

export async function listRounds(
  db: Db,
  actor: Actor,
  studyId: number,
  page: { offset?: number; limit?: number },
): Promise<Page<RoundSummary>> {
  await loadStudyFor(db, actor, studyId)
  const found = await listStudyRounds(db, studyId, {
    offset: page.offset ?? 0,
    limit: page.limit ?? 20,
  })
  const items: RoundSummary[] = []
  for (const round of found.items) items.push(await toSummary(db, round))
  return { items, total: found.total }
}

export async function getRound(db: Db, actor: Actor, id: number, now: Date): Promise<RoundDetail> {
  const round = await loadVisibleRound(db, actor, id)
  const assignments = await listRoundAssignments(db, id)
  const states = assignmentStates(assignments, round.options.gapDays ?? 0, now)
  // Researchers see rater codes only; the people who run the round see who the raters are.
  const withIdentity = actor.user.role !== 'researcher'
  return {
    ...(await toSummary(db, round)),
    raters: raterProgress(await listRoundRaters(db, id), assignments, states, withIdentity),
    images: (await listRoundImageCodes(db, id)).map((blindCode) => ({ blindCode })),
  }
}

export async function patchRound(
  db: Db,
  actor: Actor,
  id: number,
  patch: RoundPatch,
  now: Date,
): Promise<RoundDetail> {
  const round = await loadVisibleRound(db, actor, id)
  if (!(await updateRoundStatus(db, id, patch.version, patch.status))) {
    throw conflict('Someone else changed this round since you opened it. Reload to see it.', {
      version: [
        `version: current version is ${(await findRound(db, id))?.version ?? round.version}`,
      ],
    })
  }
  const verb = patch.status === 'closed' ? 'Closed' : 'Reopened'
  await audit(db, actor, 'update', 'round', id, `${verb} round ${id} (was ${round.status})`)
  return getRound(db, actor, id, now)
}
