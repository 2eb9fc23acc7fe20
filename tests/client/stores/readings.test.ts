import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest'
import { createPinia, setActivePinia } from 'pinia'
import { ApiError } from '../../../src/api/http'
import { AUTOSAVE_DELAY_MS, RETRY_DELAYS_MS } from '../../../src/composables/use-autosave'
import { acceptPatches, api, loadedStore, readingFixture } from './reading-test-support'

vi.mock('@/api/readings')
vi.mock('@/api/images')
vi.mock('@/api/visits')

beforeEach(() => {
  setActivePinia(createPinia())
  vi.useFakeTimers()
  vi.resetAllMocks()
})
afterEach(() => {
  vi.useRealTimers()
})

describe('readings store: sign-off', () => {
  it("shows another rater's draft read-only, and a returned reading editable by its rater", async () => {
    const { store: surgeonView, editor: surgeonViewEditor } = await loadedStore(readingFixture(), {
      id: 2,
      role: 'surgeon',
    })
    surgeonViewEditor.placePoint('L5.as', [1, 1])
    expect(surgeonViewEditor.points).toEqual({})
    expect(surgeonView.readOnly).toBe(true)
    setActivePinia(createPinia())
    const { editor: returnedEditor } = await loadedStore(readingFixture({ status: 'returned' }))
    returnedEditor.placePoint('L5.as', [1, 1])
    expect(returnedEditor.points).toEqual({ 'L5.as': [1, 1] })
  })

  it('offers a surgeon Sign and Return on a submitted reading, and a signed one for amendment', async () => {
    const { store: submitted } = await loadedStore(readingFixture({ status: 'submitted' }), {
      id: 2,
      role: 'surgeon',
    })
    expect([submitted.canSign, submitted.canReturn, submitted.canAmend]).toEqual([
      true,
      true,
      false,
    ])
    setActivePinia(createPinia())
    const { store: researcher } = await loadedStore(readingFixture({ status: 'signed' }), {
      id: 3,
      role: 'researcher',
    })
    expect([researcher.canSign, researcher.canAmend]).toEqual([false, false])
    setActivePinia(createPinia())
    const { store: signed } = await loadedStore(readingFixture({ status: 'signed' }))
    expect(signed.canAmend).toBe(true)
  })

  it("takes the server's signed reading, and loads the current one when the signature meets a 409", async () => {
    const { store } = await loadedStore(readingFixture({ status: 'submitted', version: 2 }), {
      id: 2,
      role: 'surgeon',
    })
    api.signReading.mockResolvedValueOnce(readingFixture({ status: 'signed', version: 3 }))
    await store.sign()
    expect(api.signReading).toHaveBeenCalledWith(7, 2)
    expect(store.reading?.status).toBe('signed')

    setActivePinia(createPinia())
    const { store: stale } = await loadedStore(
      readingFixture({ status: 'submitted', version: 2 }),
      {
        id: 2,
        role: 'surgeon',
      },
    )
    api.signReading.mockRejectedValueOnce(new ApiError(409, 'conflict', 'changed'))
    api.getReading.mockResolvedValueOnce(readingFixture({ status: 'returned', version: 3 }))
    await expect(stale.sign()).rejects.toThrow('changed')
    expect(stale.reading?.status).toBe('returned')
    expect(stale.canSign).toBe(false)
  })
})

