import { beforeEach, describe, expect, it, vi } from 'vitest'
import { createPinia, setActivePinia } from 'pinia'
import { ApiError } from '@/api/http'

vi.mock('@/api/images', () => ({
  listVisitImages: vi.fn(async () => []),
  deleteImage: vi.fn(async () => undefined),
  uploadFilm: vi.fn(),
}))

const api = await import('@/api/images')
const { useImagesStore } = await import('@/stores/images')

function file(name: string, type = ''): File {
  return new File([new Uint8Array([1, 2, 3])], name, { type })
}

describe('images store', () => {
  beforeEach(() => {
    setActivePinia(createPinia())
    vi.mocked(api.uploadFilm).mockReset()
  })

  it('lets a DICOM file take its view from the header and starts other files at lateral neutral', () => {
    const images = useImagesStore()
    images.queue(7, [file('a.dcm'), file('b.png', 'image/png')])
    expect(images.pendingFor(7).map((upload) => upload.view)).toEqual(['', 'lateral-neutral'])
    expect(images.pendingFor(8)).toEqual([])
  })

  it('removes a finished upload from the queue and reloads the visit films', async () => {
    const images = useImagesStore()
    images.queue(7, [file('b.png', 'image/png')])
    vi.mocked(api.uploadFilm).mockImplementation((_visit, _upload, onProgress) => {
      onProgress(0.5)
      return { done: Promise.resolve([]), abort: () => undefined }
    })
    await images.sendAll(7)
    expect(images.pendingFor(7)).toEqual([])
    expect(api.listVisitImages).toHaveBeenCalledWith(7)
  })

  it('keeps a film whose header names another patient waiting for confirmation, with the differences', async () => {
    const images = useImagesStore()
    images.queue(7, [file('other.dcm')])
    vi.mocked(api.uploadFilm).mockImplementation(() => ({
      done: Promise.reject(
        new ApiError(409, 'patient_mismatch', 'does not match', {
          mismatches: ['other.dcm: name is "X" in the file, "Y" on record'],
        }),
      ),
      abort: () => undefined,
    }))
    await images.sendAll(7)
    const [upload] = images.pendingFor(7)
    expect(upload?.status).toBe('needs-confirmation')
    expect(upload?.mismatches).toEqual(['other.dcm: name is "X" in the file, "Y" on record'])

    vi.mocked(api.uploadFilm).mockImplementation(() => ({
      done: Promise.resolve([]),
      abort: () => undefined,
    }))
    await images.send(upload!.key, true)
    expect(vi.mocked(api.uploadFilm).mock.calls.at(-1)?.[1]).toMatchObject({
      confirmPatientMismatch: true,
    })
    expect(images.pendingFor(7)).toEqual([])
  })

  it('marks a failed upload with the server message and allows a retry', async () => {
    const images = useImagesStore()
    images.queue(7, [file('bad.png', 'image/png')])
    vi.mocked(api.uploadFilm).mockImplementation(() => ({
      done: Promise.reject(
        new ApiError(415, 'unsupported_file_type', 'bad.png: not a film Endplate reads'),
      ),
      abort: () => undefined,
    }))
    await images.sendAll(7)
    expect(images.pendingFor(7)[0]).toMatchObject({
      status: 'failed',
      message: 'bad.png: not a film Endplate reads',
    })
  })
})
