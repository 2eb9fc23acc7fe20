import type { Knex } from 'knex'
import { TABLES } from '../server/db/tables'
import { createReading, patchReading, submitReading } from '../server/services/readings'
import { phantomGroundTruth } from '../server/phantom/generate-phantom'
import { seededRandom } from '../server/phantom/seeded-random'
import { DEMO_PATIENTS } from '../server/demo/demo-data'
import { DEMO_FILMS, demoFilmParams, type DemoFilm } from '../server/demo/demo-films'
import { templateLandmarks } from '../shared/readings/templates'
import type { PixelPoint } from '../shared/types/landmarks'
import { demoActor } from '../server/demo/demo-actor'

/** A human hand: each landmark a little off the exact corner (about 1 px SD), reproducibly. */
function asPlacedByHand(
  points: Record<string, PixelPoint>,
  names: string[],
  seed: number,
): Record<string, PixelPoint> {
  const random = seededRandom(seed)
  const jitter = () => (random() + random() + random() - 1.5) * 2
  const placed: Record<string, PixelPoint> = {}
  for (const name of names) {
    const point = points[name]
    if (point) placed[name] = [point[0] + jitter(), point[1] + jitter()]
  }
  return placed
}

function groundTruth(film: DemoFilm): Record<string, PixelPoint> {
  const patient = DEMO_PATIENTS.find((candidate) => candidate.key === film.patientKey)!
  return phantomGroundTruth(demoFilmParams(film, patient, patient.visits[film.visitIndex]!))
    .landmarks.points
}

/**
 * Demo readings by the two fellows on the demo films, from the phantoms' exact landmarks with a
 * little hand jitter; some submitted for sign-off, some still drafts. Skipped with the films.
 */
export async function seed(knex: Knex): Promise<void> {
  if (process.env.NODE_ENV === 'production') throw new Error('Demo seeds never run in production.')
  if (process.env.NODE_ENV === 'test' && process.env.ENDPLATE_SEED_FILMS !== '1') return
  const fellows = [
    await demoActor(knex, 'priya.lindqvist@endplate.example'),
    await demoActor(knex, 'jonah.ferris@endplate.example'),
  ]

  for (const [index, film] of DEMO_FILMS.entries()) {
    if (!film.reading) continue
    const image = await knex(TABLES.images)
      .where({ original_name: `${film.preset}.dcm` })
      .first()
    if (!image) throw new Error(`Demo film ${film.preset} was not filed`)
    const actor = fellows[index % fellows.length]!
    const names = templateLandmarks(film.reading.template, film.reading.options).map(
      (spec) => spec.name,
    )
    const points = asPlacedByHand(groundTruth(film), names, film.seed)
    const pairedFilm =
      film.reading.template === 'motion-pair'
        ? DEMO_FILMS.find((other) => other.preset === 'motion-extension')
        : undefined
    const pairedImage = pairedFilm
      ? await knex(TABLES.images)
          .where({ original_name: `${pairedFilm.preset}.dcm` })
          .first()
      : undefined
    let reading = await createReading(knex, actor, image.id, {
      template: film.reading.template,
      options: film.reading.options,
      ...(pairedImage ? { pairedImageId: pairedImage.id } : {}),
      points,
    })
    if (pairedFilm) {
      const pairedPoints = asPlacedByHand(groundTruth(pairedFilm), names, pairedFilm.seed)
      reading = await patchReading(knex, actor, reading.id, {
        points,
        pairedPoints,
        version: reading.version,
      })
    }
    if (film.reading.submit) await submitReading(knex, actor, reading.id, reading.version)
  }
}
