import { afterAll, beforeAll, beforeEach, describe, expect, it, vi } from 'vitest'
import { pino } from 'pino'
import request from 'supertest'
import type { Express } from 'express'
import type { Db } from '../../server/db/knex'
import type { AppConfig } from '../../server/config'
import { config as projectConfig } from '../../server/config'
import { TABLES } from '../../server/db/tables'
import { GENESIS_HASH } from '../../server/db/audit-chain'
import { verifyAuditChain } from '../../server/db/audit-chain-verify'
import { sealQueuedAuditEvents } from '../../server/db/audit-seal'
import { createAuditSealer } from '../../server/services/audit-sealer'
import { mariaDbPaths, runRootSql } from '../../server/cli/mariadb'
import type { Role } from '../../shared/types/domain'
import { openTestDb, truncateAll, workerDatabaseName } from '../support/test-db'
import { buildTestApp, createUsersForEveryRole, type TestUser } from '../support/test-app'
import { insertTestPatient } from '../support/fixtures'

let db: Db
let app: Express
let config: AppConfig
let users: Record<Role, TestUser>
let patientId: number

beforeAll(async () => {
  db = await openTestDb()
  ;({ app, config } = buildTestApp(db))
})
afterAll(async () => {
  await db.destroy()
})
beforeEach(async () => {
  await truncateAll(db)
  users = await createUsersForEveryRole(db, config)
  patientId = await insertTestPatient(db, users.fellow.id)
})

const readPatient = (who: TestUser) =>
  request(app).get(`/api/patients/${patientId}`).set('Cookie', who.cookie)
const chain = () => request(app).get('/api/audit-events/chain').set('Cookie', users.admin.cookie)

const rootSql = (sql: string) =>
  runRootSql(mariaDbPaths(projectConfig.dataDirAbsolute), `USE \`${workerDatabaseName()}\`; ${sql}`)

describe('the application account and the audit trail', () => {
  it('is refused UPDATE and DELETE of audit events and seals by MariaDB itself, and may still append', async () => {
    expect((await readPatient(users.fellow)).status).toBe(200)
    await verifyAuditChain(db)
    const [event] = await db(TABLES.auditEvents).select('id')
    expect(event).toBeDefined()
    // MariaDB error 1142 ER_TABLEACCESS_DENIED_ERROR: "UPDATE command denied to user ...".
    await expect(
      db(TABLES.auditEvents).where({ id: event.id }).update({ summary: 'rewritten' }),
    ).rejects.toMatchObject({ errno: 1142 })
    await expect(db(TABLES.auditEvents).where({ id: event.id }).delete()).rejects.toMatchObject({
      errno: 1142,
    })
    await expect(db.raw(`TRUNCATE TABLE \`${TABLES.auditEvents}\``)).rejects.toMatchObject({
      errno: 1142,
    })
    await expect(
      db(TABLES.auditSeals).where({ event_id: event.id }).update({ hash: GENESIS_HASH }),
    ).rejects.toMatchObject({ errno: 1142 })
    await expect(db(TABLES.auditSeals).delete()).rejects.toMatchObject({ errno: 1142 })
    expect((await readPatient(users.fellow)).status).toBe(200)
    expect(await db(TABLES.auditEvents).count({ n: '*' })).toEqual([{ n: 2 }])
  })
})

