import { onBeforeUnmount, onMounted, ref } from 'vue'

export interface WorkspaceKeyActions {
  undo(): void
  redo(): void
  remove(): void
  step(direction: 1 | -1): void
  escape(): void
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

/**
 * Workspace shortcuts: Ctrl/⌘-Z undo, Ctrl/⌘-Shift-Z and Ctrl/⌘-Y redo, Delete/Backspace remove
 * the selected landmark, Tab/Shift-Tab step through the checklist, Escape stop placing, Space
 * held pan. Keys typed into a field are left alone, and so is everything while a dialog is open.
 */
export function useWorkspaceKeyboard(actions: WorkspaceKeyActions, enabled: () => boolean) {
  const spaceHeld = ref(false)

  function onKeyDown(event: KeyboardEvent): void {
    if (!enabled() || isTyping(event.target) || document.querySelector('.p-dialog-mask')) return
    const command = event.ctrlKey || event.metaKey
    const key = event.key.toLowerCase()
    if (command && key === 'z') {
      event.preventDefault()
      if (event.shiftKey) actions.redo()
      else actions.undo()
    } else if (command && key === 'y') {
      event.preventDefault()
      actions.redo()
    } else if (event.key === 'Delete' || event.key === 'Backspace') {
      event.preventDefault()
      actions.remove()
    } else if (event.key === 'Tab' && !inToolbar(event.target)) {
      // Tab steps through landmarks; in the bars it still moves focus between controls.
      event.preventDefault()
      actions.step(event.shiftKey ? -1 : 1)
    } else if (event.key === 'Escape') {
      actions.escape()
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
