import type { Knex } from 'knex'
import { TABLES } from '../server/db/tables'
import { createRound } from '../server/services/rounds'
import { startAssignment } from '../server/services/assignments'
import { patchReading, submitReading } from '../server/services/readings'
import { phantomGroundTruth } from '../server/phantom/generate-phantom'
import { DEMO_PATIENTS } from '../server/demo/demo-data'
import { DEMO_FILMS, demoFilmParams } from '../server/demo/demo-films'
import { demoActor } from '../server/demo/demo-actor'
import {
  DEMO_ROUNDS,
  INTER_RATER_SIGMA_MM,
  INTRA_RATER_SIGMA_MM,
  placedWithNoise,
} from '../server/demo/demo-rounds'
import { templateLandmarks } from '../shared/readings/templates'
import type { Actor } from '../server/services/audit'

const DAY_MS = 86_400_000
const TEMPLATE = 'lumbar-alignment' as const
const NAMES = templateLandmarks(TEMPLATE).map((spec) => spec.name)

interface DemoRoundFilm {
  imageId: number
  mmPerPixel: [number, number]
  truth: ReturnType<typeof phantomGroundTruth>['landmarks']['points']
}

/** The study's lateral demo films with their exact landmarks. */
async function roundFilms(knex: Knex): Promise<DemoRoundFilm[]> {
  const films: DemoRoundFilm[] = []
  for (const film of DEMO_FILMS) {
    const image = await knex(TABLES.images)
      .where({ original_name: `${film.preset}.dcm` })
      .first()
    if (!image || image.view === 'ap') continue
    const patient = DEMO_PATIENTS.find((candidate) => candidate.key === film.patientKey)!
    if (!patient.inStudy) continue
    const truth = phantomGroundTruth(
      demoFilmParams(film, patient, patient.visits[film.visitIndex]!),
    )
    films.push({
      imageId: image.id as number,
      mmPerPixel: [Number(image.mm_per_pixel_row), Number(image.mm_per_pixel_column)],
      truth: truth.landmarks.points,
    })
  }
  return films
}

/** Reads one assignment through the services, as the rater's clicks would, and submits it. */
async function read(
  knex: Knex,
  actor: Actor,
  assignmentId: number,
  film: DemoRoundFilm,
  sigmaMm: number,
  seed: number,
): Promise<number> {
  const { readingId } = await startAssignment(knex, actor, assignmentId, new Date())
  const started = await knex(TABLES.readings).where({ id: readingId }).first('version')
  const points = placedWithNoise(film.truth, NAMES, sigmaMm, film.mmPerPixel, seed)
  const saved = await patchReading(knex, actor, readingId, { points, version: started.version })
  await submitReading(knex, actor, readingId, saved.version)
  return readingId
}

async function assignmentsOf(knex: Knex, roundId: number, raterId: number, repetition: number) {
  return knex(TABLES.roundAssignments)
    .where({ round_id: roundId, rater_id: raterId, repetition })
    .orderBy('position')
    .select('id', 'image_id')
}

/**
 * The demo study's two re-reading rounds with blinded readings, so the results page shows real
 * numbers on a fresh start. Skipped with the films.
 */
export async function seed(knex: Knex): Promise<void> {
  if (process.env.NODE_ENV === 'production') throw new Error('Demo seeds never run in production.')
  if (process.env.NODE_ENV === 'test' && process.env.ENDPLATE_SEED_FILMS !== '1') return
  const study = await knex(TABLES.studies).first('id')
  const films = await roundFilms(knex)
  const byImage = new Map(films.map((film) => [film.imageId, film]))
  const manager = await demoActor(knex, DEMO_ROUNDS.manager)
  const imageIds = films.map((film) => film.imageId)

  const raters = await Promise.all(DEMO_ROUNDS.inter.raters.map((email) => demoActor(knex, email)))
  const inter = await createRound(knex, manager, study.id as number, {
    name: DEMO_ROUNDS.inter.name,
    kind: 'inter',
    template: TEMPLATE,
    options: { showResultsBeforeSubmit: false },
    imageIds,
    raterIds: raters.map((rater) => rater.user.id),
    seed: DEMO_ROUNDS.inter.seed,
  })
  for (const [raterIndex, rater] of raters.entries()) {
    for (const assignment of await assignmentsOf(knex, inter.id, rater.user.id, 1)) {
      const film = byImage.get(assignment.image_id as number)!
      await read(
        knex,
        rater,
        assignment.id as number,
        film,
        INTER_RATER_SIGMA_MM,
        1000 * (raterIndex + 1) + film.imageId,
      )
    }
  }

  const fellow = await demoActor(knex, DEMO_ROUNDS.intra.rater)
  const intra = await createRound(knex, manager, study.id as number, {
    name: DEMO_ROUNDS.intra.name,
    kind: 'intra',
    template: TEMPLATE,
    options: { showResultsBeforeSubmit: false, gapDays: DEMO_ROUNDS.intra.gapDays },
    imageIds,
    raterIds: [fellow.user.id],
    repeats: 2,
    seed: DEMO_ROUNDS.intra.seed,
  })
  const firstPass: number[] = []
  for (const assignment of await assignmentsOf(knex, intra.id, fellow.user.id, 1)) {
    const film = byImage.get(assignment.image_id as number)!
    firstPass.push(
      await read(
        knex,
        fellow,
        assignment.id as number,
        film,
        INTRA_RATER_SIGMA_MM,
        5000 + film.imageId,
      ),
    )
  }
  // The first pass was read weeks ago in the story, so the gap has passed and the repeat is open.
  const readAt = new Date(Date.now() - DEMO_ROUNDS.intra.firstPassDaysAgo * DAY_MS)
  await knex(TABLES.readings)
    .whereIn('id', firstPass)
    .update({ created_at: readAt, updated_at: readAt, submitted_at: readAt })
  const repeats = await assignmentsOf(knex, intra.id, fellow.user.id, 2)
  for (const assignment of repeats.slice(0, DEMO_ROUNDS.intra.repeatsDone)) {
    const film = byImage.get(assignment.image_id as number)!
    await read(
      knex,
      fellow,
      assignment.id as number,
      film,
      INTRA_RATER_SIGMA_MM,
      7000 + film.imageId,
    )
  }
}
