import { onBeforeUnmount, onMounted, ref, type Ref } from 'vue'
import type { Point } from '@shared/geometry/types'
import {
  VIEW_TRANSFORM_IDENTITY,
  viewTransformActualSize,
  viewTransformFit,
  viewTransformPan,
  viewTransformPinch,
  viewTransformZoomAroundPoint,
  wheelZoomFactor,
  type ViewTransform,
} from '@shared/geometry/view-transform'

/** Room kept round a fitted film, in CSS px. */
const FIT_MARGIN_PX = 16

/**
 * The view of one film in its container: size (followed with a ResizeObserver), the transform,
 * Fit, 1:1, zoom round the cursor and two-finger pinch. The film stays fitted until the user
 * zooms or pans, so resizing the window keeps it whole.
 */
export function useStageView(
  container: Ref<HTMLElement | null>,
  imageSize: () => [number, number] | null,
) {
  const width = ref(0)
  const height = ref(0)
  const view = ref<ViewTransform>(VIEW_TRANSFORM_IDENTITY)
  const fitted = ref(true)
  let observer: ResizeObserver | null = null

  /** The transform that fits the whole film in the container now; null before the film is known. */
  function fittedView(): ViewTransform | null {
    const size = imageSize()
    return size
      ? viewTransformFit(size[0], size[1], width.value, height.value, FIT_MARGIN_PX)
      : null
  }

  function fit(): void {
    const fitting = fittedView()
    if (!fitting) return
    view.value = fitting
    fitted.value = true
  }

  function actualSize(): void {
    view.value = viewTransformActualSize(
      view.value,
      [width.value / 2, height.value / 2],
      window.devicePixelRatio || 1,
    )
    fitted.value = false
  }

  function zoomAt(factor: number, anchorStage: Point): void {
    view.value = viewTransformZoomAroundPoint(view.value, factor, anchorStage)
    fitted.value = false
  }

  function panBy(dx: number, dy: number): void {
    view.value = viewTransformPan(view.value, dx, dy)
    fitted.value = false
  }

  function pinch(a0: Point, b0: Point, a1: Point, b1: Point): void {
    view.value = viewTransformPinch(view.value, a0, b0, a1, b1)
    fitted.value = false
  }

  function onWheel(event: WheelEvent): void {
    const element = container.value
    if (!element) return
    event.preventDefault()
    const rect = element.getBoundingClientRect()
    // Trackpad pinch arrives as a wheel event with ctrlKey and small deltas: zoom faster.
    const factor = wheelZoomFactor(
      event.deltaMode === 1 ? event.deltaY * 16 : event.deltaY,
      event.ctrlKey ? 0.01 : 0.0015,
    )
    zoomAt(factor, [event.clientX - rect.left, event.clientY - rect.top])
  }

  onMounted(() => {
    const element = container.value
    if (!element) return
    observer = new ResizeObserver(() => {
      width.value = element.clientWidth
      height.value = element.clientHeight
      if (fitted.value) fit()
    })
    observer.observe(element)
    element.addEventListener('wheel', onWheel, { passive: false })
  })
  onBeforeUnmount(() => {
    observer?.disconnect()
    container.value?.removeEventListener('wheel', onWheel)
  })

  return { width, height, view, fitted, fittedView, fit, actualSize, zoomAt, panBy, pinch }
}
