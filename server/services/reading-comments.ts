import type { Db } from '../db/knex'
import { insertComment, listComments } from '../db/comments'
import type { ReadingComment } from '../../shared/types/readings'
import { HttpError } from '../errors'
import { audit, type Actor } from './audit'
import { loadVisibleReading } from './readings'
import { notifyReadingComment } from './reading-notifications'

export async function listReadingComments(
  db: Db,
  actor: Actor,
  readingId: number,
): Promise<ReadingComment[]> {
  const { reading } = await loadVisibleReading(db, actor, readingId)
  if (reading.blinded) return []
  return listComments(db, readingId)
}

export async function addReadingComment(
  db: Db,
  actor: Actor,
  readingId: number,
  text: string,
): Promise<ReadingComment> {
  const { reading } = await loadVisibleReading(db, actor, readingId)
  // A thread would carry dates and could name the patient; a round's reading has none.
  if (reading.blinded)
    throw new HttpError(
      409,
      'reading_blinded',
      'A reading made in a re-reading round has no thread.',
    )
  return db.transaction(async (trx) => {
    const comment = await insertComment(trx, {
      readingId,
      userId: actor.user.id,
      kind: 'comment',
      text,
    })
    await audit(
      trx,
      actor,
      'comment',
      'reading',
      readingId,
      `Commented on reading ${readingId} (${text.length} characters)`,
    )
    await notifyReadingComment(trx, reading, actor)
    return comment
  })
}
