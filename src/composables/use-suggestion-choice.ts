import { ref, type Ref } from 'vue'
import type { PixelPoint } from '@shared/types/landmarks'
import type { SuggestionAcceptance } from '@shared/types/readings'
import type { FilmSide, PointMap } from '@/utils/landmark-snapshot'

/** A corner the image suggests for a placed landmark, waiting for the rater's Enter or Escape. */
export interface PendingSuggestion {
  name: string
  side: FilmSide
  /** Where the rater put the landmark (the suggestion stands only while it is still there). */
  from: PixelPoint
  /** The suggested corner, image px. */
  at: PixelPoint
}

export interface SuggestionChoiceInput {
  pointsOf: (side: FilmSide) => Ref<PointMap>
  readOnly: Ref<boolean>
  /** The record changed without a history step (an offer noted as "own point kept"). */
  edited: () => void
  /** Runs `change` as one Undo step. */
  step: (change: () => void) => void
}

/**
 * The pending corner suggestion and, per landmark and film, whether the rater took the image's
 * suggestion or kept their own point beside one: the record a saved reading carries.
 */
export function useSuggestionChoice(input: SuggestionChoiceInput) {
  /** Per landmark: accepted the image's suggestion (true) or kept their own point beside one. */
  const accepted = ref<SuggestionAcceptance>({})
  const pairedAccepted = ref<SuggestionAcceptance>({})
  const suggestion = ref<PendingSuggestion | null>(null)
  const acceptedOf = (side: FilmSide) => (side === 'primary' ? accepted : pairedAccepted)

  /** A landmark placed anew has no suggestion history until one is offered for it. */
  function forget(name: string, side: FilmSide): void {
    if (suggestion.value?.name === name && suggestion.value.side === side) suggestion.value = null
    if (name in acceptedOf(side).value) {
      const next = { ...acceptedOf(side).value }
      delete next[name]
      acceptedOf(side).value = next
    }
  }

  /**
   * The image's answer for a landmark just placed or dropped: shown only while the landmark is
   * still where it was when asked, and recorded as "own point kept" until the rater accepts.
   */
  function offer(offered: PendingSuggestion): void {
    if (input.readOnly.value) return
    const current = input.pointsOf(offered.side).value[offered.name]
    if (!current || current[0] !== offered.from[0] || current[1] !== offered.from[1]) return
    suggestion.value = offered
    acceptedOf(offered.side).value = { ...acceptedOf(offered.side).value, [offered.name]: false }
    input.edited()
  }

  /**
   * Enter, or a click on the mark: the landmark moves to the suggestion (one Undo step).
   * Answers the landmark moved, or null when there was nothing to accept.
   */
  function accept(): string | null {
    const offered = suggestion.value
    if (!offered || input.readOnly.value) return null
    input.step(() => {
      input.pointsOf(offered.side).value[offered.name] = [offered.at[0], offered.at[1]]
      acceptedOf(offered.side).value = { ...acceptedOf(offered.side).value, [offered.name]: true }
      suggestion.value = null
    })
    return offered.name
  }

  /** Escape: the rater's own point stays, as it does when they simply go on. */
  function decline(): void {
    suggestion.value = null
  }

  return { accepted, pairedAccepted, suggestion, forget, offer, accept, decline }
}
