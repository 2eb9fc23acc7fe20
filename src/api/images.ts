import type { ApiErrorBody, CalibrationInput, ImageRecord } from '@shared/types/api'
import type { ImageView } from '@shared/types/domain'
import type { PixelReviewInput } from '@shared/types/pixel-review'
import { ApiError, http } from './http'

export const listVisitImages = (visitId: number) =>
  http.get<ImageRecord[]>(`/visits/${visitId}/images`)
export const getImage = (id: number) => http.get<ImageRecord>(`/images/${id}`)
export const deleteImage = (id: number) => http.delete<void>(`/images/${id}`)
export const calibrateImage = (id: number, input: CalibrationInput) =>
  http.patch<ImageRecord>(`/images/${id}/calibration`, input)

export const reviewFilmPixels = (id: number, input: PixelReviewInput) =>
  http.put<ImageRecord>(`/images/${id}/pixel-review`, input)

export interface FilmUpload {
  file: File
  /** Empty: take the view from the DICOM header. */
  view: ImageView | ''
  confirmPatientMismatch?: boolean
}

/**
 * Uploads one film with progress events. XMLHttpRequest rather than fetch: only it reports
 * upload progress in today's browsers.
 */
export function uploadFilm(
  visitId: number,
  upload: FilmUpload,
  onProgress: (fraction: number) => void,
): { done: Promise<ImageRecord[]>; abort: () => void } {
  const xhr = new XMLHttpRequest()
  const done = new Promise<ImageRecord[]>((resolve, reject) => {
    const form = new FormData()
    form.append('view', upload.view)
    if (upload.confirmPatientMismatch) form.append('confirmPatientMismatch', 'true')
    form.append('file', upload.file, upload.file.name)
    xhr.open('POST', `${import.meta.env.VITE_API_BASE ?? '/api'}/visits/${visitId}/images`)
    xhr.withCredentials = true
    xhr.upload.onprogress = (event) => {
      if (event.lengthComputable) onProgress(event.loaded / event.total)
    }
    xhr.onerror = () =>
      reject(
        new ApiError(
          0,
          'offline',
          'The upload was interrupted. Check the connection and try again.',
        ),
      )
    xhr.onabort = () => reject(new ApiError(0, 'aborted', 'Upload cancelled.'))
    xhr.onload = () => {
      let body: unknown
      try {
        body = xhr.responseText ? JSON.parse(xhr.responseText) : undefined
      } catch {
        body = undefined
      }
      if (xhr.status >= 200 && xhr.status < 300) {
        resolve(body as ImageRecord[])
        return
      }
      const error = (body as ApiErrorBody | undefined)?.error
      reject(
        new ApiError(
          xhr.status,
          error?.code ?? 'http_error',
          error?.message ?? `The server answered ${xhr.status}.`,
          error?.details,
        ),
      )
    }
    xhr.send(form)
  })
  return { done, abort: () => xhr.abort() }
}
