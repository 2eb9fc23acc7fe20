import { onBeforeUnmount, onMounted, type Ref } from 'vue'

/**
 * Makes a view fill the window between the app header and the cautions line, which stays
 * visible: the shell grows with its content elsewhere, so the workspace pins the app root to the
 * viewport height while it is shown and gives the previous styles back when it leaves.
 */
export function useFullHeightLayout(root: Ref<HTMLElement | null>): void {
  const restores: Array<() => void> = []

  function set(element: HTMLElement | null, styles: Partial<CSSStyleDeclaration>): void {
    if (!element) return
    const previous = Object.fromEntries(
      Object.keys(styles).map((key) => [key, element.style[key as never]]),
    )
    Object.assign(element.style, styles)
    restores.push(() => Object.assign(element.style, previous))
  }

  onMounted(() => {
    set(document.getElementById('app'), { height: '100dvh', minHeight: '0', overflow: 'hidden' })
    set(root.value?.parentElement ?? null, { minHeight: '0', overflow: 'hidden' })
  })
  onBeforeUnmount(() => {
    for (const restore of restores.reverse()) restore()
    restores.length = 0
  })
}
