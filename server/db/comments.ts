import type { Db } from './knex'
import { TABLES } from './tables'
import { toIsoDateTime } from './rows'
import type { ReadingComment } from '../../shared/types/readings'

interface CommentRow {
  id: number
  reading_id: number
  user_id: number
  author_name: string
  kind: ReadingComment['kind']
  body: string
  created_at: Date
}

function toComment(row: CommentRow): ReadingComment {
  return {
    id: row.id,
    readingId: row.reading_id,
    authorId: row.user_id,
    authorName: row.author_name,
    kind: row.kind,
    text: row.body,
    createdAt: toIsoDateTime(row.created_at),
  }
}

const selectComments = (db: Db) =>
  db(`${TABLES.comments} as c`)
    .join(`${TABLES.users} as u`, 'u.id', 'c.user_id')
    .select(
      'c.id',
      'c.reading_id',
      'c.user_id',
      'u.display_name as author_name',
      'c.kind',
      'c.body',
      'c.created_at',
    )

/** A reading's thread, oldest first. */
export async function listComments(db: Db, readingId: number): Promise<ReadingComment[]> {
  const rows = (await selectComments(db)
    .where('c.reading_id', readingId)
    .orderBy([
      { column: 'c.created_at', order: 'asc' },
      { column: 'c.id', order: 'asc' },
    ])) as CommentRow[]
  return rows.map(toComment)
}

export async function insertComment(
  db: Db,
  comment: { readingId: number; userId: number; kind: ReadingComment['kind']; text: string },
): Promise<ReadingComment> {
  const [id] = await db(TABLES.comments).insert({
    reading_id: comment.readingId,
    user_id: comment.userId,
    kind: comment.kind,
    body: comment.text,
  })
  const row = (await selectComments(db).where('c.id', id).first()) as CommentRow
  return toComment(row)
}

/** Everyone who wrote in a reading's thread. */
export async function listCommenterIds(db: Db, readingId: number): Promise<number[]> {
  const rows = (await db(TABLES.comments)
    .distinct('user_id')
    .where({ reading_id: readingId })) as Array<{ user_id: number }>
  return rows.map((row) => row.user_id)
}