describe('readings store: autosave', () => {
  it('saves once, 800 ms after the last of several quick edits, with the version it was based on', async () => {
    acceptPatches()
    const { store, editor } = await loadedStore()
    editor.placePoint('L5.as', [1, 1])
    await vi.advanceTimersByTimeAsync(AUTOSAVE_DELAY_MS - 100)
    editor.placePoint('L5.ps', [2, 2])
    expect(store.saveState).toBe('unsaved')
    await vi.advanceTimersByTimeAsync(AUTOSAVE_DELAY_MS - 1)
    expect(api.patchReading).not.toHaveBeenCalled()
    await vi.advanceTimersByTimeAsync(1)
    expect(api.patchReading).toHaveBeenCalledTimes(1)
    expect(api.patchReading.mock.calls[0]?.[1]).toEqual({
      points: { 'L5.as': [1, 1], 'L5.ps': [2, 2] },
      suggestionUse: { points: {} },
      version: 1,
    })
    expect(store.saveState).toBe('saved')
    expect(store.reading?.version).toBe(2)
  })

  it('keeps an edit made while a save is in flight and sends it next on the new version', async () => {
    let release: () => void = () => undefined
    api.patchReading.mockImplementationOnce(
      (_id, input) =>
        new Promise(
          (resolve) =>
            (release = () =>
              resolve(readingFixture({ version: 2, landmarks: { points: input.points } }))),
        ),
    )
    api.patchReading.mockImplementationOnce(async (_id, input) =>
      readingFixture({ version: 3, landmarks: { points: input.points } }),
    )
    const { store, editor } = await loadedStore()
    editor.placePoint('L5.as', [1, 1])
    await vi.advanceTimersByTimeAsync(AUTOSAVE_DELAY_MS)
    expect(store.saveState).toBe('saving')
    editor.placePoint('L5.ps', [2, 2])
    release()
    await vi.advanceTimersByTimeAsync(0)
    expect(store.saveState).toBe('unsaved')
    await vi.advanceTimersByTimeAsync(AUTOSAVE_DELAY_MS)
    expect(api.patchReading).toHaveBeenCalledTimes(2)
    expect(api.patchReading.mock.calls[1]?.[1].version).toBe(2)
    expect(store.saveState).toBe('saved')
  })

  it('goes offline when the server cannot be reached and retries with growing waits', async () => {
    const offline = new ApiError(0, 'offline', 'The server cannot be reached.')
    api.patchReading.mockRejectedValueOnce(offline).mockRejectedValueOnce(offline)
    api.patchReading.mockImplementation(async (_id, input) =>
      readingFixture({ version: 2, landmarks: { points: input.points } }),
    )
    const { store, editor } = await loadedStore()
    editor.placePoint('L5.as', [1, 1])
    await vi.advanceTimersByTimeAsync(AUTOSAVE_DELAY_MS)
    expect(store.saveState).toBe('offline')
    await vi.advanceTimersByTimeAsync(RETRY_DELAYS_MS[0])
    expect(api.patchReading).toHaveBeenCalledTimes(2)
    expect(store.saveState).toBe('offline')
    await vi.advanceTimersByTimeAsync(RETRY_DELAYS_MS[1] - 1)
    expect(api.patchReading).toHaveBeenCalledTimes(2)
    await vi.advanceTimersByTimeAsync(1)
    expect(api.patchReading).toHaveBeenCalledTimes(3)
    expect(store.saveState).toBe('saved')
    expect(editor.points['L5.as']).toEqual([1, 1])
  })

  it('shows a refused save as an error, keeps the landmarks and does not retry by itself', async () => {
    api.patchReading.mockRejectedValue(
      new ApiError(400, 'validation_failed', 'points: L5.as is outside the film'),
    )
    const { store, editor } = await loadedStore()
    editor.placePoint('L5.as', [1, 1])
    await vi.advanceTimersByTimeAsync(AUTOSAVE_DELAY_MS + 60_000)
    expect(store.saveState).toBe('error')
    expect(store.saveMessage).toContain('outside the film')
    expect(api.patchReading).toHaveBeenCalledTimes(1)
    expect(editor.points['L5.as']).toEqual([1, 1])
  })
})

describe('readings store: conflicts (409 on a stale version)', () => {
  async function conflicted() {
    const theirs = readingFixture({ version: 5, landmarks: { points: { 'L5.as': [90, 90] } } })
    api.patchReading.mockRejectedValueOnce(new ApiError(409, 'version_conflict', 'stale'))
    const loaded = await loadedStore()
    api.getReading.mockResolvedValue(theirs)
    loaded.editor.placePoint('L5.as', [1, 1])
    await vi.advanceTimersByTimeAsync(AUTOSAVE_DELAY_MS)
    return loaded
  }

  it('enters the conflict state with the other version and stops autosaving', async () => {
    const { store, editor } = await conflicted()
    expect(store.saveState).toBe('conflict')
    expect(store.conflict?.version).toBe(5)
    editor.placePoint('L5.ps', [2, 2])
    await vi.advanceTimersByTimeAsync(AUTOSAVE_DELAY_MS * 3)
    expect(api.patchReading).toHaveBeenCalledTimes(1)
  })

  it('loads theirs and keeps ours one undo away', async () => {
    const { store, editor } = await conflicted()
    store.loadTheirs()
    expect(editor.points['L5.as']).toEqual([90, 90])
    expect(store.saveState).toBe('saved')
    editor.undo()
    expect(editor.points['L5.as']).toEqual([1, 1])
  })

  it('overwrites by re-basing our landmarks on their version', async () => {
    const { store } = await conflicted()
    api.patchReading.mockImplementation(async (_id, input) =>
      readingFixture({ version: input.version + 1, landmarks: { points: input.points } }),
    )
    await store.overwriteTheirs()
    expect(api.patchReading).toHaveBeenLastCalledWith(7, {
      points: { 'L5.as': [1, 1] },
      suggestionUse: { points: {} },
      version: 5,
    })
    expect(store.saveState).toBe('saved')
    expect(store.reading?.version).toBe(6)
  })
})
