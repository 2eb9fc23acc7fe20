import { availableParallelism } from 'node:os'
import Tinypool from 'tinypool'
import { ImageError } from '../image-error'
import type { IngestedFilm, IngestOutcome, IngestTask } from './ingest-film'

/**
 * Heap ceiling of one ingest worker. Pixels, files and WebAssembly memory live outside the V8
 * heap and are bounded by the film's size checks instead (MAX_FILM_PIXELS, the inflate cap, the
 * codec frame header); this catches a parser driven into building millions of objects.
 */
const WORKER_HEAP_MB = 512

let pool: Tinypool | null = null

/**
 * One worker thread per core decodes films and makes their renditions, so that concurrent
 * uploads queue for the cores instead of all holding a decoded film in memory at once. The
 * queue in front of it is bounded by the upload admission (upload-admission.ts). Idle workers
 * exit after a while and do not keep the process alive.
 */
function ingestPool(): Tinypool {
  pool ??= new Tinypool({
    filename: new URL('./ingest-worker.mjs', import.meta.url).href,
    name: 'ingestFilm',
    minThreads: 0,
    maxThreads: availableParallelism(),
    idleTimeout: 30_000,
    resourceLimits: { maxOldGenerationSizeMb: WORKER_HEAP_MB, maxYoungGenerationSizeMb: 64 },
  })
  return pool
}

function isWorkerOutOfMemory(error: unknown): boolean {
  return (
    typeof error === 'object' &&
    error !== null &&
    (error as { code?: string }).code === 'ERR_WORKER_OUT_OF_MEMORY'
  )
}

/** Decodes the film at `task.path` in a worker and writes its renditions under `task.tmpDir`. */
export async function ingestInWorker(task: IngestTask): Promise<IngestedFilm> {
  let outcome: IngestOutcome
  try {
    outcome = (await ingestPool().run(task)) as IngestOutcome
  } catch (error) {
    if (isWorkerOutOfMemory(error)) {
      throw new ImageError(
        'exceeds-decode-limit',
        `Decoding this file needs more than the ${WORKER_HEAP_MB} MB of working memory Endplate allows; the file is damaged or not a radiograph.`,
      )
    }
    throw error
  }
  if (!outcome.ok) {
    const { code, message, details } = outcome.refusal
    throw new ImageError(code, message, details)
  }
  return outcome.value
}

/** Stops the workers (server shutdown); a later ingest starts a new pool. */
export async function closeIngestPool(): Promise<void> {
  const closing = pool
  pool = null
  await closing?.destroy()
}
