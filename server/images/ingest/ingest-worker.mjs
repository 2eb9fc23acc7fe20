// Entry of the film ingest worker threads (ingest-pool.ts). Worker threads do not inherit the
// TypeScript loader of the thread that starts them, so this plain module registers tsx first.
import { register } from 'tsx/esm/api'

register()
export const { ingestFilm } = await import('./ingest-film.ts')
