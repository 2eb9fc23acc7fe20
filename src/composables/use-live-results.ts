import { computed, onScopeDispose, ref, shallowRef, watch, type Ref } from 'vue'
import type { ImageRecord } from '@shared/types/api'
import type { Reading, ResultSettings } from '@shared/types/readings'
import type { SiteSettingValues } from '@shared/settings/site-settings'
import type { LandmarkDocument, PixelPoint } from '@shared/types/landmarks'
import type {
  MeasurementResult,
  MotionPairResult,
  UncertaintyResult,
} from '@shared/types/measurement'
import {
  computeMeasurements,
  computeMotionPair,
  computeUncertainty,
  DEFAULT_SIGMA_MM,
  DEFAULT_SIGMA_PX,
} from '@shared/measurement'

export interface LiveFilmResults {
  measurements: MeasurementResult | null
  /** Null when the landmarks are refused; refreshed a few times a second during a drag. */
  uncertainty: UncertaintyResult | null
  /** True while the intervals lag the landmarks during a drag. */
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

/** A signed (or superseded) reading shows what was signed; every other one computes as now. */
export function isFrozen(reading: Pick<Reading, 'status'> | null): boolean {
  return reading?.status === 'signed' || reading?.status === 'superseded'
}

/**
 * The settings the live results compute with: the site's, as the server uses them (GET
 * /api/settings), or for a frozen reading those it was computed with.
 */
export function resultSettingsInForce(
  site: SiteSettingValues,
  reading: Pick<Reading, 'status' | 'results'> | null,
): ResultSettings {
  const frozen = isFrozen(reading) ? reading?.results.computedWith : undefined
  return {
    landmarkSigmaMm: frozen?.landmarkSigmaMm ?? site.landmarkSigmaMm,
    subsidenceThresholdMm: frozen?.subsidenceThresholdMm ?? site.subsidenceThresholdMm,
    instabilityCriterion: frozen?.instabilityCriterion ?? site.instabilityCriterion,
    implantCentringThresholdMm:
      frozen?.implantCentringThresholdMm ?? site.implantCentringThresholdMm,
  }
}

/** The film as the results use it: a frozen reading keeps the spacing it was computed with. */
export function filmAsComputed(
  record: ImageRecord | null,
  reading: Pick<Reading, 'status'> | null,
  calibration: Reading['calibration'] | null | undefined,
): ImageRecord | null {
  if (!record || !isFrozen(reading) || !calibration) return record
  return { ...record, mmPerPixel: calibration.mmPerPixel, spacingSource: calibration.source }
}

/** While dragging, intervals are refreshed at most this often (a few engine runs per frame
 * otherwise); every measurement itself follows each move. */
export const DRAG_UNCERTAINTY_INTERVAL_MS = 150

/**
 * Results recomputed in the browser from the landmarks with the shared engine, on every change:
 * the measurements at once (well under a millisecond), the uncertainty (about 2 × the number of
 * coordinates engine runs) at once when a landmark is placed or dropped, and every
 * DRAG_UNCERTAINTY_INTERVAL_MS during a drag, so dragging stays smooth. The intervals use the
 * site's landmark σ in mm (the server's too; 3 px on uncalibrated films, as on the server). The
 * server's stored results remain the record.
 */
export function useLiveResults(
  points: Ref<Record<string, PixelPoint>>,
  film: Ref<ImageRecord | null>,
  dragging: Ref<boolean>,
  sigmaMm: Ref<number> = ref(DEFAULT_SIGMA_MM),
) {
  const doc = computed(() => documentOf(points.value, film.value))
  const measured = computed(() => measure(doc.value))
  const uncertainty = shallowRef<UncertaintyResult | null>(null)
  const stale = ref(false)
  let timer: ReturnType<typeof setTimeout> | null = null

  function refresh(): void {
    timer = null
    stale.value = false
    if (measured.value.measurements === null) {
      uncertainty.value = null
      return
    }
    try {
      uncertainty.value = computeUncertainty(doc.value, {
        sigmaMm: sigmaMm.value,
        sigmaPx: DEFAULT_SIGMA_PX,
      })
    } catch {
      uncertainty.value = null
    }
  }

  // During a drag the last intervals stay on screen, marked stale, until the next refresh.
  watch(
    [doc, dragging, sigmaMm],
    () => {
      if (!dragging.value) {
        if (timer !== null) clearTimeout(timer)
        refresh()
        return
      }
      stale.value = true
      timer ??= setTimeout(refresh, DRAG_UNCERTAINTY_INTERVAL_MS)
    },
    { immediate: true },
  )
  onScopeDispose(() => {
    if (timer !== null) clearTimeout(timer)
  })

  const results = computed<LiveFilmResults>(() => ({
    measurements: measured.value.measurements,
    uncertainty: uncertainty.value,
    stale: stale.value,
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
