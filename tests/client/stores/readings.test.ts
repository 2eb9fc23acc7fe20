import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest'
import { createPinia, setActivePinia } from 'pinia'
import type { ImageRecord } from '../../../shared/types/api'
import type { Reading } from '../../../shared/types/readings'
import { templateLandmarks } from '../../../shared/readings/templates'
import { ApiError } from '../../../src/api/http'
import * as readingsApi from '../../../src/api/readings'
import * as imagesApi from '../../../src/api/images'
import * as visitsApi from '../../../src/api/visits'
import { AUTOSAVE_DELAY_MS, RETRY_DELAYS_MS, useReadingsStore } from '../../../src/stores/readings'

vi.mock('@/api/readings')
vi.mock('@/api/images')
vi.mock('@/api/visits')

const api = vi.mocked(readingsApi)
const images = vi.mocked(imagesApi)
const visits = vi.mocked(visitsApi)

function readingFixture(overrides: Partial<Reading> = {}): Reading {
  return {
    id: 7,
    imageId: 3,
    pairedImageId: null,
    raterId: 1,
    raterName: 'Test fellow',
    template: 'slip-grade',
    options: { segment: 'L5-S1' },
    landmarks: { points: {} },
    pairedLandmarks: null,
    suggestionUse: { points: {} },
    calibration: { mmPerPixel: [0.5, 0.5], source: 'dicom-pixel-spacing' },
    pairedCalibration: null,
    results: {
      measurements: {} as Reading['results']['measurements'],
      uncertainty: null,
      motion: null,
      subsidence: null,
      subsidenceBaselineReadingId: null,
    },
    engineVersion: 'test',
    status: 'draft',
    version: 1,
    blinded: false,
    supersedesId: null,
    supersedeReason: null,
    supersededById: null,
    reviewerId: null,
    submittedAt: null,
    signedAt: null,
    signedBy: null,
    signedByName: null,
    returnedBy: null,
    returnedByName: null,
    returnedAt: null,
    returnComment: null,
    createdAt: '2026-01-01T00:00:00Z',
    updatedAt: '2026-01-01T00:00:00Z',
    ...overrides,
  }
}

const film = {
  id: 3,
  visitId: 11,
  version: 1,
  width: 750,
  height: 625,
  mmPerPixel: [0.5, 0.5],
  spacingSource: 'dicom-pixel-spacing',
} as ImageRecord

/** The server's side of the contract (shared/types/readings.ts): bumps the version, echoes points. */
function acceptPatches() {
  let version = 1
  api.patchReading.mockImplementation(async (_id, input) => {
    if (input.version !== version) throw new ApiError(409, 'version_conflict', 'stale')
    version += 1
    return readingFixture({ version, landmarks: { points: input.points } })
  })
}

/** The fixture's rater (id 1, a fellow) looks at it unless another viewer is named. */
async function loadedStore(
  reading = readingFixture(),
  viewer: { id: number; role: 'fellow' | 'surgeon' | 'researcher' } = { id: 1, role: 'fellow' },
) {
  api.getReading.mockResolvedValue(reading)
  visits.getVisit.mockRejectedValue(new Error('not needed'))
  images.getImage.mockResolvedValue(film)
  const store = useReadingsStore()
  store.viewer = viewer
  await store.load(reading.id)
  return store
}

beforeEach(() => {
  setActivePinia(createPinia())
  vi.useFakeTimers()
  vi.resetAllMocks()
})
afterEach(() => {
  vi.useRealTimers()
})

