import { describe, expect, it } from 'vitest'
import { blindedFilmRecord } from '@/utils/blinded-film'

describe('blindedFilmRecord', () => {
  const film = {
    width: 2000,
    height: 2500,
    spacingMm: { row: 0.15, column: 0.16 },
    calibrationSource: 'dicom-pixel-spacing',
    bitsStored: 12,
    window: { center: 2048, width: 4096 },
    urls: {
      display: '/api/assignments/7/film/display',
      preview: '/api/assignments/7/film/preview',
      thumbnail: '/api/assignments/7/film/thumbnail',
      fullDepth: '/api/assignments/7/film/full-depth',
    },
  }

  it('keeps size, scale as [row, column] and the window, with the assignment urls', () => {
    const record = blindedFilmRecord(41, film)
    expect(record.id).toBe(41)
    expect([record.width, record.height]).toEqual([2000, 2500])
    expect(record.mmPerPixel).toEqual([0.15, 0.16])
    expect(record.spacingSource).toBe('dicom-pixel-spacing')
    expect(record.window).toEqual({ center: 2048, width: 4096 })
    expect(record.urls.fullDepth).toBe('/api/assignments/7/film/full-depth')
  })

  it('carries no date, header, hash or visit', () => {
    const record = blindedFilmRecord(41, film)
    expect(record.acquiredAt).toBeNull()
    expect(record.createdAt).toBeNull()
    expect(record.dicom).toBeNull()
    expect(record.contentHash).toBeNull()
    expect(record.visitId).toBe(0)
  })

  it('reads an unknown calibration source as no scale source', () => {
    expect(blindedFilmRecord(1, { ...film, calibrationSource: 'other' }).spacingSource).toBe('none')
  })
})
