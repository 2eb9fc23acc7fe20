import type { Db } from './knex'
import { TABLES } from './tables'
import { chainedFieldsOf, chainHash, GENESIS_HASH } from './audit-chain'

/** Events sealed per transaction: a burst is chained in a few short statements. */
const SEAL_BATCH = 500

/**
 * Chains queued audit events onto the end of the hash chain, oldest queued first, and answers
 * how many it sealed. The head row is locked for the length of the transaction, so sealers in
 * several server processes take turns and the chain never forks; the requests that recorded the
 * events never wait for it.
 */
export async function sealQueuedAuditEvents(db: Db): Promise<number> {
  return db.transaction(async (trx) => {
    const head = (await trx(TABLES.auditChainHead).where({ id: 1 }).forUpdate().first()) as
      { last_seq: number | string; last_hash: string } | undefined
    const events = (await trx(`${TABLES.auditUnsealed} as q`)
      .join(`${TABLES.auditEvents} as e`, 'e.id', 'q.event_id')
      .orderBy('q.event_id')
      .limit(SEAL_BATCH)
      .select('e.*')) as Array<Record<string, unknown>>
    if (events.length === 0) return 0
    let seq = head ? Number(head.last_seq) : 0
    let previousHash = head?.last_hash ?? GENESIS_HASH
    const seals = events.map((event) => {
      const hash = chainHash(previousHash, chainedFieldsOf(event))
      seq += 1
      const seal = { seq, event_id: Number(event.id), prev_hash: previousHash, hash }
      previousHash = hash
      return seal
    })
    await trx(TABLES.auditSeals).insert(seals)
    await trx(TABLES.auditUnsealed)
      .whereIn(
        'event_id',
        seals.map((seal) => seal.event_id),
      )
      .delete()
    if (head)
      await trx(TABLES.auditChainHead)
        .where({ id: 1 })
        .update({ last_seq: seq, last_hash: previousHash })
    else await trx(TABLES.auditChainHead).insert({ id: 1, last_seq: seq, last_hash: previousHash })
    return seals.length
  })
}
