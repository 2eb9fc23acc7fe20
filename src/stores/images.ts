import { ref } from 'vue'
import { defineStore } from 'pinia'
import type { ImageRecord } from '@shared/types/api'
import type { ImageView } from '@shared/types/domain'
import type { PixelReviewInput } from '@shared/types/pixel-review'
import { deleteImage, listVisitImages, reviewFilmPixels, uploadFilm } from '@/api/images'
import { ApiError } from '@/api/http'

export type UploadStatus = 'waiting' | 'uploading' | 'done' | 'failed' | 'needs-confirmation'

export interface PendingUpload {
  key: number
  visitId: number
  file: File
  view: ImageView | ''
  progress: number
  status: UploadStatus
  message: string | null
  /** Header differences from the patient on record, when the server asked for confirmation. */
  mismatches: string[]
}

let nextKey = 1

export const useImagesStore = defineStore('images', () => {
  const byVisit = ref<Record<number, ImageRecord[]>>({})
  const uploads = ref<PendingUpload[]>([])
  const errors = ref<Record<number, string>>({})

  async function loadForVisit(visitId: number): Promise<void> {
    try {
      byVisit.value[visitId] = await listVisitImages(visitId)
      delete errors.value[visitId]
    } catch (caught) {
      errors.value[visitId] = caught instanceof Error ? caught.message : String(caught)
    }
  }

  /** DICOM files can name their own view; other files start with lateral neutral. */
  function queue(visitId: number, files: File[]): void {
    for (const file of files) {
      const isDicom = /\.dcm$/i.test(file.name) || file.type === 'application/dicom'
      uploads.value.push({
        key: nextKey++,
        visitId,
        file,
        view: isDicom ? '' : 'lateral-neutral',
        progress: 0,
        status: 'waiting',
        message: null,
        mismatches: [],
      })
    }
  }

  function pendingFor(visitId: number): PendingUpload[] {
    return uploads.value.filter((upload) => upload.visitId === visitId)
  }

  function discard(key: number): void {
    uploads.value = uploads.value.filter((upload) => upload.key !== key)
  }

  async function send(key: number, confirmPatientMismatch = false): Promise<void> {
    const upload = uploads.value.find((candidate) => candidate.key === key)
    if (!upload || upload.status === 'uploading' || upload.status === 'done') return
    upload.status = 'uploading'
    upload.progress = 0
    upload.message = null
    try {
      const { done } = uploadFilm(
        upload.visitId,
        { file: upload.file, view: upload.view, confirmPatientMismatch },
        (fraction) => {
          upload.progress = fraction
        },
      )
      await done
      upload.status = 'done'
      upload.progress = 1
      await loadForVisit(upload.visitId)
      discard(key)
    } catch (caught) {
      const error = caught instanceof ApiError ? caught : null
      if (error?.code === 'patient_mismatch') {
        upload.status = 'needs-confirmation'
        upload.mismatches = error.details?.mismatches ?? []
      } else {
        upload.status = 'failed'
      }
      upload.message = caught instanceof Error ? caught.message : String(caught)
    }
  }

  /** Sends every waiting file of a visit one after another (a hospital link is often the bottleneck). */
  async function sendAll(visitId: number): Promise<void> {
    for (const upload of pendingFor(visitId)) {
      if (upload.status === 'waiting' || upload.status === 'failed') await send(upload.key)
    }
  }

  async function remove(image: ImageRecord): Promise<void> {
    await deleteImage(image.id)
    await loadForVisit(image.visitId)
  }

  /** A clinician's confirmation that the film shows no identity in its pixels, or its withdrawal. */
  async function reviewPixels(image: ImageRecord, input: PixelReviewInput): Promise<ImageRecord> {
    const updated = await reviewFilmPixels(image.id, input)
    const list = byVisit.value[image.visitId]
    if (list)
      byVisit.value[image.visitId] = list.map((film) => (film.id === updated.id ? updated : film))
    return updated
  }

  return {
    byVisit,
    uploads,
    errors,
    loadForVisit,
    queue,
    pendingFor,
    discard,
    send,
    sendAll,
    remove,
    reviewPixels,
  }
})