describe('readings store: placing and history', () => {
  it('offers the template landmarks in order and highlights the first unplaced one', async () => {
    const store = await loadedStore()
    const names = templateLandmarks('slip-grade', { segment: 'L5-S1' }).map((spec) => spec.name)
    expect(store.specs.map((spec) => spec.name)).toEqual(names)
    expect(store.nextName).toBe('L5.as')
    store.placePoint('L5.as', [100, 100])
    expect(store.nextName).toBe('L5.ps')
    expect(store.targetForClick()).toBe('L5.ps')
  })

  it('makes one undo step of a whole drag, committed on pointer-up', async () => {
    const store = await loadedStore(
      readingFixture({ landmarks: { points: { 'L5.as': [10, 10] } } }),
    )
    store.beginDrag()
    for (let x = 11; x <= 40; x++) store.dragPoint('L5.as', [x, 10])
    store.endDrag()
    expect(store.undoStack).toHaveLength(1)
    store.undo()
    expect(store.points['L5.as']).toEqual([10, 10])
    store.redo()
    expect(store.points['L5.as']).toEqual([40, 10])
  })

  it('records removal as a step, clears redo on a new edit, and ignores a drag that moved nothing', async () => {
    const store = await loadedStore(
      readingFixture({ landmarks: { points: { 'L5.as': [10, 10] } } }),
    )
    store.beginDrag()
    store.endDrag()
    expect(store.undoStack).toHaveLength(0)
    store.removePoint('L5.as')
    expect(store.points).toEqual({})
    store.undo()
    expect(store.redoStack).toHaveLength(1)
    store.placePoint('L5.ps', [5, 5])
    expect(store.redoStack).toHaveLength(0)
  })

  it('steps through the checklist with wrap-round and stops placing on Escape', async () => {
    const store = await loadedStore()
    store.selectStep(-1)
    expect(store.selectedName).toBe('S1.pw')
    store.selectStep(1)
    expect(store.selectedName).toBe('L5.as')
    store.stopPlacing()
    expect(store.targetForClick()).toBeNull()
  })

  it('allows submitting only when every required landmark is placed', async () => {
    const store = await loadedStore()
    expect(store.canSubmit).toBe(false)
    for (const spec of store.specs) store.placePoint(spec.name, [1, 1])
    expect(store.canSubmit).toBe(true)
  })

  it('changes nothing on a submitted reading', async () => {
    const store = await loadedStore(readingFixture({ status: 'submitted' }))
    store.placePoint('L5.as', [1, 1])
    expect(store.points).toEqual({})
    expect(store.readOnly).toBe(true)
  })
})

describe('readings store: corner suggestions', () => {
  it('moves a landmark only when the rater accepts, records it, and undoes it in one step', async () => {
    acceptPatches()
    const store = await loadedStore()
    store.placePoint('L5.as', [100, 100])
    store.offerSuggestion({ name: 'L5.as', side: 'primary', from: [100, 100], at: [102.4, 98.7] })
    // Offered, not taken: the point stays, recorded as the rater's own beside a suggestion.
    expect(store.points['L5.as']).toEqual([100, 100])
    expect(store.accepted).toEqual({ 'L5.as': false })
    store.acceptSuggestion()
    expect(store.points['L5.as']).toEqual([102.4, 98.7])
    expect(store.accepted).toEqual({ 'L5.as': true })
    expect(store.suggestion).toBeNull()
    await vi.advanceTimersByTimeAsync(AUTOSAVE_DELAY_MS)
    expect(api.patchReading.mock.calls.at(-1)?.[1]).toMatchObject({
      points: { 'L5.as': [102.4, 98.7] },
      suggestionUse: { points: { 'L5.as': true } },
    })
    store.undo()
    expect(store.points['L5.as']).toEqual([100, 100])
    expect(store.accepted).toEqual({ 'L5.as': false })
  })

  it('keeps the own point on Escape or on going on, and ignores an answer for a moved point', async () => {
    const store = await loadedStore()
    store.placePoint('L5.as', [100, 100])
    store.offerSuggestion({ name: 'L5.as', side: 'primary', from: [100, 100], at: [103, 99] })
    store.declineSuggestion()
    expect(store.suggestion).toBeNull()
    store.acceptSuggestion()
    expect(store.points['L5.as']).toEqual([100, 100])

    store.offerSuggestion({ name: 'L5.as', side: 'primary', from: [100, 100], at: [103, 99] })
    store.placePoint('L5.ps', [200, 100])
    expect(store.suggestion).toBeNull()
    expect(store.points['L5.as']).toEqual([100, 100])
    expect(store.accepted).toEqual({ 'L5.as': false })

    // The answer came after the rater had already moved the point: it is not shown.
    store.offerSuggestion({ name: 'L5.ps', side: 'primary', from: [190, 100], at: [191, 101] })
    expect(store.suggestion).toBeNull()
    // Placed again, the landmark's earlier record goes with its earlier position.
    store.placePoint('L5.as', [120, 100])
    expect(store.accepted).toEqual({})
  })
})

