import { computed, ref, type Ref } from 'vue'
import type { LandmarkSpec } from '@shared/readings/templates'
import type { FilmSide, PointMap } from '@/utils/landmark-snapshot'

export interface LandmarkSelectionInput {
  /** The checklist, in template order. */
  specs: Ref<readonly LandmarkSpec[]>
  /** The landmarks placed on each film. */
  pointsOf: (side: FilmSide) => PointMap
  readOnly: Ref<boolean>
  /** A pending corner suggestion: selecting another landmark drops it. */
  suggestion: Ref<{ name: string; side: FilmSide } | null>
}

/**
 * Which landmark the next click on the film places: the checklist's selection, the row picked to
 * re-place, Tab order with wrap-round, and Escape to stop placing.
 */
export function useLandmarkSelection(input: LandmarkSelectionInput) {
  const activeSide = ref<FilmSide>('primary')
  const selectedName = ref<string | null>(null)
  /** False after Escape: clicks on the film no longer place the next landmark. */
  const placing = ref(true)
  /** A row picked in the checklist (or by Tab): the next click on the film re-places it. */
  const replacing = ref<string | null>(null)

  const activePoints = computed(() => input.pointsOf(activeSide.value))
  /** The first landmark of the checklist not yet placed on the active film. */
  const nextName = computed(
    () => input.specs.value.find((spec) => !(spec.name in activePoints.value))?.name ?? null,
  )

  /** Selects a landmark (clicking it on the film): a click elsewhere then places the next one. */
  function select(name: string | null, side: FilmSide = activeSide.value): void {
    const pending = input.suggestion.value
    if (pending && (pending.name !== name || pending.side !== side)) input.suggestion.value = null
    selectedName.value = name
    activeSide.value = side
    replacing.value = null
    if (name !== null) placing.value = true
  }

  /** Picks a checklist row: the next click on the film puts that landmark there. */
  function pick(name: string, side: FilmSide = activeSide.value): void {
    select(name, side)
    replacing.value = name
  }

  /** Tab / Shift-Tab: the next or previous checklist row, wrapping round. */
  function selectStep(step: 1 | -1): void {
    const names = input.specs.value.map((spec) => spec.name)
    if (names.length === 0) return
    const current = selectedName.value === null ? -1 : names.indexOf(selectedName.value)
    const index =
      current === -1
        ? step === 1
          ? 0
          : names.length - 1
        : (current + step + names.length) % names.length
    const name = names[index]
    if (name !== undefined) pick(name)
  }

  /**
   * The landmark a click places: the row the user picked (to place or re-place it), the
   * selected one while it is still unplaced, else the next unplaced one.
   */
  function targetForClick(): string | null {
    if (!placing.value || input.readOnly.value) return null
    if (replacing.value !== null) return replacing.value
    if (selectedName.value !== null && !(selectedName.value in activePoints.value))
      return selectedName.value
    return nextName.value
  }

  function stopPlacing(): void {
    input.suggestion.value = null
    placing.value = false
    selectedName.value = null
    replacing.value = null
  }

  function reset(): void {
    activeSide.value = 'primary'
    selectedName.value = null
    placing.value = true
    replacing.value = null
  }

  return {
    activeSide,
    selectedName,
    placing,
    replacing,
    activePoints,
    nextName,
    select,
    pick,
    selectStep,
    targetForClick,
    stopPlacing,
    reset,
  }
}
