/// <reference lib="webworker" />
/**
 * Window/level for the full-depth film, off the main thread: decodes the 16-bit grey PNG once
 * (browsers hand canvases 8 bits only), then maps every pixel through a 65 536-entry lookup
 * table for each window asked for and sends back one bitmap for Konva.
 */
import { decodeFilmPng, type GreyImage } from './film-png'
import { windowLookupTableLinear } from './window-lookup'

export type FilmWindowRequest =
  | { type: 'decode'; buffer: ArrayBuffer }
  | { type: 'render'; id: number; center: number; width: number; invert: boolean }

export type FilmWindowResponse =
  | { type: 'decoded'; width: number; height: number; minValue: number; maxValue: number }
  | { type: 'rendered'; id: number; bitmap: ImageBitmap }
  | { type: 'failed'; message: string }

let film: GreyImage | null = null
let rgba: Uint32Array<ArrayBuffer> | null = null

function post(message: FilmWindowResponse, transfer: Transferable[] = []): void {
  ;(self as DedicatedWorkerGlobalScope).postMessage(message, transfer)
}

self.onmessage = async (event: MessageEvent<FilmWindowRequest>) => {
  const request = event.data
  try {
    if (request.type === 'decode') {
      film = decodeFilmPng(new Uint8Array(request.buffer))
      let minValue = 65535
      let maxValue = 0
      for (const value of film.pixels) {
        if (value < minValue) minValue = value
        if (value > maxValue) maxValue = value
      }
      rgba = new Uint32Array(film.width * film.height)
      post({ type: 'decoded', width: film.width, height: film.height, minValue, maxValue })
      return
    }
    if (!film || !rgba) throw new Error('No film decoded yet')
    const lut = windowLookupTableLinear(request.center, request.width, request.invert)
    // Little-endian RGBA packed as one 32-bit word: opaque grey.
    const colours = new Uint32Array(256)
    for (let grey = 0; grey < 256; grey++)
      colours[grey] = 0xff000000 | (grey << 16) | (grey << 8) | grey
    const pixels = film.pixels
    for (let i = 0; i < pixels.length; i++)
      rgba[i] = colours[lut[pixels[i] as number] as number] as number
    const image = new ImageData(new Uint8ClampedArray(rgba.buffer), film.width, film.height)
    // createImageBitmap copies the pixels, so the buffer can be reused for the next window.
    const bitmap = await createImageBitmap(image)
    post({ type: 'rendered', id: request.id, bitmap }, [bitmap])
  } catch (caught) {
    post({ type: 'failed', message: caught instanceof Error ? caught.message : String(caught) })
  }
}
