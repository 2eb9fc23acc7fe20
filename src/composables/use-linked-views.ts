import { toRaw, watch, type Ref } from 'vue'
import { viewTransformLinked } from '@shared/geometry/linked-view'
import type { ViewTransform } from '@shared/geometry/view-transform'

/** What linking needs from one film's stage view (useStageView) and its film. */
export interface LinkableView {
  stage: {
    view: Ref<ViewTransform>
    fitted: Ref<boolean>
    width: Ref<number>
    height: Ref<number>
    fittedView(): ViewTransform | null
  }
  imageSize(): [number, number]
}

/**
 * Keeps two films' zoom and pan together while `linked` is true: a change on either side is
 * carried to the other relative to each film's own fit (viewTransformLinked), so a zoom into one
 * film's L4-L5 shows the other's at the same magnification over its fit and the same place. A
 * view written by the link is not carried back. Turning the link on brings `after` to `before`.
 */
export function useLinkedViews(
  before: () => LinkableView | null,
  after: () => LinkableView | null,
  linked: Ref<boolean>,
): void {
  const written = new WeakMap<LinkableView, ViewTransform>()

  function carry(from: LinkableView | null, to: LinkableView | null): void {
    if (!linked.value || !from || !to) return
    const fromFit = from.stage.fittedView()
    const toFit = to.stage.fittedView()
    if (!fromFit || !toFit || to.stage.width.value === 0) return
    const next = viewTransformLinked(
      {
        view: from.stage.view.value,
        fit: fromFit,
        imageSizePx: from.imageSize(),
        viewportPx: [from.stage.width.value, from.stage.height.value],
      },
      {
        fit: toFit,
        imageSizePx: to.imageSize(),
        viewportPx: [to.stage.width.value, to.stage.height.value],
      },
    )
    written.set(to, next)
    to.stage.view.value = next
    to.stage.fitted.value = from.stage.fitted.value
  }

  function follow(source: () => LinkableView | null, target: () => LinkableView | null): void {
    watch(
      () => source()?.stage.view.value,
      (view) => {
        const from = source()
        // A ref hands back a reactive proxy of what was written: compare the raw objects.
        if (!from || !view || written.get(from) === toRaw(view)) return
        carry(from, target())
      },
    )
  }

  follow(before, after)
  follow(after, before)
  watch(linked, (on) => {
    if (on) carry(before(), after())
  })
}
