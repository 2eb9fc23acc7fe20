import type { Db } from './knex'
import { TABLES } from './tables'
import { toIsoDateTime } from './rows'
import type { CaughtMail } from '../../shared/types/mail'

/** Keeps what the local fake mail server caught (development, demo and tests). */
export async function insertCaughtMail(
  db: Db,
  mail: { to: string; subject: string; text: string },
): Promise<void> {
  await db(TABLES.caughtMails).insert({
    to_address: mail.to.slice(0, 1000),
    subject: mail.subject.slice(0, 500),
    body_text: mail.text,
  })
}

/** Newest first. */
export async function listCaughtMails(
  db: Db,
  page: { offset: number; limit: number; to?: string },
): Promise<{ items: CaughtMail[]; total: number }> {
  const query = db(TABLES.caughtMails)
  if (page.to) query.whereILike('to_address', `%${page.to.replace(/[\\%_]/g, (c) => `\\${c}`)}%`)
  const [{ total }] = (await query.clone().count({ total: '*' })) as [{ total: number | string }]
  const rows = await query
    .select('id', 'to_address', 'subject', 'body_text', 'received_at')
    .orderBy('id', 'desc')
    .offset(page.offset)
    .limit(page.limit)
  return {
    total: Number(total),
    items: rows.map((row) => ({
      id: row.id,
      to: row.to_address,
      subject: row.subject,
      text: row.body_text,
      receivedAt: toIsoDateTime(row.received_at),
    })),
  }
}
