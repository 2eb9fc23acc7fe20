import { onBeforeUnmount, watch, type Ref } from 'vue'
import type { ImageRecord } from '@shared/types/api'
import type { PixelPoint } from '@shared/types/landmarks'
import type {
  CornerWorkerRequest,
  CornerWorkerResponse,
} from '@/workers/corner-suggestion-protocol'

export interface CornerSearchSettings {
  enabled: boolean
  radiusMm: number
  /** On a film without a mm scale. */
  radiusPx: number
}

/** A suggestion closer than this to the rater's point says nothing new: it is not shown. */
const SAME_POINT_PX = 0.35

/** The search radius in image px: the site's mm over the film's spacing, or its px. */
export function searchRadiusPx(
  mmPerPixel: readonly [number, number] | null,
  settings: CornerSearchSettings,
): number {
  if (!mmPerPixel) return settings.radiusPx
  return settings.radiusMm / ((mmPerPixel[0] + mmPerPixel[1]) / 2)
}

/**
 * Corner suggestions for one film, answered by a Worker on the full-depth pixels (the bytes the
 * windowed film fetched, decoded in the worker). `ask` resolves with the suggested corner, or
 * null when there is none, suggestions are off, the film is not ready, or a newer question was
 * asked meanwhile (only the latest placement matters).
 */
export function useCornerSuggestion(
  film: Ref<ImageRecord | null>,
  fullDepthBytes: Ref<ArrayBuffer | null>,
  settings: () => CornerSearchSettings,
) {
  let worker: Worker | null = null
  let ready = false
  let nextId = 1
  let latestId = 0
  const waiting = new Map<number, (point: PixelPoint | null) => void>()

  function stop(): void {
    worker?.terminate()
    worker = null
    ready = false
    for (const resolve of waiting.values()) resolve(null)
    waiting.clear()
  }

  function start(bytes: ArrayBuffer): void {
    stop()
    const record = film.value
    worker = new Worker(new URL('../workers/corner-suggestion.worker.ts', import.meta.url), {
      type: 'module',
    })
    worker.onmessage = (event: MessageEvent<CornerWorkerResponse>) => {
      const message = event.data
      if (message.type === 'ready') {
        // Landmarks are in the film's pixels: a rendition of another size cannot answer them.
        ready =
          record !== null && message.width === record.width && message.height === record.height
        return
      }
      if (message.id === null) return
      const resolve = waiting.get(message.id)
      waiting.delete(message.id)
      if (!resolve) return
      const found = message.type === 'suggestion' ? message.suggestion : null
      resolve(
        found && message.id === latestId && found.distancePx > SAME_POINT_PX
          ? [found.x, found.y]
          : null,
      )
    }
    // The bytes are the windowed film's spare copy: handed over, not copied again.
    const request: CornerWorkerRequest = { type: 'film-png', buffer: bytes }
    worker.postMessage(request, [bytes])
  }

  watch(
    fullDepthBytes,
    (bytes) => {
      if (bytes) start(bytes)
      else stop()
    },
    { immediate: true },
  )
  onBeforeUnmount(stop)

  function ask(pointPx: PixelPoint): Promise<PixelPoint | null> {
    const current = settings()
    if (!current.enabled || !worker || !ready || !film.value) return Promise.resolve(null)
    const id = nextId++
    latestId = id
    const request: CornerWorkerRequest = {
      type: 'suggest',
      id,
      x: pointPx[0],
      y: pointPx[1],
      radiusPx: searchRadiusPx(film.value.mmPerPixel, current),
    }
    return new Promise((resolve) => {
      waiting.set(id, resolve)
      worker?.postMessage(request)
    })
  }

  return { ask }
}
