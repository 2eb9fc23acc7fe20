import type { Logger } from 'pino'
import type { Db } from '../db/knex'
import { onAuditEventCommitted } from '../db/audit'
import { sealQueuedAuditEvents } from '../db/audit-seal'

export interface AuditSealerOptions {
  db: Db
  logger: Logger
  /** Wait after a commit before sealing, so a burst of events is chained in one transaction. */
  settleMs?: number
  /** Also look at the queue this often: events committed by another server process. */
  sweepMs?: number
}

export interface AuditSealer {
  /** Seals what is queued now, then after every audit event this process commits, until stop(). */
  start(): void
  /** Stops and waits for a seal in progress. */
  stop(): Promise<void>
  /** Seals everything queued and resolves when done (also while stopped). */
  sealNow(): Promise<number>
}

/**
 * Keeps the audit trail's hash chain moments behind its events. A commit in this process wakes
 * the sealer after `settleMs`; a sweep every `sweepMs` picks up events of other processes and any
 * left by a process that stopped before sealing. A failure (the database away, say) is logged
 * and the next wake-up tries again; the events wait safely in their queue.
 */
export function createAuditSealer(options: AuditSealerOptions): AuditSealer {
  const settleMs = options.settleMs ?? 25
  const sweepMs = options.sweepMs ?? 5_000
  let stopped = true
  let wake: ReturnType<typeof setTimeout> | null = null
  let sweep: ReturnType<typeof setInterval> | null = null
  let running: Promise<number> | null = null
  let again = false
  let stopListening: (() => void) | null = null

  async function sealAll(): Promise<number> {
    let total = 0
    for (;;) {
      const sealed = await sealQueuedAuditEvents(options.db)
      total += sealed
      if (sealed === 0) return total
    }
  }

  function sealNow(): Promise<number> {
    if (running) {
      // A commit during a seal may not have been visible to it: seal once more afterwards.
      again = true
      return running
    }
    running = sealAll().finally(() => {
      running = null
      if (again && !stopped) {
        again = false
        runQuietly()
      }
    })
    return running
  }

  function runQuietly(): void {
    sealNow().catch((error: unknown) => {
      options.logger.warn({ err: error }, 'audit events could not be sealed yet; retrying later')
    })
  }

  function scheduleSoon(): void {
    if (stopped || wake) return
    wake = setTimeout(() => {
      wake = null
      runQuietly()
    }, settleMs)
    wake.unref()
  }

  return {
    start() {
      if (!stopped) return
      stopped = false
      stopListening = onAuditEventCommitted(scheduleSoon)
      sweep = setInterval(runQuietly, sweepMs)
      sweep.unref()
      runQuietly()
    },
    async stop() {
      stopped = true
      stopListening?.()
      stopListening = null
      if (wake) clearTimeout(wake)
      if (sweep) clearInterval(sweep)
      wake = null
      sweep = null
      await running?.catch(() => undefined)
    },
    sealNow,
  }
}
