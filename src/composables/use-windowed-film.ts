import { onBeforeUnmount, ref, shallowRef, watch, type Ref } from 'vue'
import type { ImageRecord } from '@shared/types/api'
import type { FilmWindowRequest, FilmWindowResponse } from '@/workers/film-window.worker'

export interface FilmWindow {
  center: number
  width: number
  invert: boolean
}

function loadImageElement(url: string): Promise<HTMLImageElement> {
  return new Promise((resolve, reject) => {
    const image = new Image()
    image.onload = () => resolve(image)
    image.onerror = () => reject(new Error('The film could not be loaded'))
    image.src = url
  })
}

/**
 * The picture Konva draws for one film: the 8-bit preview first (a quick first paint), then the
 * full-depth 16-bit pixels through the current window in a Worker. Window changes made while the
 * worker is busy are coalesced: only the latest is rendered next.
 */
export function useWindowedFilm(film: Ref<ImageRecord | null>) {
  const source = shallowRef<CanvasImageSource | null>(null)
  const fullDepth = ref(false)
  const error = ref<string | null>(null)
  const valueRange = ref<[number, number]>([0, 65535])
  const filmWindow = ref<FilmWindow>({ center: 32768, width: 65536, invert: false })
  /** When the first picture of the film was on screen (performance.now()). */
  const firstPaintAt = ref<number | null>(null)
  /** A copy of the full-depth PNG for the corner-suggestion worker (which takes it over). */
  const fullDepthBytes = shallowRef<ArrayBuffer | null>(null)

  let worker: Worker | null = null
  let busy = false
  let pending = false
  let nextId = 1
  let loadToken = 0

  function stopWorker(): void {
    worker?.terminate()
    worker = null
    busy = false
    pending = false
  }

  function requestRender(): void {
    if (!worker || !fullDepthDecoded) return
    if (busy) {
      pending = true
      return
    }
    busy = true
    pending = false
    const message: FilmWindowRequest = { type: 'render', id: nextId++, ...filmWindow.value }
    worker.postMessage(message)
  }

  let fullDepthDecoded = false

  async function load(record: ImageRecord): Promise<void> {
    const token = ++loadToken
    stopWorker()
    fullDepthDecoded = false
    fullDepth.value = false
    error.value = null
    source.value = null
    fullDepthBytes.value = null
    if (record.window)
      filmWindow.value = { center: record.window.center, width: record.window.width, invert: false }
    try {
      const preview = await loadImageElement(record.urls.preview)
      if (token !== loadToken) return
      if (!fullDepth.value) source.value = preview
      firstPaintAt.value ??= performance.now()
    } catch (caught) {
      error.value = (caught as Error).message
    }
    try {
      const response = await fetch(record.urls.fullDepth, { credentials: 'same-origin' })
      if (!response.ok) throw new Error(`The full-depth film answered ${response.status}`)
      const buffer = await response.arrayBuffer()
      if (token !== loadToken) return
      worker = new Worker(new URL('../workers/film-window.worker.ts', import.meta.url), {
        type: 'module',
      })
      worker.onmessage = (event: MessageEvent<FilmWindowResponse>) => {
        const message = event.data
        if (message.type === 'decoded') {
          fullDepthDecoded = true
          valueRange.value = [message.minValue, message.maxValue]
          if (!record.window) {
            filmWindow.value = {
              center: (message.minValue + message.maxValue) / 2,
              width: Math.max(1, message.maxValue - message.minValue),
              invert: false,
            }
          }
          requestRender()
        } else if (message.type === 'rendered') {
          busy = false
          const previous = source.value
          source.value = message.bitmap
          fullDepth.value = true
          firstPaintAt.value ??= performance.now()
          if (previous instanceof ImageBitmap) previous.close()
          if (pending) requestRender()
        } else {
          busy = false
          error.value = message.message
        }
      }
      fullDepthBytes.value = buffer.slice(0)
      const request: FilmWindowRequest = { type: 'decode', buffer }
      worker.postMessage(request, [buffer])
    } catch (caught) {
      // The preview stays on screen; only window/level is unavailable.
      error.value = `Window and level are unavailable: ${(caught as Error).message}`
    }
  }

  watch(
    () => film.value?.id,
    () => {
      if (film.value) void load(film.value)
    },
    { immediate: true },
  )
  watch(filmWindow, requestRender, { deep: true })

  function resetWindow(): void {
    const record = film.value
    if (record?.window)
      filmWindow.value = {
        center: record.window.center,
        width: record.window.width,
        invert: filmWindow.value.invert,
      }
    else
      filmWindow.value = {
        center: (valueRange.value[0] + valueRange.value[1]) / 2,
        width: Math.max(1, valueRange.value[1] - valueRange.value[0]),
        invert: filmWindow.value.invert,
      }
  }

  onBeforeUnmount(() => {
    loadToken += 1
    stopWorker()
  })

  return {
    source,
    fullDepth,
    error,
    filmWindow,
    valueRange,
    firstPaintAt,
    fullDepthBytes,
    resetWindow,
  }
}
