import { onBeforeUnmount, onMounted } from 'vue'
import { onBeforeRouteLeave } from 'vue-router'

/**
 * Warns before unsaved work is lost: the browser's own prompt on reload or close, and a
 * confirmation on in-app navigation. `flush` gets one chance to save before asking.
 */
export function useLeaveGuard(
  hasUnsaved: () => boolean,
  flush: () => Promise<void>,
  confirmLeave: () => Promise<boolean>,
): void {
  function onBeforeUnload(event: BeforeUnloadEvent): void {
    if (!hasUnsaved()) return
    event.preventDefault()
    // Older browsers need returnValue set to show the prompt.
    event.returnValue = ''
  }

  onBeforeRouteLeave(async () => {
    if (!hasUnsaved()) return true
    await flush().catch(() => undefined)
    if (!hasUnsaved()) return true
    return confirmLeave()
  })

  onMounted(() => window.addEventListener('beforeunload', onBeforeUnload))
  onBeforeUnmount(() => window.removeEventListener('beforeunload', onBeforeUnload))
}
