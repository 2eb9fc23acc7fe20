import type { Db } from './knex'
import { TABLES } from './tables'
import { chainedFieldsOf, chainHash, GENESIS_HASH } from './audit-chain'
import { sealQueuedAuditEvents } from './audit-seal'

export type ChainBreak =
  | { id: number; reason: 'content-changed' }
  | { id: number; reason: 'link-broken' }
  | { id: number; reason: 'event-missing' }
  | { id: number; reason: 'head-mismatch' }
  | { id: number; reason: 'not-chained' }

export interface ChainVerification {
  intact: boolean
  /** Events checked, in chain order. */
  checked: number
  /** The first event where the chain breaks; null when it is intact. */
  firstBreak: ChainBreak | null
}

const BATCH = 1000

/**
 * Seals what is queued, then recomputes the chain from the first seal in batches: an event whose
 * content no longer gives its seal's hash was changed; a seal whose event is gone marks a deleted
 * event; a seal whose previous hash is not its predecessor's hash, or whose number skips one,
 * marks a seal removed or forged. The head row must name the last seal, so removing the newest
 * seals shows too, and every event must have a seal or wait in the queue, so an event slipped in
 * around the queue shows as well.
 */
export async function verifyAuditChain(db: Db): Promise<ChainVerification> {
  while ((await sealQueuedAuditEvents(db)) > 0);
  let previousHash = GENESIS_HASH
  let previousSeq = 0
  let lastEventId = 0
  let checked = 0
  for (;;) {
    const rows = (await db(`${TABLES.auditSeals} as s`)
      .leftJoin(`${TABLES.auditEvents} as e`, 'e.id', 's.event_id')
      .where('s.seq', '>', previousSeq)
      .orderBy('s.seq')
      .limit(BATCH)
      .select(
        's.seq',
        's.event_id',
        's.prev_hash',
        's.hash',
        'e.id',
        'e.at',
        'e.user_id',
        'e.action',
        'e.entity',
        'e.entity_id',
        'e.summary',
        'e.ip',
      )) as Array<Record<string, unknown>>
    for (const row of rows) {
      const eventId = Number(row.event_id)
      const fail = (reason: ChainBreak['reason']): ChainVerification => ({
        intact: false,
        checked,
        firstBreak: { id: eventId, reason } as ChainBreak,
      })
      if (row.id === null) return fail('event-missing')
      if (Number(row.seq) !== previousSeq + 1 || row.prev_hash !== previousHash)
        return fail('link-broken')
      if (chainHash(previousHash, chainedFieldsOf(row)) !== row.hash) return fail('content-changed')
      previousHash = String(row.hash)
      previousSeq = Number(row.seq)
      lastEventId = eventId
      checked += 1
    }
    if (rows.length < BATCH) break
  }
  const head = await db(TABLES.auditChainHead).where({ id: 1 }).first()
  if (head && (Number(head.last_seq) !== previousSeq || head.last_hash !== previousHash))
    return { intact: false, checked, firstBreak: { id: lastEventId, reason: 'head-mismatch' } }
  const outside = (await db(`${TABLES.auditEvents} as e`)
    .leftJoin(`${TABLES.auditSeals} as s`, 's.event_id', 'e.id')
    .leftJoin(`${TABLES.auditUnsealed} as q`, 'q.event_id', 'e.id')
    .whereNull('s.event_id')
    .whereNull('q.event_id')
    .min({ id: 'e.id' })
    .first()) as { id: number | string | null } | undefined
  if (outside?.id != null)
    return { intact: false, checked, firstBreak: { id: Number(outside.id), reason: 'not-chained' } }
  return { intact: true, checked, firstBreak: null }
}
