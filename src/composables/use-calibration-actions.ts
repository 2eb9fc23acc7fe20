import { computed, ref, type Ref } from 'vue'
import { useToast } from 'primevue/usetoast'
import { useReadingsStore } from '@/stores/readings'
import type { FilmSide } from '@/utils/landmark-snapshot'
import { errorMessage } from '@/utils/error-message'

type Line = [[number, number], [number, number]]

/** What the workspace asks of a film canvas while calibrating. */
interface CalibratingCanvas {
  clearCalibration(): void
}

/**
 * Calibration in the reading workspace: a canvas hands over the line drawn on a film, the dialog
 * asks for its true length in mm, and the reading's calibration is saved through the store.
 */
export function useCalibrationActions(options: {
  canvases: Ref<Record<FilmSide, CalibratingCanvas | null>>
  /** Called once a calibration is saved (the workspace goes back to placing landmarks). */
  onSaved: () => void
}) {
  const store = useReadingsStore()
  const toast = useToast()
  const pendingCalibration = ref<{ side: FilmSide; line: Line } | null>(null)
  const calibrationSaving = ref(false)
  const calibrationError = ref<string | null>(null)
  const calibrationLengthPx = computed(() => {
    const line = pendingCalibration.value?.line
    return line ? Math.hypot(line[1][0] - line[0][0], line[1][1] - line[0][1]) : 0
  })

  function onCalibrationLine(side: FilmSide, line: Line): void {
    calibrationError.value = null
    pendingCalibration.value = { side, line }
  }

  function cancelCalibration(): void {
    pendingCalibration.value = null
    options.canvases.value.primary?.clearCalibration()
    options.canvases.value.paired?.clearCalibration()
  }

  async function saveCalibration(lengthMm: number): Promise<void> {
    const pending = pendingCalibration.value
    if (!pending) return
    calibrationSaving.value = true
    try {
      await store.calibrate(pending.side, pending.line, lengthMm)
      toast.add({
        severity: 'success',
        summary: 'Calibrated',
        detail: `${lengthMm} mm over ${calibrationLengthPx.value.toFixed(1)} px`,
        life: 3000,
      })
      cancelCalibration()
      options.onSaved()
    } catch (caught) {
      calibrationError.value = errorMessage(caught)
    } finally {
      calibrationSaving.value = false
    }
  }

  return {
    pendingCalibration,
    calibrationSaving,
    calibrationError,
    calibrationLengthPx,
    onCalibrationLine,
    cancelCalibration,
    saveCalibration,
  }
}
