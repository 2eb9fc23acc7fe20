import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest'
import { ApiError } from '../../../src/api/http'
import {
  AUTOSAVE_DELAY_MS,
  RETRY_DELAYS_MS,
  useAutosave,
} from '../../../src/composables/use-autosave'

// A stand-in for the server's PATCH: it answers each call with the next scripted outcome
// (an ApiError as src/api/http throws it, or success), the version rule of
// shared/types/readings.ts (409 on a stale version) being the server's, not repeated here.
function fakeServer(outcomes: Array<ApiError | 'ok'>) {
  const calls: number[] = []
  const send = vi.fn(async () => {
    calls.push(Date.now())
    const next = outcomes.shift() ?? 'ok'
    if (next !== 'ok') throw next
  })
  return { send, calls }
}

function autosaveWith(send: () => Promise<void>, theirs = { version: 5 }) {
  const fetchTheirs = vi.fn(async () => theirs)
  const autosave = useAutosave<{ version: number }>({
    canSave: () => true,
    send,
    fetchTheirs,
  })
  return { autosave, fetchTheirs }
}

beforeEach(() => vi.useFakeTimers())
afterEach(() => vi.useRealTimers())

describe('useAutosave: debouncing', () => {
  it('sends once, AUTOSAVE_DELAY_MS after the last of several quick edits', async () => {
    const server = fakeServer([])
    const { autosave } = autosaveWith(server.send)
    autosave.markEdited()
    await vi.advanceTimersByTimeAsync(AUTOSAVE_DELAY_MS - 1)
    autosave.markEdited()
    await vi.advanceTimersByTimeAsync(AUTOSAVE_DELAY_MS - 1)
    expect(server.send).not.toHaveBeenCalled()
    expect(autosave.saveState.value).toBe('unsaved')
    await vi.advanceTimersByTimeAsync(1)
    expect(server.send).toHaveBeenCalledTimes(1)
    expect(autosave.saveState.value).toBe('saved')
    expect(autosave.dirty.value).toBe(false)
    expect(autosave.lastSavedAt.value).toBeInstanceOf(Date)
  })

  it('sends nothing when nothing changed or nothing may be saved', async () => {
    const server = fakeServer([])
    const { autosave } = autosaveWith(server.send)
    await autosave.save()
    const locked = useAutosave({ canSave: () => false, send: server.send, fetchTheirs: () => null })
    locked.markEdited()
    await vi.advanceTimersByTimeAsync(AUTOSAVE_DELAY_MS * 2)
    expect(server.send).not.toHaveBeenCalled()
  })
})

describe('useAutosave: retries', () => {
  it('goes offline when the server cannot be reached and retries after 1 s, 2 s, 4 s ...', async () => {
    const offline = new ApiError(0, 'offline', 'The server cannot be reached.')
    const server = fakeServer([offline, offline, offline])
    const { autosave } = autosaveWith(server.send)
    autosave.markEdited()
    await vi.advanceTimersByTimeAsync(AUTOSAVE_DELAY_MS)
    expect(autosave.saveState.value).toBe('offline')
    expect(autosave.saveMessage.value).toBe('The server cannot be reached.')
    // An edit while offline does not start its own timer: the retry owns the next attempt.
    autosave.markEdited()
    await vi.advanceTimersByTimeAsync(RETRY_DELAYS_MS[0] - 1)
    expect(server.send).toHaveBeenCalledTimes(1)
    await vi.advanceTimersByTimeAsync(1)
    expect(server.send).toHaveBeenCalledTimes(2)
    await vi.advanceTimersByTimeAsync(RETRY_DELAYS_MS[1])
    expect(server.send).toHaveBeenCalledTimes(3)
    await vi.advanceTimersByTimeAsync(RETRY_DELAYS_MS[2])
    expect(server.send).toHaveBeenCalledTimes(4)
    const [first, second, third, fourth] = server.calls as [number, number, number, number]
    expect([second - first, third - second, fourth - third]).toEqual([
      RETRY_DELAYS_MS[0],
      RETRY_DELAYS_MS[1],
      RETRY_DELAYS_MS[2],
    ])
    expect(autosave.saveState.value).toBe('saved')
    expect(autosave.saveMessage.value).toBeNull()
  })

  it('retries a gateway error (503) but not a refusal (400), which waits for Retry', async () => {
    const server = fakeServer([
      new ApiError(503, 'unavailable', 'Service unavailable'),
      new ApiError(400, 'validation_failed', 'points: L5.as is outside the film'),
    ])
    const { autosave } = autosaveWith(server.send)
    autosave.markEdited()
    await vi.advanceTimersByTimeAsync(AUTOSAVE_DELAY_MS)
    expect(autosave.saveState.value).toBe('error')
    await vi.advanceTimersByTimeAsync(RETRY_DELAYS_MS[0])
    expect(server.send).toHaveBeenCalledTimes(2)
    expect(autosave.saveState.value).toBe('error')
    expect(autosave.saveMessage.value).toContain('outside the film')
    await vi.advanceTimersByTimeAsync(60_000)
    expect(server.send).toHaveBeenCalledTimes(2)
    autosave.retryNow()
    await vi.advanceTimersByTimeAsync(0)
    expect(server.send).toHaveBeenCalledTimes(3)
    expect(autosave.saveState.value).toBe('saved')
  })

  it('starts the waits from the first again after a save gets through', async () => {
    const offline = new ApiError(0, 'offline', 'offline')
    const server = fakeServer([offline, offline, 'ok', offline])
    const { autosave } = autosaveWith(server.send)
    autosave.markEdited()
    await vi.advanceTimersByTimeAsync(AUTOSAVE_DELAY_MS + RETRY_DELAYS_MS[0] + RETRY_DELAYS_MS[1])
    expect(autosave.saveState.value).toBe('saved')
    autosave.markEdited()
    await vi.advanceTimersByTimeAsync(AUTOSAVE_DELAY_MS)
    expect(autosave.saveState.value).toBe('offline')
    await vi.advanceTimersByTimeAsync(RETRY_DELAYS_MS[0])
    expect(server.send).toHaveBeenCalledTimes(5)
    expect(autosave.saveState.value).toBe('saved')
  })
})

