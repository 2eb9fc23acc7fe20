/// <reference types="node" />
/**
 * One rule decides whether a reading may be submitted (shared/readings/reading-rules): every
 * required landmark of the template placed on each of its films, optional ones (the second
 * femoral head, a spinous process) left out at will. This table runs each case through both
 * sides: the server's submit (real API, real MariaDB) and the client's readings store (its
 * Submit button and message), fed the reading exactly as the API returns it.
 */
import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterAll, beforeAll, beforeEach, describe, expect, it, vi } from 'vitest'
import request from 'supertest'
import type { Express } from 'express'
import { createPinia, setActivePinia } from 'pinia'
import type { Db } from '../../server/db/knex'
import type { AppConfig } from '../../server/config'
import { flexionExtensionPair } from '../../server/phantom/motion-pair'
import type { PhantomParamsInput } from '../../server/phantom/phantom-params'
import { submitRefusal } from '../../shared/readings/reading-rules'
import { templateLandmarks, type TemplateOptions } from '../../shared/readings/templates'
import type { ReadingTemplate, Role } from '../../shared/types/domain'
import type { PixelPoint } from '../../shared/types/landmarks'
import * as readingsApi from '../../src/api/readings'
import * as imagesApi from '../../src/api/images'
import * as visitsApi from '../../src/api/visits'
import { useReadingsStore } from '../../src/stores/readings'
import { useReadingEditorStore } from '../../src/stores/reading-editor'
import { openTestDb, truncateAll } from '../support/test-db'
import { buildTestApp, createUsersForEveryRole, type TestUser } from '../support/test-app'
import { insertTestPatient, insertTestVisit } from '../support/fixtures'
import { smallPhantomFiles } from '../support/phantom-files'

vi.mock('@/api/readings')
vi.mock('@/api/images')
vi.mock('@/api/visits')

type Phantom = Awaited<ReturnType<typeof smallPhantomFiles>>
type Points = Record<string, PixelPoint>
type FilmName = 'lateral' | 'ap' | 'flexion'

let db: Db
let app: Express
let config: AppConfig
let uploadDir: string
let users: Record<Role, TestUser>
let visitId: number
const films = {} as Record<FilmName | 'extension', Phantom>

beforeAll(async () => {
  db = await openTestDb()
  uploadDir = mkdtempSync(join(tmpdir(), 'endplate-rules-'))
  ;({ app, config } = buildTestApp(db, { UPLOAD_DIR: uploadDir }))
  const small: PhantomParamsInput = { widthPx: 750, heightPx: 625, detectorPixelMm: 0.6 }
  // Invented post-op films: a disc replacement at L4-L5, seen from the side and from the front.
  films.lateral = await smallPhantomFiles({
    implants: [{ kind: 'disc-replacement', segment: 'L4-L5' }],
  })
  films.ap = await smallPhantomFiles({
    view: 'ap',
    seriesDescription: 'LUMBAR SPINE AP',
    widthPx: 625,
    heightPx: 750,
    implants: [{ kind: 'disc-replacement', segment: 'L4-L5', lateralOffsetMm: 1 }],
  })
  const pair = flexionExtensionPair(small, {
    segment: 'L4-L5',
    angularRangeDeg: 10,
    translationPercent: 4,
  })
  films.flexion = await smallPhantomFiles(pair.flexion as PhantomParamsInput)
  films.extension = await smallPhantomFiles(pair.extension as PhantomParamsInput)
}, 90_000)
afterAll(async () => {
  await db.destroy()
  rmSync(uploadDir, { recursive: true, force: true })
})
beforeEach(async () => {
  await truncateAll(db)
  users = await createUsersForEveryRole(db, config)
  const patientId = await insertTestPatient(db, users.fellow.id)
  visitId = await insertTestVisit(db, patientId, users.fellow.id, '2026-03-02', 'post-op')
  setActivePinia(createPinia())
})

interface RuleCase {
  name: string
  template: ReadingTemplate
  options: TemplateOptions
  film: FilmName
  /** Landmarks of the template left out on the (first) film. */
  omit: string[]
  /** Motion pair: landmarks left out on the extension film. */
  omitPaired?: string[]
  /** What the rule should answer, stated apart from the rule itself. */
  submittable: boolean
  /** Part of the refusal message, when refused. */
  message?: RegExp
}

