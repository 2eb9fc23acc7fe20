/** How long before the idle sign-out the warning dialog opens. */
export const IDLE_WARNING_MS = 60_000

export type IdlePhase =
  { kind: 'active' } | { kind: 'warning'; secondsLeft: number } | { kind: 'expired' }

/**
 * Where a browser stands after `idleMs` without mouse or keyboard, given the site's idle limit:
 * in use, in the last minute (the warning, with whole seconds left) or past the limit. A limit
 * shorter than the warning warns from the start.
 */
export function idlePhase(idleMs: number, idleLimitMs: number): IdlePhase {
  if (idleMs >= idleLimitMs) return { kind: 'expired' }
  const warningMs = Math.min(IDLE_WARNING_MS, idleLimitMs)
  if (idleMs >= idleLimitMs - warningMs)
    return { kind: 'warning', secondsLeft: Math.ceil((idleLimitMs - idleMs) / 1000) }
  return { kind: 'active' }
}
