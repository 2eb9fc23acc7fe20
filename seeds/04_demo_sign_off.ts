import type { Knex } from 'knex'
import { TABLES } from '../server/db/tables'
import { getReading, patchReading, submitReading } from '../server/services/readings'
import { amendReading, returnReading, signReading } from '../server/services/reading-review'
import { addReadingComment } from '../server/services/reading-comments'
import { createInvitation } from '../server/services/invitations'
import { systemClock } from '../server/clock'
import { demoActor } from '../server/demo/demo-actor'
import { DEMO_ADMIN, DEMO_INVITATION, DEMO_REVIEWS } from '../server/demo/demo-sign-off'

/** The reading a demo fellow made on the demo film of this preset. */
async function readingOnFilm(knex: Knex, preset: string): Promise<number> {
  const row = await knex(`${TABLES.readings} as r`)
    .join(`${TABLES.images} as i`, 'i.id', 'r.image_id')
    .where('i.original_name', `${preset}.dcm`)
    .orderBy('r.id')
    .first('r.id')
  if (!row) throw new Error(`Demo film ${preset} has no reading`)
  return row.id as number
}

/**
 * The demo's sign-off, through the same services as people's clicks (so the audit trail and the
 * outbox hold what they would): a reading returned with a comment, a reading signed and then
 * corrected by a signed amendment that supersedes it, a short thread, and a pending
 * invitation. The outbox's mails reach the local mail catcher when Endplate starts. Skipped
 * with the films.
 */
export async function seed(knex: Knex): Promise<void> {
  if (process.env.NODE_ENV === 'production') throw new Error('Demo seeds never run in production.')
  if (process.env.NODE_ENV === 'test' && process.env.ENDPLATE_SEED_FILMS !== '1') return

  for (const review of DEMO_REVIEWS) {
    const surgeon = await demoActor(knex, review.surgeon)
    const id = await readingOnFilm(knex, review.preset)
    const reading = await getReading(knex, surgeon, id)
    const outcome = review.outcome
    if (outcome.kind === 'return') {
      await returnReading(knex, surgeon, id, { version: reading.version, comment: outcome.comment })
    } else if (outcome.kind === 'thread') {
      for (const comment of outcome.comments)
        await addReadingComment(knex, await demoActor(knex, comment.by), id, comment.text)
    } else {
      await signReading(knex, surgeon, id, reading.version)
      if (!outcome.amendment) continue
      const rater = await demoActor(knex, outcome.amendment.by)
      let amendment = await amendReading(knex, rater, id, outcome.amendment.reason)
      const points = { ...amendment.landmarks.points }
      const moved = points[outcome.amendment.moveLandmark]
      if (moved) points[outcome.amendment.moveLandmark] = [moved[0] + 3, moved[1] - 1]
      amendment = await patchReading(knex, rater, amendment.id, {
        points,
        version: amendment.version,
      })
      amendment = await submitReading(knex, rater, amendment.id, amendment.version)
      await signReading(knex, surgeon, amendment.id, amendment.version)
    }
  }

  await createInvitation(knex, await demoActor(knex, DEMO_ADMIN), DEMO_INVITATION, systemClock)
}