describe('useAutosave: version conflicts', () => {
  it('stops on a 409, keeps the other version, and sends no more until the user decides', async () => {
    const server = fakeServer([new ApiError(409, 'version_conflict', 'stale')])
    const { autosave, fetchTheirs } = autosaveWith(server.send)
    autosave.markEdited()
    await vi.advanceTimersByTimeAsync(AUTOSAVE_DELAY_MS)
    expect(autosave.saveState.value).toBe('conflict')
    expect(autosave.saveMessage.value).toBe('Someone else saved this reading after you opened it.')
    expect(fetchTheirs).toHaveBeenCalledTimes(1)
    expect(autosave.conflict.value).toEqual({ version: 5 })
    autosave.markEdited()
    autosave.retryNow()
    await vi.advanceTimersByTimeAsync(AUTOSAVE_DELAY_MS * 5)
    expect(server.send).toHaveBeenCalledTimes(1)
  })

  it('taking theirs leaves nothing to send; keeping mine sends at once', async () => {
    const server = fakeServer([new ApiError(409, 'version_conflict', 'stale')])
    const first = autosaveWith(server.send).autosave
    first.markEdited()
    await vi.advanceTimersByTimeAsync(AUTOSAVE_DELAY_MS)
    first.acceptTheirs()
    expect([first.saveState.value, first.dirty.value, first.conflict.value]).toEqual([
      'saved',
      false,
      null,
    ])

    const again = fakeServer([new ApiError(409, 'version_conflict', 'stale')])
    const second = autosaveWith(again.send).autosave
    second.markEdited()
    await vi.advanceTimersByTimeAsync(AUTOSAVE_DELAY_MS)
    await second.keepMine()
    expect(again.send).toHaveBeenCalledTimes(2)
    expect(second.saveState.value).toBe('saved')
    expect(second.conflict.value).toBeNull()
  })

  it('says so when the other version cannot be loaded', async () => {
    const server = fakeServer([new ApiError(409, 'version_conflict', 'stale')])
    const autosave = useAutosave({
      canSave: () => true,
      send: server.send,
      fetchTheirs: () => Promise.reject(new Error('The server cannot be reached.')),
    })
    autosave.markEdited()
    await vi.advanceTimersByTimeAsync(AUTOSAVE_DELAY_MS)
    expect(autosave.saveState.value).toBe('conflict')
    expect(autosave.conflict.value).toBeNull()
    expect(autosave.saveMessage.value).toBe(
      'Someone else saved this reading after you opened it. The other version could not be loaded: The server cannot be reached.',
    )
  })
})
