import type { Db } from '../db/knex'
import { TABLES } from '../db/tables'

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
