import { describe, expect, it } from 'vitest'
import { IDLE_WARNING_MS, idlePhase } from '@/session/idle-phase'

// Common practice: warn a minute before an idle sign-out and show the seconds left.
describe('idlePhase', () => {
  const limitMs = 30 * 60_000

  it('is active until the last minute, warns with whole seconds left, then expires', () => {
    expect(idlePhase(0, limitMs)).toEqual({ kind: 'active' })
    expect(idlePhase(limitMs - IDLE_WARNING_MS - 1, limitMs)).toEqual({ kind: 'active' })
    expect(idlePhase(limitMs - IDLE_WARNING_MS, limitMs)).toEqual({
      kind: 'warning',
      secondsLeft: 60,
    })
    expect(idlePhase(limitMs - 1500, limitMs)).toEqual({ kind: 'warning', secondsLeft: 2 })
    expect(idlePhase(limitMs, limitMs)).toEqual({ kind: 'expired' })
  })

  it('warns from the start when the limit is shorter than the warning', () => {
    expect(idlePhase(0, 30_000)).toEqual({ kind: 'warning', secondsLeft: 30 })
  })
})
