import { computed, shallowRef, watch, type Ref } from 'vue'
import type { ImageRecord } from '@shared/types/api'
import type { LandmarkDocument, PixelPoint } from '@shared/types/landmarks'
import type {
  MeasurementResult,
  MotionPairResult,
  UncertaintyResult,
} from '@shared/types/measurement'
import { computeMeasurements, computeMotionPair, computeUncertainty } from '@shared/measurement'

export interface LiveFilmResults {
  measurements: MeasurementResult | null
  /** Null when the landmarks are refused; from before the drag while one is under way. */
  uncertainty: UncertaintyResult | null
  /** True while the intervals are those from before the current drag. */
  stale: boolean
  /** The engine's message when it refuses the landmarks (e.g. two corners on one spot). */
  error: string | null
}

// The copy reads every key, so the document (and whatever watches it) follows each placed,
// moved or removed point, not only a replaced map.
function documentOf(
  points: Record<string, PixelPoint>,
  film: ImageRecord | null,
): LandmarkDocument {
  return { mmPerPixel: film?.mmPerPixel ?? null, points: { ...points } }
}

function measure(doc: LandmarkDocument): {
  measurements: MeasurementResult | null
  error: string | null
} {
  try {
    return { measurements: computeMeasurements(doc), error: null }
  } catch (caught) {
    return { measurements: null, error: caught instanceof Error ? caught.message : String(caught) }
  }
}

/**
 * Results recomputed in the browser from the landmarks with the shared engine, on every change:
 * the measurements at once (well under a millisecond), the uncertainty (about 2 × the number of
 * coordinates engine runs) once a drag ends, so dragging stays smooth. The server's stored
 * results remain the record.
 */
export function useLiveResults(
  points: Ref<Record<string, PixelPoint>>,
  film: Ref<ImageRecord | null>,
  dragging: Ref<boolean>,
) {
  const doc = computed(() => documentOf(points.value, film.value))
  const measured = computed(() => measure(doc.value))
  const uncertainty = shallowRef<UncertaintyResult | null>(null)

  // While a landmark is dragged the last intervals stay on screen, marked stale, so the panel
  // does not jump; they are recomputed when the drag ends.
  watch(
    [doc, dragging],
    () => {
      if (dragging.value) return
      if (measured.value.measurements === null) {
        uncertainty.value = null
        return
      }
      try {
        uncertainty.value = computeUncertainty(doc.value)
      } catch {
        uncertainty.value = null
      }
    },
    { immediate: true },
  )

  const results = computed<LiveFilmResults>(() => ({
    measurements: measured.value.measurements,
    uncertainty: uncertainty.value,
    stale: dragging.value,
    error: measured.value.error,
  }))
  return { doc, results }
}

/** Motion between the flexion (image) and extension (paired image) landmarks, when both measure. */
export function motionOf(
  flexion: LandmarkDocument,
  extension: LandmarkDocument,
): MotionPairResult | null {
  try {
    return computeMotionPair(flexion, extension)
  } catch {
    return null
  }
}
