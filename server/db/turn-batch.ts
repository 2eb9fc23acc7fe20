import DataLoader from 'dataloader'
import type { Db } from './knex'

/** Enough to share one statement among every request of a busy moment, small enough to bind. */
const MAX_CALLS_PER_STATEMENT = 200

/**
 * Gathers the calls that arrive in one turn of the event loop into one call of `run`: under load
 * the requests parsed in the same turn then share one statement instead of one round trip each.
 * DataLoader does the gathering (with its cache off: every call is answered by the statement it
 * joined, never by an earlier answer); its default schedule would end a batch with the current
 * request's promise jobs, so `setImmediate` lets the other sockets read in the same turn join.
 * A call waits at most until the end of the turn it arrived in.
 */
export function batchPerTurn<K, V>(
  run: (calls: readonly K[]) => Promise<readonly (V | Error)[]>,
): DataLoader<K, V> {
  return new DataLoader<K, V>(run, {
    cache: false,
    maxBatchSize: MAX_CALLS_PER_STATEMENT,
    batchScheduleFn: (dispatch) => setImmediate(dispatch),
  })
}

/** One batcher per pool (tests and benches run several pools in one process). */
export function batcherPerPool<K, V>(
  make: (db: Db) => DataLoader<K, V>,
): (db: Db) => DataLoader<K, V> {
  const batchers = new WeakMap<Db, DataLoader<K, V>>()
  return (db) => {
    let batcher = batchers.get(db)
    if (batcher === undefined) {
      batcher = make(db)
      batchers.set(db, batcher)
    }
    return batcher
  }
}
