/**
 * How long the API waits on MariaDB before it answers 503 instead of hanging: a paused or
 * unreachable database must cost a request a few seconds, never minutes.
 */
export interface DbTimeouts {
  /** TCP connect plus the server's handshake (mysql2 `connectTimeout`). */
  connectMs: number
  /** Waiting for a free pool connection (Knex `acquireConnectionTimeout`). */
  acquireMs: number
  /**
   * One statement: the client gives up after this (mysql2's per-query `timeout`, which covers a
   * server that stopped answering), and MariaDB itself aborts a statement running longer
   * (`max_statement_time`), so the server frees what the client abandoned.
   */
  queryMs: number
}

export function dbTimeouts(queryMs: number): DbTimeouts {
  return { connectMs: 2_000, acquireMs: Math.max(4_000, Math.min(queryMs, 10_000)), queryMs }
}

interface RawConnection {
  query: (...args: unknown[]) => unknown
  destroy: () => void
}

type Callback = (error: unknown, ...rest: unknown[]) => void

/**
 * Knex pool `afterCreate` hook that gives every statement on a new connection the query
 * timeout. Knex has no pool-wide setting for it, so the connection's `query` is wrapped to add
 * mysql2's `timeout` option to statements that set none; a connection whose statement timed
 * out is destroyed, because its late answer would otherwise be read as the next statement's
 * (the pool then discards it: Knex validates `_closing` before reuse).
 */
export function applyQueryTimeout(timeouts: DbTimeouts) {
  return (connection: RawConnection, done: (error: unknown, connection: unknown) => void): void => {
    const query = connection.query.bind(connection)
    connection.query = (...args: unknown[]) => {
      const [first] = args
      if (typeof first === 'object' && first !== null && !('timeout' in first)) {
        args[0] = { ...first, timeout: timeouts.queryMs }
      }
      const last = args[args.length - 1]
      if (typeof last === 'function') {
        args[args.length - 1] = (error: unknown, ...rest: unknown[]) => {
          if ((error as { code?: string } | null)?.code === 'PROTOCOL_SEQUENCE_TIMEOUT')
            connection.destroy()
          ;(last as Callback)(error, ...rest)
        }
      }
      return query(...args)
    }
    // MariaDB's own limit, in seconds, a little above the client's so the client speaks first.
    const seconds = Math.ceil(timeouts.queryMs / 1000) + 1
    query(`SET SESSION max_statement_time = ${seconds}`, (error: unknown) =>
      done(error, connection),
    )
  }
}
