/**
 * The corner-suggestion worker's messages and their handling, apart from the Worker itself so
 * the handling can be tested in Node. The film's full-depth pixels are sent once; each
 * suggestion request names the click and the search radius in image px and is answered with
 * the same id.
 */
import {
  suggestCorner,
  type CornerSearchOptions,
  type CornerSuggestion,
  type GreyPixels,
} from '@shared/image-analysis/corner-suggestion'
import { decodeFilmPng } from './film-png'

export type CornerWorkerRequest =
  | { type: 'film'; width: number; height: number; pixels: Uint16Array }
  | { type: 'film-png'; buffer: ArrayBuffer }
  | {
      type: 'suggest'
      id: number
      /** The click, image px. */
      x: number
      y: number
      radiusPx: number
      options?: Omit<CornerSearchOptions, 'radiusPx'>
    }

export type CornerWorkerResponse =
  | { type: 'ready'; width: number; height: number }
  | { type: 'suggestion'; id: number; suggestion: CornerSuggestion | null }
  | { type: 'failed'; id: number | null; message: string }

/** Keeps the film between messages and answers each one. */
export function createCornerSuggestionHandler(): (
  request: CornerWorkerRequest,
) => CornerWorkerResponse {
  let film: GreyPixels | null = null
  return (request) => {
    try {
      if (request.type === 'film') {
        if (request.pixels.length !== request.width * request.height) {
          throw new Error(
            `The film holds ${request.pixels.length} pixels, not ${request.width} × ${request.height}`,
          )
        }
        film = { width: request.width, height: request.height, pixels: request.pixels }
        return { type: 'ready', width: request.width, height: request.height }
      }
      if (request.type === 'film-png') {
        film = decodeFilmPng(new Uint8Array(request.buffer))
        return { type: 'ready', width: film.width, height: film.height }
      }
      if (!film) throw new Error('No film sent yet')
      const suggestion = suggestCorner(film, [request.x, request.y], {
        ...request.options,
        radiusPx: request.radiusPx,
      })
      return { type: 'suggestion', id: request.id, suggestion }
    } catch (caught) {
      return {
        type: 'failed',
        id: request.type === 'suggest' ? request.id : null,
        message: caught instanceof Error ? caught.message : String(caught),
      }
    }
  }
}
