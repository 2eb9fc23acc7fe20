import type { Db } from '../db/knex'
import { TABLES } from '../db/tables'

/** The demo is seeded only on request (`--demo`), and never into a production database. */
export function demoRequested(argv: readonly string[], nodeEnv: string): boolean {
  return argv.includes('--demo') && nodeEnv !== 'production'
}

/** Seeds the demo only into an empty database, so a second `npm start` keeps what users entered. */
export async function seedDemoWhenEmpty(db: Db): Promise<void> {
  const [{ count }] = (await db(TABLES.users).count({ count: '*' })) as [{ count: number | string }]
  if (Number(count) > 0) {
    console.log('Existing data kept (npm run db:reset starts over with the demo).')
    return
  }
  console.log('Seeding the demo clinic and rendering its synthetic films (about a minute) ...')
  await db.seed.run()
}
