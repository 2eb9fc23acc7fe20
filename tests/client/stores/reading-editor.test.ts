import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest'
import { createPinia, setActivePinia } from 'pinia'
import { templateLandmarks } from '../../../shared/readings/templates'
import { AUTOSAVE_DELAY_MS } from '../../../src/composables/use-autosave'
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

describe('reading editor: placing and history', () => {
  it('offers the template landmarks in order and highlights the first unplaced one', async () => {
    const { store, editor } = await loadedStore()
    const names = templateLandmarks('slip-grade', { segment: 'L5-S1' }).map((spec) => spec.name)
    expect(store.specs.map((spec) => spec.name)).toEqual(names)
    expect(editor.nextName).toBe('L5.as')
    editor.placePoint('L5.as', [100, 100])
    expect(editor.nextName).toBe('L5.ps')
    expect(editor.targetForClick()).toBe('L5.ps')
  })

  it('makes one undo step of a whole drag, committed on pointer-up', async () => {
    const { editor } = await loadedStore(
      readingFixture({ landmarks: { points: { 'L5.as': [10, 10] } } }),
    )
    editor.beginDrag()
    for (let x = 11; x <= 40; x++) editor.dragPoint('L5.as', [x, 10])
    editor.endDrag()
    expect(editor.undoStack).toHaveLength(1)
    editor.undo()
    expect(editor.points['L5.as']).toEqual([10, 10])
    editor.redo()
    expect(editor.points['L5.as']).toEqual([40, 10])
  })

  it('records removal as a step, clears redo on a new edit, and ignores a drag that moved nothing', async () => {
    const { editor } = await loadedStore(
      readingFixture({ landmarks: { points: { 'L5.as': [10, 10] } } }),
    )
    editor.beginDrag()
    editor.endDrag()
    expect(editor.undoStack).toHaveLength(0)
    editor.removePoint('L5.as')
    expect(editor.points).toEqual({})
    editor.undo()
    expect(editor.redoStack).toHaveLength(1)
    editor.placePoint('L5.ps', [5, 5])
    expect(editor.redoStack).toHaveLength(0)
  })

  it('steps through the checklist with wrap-round and stops placing on Escape', async () => {
    const { editor } = await loadedStore()
    editor.selectStep(-1)
    expect(editor.selectedName).toBe('S1.pw')
    editor.selectStep(1)
    expect(editor.selectedName).toBe('L5.as')
    editor.stopPlacing()
    expect(editor.targetForClick()).toBeNull()
  })

  it('allows submitting only when every required landmark is placed', async () => {
    const { store, editor } = await loadedStore()
    expect(store.canSubmit).toBe(false)
    for (const spec of store.specs) editor.placePoint(spec.name, [1, 1])
    expect(store.canSubmit).toBe(true)
  })

  it('changes nothing on a submitted reading', async () => {
    const { store, editor } = await loadedStore(readingFixture({ status: 'submitted' }))
    editor.placePoint('L5.as', [1, 1])
    expect(editor.points).toEqual({})
    expect(store.readOnly).toBe(true)
  })
})

describe('reading editor: corner suggestions', () => {
  it('moves a landmark only when the rater accepts, records it, and undoes it in one step', async () => {
    acceptPatches()
    const { editor } = await loadedStore()
    editor.placePoint('L5.as', [100, 100])
    editor.offerSuggestion({ name: 'L5.as', side: 'primary', from: [100, 100], at: [102.4, 98.7] })
    // Offered, not taken: the point stays, recorded as the rater's own beside a suggestion.
    expect(editor.points['L5.as']).toEqual([100, 100])
    expect(editor.accepted).toEqual({ 'L5.as': false })
    editor.acceptSuggestion()
    expect(editor.points['L5.as']).toEqual([102.4, 98.7])
    expect(editor.accepted).toEqual({ 'L5.as': true })
    expect(editor.suggestion).toBeNull()
    await vi.advanceTimersByTimeAsync(AUTOSAVE_DELAY_MS)
    expect(api.patchReading.mock.calls.at(-1)?.[1]).toMatchObject({
      points: { 'L5.as': [102.4, 98.7] },
      suggestionUse: { points: { 'L5.as': true } },
    })
    editor.undo()
    expect(editor.points['L5.as']).toEqual([100, 100])
    expect(editor.accepted).toEqual({ 'L5.as': false })
  })

  it('keeps the own point on Escape or on going on, and ignores an answer for a moved point', async () => {
    const { editor } = await loadedStore()
    editor.placePoint('L5.as', [100, 100])
    editor.offerSuggestion({ name: 'L5.as', side: 'primary', from: [100, 100], at: [103, 99] })
    editor.declineSuggestion()
    expect(editor.suggestion).toBeNull()
    editor.acceptSuggestion()
    expect(editor.points['L5.as']).toEqual([100, 100])

    editor.offerSuggestion({ name: 'L5.as', side: 'primary', from: [100, 100], at: [103, 99] })
    editor.placePoint('L5.ps', [200, 100])
    expect(editor.suggestion).toBeNull()
    expect(editor.points['L5.as']).toEqual([100, 100])
    expect(editor.accepted).toEqual({ 'L5.as': false })

    // The answer came after the rater had already moved the point: it is not shown.
    editor.offerSuggestion({ name: 'L5.ps', side: 'primary', from: [190, 100], at: [191, 101] })
    expect(editor.suggestion).toBeNull()
    // Placed again, the landmark's earlier record goes with its earlier position.
    editor.placePoint('L5.as', [120, 100])
    expect(editor.accepted).toEqual({})
  })
})

describe('reading editor: re-placing from the checklist', () => {
  it('a picked row is placed by the next click even when already placed; a selected landmark is not', async () => {
    const { editor } = await loadedStore(
      readingFixture({ landmarks: { points: { 'L5.as': [10, 10] } } }),
    )
    editor.select('L5.as')
    expect(editor.targetForClick()).toBe('L5.ps')
    editor.pick('L5.as')
    expect(editor.targetForClick()).toBe('L5.as')
    editor.placePoint('L5.as', [20, 20])
    expect(editor.points['L5.as']).toEqual([20, 20])
    expect(editor.targetForClick()).toBe('L5.ps')
  })
})
