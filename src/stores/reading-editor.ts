import { computed, ref } from 'vue'
import { defineStore } from 'pinia'
import type { PixelPoint } from '@shared/types/landmarks'
import type { Reading, SuggestionUse } from '@shared/types/readings'
import { submitRefusal } from '@shared/readings/reading-rules'
import type { LandmarkSpec } from '@shared/readings/templates'
import { useUndoHistory } from '@/composables/use-undo-history'
import { useLandmarkSelection } from '@/composables/use-landmark-selection'
import { useSuggestionChoice } from '@/composables/use-suggestion-choice'
import {
  copyPoints,
  copySnapshot,
  sameSnapshot,
  type FilmSide,
  type LandmarkSnapshot,
  type PointMap,
} from '@/utils/landmark-snapshot'
import { useReadingsStore } from './readings'

/**
 * What the editor reads from the `readings` store. Spelled out, not inferred, because the two
 * stores use each other and TypeScript cannot infer a type that refers to itself.
 */
interface ReadingContext {
  readonly reading: Reading | null
  readonly specs: readonly LandmarkSpec[]
  readonly isPair: boolean
  readonly readOnly: boolean
  noteEdit(): void
}

/**
 * The landmark document being edited and everything about editing it: placing, dragging,
 * selection, the image's corner suggestions and the undo history. It is a store of its own,
 * beside `readings` (the reading as the server holds it), because it changes on every pointer
 * move while the server object changes only when loaded, saved or signed; it reads whether
 * editing is allowed from `readings` and tells it of each edit, which `readings` autosaves.
 */
