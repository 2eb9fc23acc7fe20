/**
 * Sign-off: a surgeon signs a submitted reading or returns it with a comment; a signed reading is
 * corrected by an amendment, a new draft that supersedes it once signed.
 */
import type { Db } from '../db/knex'
import {
  insertReading,
  lockReading,
  returnSubmittedReading,
  signSubmittedReading,
  supersedeSignedReading,
} from '../db/readings'
import { insertComment } from '../db/comments'
import { conflict } from '../errors'
import { APP_VERSION } from '../version'
import type { Reading, ReturnReadingInput } from '../../shared/types/readings'
import { audit, type Actor } from './audit'
import {
  assertCan,
  guardedWrite,
  GuardedWriteRefused,
  loadVisibleReading,
  recomputeStored,
  reload,
  toReadingDto,
} from './readings'
import { notifyReadingReviewed } from './reading-notifications'

export async function signReading(
  db: Db,
  actor: Actor,
  id: number,
  version: number,
): Promise<Reading> {
  const { reading, image } = await loadVisibleReading(db, actor, id)
  assertCan('sign', reading, actor, version)
  return guardedWrite(db, 'sign', id, actor, version, async (trx) => {
    // Recomputed once more, so the signed results are those of the engine and settings in force
    // at signature, and frozen from here on with that engine version.
    const computation = await recomputeStored(trx, reading, image, id)
    if (!(await signSubmittedReading(trx, id, version, actor.user.id, computation)))
      throw new GuardedWriteRefused()
    let replaced = ''
    if (reading.supersedesId !== null) {
      // The amendment is now the record; the original stays visible as superseded.
      await supersedeSignedReading(trx, reading.supersedesId)
      replaced = `; reading ${reading.supersedesId} is superseded`
      await audit(
        trx,
        actor,
        'update',
        'reading',
        reading.supersedesId,
        `Reading ${reading.supersedesId} superseded by signed amendment ${id}`,
      )
    }
    await audit(
      trx,
      actor,
      'sign',
      'reading',
      id,
      `Signed ${reading.template} reading ${id} by ${reading.raterName} (engine ${APP_VERSION})${replaced}`,
    )
    const signed = await reload(trx, id)
    await notifyReadingReviewed(trx, signed, actor, 'signed')
    return toReadingDto(signed)
  })
}

export async function returnReading(
  db: Db,
  actor: Actor,
  id: number,
  input: ReturnReadingInput,
): Promise<Reading> {
  const { reading } = await loadVisibleReading(db, actor, id)
  assertCan('return', reading, actor, input.version)
  return guardedWrite(db, 'return', id, actor, input.version, async (trx) => {
    if (!(await returnSubmittedReading(trx, id, input.version, actor.user.id, input.comment)))
      throw new GuardedWriteRefused()
    await insertComment(trx, {
      readingId: id,
      userId: actor.user.id,
      kind: 'return',
      text: input.comment,
    })
    // The comment itself stays out of the trail: free text may name the patient.
    await audit(
      trx,
      actor,
      'return',
      'reading',
      id,
      `Returned ${reading.template} reading ${id} to ${reading.raterName} with a comment of ${input.comment.length} characters`,
    )
    const returned = await reload(trx, id)
    await notifyReadingReviewed(trx, returned, actor, 'returned')
    return toReadingDto(returned)
  })
}

/**
 * A new draft by the actor with the signed reading's landmarks, recomputed with the films'
 * current calibration. One amendment at a time: a second is refused while one exists.
 */
export async function amendReading(
  db: Db,
  actor: Actor,
  id: number,
  reason: string,
): Promise<Reading> {
  const { image } = await loadVisibleReading(db, actor, id)
  return db.transaction(async (trx) => {
    await lockReading(trx, id)
    const original = await reload(trx, id)
    assertCan('amend', original, actor)
    if (original.supersededById !== null) {
      throw conflict(
        `Reading ${original.supersededById} already amends this reading; continue that one instead.`,
        { supersededById: [`supersededById: ${original.supersededById}`] },
      )
    }
    const computation = await recomputeStored(trx, original, image, null)
    const amendmentId = await insertReading(trx, {
      imageId: original.imageId,
      pairedImageId: original.pairedImageId,
      raterId: actor.user.id,
      template: original.template,
      options: original.options,
      supersedes: { id, reason },
      suggestionUse: original.suggestionUse,
      ...computation,
    })
    await audit(
      trx,
      actor,
      'amend',
      'reading',
      amendmentId,
      `Started amendment ${amendmentId} of signed ${original.template} reading ${id} with a reason of ${reason.length} characters`,
    )
    return toReadingDto(await reload(trx, amendmentId))
  })
}
