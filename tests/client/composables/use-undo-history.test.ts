import { describe, expect, it } from 'vitest'
import { useUndoHistory } from '../../../src/composables/use-undo-history'

// Undo/redo as editors commonly keep it (common practice): a linear history where undo then
// redo returns to the same state, and a new step discards what could have been redone.
describe('useUndoHistory', () => {
  it('undoes steps in reverse order and redoes them forward', () => {
    const history = useUndoHistory<string>()
    history.record('a') // a → b
    history.record('b') // b → c
    expect(history.undo('c')).toBe('b')
    expect(history.undo('b')).toBe('a')
    expect(history.undo('a')).toBeUndefined()
    expect(history.redo('a')).toBe('b')
    expect(history.redo('b')).toBe('c')
    expect(history.redo('c')).toBeUndefined()
  })

  it('drops the redo steps when a new step is recorded', () => {
    const history = useUndoHistory<string>()
    history.record('a')
    history.undo('b')
    expect(history.hasRedo.value).toBe(true)
    history.record('a')
    expect(history.hasRedo.value).toBe(false)
    expect(history.redo('x')).toBeUndefined()
    expect(history.undoStack.value).toEqual(['a'])
  })

  it('keeps nothing on an empty undo, and clear empties both stacks', () => {
    const history = useUndoHistory<number>()
    expect(history.undo(1)).toBeUndefined()
    expect(history.hasRedo.value).toBe(false)
    history.record(1)
    history.undo(2)
    history.clear()
    expect([history.hasUndo.value, history.hasRedo.value]).toEqual([false, false])
  })
})
