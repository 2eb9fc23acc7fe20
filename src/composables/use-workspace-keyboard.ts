import { onBeforeUnmount, onMounted, ref } from 'vue'

export interface WorkspaceKeyActions {
  undo(): void
  redo(): void
  remove(): void
  step(direction: 1 | -1): void
  escape(): void
  /** Enter: accept what is offered (a corner suggestion); false when nothing is. */
  accept(): boolean
}

function isTyping(target: EventTarget | null): boolean {
  const element = target as HTMLElement | null
  return Boolean(
    element &&
    (element.isContentEditable || ['INPUT', 'TEXTAREA', 'SELECT'].includes(element.tagName)),
  )
}

function inToolbar(target: EventTarget | null): boolean {
  return Boolean((target as HTMLElement | null)?.closest?.('.top-bar, .film-controls, .app-header'))
}

function onControl(target: EventTarget | null): boolean {
  return Boolean((target as HTMLElement | null)?.closest?.('button, a, [role="button"]'))
}

/**
 * Workspace shortcuts: Ctrl/⌘-Z undo, Ctrl/⌘-Shift-Z and Ctrl/⌘-Y redo, Delete/Backspace remove
 * the selected landmark, Tab/Shift-Tab step through the checklist, Enter accept a corner
 * suggestion (a focused button keeps its Enter), Escape stop placing, Space
 * held pan. Keys typed into a field are left alone, and so is everything while a dialog is open.
 * A screen that edits nothing passes only the actions it has: keys without one keep their usual
 * browser meaning (Tab still moves focus), and Space held still pans.
 */
export function useWorkspaceKeyboard(
  actions: Partial<WorkspaceKeyActions>,
  enabled: () => boolean,
) {
  const spaceHeld = ref(false)

  function onKeyDown(event: KeyboardEvent): void {
    if (!enabled() || isTyping(event.target) || document.querySelector('.p-dialog-mask')) return
    const command = event.ctrlKey || event.metaKey
    const key = event.key.toLowerCase()
    const { undo, redo, remove, step, escape, accept } = actions
    if (command && key === 'z' && undo && redo) {
      event.preventDefault()
      if (event.shiftKey) redo()
      else undo()
    } else if (command && key === 'y' && redo) {
      event.preventDefault()
      redo()
    } else if ((event.key === 'Delete' || event.key === 'Backspace') && remove) {
      event.preventDefault()
      remove()
    } else if (event.key === 'Tab' && step && !inToolbar(event.target)) {
      // Tab steps through landmarks; in the bars it still moves focus between controls.
      event.preventDefault()
      step(event.shiftKey ? -1 : 1)
    } else if (event.key === 'Enter' && accept && !onControl(event.target)) {
      if (accept()) event.preventDefault()
    } else if (event.key === 'Escape' && escape) {
      escape()
    } else if (event.key === ' ') {
      // Space would otherwise press the focused button.
      event.preventDefault()
      spaceHeld.value = true
    }
  }

  function onKeyUp(event: KeyboardEvent): void {
    if (event.key === ' ') spaceHeld.value = false
  }

  function onBlur(): void {
    spaceHeld.value = false
  }

  onMounted(() => {
    window.addEventListener('keydown', onKeyDown)
    window.addEventListener('keyup', onKeyUp)
    window.addEventListener('blur', onBlur)
  })
  onBeforeUnmount(() => {
    window.removeEventListener('keydown', onKeyDown)
    window.removeEventListener('keyup', onKeyUp)
    window.removeEventListener('blur', onBlur)
  })
  return { spaceHeld }
}