const CASES: RuleCase[] = [
  {
    name: 'a complete slip grade',
    template: 'slip-grade',
    options: { segment: 'L4-L5' },
    film: 'lateral',
    omit: [],
    submittable: true,
  },
  {
    // The client used to refuse this and the server to accept it (one landmark was enough).
    name: 'a slip grade missing one corner',
    template: 'slip-grade',
    options: { segment: 'L4-L5' },
    film: 'lateral',
    omit: ['L5.ai'],
    submittable: false,
    message: /^Place 1 required landmark before submitting: L5 anterior-inferior\.$/,
  },
  {
    name: 'a lumbar alignment without the second femoral head (optional)',
    template: 'lumbar-alignment',
    options: {},
    film: 'lateral',
    omit: ['FH2'],
    submittable: true,
  },
  {
    name: 'a lumbar alignment without any femoral head',
    template: 'lumbar-alignment',
    options: {},
    film: 'lateral',
    omit: ['FH1', 'FH2'],
    submittable: false,
    message: /Femoral head centre 1\.$/,
  },
  {
    name: 'a construct check without the disc-replacement marker',
    template: 'construct-check',
    options: { construct: [{ segment: 'L4-L5', implant: 'disc-replacement' }] },
    film: 'lateral',
    omit: ['implant.L4-L5.marker'],
    submittable: false,
    message: /Disc replacement marker L4-L5/,
  },
  {
    name: 'an implant centring without the spinous process (optional)',
    template: 'implant-centring',
    options: { discReplacements: ['L4-L5'] },
    film: 'ap',
    omit: ['L4.sp'],
    submittable: true,
  },
  {
    name: 'an implant centring with neither endplate below the implant',
    template: 'implant-centring',
    options: { discReplacements: ['L4-L5'] },
    film: 'ap',
    omit: ['L5.sl', 'L5.sr'],
    submittable: false,
    message: /^Place 2 required landmarks before submitting: L5 superior endplate/,
  },
  {
    name: 'a motion pair missing a corner on the extension film only',
    template: 'motion-pair',
    options: { segment: 'L4-L5' },
    film: 'flexion',
    omit: [],
    omitPaired: ['L4.as'],
    submittable: false,
    message: /L4 anterior-superior on the extension film\.$/,
  },
  {
    name: 'a complete motion pair',
    template: 'motion-pair',
    options: { segment: 'L4-L5' },
    film: 'flexion',
    omit: [],
    omitPaired: [],
    submittable: true,
  },
]

async function upload(film: Phantom, view: string): Promise<number> {
  const res = await request(app)
    .post(`/api/visits/${visitId}/images`)
    .set('Cookie', users.fellow.cookie)
    .field('view', view)
    .field('confirmPatientMismatch', 'true')
    .attach('file', film.dicom, `${view}.dcm`)
  expect(res.status).toBe(201)
  return res.body[0].id as number
}

function pointsOf(film: Phantom, rule: RuleCase, omit: string[]): Points {
  const names = templateLandmarks(rule.template, rule.options).map((spec) => spec.name)
  const truth = film.film.landmarks.points as Points
  return Object.fromEntries(
    names.filter((name) => !omit.includes(name)).map((name) => [name, truth[name] as PixelPoint]),
  )
}

/** Saves a motion pair's extension-film landmarks; answers the new version. */
async function placePaired(
  id: number,
  points: Points,
  pairedPoints: Points,
  version: number,
): Promise<number> {
  const patched = await request(app)
    .patch(`/api/readings/${id}`)
    .set('Cookie', users.fellow.cookie)
    .send({ points, pairedPoints, version })
  expect(patched.status).toBe(200)
  return patched.body.version as number
}

const get = (path: string) => request(app).get(path).set('Cookie', users.fellow.cookie)

describe('the submit rule, on the server and in the client', () => {
  it.each(CASES)('$name', async (rule) => {
    const isPair = rule.template === 'motion-pair'
    const view =
      rule.film === 'ap' ? 'ap' : rule.film === 'flexion' ? 'lateral-flexion' : 'lateral-neutral'
    const imageId = await upload(films[rule.film], view)
    const pairedImageId = isPair ? await upload(films.extension, 'lateral-extension') : undefined
    const points = pointsOf(films[rule.film], rule, rule.omit)
    const pairedPoints = isPair ? pointsOf(films.extension, rule, rule.omitPaired ?? []) : null
    const created = await request(app)
      .post(`/api/images/${imageId}/readings`)
      .set('Cookie', users.fellow.cookie)
      .send({ template: rule.template, options: rule.options, points, pairedImageId })
    expect(created.status).toBe(201)
    const version = pairedPoints
      ? await placePaired(created.body.id, points, pairedPoints, created.body.version)
      : (created.body.version as number)

    // The rule itself, against what the table says.
    const refusal = submitRefusal({
      template: rule.template,
      options: rule.options,
      points,
      pairedPoints,
    })
    expect(refusal === null).toBe(rule.submittable)
    expect(refusal?.message ?? '').toMatch(rule.message ?? /^$/)

    // The client: the store fed the reading and films as the API returns them.
    const reading = (await get(`/api/readings/${created.body.id}`)).body
    vi.mocked(readingsApi.getReading).mockResolvedValue(reading)
    vi.mocked(imagesApi.getImage).mockImplementation(
      async (id: number) => (await get(`/api/images/${id}`)).body,
    )
    vi.mocked(visitsApi.getVisit).mockImplementation(
      async (id: number) => (await get(`/api/visits/${id}`)).body,
    )
    const store = useReadingsStore()
    // The rater looks at it: only the rater may submit a reading.
    store.viewer = { id: users.fellow.id, role: 'fellow' }
    await store.load(created.body.id)
    expect(store.loadError).toBeNull()
    expect(store.canSubmit).toBe(rule.submittable)
    expect(useReadingEditorStore().submitBlocked).toBe(refusal?.message ?? null)

    // The server: the same verdict and the same words.
    const submitted = await request(app)
      .post(`/api/readings/${created.body.id}/submit`)
      .set('Cookie', users.fellow.cookie)
      .send({ version })
    expect(submitted.status).toBe(rule.submittable ? 200 : 400)
    expect(submitted.body.error?.message).toBe(refusal?.message)
  })
})
