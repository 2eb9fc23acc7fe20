import { computed, ref, type Ref } from 'vue'

/**
 * Undo and redo over whole states: each step keeps the state before it, so undoing restores it
 * exactly. A new step drops whatever could have been redone, as editors commonly do.
 */
export function useUndoHistory<T>() {
  const undoStack = ref<T[]>([]) as Ref<T[]>
  const redoStack = ref<T[]>([]) as Ref<T[]>
  const hasUndo = computed(() => undoStack.value.length > 0)
  const hasRedo = computed(() => redoStack.value.length > 0)

  /** A new step that started from `before`. */
  function record(before: T): void {
    undoStack.value.push(before)
    redoStack.value = []
  }

  /** The state to go back to, keeping `current` for Redo; undefined when there is none. */
  function undo(current: T): T | undefined {
    const previous = undoStack.value.pop()
    if (previous !== undefined) redoStack.value.push(current)
    return previous
  }

  /** The state to go forward to, keeping `current` for Undo; undefined when there is none. */
  function redo(current: T): T | undefined {
    const next = redoStack.value.pop()
    if (next !== undefined) undoStack.value.push(current)
    return next
  }

  function clear(): void {
    undoStack.value = []
    redoStack.value = []
  }

  return { undoStack, redoStack, hasUndo, hasRedo, record, undo, redo, clear }
}