export const useReadingEditorStore = defineStore('reading-editor', () => {
  const readings: ReadingContext = useReadingsStore()

  const points = ref<PointMap>({})
  const pairedPoints = ref<PointMap>({})
  /** True between pointer-down and pointer-up on a landmark. */
  const dragging = ref(false)
  const history = useUndoHistory<LandmarkSnapshot>()
  let dragStart: LandmarkSnapshot | null = null

  const readOnly = computed(() => readings.readOnly)
  const sidePoints = (side: FilmSide) => (side === 'primary' ? points : pairedPoints)
  const choice = useSuggestionChoice({
    pointsOf: sidePoints,
    readOnly,
    edited: () => readings.noteEdit(),
    step: (change) => {
      const before = snapshot()
      change()
      commitFrom(before)
    },
  })
  const { accepted, pairedAccepted, suggestion } = choice
  const selection = useLandmarkSelection({
    specs: computed(() => readings.specs),
    pointsOf: (side) => sidePoints(side).value,
    readOnly,
    suggestion,
  })
  const { activeSide, selectedName, replacing } = selection
  /** The reading as the shared rules see it (shared/readings/reading-rules, as the server). */
  const ruleInput = computed(() =>
    readings.reading
      ? {
          template: readings.reading.template,
          options: readings.reading.options,
          points: points.value,
          pairedPoints: readings.isPair ? pairedPoints.value : null,
        }
      : null,
  )
  /** Why Submit is refused now, in the server's words; null when it may be submitted. */
  const submitBlocked = computed(() =>
    ruleInput.value ? (submitRefusal(ruleInput.value)?.message ?? null) : null,
  )
  const canUndo = computed(() => !readOnly.value && history.hasUndo.value)
  const canRedo = computed(() => !readOnly.value && history.hasRedo.value)

  function snapshot(): LandmarkSnapshot {
    return copySnapshot({
      points: points.value,
      pairedPoints: pairedPoints.value,
      accepted: accepted.value,
      pairedAccepted: pairedAccepted.value,
    })
  }

  function restore(state: LandmarkSnapshot): void {
    const copy = copySnapshot(state)
    points.value = copy.points
    pairedPoints.value = copy.pairedPoints
    accepted.value = copy.accepted
    pairedAccepted.value = copy.pairedAccepted
    suggestion.value = null
  }

  /** Takes a reading's landmarks as they were saved (loading, signing, a conflict's choice). */
  function hydrate(loaded: Reading): void {
    restore({
      points: loaded.landmarks.points,
      pairedPoints: loaded.pairedLandmarks?.points ?? {},
      accepted: loaded.suggestionUse.points,
      pairedAccepted: loaded.suggestionUse.pairedPoints ?? {},
    })
  }

  /** The landmarks and suggestion records as a save sends them. */
  function draft(): { points: PointMap; pairedPoints?: PointMap; suggestionUse: SuggestionUse } {
    const suggestionUse: SuggestionUse = {
      points: { ...accepted.value },
      ...(readings.isPair ? { pairedPoints: { ...pairedAccepted.value } } : {}),
    }
    return {
      points: copyPoints(points.value),
      ...(readings.isPair ? { pairedPoints: copyPoints(pairedPoints.value) } : {}),
      suggestionUse,
    }
  }

  /** The current landmarks become one Undo step (before another version replaces them). */
  function keepForUndo(): void {
    history.record(snapshot())
  }

  /** One history step from `before` to now; nothing when nothing changed. */
  function commitFrom(before: LandmarkSnapshot): void {
    if (sameSnapshot(before, snapshot())) return
    history.record(before)
    readings.noteEdit()
  }

  /** Enter, or a click on the mark: the landmark moves to the suggestion (one Undo step). */
  function acceptSuggestion(): void {
    const name = choice.accept()
    if (name !== null) selectedName.value = name
  }

  function placePoint(name: string, pointPx: PixelPoint, side: FilmSide = activeSide.value): void {
    if (readOnly.value) return
    const before = snapshot()
    suggestion.value = null
    sidePoints(side).value[name] = [pointPx[0], pointPx[1]]
    choice.forget(name, side)
    selectedName.value = name
    replacing.value = null
    commitFrom(before)
  }

  /** Pointer-down on a landmark: remembers where the history step starts. */
  function beginDrag(): void {
    if (readOnly.value) return
    dragStart = snapshot()
    suggestion.value = null
    dragging.value = true
  }

  /** Every pointer move: updates the point (results follow) without a history step. */
  function dragPoint(name: string, pointPx: PixelPoint, side: FilmSide = activeSide.value): void {
    if (readOnly.value || dragStart === null) return
    sidePoints(side).value[name] = [pointPx[0], pointPx[1]]
  }

  /** Pointer-up: one history step for the whole drag. */
  function endDrag(name?: string, side: FilmSide = activeSide.value): void {
    if (dragStart !== null && name !== undefined) {
      const start = side === 'primary' ? dragStart.points[name] : dragStart.pairedPoints[name]
      const now = sidePoints(side).value[name]
      if (!start || !now || start[0] !== now[0] || start[1] !== now[1]) choice.forget(name, side)
    }
    if (dragStart !== null) commitFrom(dragStart)
    dragStart = null
    dragging.value = false
  }

  function removePoint(name: string, side: FilmSide = activeSide.value): void {
    if (readOnly.value || !(name in sidePoints(side).value)) return
    const before = snapshot()
    const next = { ...sidePoints(side).value }
    delete next[name]
    sidePoints(side).value = next
    choice.forget(name, side)
    commitFrom(before)
  }

  function undo(): void {
    if (readOnly.value) return
    const previous = history.undo(snapshot())
    if (!previous) return
    restore(previous)
    readings.noteEdit()
  }

  function redo(): void {
    if (readOnly.value) return
    const next = history.redo(snapshot())
    if (!next) return
    restore(next)
    readings.noteEdit()
  }

  function reset(): void {
    points.value = {}
    pairedPoints.value = {}
    accepted.value = {}
    pairedAccepted.value = {}
    suggestion.value = null
    selection.reset()
    history.clear()
    dragStart = null
    dragging.value = false
  }

  return {
    points,
    pairedPoints,
    accepted,
    pairedAccepted,
    suggestion,
    activeSide,
    selectedName,
    placing: selection.placing,
    replacing,
    dragging,
    undoStack: history.undoStack,
    redoStack: history.redoStack,
    activePoints: selection.activePoints,
    nextName: selection.nextName,
    submitBlocked,
    canUndo,
    canRedo,
    hydrate,
    draft,
    keepForUndo,
    placePoint,
    beginDrag,
    dragPoint,
    endDrag,
    offerSuggestion: choice.offer,
    acceptSuggestion,
    declineSuggestion: choice.decline,
    removePoint,
    undo,
    redo,
    select: selection.select,
    pick: selection.pick,
    selectStep: selection.selectStep,
    targetForClick: selection.targetForClick,
    stopPlacing: selection.stopPlacing,
    reset,
  }
})