describe('the hash chain', () => {
  it('queues every event as it is written and chains 50 concurrent ones into one unbroken chain', async () => {
    const answers = await Promise.all(
      Array.from({ length: 50 }, (_, i) => readPatient(i % 2 === 0 ? users.fellow : users.surgeon)),
    )
    expect(answers.map((res) => res.status)).toEqual(Array(50).fill(200))
    expect(await db(TABLES.auditUnsealed).count({ n: '*' })).toEqual([{ n: 50 }])
    expect(await sealQueuedAuditEvents(db)).toBe(50)
    expect(await db(TABLES.auditUnsealed).count({ n: '*' })).toEqual([{ n: 0 }])
    const seals = await db(TABLES.auditSeals).orderBy('seq')
    // One chain: seals 1..50, one per event, each linking to the hash of the one before it.
    expect(seals.map((seal) => Number(seal.seq))).toEqual(
      Array.from({ length: 50 }, (_, i) => i + 1),
    )
    expect(new Set(seals.map((seal) => Number(seal.event_id))).size).toBe(50)
    expect(seals[0].prev_hash).toBe(GENESIS_HASH)
    for (let i = 1; i < seals.length; i++) expect(seals[i].prev_hash).toBe(seals[i - 1].hash)
    const head = await db(TABLES.auditChainHead).where({ id: 1 }).first()
    expect({ seq: Number(head.last_seq), hash: head.last_hash }).toEqual({
      seq: 50,
      hash: seals[49].hash,
    })
    const res = await chain()
    expect(res.status).toBe(200)
    expect(res.body).toEqual({ intact: true, checked: 50, firstBreak: null })
  })

  it('is kept up by the sealer without anyone asking, from the commit of each event', async () => {
    const sealer = createAuditSealer({ db, logger: pino({ level: 'silent' }), settleMs: 5 })
    sealer.start()
    try {
      for (let i = 0; i < 3; i++) expect((await readPatient(users.fellow)).status).toBe(200)
      await vi.waitFor(
        async () => expect(await db(TABLES.auditSeals).count({ n: '*' })).toEqual([{ n: 3 }]),
        { timeout: 10_000, interval: 20 },
      )
      expect(await db(TABLES.auditUnsealed).count({ n: '*' })).toEqual([{ n: 0 }])
    } finally {
      await sealer.stop()
    }
  })

  it('finds an UPDATE made as MariaDB root at the event that was changed', async () => {
    for (let i = 0; i < 5; i++) expect((await readPatient(users.fellow)).status).toBe(200)
    expect((await chain()).body.intact).toBe(true)
    await rootSql(`UPDATE \`${TABLES.auditEvents}\` SET summary = 'nothing happened' WHERE id = 3`)
    expect((await chain()).body).toEqual({
      intact: false,
      checked: 2,
      firstBreak: { id: 3, reason: 'content-changed' },
    })
  })

  it('finds an event deleted as root, foreign key checks off, at the deleted event', async () => {
    for (let i = 0; i < 4; i++) expect((await readPatient(users.fellow)).status).toBe(200)
    await verifyAuditChain(db)
    await rootSql(`SET FOREIGN_KEY_CHECKS = 0; DELETE FROM \`${TABLES.auditEvents}\` WHERE id = 2`)
    expect(await verifyAuditChain(db)).toEqual({
      intact: false,
      checked: 1,
      firstBreak: { id: 2, reason: 'event-missing' },
    })
  })

  it('finds a seal removed from the middle, and the newest seals removed from the end', async () => {
    for (let i = 0; i < 5; i++) expect((await readPatient(users.fellow)).status).toBe(200)
    await verifyAuditChain(db)
    await rootSql(`DELETE FROM \`${TABLES.auditSeals}\` WHERE seq = 5`)
    expect(await verifyAuditChain(db)).toEqual({
      intact: false,
      checked: 4,
      firstBreak: { id: 4, reason: 'head-mismatch' },
    })
    await rootSql(`DELETE FROM \`${TABLES.auditSeals}\` WHERE seq = 2`)
    expect(await verifyAuditChain(db)).toEqual({
      intact: false,
      checked: 1,
      firstBreak: { id: 3, reason: 'link-broken' },
    })
  })

  it('finds an event taken out of the queue before its seal, as one outside the chain', async () => {
    for (let i = 0; i < 3; i++) expect((await readPatient(users.fellow)).status).toBe(200)
    await rootSql(`DELETE FROM \`${TABLES.auditUnsealed}\` WHERE event_id = 2`)
    expect(await verifyAuditChain(db)).toEqual({
      intact: false,
      checked: 2,
      firstBreak: { id: 2, reason: 'not-chained' },
    })
  })
})
