import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest'
import { effectScope, nextTick, ref } from 'vue'
import type { ImageRecord } from '../../../shared/types/api'
import type { PixelPoint } from '../../../shared/types/landmarks'
import { computeMeasurements, computeUncertainty } from '../../../shared/measurement'
import {
  DRAG_UNCERTAINTY_INTERVAL_MS,
  useLiveResults,
} from '../../../src/composables/use-live-results'

// The S1 endplate 40 px deep along +x, L5 shifted 10 px forward: a 25 % Taillard slip
// (Butt & Saifuddin 2005 [V]); the other corners make a plain box.
const points: Record<string, PixelPoint> = {
  'L5.as': [50, 60],
  'L5.ps': [10, 60],
  'L5.pi': [10, 90],
  'L5.ai': [50, 90],
  'S1.as': [40, 100],
  'S1.ps': [0, 100],
}
const film = { mmPerPixel: [0.5, 0.5], spacingSource: 'manual' } as ImageRecord

beforeEach(() => vi.useFakeTimers())
afterEach(() => vi.useRealTimers())

describe('useLiveResults', () => {
  it('gives the engine result and its intervals for the landmarks and the film spacing', () => {
    const scope = effectScope()
    const live = scope.run(() => useLiveResults(ref({ ...points }), ref(film), ref(false)))!
    const doc = { mmPerPixel: [0.5, 0.5] as [number, number], points }
    expect(live.results.value.measurements).toEqual(computeMeasurements(doc))
    expect(live.results.value.uncertainty).toEqual(computeUncertainty(doc))
    expect(live.results.value.measurements?.segments['L5-S1']?.slipPercent).toBeCloseTo(25, 9)
    scope.stop()
  })

  it('follows every move at once and refreshes the intervals during a drag a few times a second', async () => {
    const scope = effectScope()
    const landmarks = ref({ ...points })
    const dragging = ref(false)
    const live = scope.run(() => useLiveResults(landmarks, ref(film), dragging))!
    const before = live.results.value.uncertainty
    dragging.value = true
    landmarks.value['L5.pi'] = [14, 90]
    await nextTick()
    expect(live.results.value.measurements?.segments['L5-S1']?.slipPercent).toBeCloseTo(35, 9)
    expect(live.results.value.stale).toBe(true)
    expect(live.results.value.uncertainty).toBe(before)
    await vi.advanceTimersByTimeAsync(DRAG_UNCERTAINTY_INTERVAL_MS)
    expect(live.results.value.stale).toBe(false)
    expect(
      live.results.value.uncertainty?.measurements.segments['L5-S1']?.slipPercent?.value,
    ).toBeCloseTo(35, 9)
    scope.stop()
  })

  it('reports the engine message and no values when landmarks coincide', () => {
    const scope = effectScope()
    const live = scope.run(() =>
      useLiveResults(ref({ ...points, 'S1.as': [0, 100] }), ref(film), ref(false)),
    )!
    expect(live.results.value.measurements).toBeNull()
    expect(live.results.value.error).toMatch(/S1/)
    scope.stop()
  })
})
