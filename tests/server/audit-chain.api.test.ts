import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest'
import request from 'supertest'
import type { Express } from 'express'
import type { Db } from '../../server/db/knex'
import type { AppConfig } from '../../server/config'
import { config as projectConfig } from '../../server/config'
import { TABLES } from '../../server/db/tables'
import { GENESIS_HASH, verifyAuditChain } from '../../server/db/audit-chain'
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

describe('the application account and the audit trail', () => {
  it('is refused UPDATE and DELETE of audit events by MariaDB itself, and may still append', async () => {
    expect((await readPatient(users.fellow)).status).toBe(200)
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
    expect((await readPatient(users.fellow)).status).toBe(200)
    expect(await db(TABLES.auditEvents).count({ n: '*' })).toEqual([{ n: 2 }])
  })
})

describe('the hash chain', () => {
  it('stays one unbroken chain under 50 concurrent audited requests', async () => {
    const answers = await Promise.all(
      Array.from({ length: 50 }, (_, i) => readPatient(i % 2 === 0 ? users.fellow : users.surgeon)),
    )
    expect(answers.map((res) => res.status)).toEqual(Array(50).fill(200))
    const rows = await db(TABLES.auditEvents).orderBy('id')
    expect(rows).toHaveLength(50)
    // One chain: ids 1..50, each event links to the hash of the one before it, no two share one.
    expect(rows.map((row) => Number(row.id))).toEqual(Array.from({ length: 50 }, (_, i) => i + 1))
    expect(rows[0].prev_hash).toBe(GENESIS_HASH)
    for (let i = 1; i < rows.length; i++) expect(rows[i].prev_hash).toBe(rows[i - 1].hash)
    expect(new Set(rows.map((row) => row.prev_hash)).size).toBe(50)
    const res = await chain()
    expect(res.status).toBe(200)
    expect(res.body).toEqual({ intact: true, checked: 50, firstBreak: null })
  })

  it('finds an UPDATE made as MariaDB root at the event that was changed', async () => {
    for (let i = 0; i < 5; i++) expect((await readPatient(users.fellow)).status).toBe(200)
    expect((await chain()).body.intact).toBe(true)
    await runRootSql(
      mariaDbPaths(projectConfig.dataDirAbsolute),
      `UPDATE \`${workerDatabaseName()}\`.\`${TABLES.auditEvents}\` SET summary = 'nothing happened' WHERE id = 3`,
    )
    const res = await chain()
    expect(res.body).toEqual({
      intact: false,
      checked: 2,
      firstBreak: { id: 3, reason: 'content-changed' },
    })
  })

  it('finds an event deleted as root where the gap is', async () => {
    for (let i = 0; i < 4; i++) expect((await readPatient(users.fellow)).status).toBe(200)
    await runRootSql(
      mariaDbPaths(projectConfig.dataDirAbsolute),
      `DELETE FROM \`${workerDatabaseName()}\`.\`${TABLES.auditEvents}\` WHERE id = 2`,
    )
    expect(await verifyAuditChain(db)).toEqual({
      intact: false,
      checked: 1,
      firstBreak: { id: 3, reason: 'event-missing' },
    })
  })
})