describe('readings store: sign-off', () => {
  it("shows another rater's draft read-only, and a returned reading editable by its rater", async () => {
    const surgeonView = await loadedStore(readingFixture(), { id: 2, role: 'surgeon' })
    surgeonView.placePoint('L5.as', [1, 1])
    expect(surgeonView.points).toEqual({})
    expect(surgeonView.readOnly).toBe(true)
    setActivePinia(createPinia())
    const returned = await loadedStore(readingFixture({ status: 'returned' }))
    returned.placePoint('L5.as', [1, 1])
    expect(returned.points).toEqual({ 'L5.as': [1, 1] })
  })

  it('offers a surgeon Sign and Return on a submitted reading, and a signed one for amendment', async () => {
    const submitted = await loadedStore(readingFixture({ status: 'submitted' }), {
      id: 2,
      role: 'surgeon',
    })
    expect([submitted.canSign, submitted.canReturn, submitted.canAmend]).toEqual([
      true,
      true,
      false,
    ])
    setActivePinia(createPinia())
    const researcher = await loadedStore(readingFixture({ status: 'signed' }), {
      id: 3,
      role: 'researcher',
    })
    expect([researcher.canSign, researcher.canAmend]).toEqual([false, false])
    setActivePinia(createPinia())
    const signed = await loadedStore(readingFixture({ status: 'signed' }))
    expect(signed.canAmend).toBe(true)
  })

  it("takes the server's signed reading, and loads the current one when the signature meets a 409", async () => {
    const store = await loadedStore(readingFixture({ status: 'submitted', version: 2 }), {
      id: 2,
      role: 'surgeon',
    })
    api.signReading.mockResolvedValueOnce(readingFixture({ status: 'signed', version: 3 }))
    await store.sign()
    expect(api.signReading).toHaveBeenCalledWith(7, 2)
    expect(store.reading?.status).toBe('signed')

    setActivePinia(createPinia())
    const stale = await loadedStore(readingFixture({ status: 'submitted', version: 2 }), {
      id: 2,
      role: 'surgeon',
    })
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
    const store = await loadedStore()
    store.placePoint('L5.as', [1, 1])
    await vi.advanceTimersByTimeAsync(AUTOSAVE_DELAY_MS - 100)
    store.placePoint('L5.ps', [2, 2])
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
    const store = await loadedStore()
    store.placePoint('L5.as', [1, 1])
    await vi.advanceTimersByTimeAsync(AUTOSAVE_DELAY_MS)
    expect(store.saveState).toBe('saving')
    store.placePoint('L5.ps', [2, 2])
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
    const store = await loadedStore()
    store.placePoint('L5.as', [1, 1])
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
    expect(store.points['L5.as']).toEqual([1, 1])
  })

  it('shows a refused save as an error, keeps the landmarks and does not retry by itself', async () => {
    api.patchReading.mockRejectedValue(
      new ApiError(400, 'validation_failed', 'points: L5.as is outside the film'),
    )
    const store = await loadedStore()
    store.placePoint('L5.as', [1, 1])
    await vi.advanceTimersByTimeAsync(AUTOSAVE_DELAY_MS + 60_000)
    expect(store.saveState).toBe('error')
    expect(store.saveMessage).toContain('outside the film')
    expect(api.patchReading).toHaveBeenCalledTimes(1)
    expect(store.points['L5.as']).toEqual([1, 1])
  })
})

describe('readings store: conflicts (409 on a stale version)', () => {
  async function conflicted() {
    const theirs = readingFixture({ version: 5, landmarks: { points: { 'L5.as': [90, 90] } } })
    api.patchReading.mockRejectedValueOnce(new ApiError(409, 'version_conflict', 'stale'))
    const store = await loadedStore()
    api.getReading.mockResolvedValue(theirs)
    store.placePoint('L5.as', [1, 1])
    await vi.advanceTimersByTimeAsync(AUTOSAVE_DELAY_MS)
    return store
  }

  it('enters the conflict state with the other version and stops autosaving', async () => {
    const store = await conflicted()
    expect(store.saveState).toBe('conflict')
    expect(store.conflict?.version).toBe(5)
    store.placePoint('L5.ps', [2, 2])
    await vi.advanceTimersByTimeAsync(AUTOSAVE_DELAY_MS * 3)
    expect(api.patchReading).toHaveBeenCalledTimes(1)
  })

  it('loads theirs and keeps ours one undo away', async () => {
    const store = await conflicted()
    store.loadTheirs()
    expect(store.points['L5.as']).toEqual([90, 90])
    expect(store.saveState).toBe('saved')
    store.undo()
    expect(store.points['L5.as']).toEqual([1, 1])
  })

  it('overwrites by re-basing our landmarks on their version', async () => {
    const store = await conflicted()
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

describe('readings store: re-placing from the checklist', () => {
  it('a picked row is placed by the next click even when already placed; a selected landmark is not', async () => {
    const store = await loadedStore(
      readingFixture({ landmarks: { points: { 'L5.as': [10, 10] } } }),
    )
    store.select('L5.as')
    expect(store.targetForClick()).toBe('L5.ps')
    store.pick('L5.as')
    expect(store.targetForClick()).toBe('L5.as')
    store.placePoint('L5.as', [20, 20])
    expect(store.points['L5.as']).toEqual([20, 20])
    expect(store.targetForClick()).toBe('L5.ps')
  })
})
