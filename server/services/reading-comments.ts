import type { Db } from '../db/knex'
import { insertComment, listComments } from '../db/comments'
import type { ReadingComment } from '../../shared/types/readings'
import { audit, type Actor } from './audit'
import { loadVisibleReading } from './readings'
import { notifyReadingComment } from './reading-notifications'

export async function listReadingComments(
  db: Db,
  actor: Actor,
  readingId: number,
): Promise<ReadingComment[]> {
  await loadVisibleReading(db, actor, readingId)
  return listComments(db, readingId)
}

export async function addReadingComment(
  db: Db,
  actor: Actor,
  readingId: number,
  text: string,
): Promise<ReadingComment> {
  const { reading } = await loadVisibleReading(db, actor, readingId)
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
