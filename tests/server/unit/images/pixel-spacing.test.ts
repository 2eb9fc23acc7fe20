import { describe, expect, it } from 'vitest'
import { decodeDicom } from '../../../../server/images/dicom/decode-dicom'
import { pickFilmSpacing } from '../../../../server/images/dicom/pixel-spacing'
import { writeTestDicom } from './dicom-fixture'

const none = {
  pixelSpacing: [],
  imagerPixelSpacing: [],
  calibrationType: undefined,
  magnificationFactor: undefined,
}

describe('pickFilmSpacing: the order of trust of the measurement reference §5', () => {
  it('trusts Pixel Spacing with calibration type GEOMETRY or FIDUCIAL (PS3.3 §10.7.1.1, (0028,0A02))', () => {
    for (const calibrationType of ['GEOMETRY', 'FIDUCIAL']) {
      const spacing = pickFilmSpacing({
        ...none,
        pixelSpacing: [0.13, 0.13],
        imagerPixelSpacing: [0.13, 0.13],
        calibrationType,
      })
      expect(spacing).toMatchObject({
        mmPerPixel: [0.13, 0.13],
        spacingSource: 'dicom-pixel-spacing',
      })
      expect(spacing.note).toContain(calibrationType)
    }
  })

  it('trusts Pixel Spacing that differs from Imager Pixel Spacing (PS3.3 §10.7.1.1: corrected by the modality)', () => {
    const spacing = pickFilmSpacing({
      ...none,
      pixelSpacing: [0.12, 0.12],
      imagerPixelSpacing: [0.139, 0.139],
    })
    expect(spacing).toMatchObject({
      mmPerPixel: [0.12, 0.12],
      spacingSource: 'dicom-pixel-spacing',
    })
  })

  it('treats Pixel Spacing equal to Imager Pixel Spacing without calibration type as the detector plane (PS3.3 §10.7.1.1)', () => {
    const spacing = pickFilmSpacing({
      ...none,
      pixelSpacing: [0.139, 0.139],
      imagerPixelSpacing: [0.139, 0.139],
    })
    expect(spacing).toMatchObject({
      mmPerPixel: [0.139, 0.139],
      spacingSource: 'dicom-imager-spacing',
    })
    expect(spacing.note).toMatch(/detector, magnified/)
  })

  it('estimates from Imager Pixel Spacing ÷ Estimated Radiographic Magnification Factor (0018,1114)', () => {
    const spacing = pickFilmSpacing({
      ...none,
      imagerPixelSpacing: [0.15, 0.15],
      magnificationFactor: 1.2,
    })
    expect(spacing.spacingSource).toBe('dicom-imager-spacing-magnification')
    // Hand arithmetic: 0.15 / 1.2 = 0.125.
    expect(spacing.mmPerPixel?.[0]).toBeCloseTo(0.125, 12)
    expect(spacing.mmPerPixel?.[1]).toBeCloseTo(0.125, 12)
    expect(spacing.note).toMatch(/Estimated/)
  })

  it('falls back to Imager Pixel Spacing alone, at the detector (0018,1164)', () => {
    const spacing = pickFilmSpacing({ ...none, imagerPixelSpacing: [0.1, 0.2] })
    expect(spacing).toMatchObject({ mmPerPixel: [0.1, 0.2], spacingSource: 'dicom-imager-spacing' })
  })

  it('reports no spacing when there is none, or only unusable values', () => {
    expect(pickFilmSpacing(none)).toMatchObject({ mmPerPixel: null, spacingSource: 'none' })
    expect(pickFilmSpacing({ ...none, pixelSpacing: [0, 0.1] })).toMatchObject({
      spacingSource: 'none',
    })
    expect(
      pickFilmSpacing({ ...none, imagerPixelSpacing: [0.1, 0.1], magnificationFactor: 0 }),
    ).toMatchObject({ spacingSource: 'dicom-imager-spacing' })
  })

  it('reads the attributes from a real file: row then column order (PS3.3 §10.7.1.3)', async () => {
    const film = await decodeDicom(
      writeTestDicom({
        attributes: {
          ImagerPixelSpacing: [0.2, 0.1],
          EstimatedRadiographicMagnificationFactor: 1.25,
        },
      }),
    )
    expect(film.header?.spacing.spacingSource).toBe('dicom-imager-spacing-magnification')
    expect(film.header?.spacing.mmPerPixel?.[0]).toBeCloseTo(0.16, 12)
    expect(film.header?.spacing.mmPerPixel?.[1]).toBeCloseTo(0.08, 12)
  })
})

describe('pickFilmSpacing: refuses a spacing no radiograph has', () => {
  // Radiograph detectors have pixel pitches of roughly 0.05 to 0.2 mm and magnification is
  // 1.05 to 1.40 on lumbar films (common practice); 0.01 to 5 mm leaves wide room on both sides
  // while a damaged header's 1e308 (or 1e-308) is plainly not a spacing.
  it.each([
    ['Pixel Spacing 1e308', { pixelSpacing: [1e308, 1e308], calibrationType: 'GEOMETRY' }],
    ['Pixel Spacing 1e300 alone', { pixelSpacing: [1e300, 1e300] }],
    ['Pixel Spacing 0.001', { pixelSpacing: [0.001, 0.001], calibrationType: 'FIDUCIAL' }],
    ['Imager Pixel Spacing 6 mm', { imagerPixelSpacing: [6, 6] }],
    ['one axis only out of range', { imagerPixelSpacing: [0.1, 50] }],
    [
      'a magnification that makes it absurd',
      { imagerPixelSpacing: [0.1, 0.1], magnificationFactor: 1e-300 },
    ],
    ['Infinity', { pixelSpacing: [Infinity, Infinity] }],
  ])('%s: uncalibrated, with a note giving the range', (_label, attributes) => {
    const spacing = pickFilmSpacing({ ...none, ...attributes })
    expect(spacing.mmPerPixel).toBeNull()
    expect(spacing.spacingSource).toBe('none')
    expect(spacing.note).toMatch(/0\.01.5 mm/)
    expect(spacing.note).toMatch(/calibrate/i)
    expect(spacing.note.length).toBeLessThanOrEqual(300)
  })

  it('keeps spacings at both ends of the range', () => {
    expect(pickFilmSpacing({ ...none, imagerPixelSpacing: [0.01, 0.01] }).mmPerPixel).toEqual([
      0.01, 0.01,
    ])
    expect(pickFilmSpacing({ ...none, imagerPixelSpacing: [5, 5] }).mmPerPixel).toEqual([5, 5])
  })

  it('reads 1e308\\1e308 from a real file as uncalibrated', async () => {
    const film = await decodeDicom(
      writeTestDicom({
        attributes: { PixelSpacing: [1e308, 1e308], PixelSpacingCalibrationType: 'GEOMETRY' },
      }),
    )
    expect(film.header?.spacing).toMatchObject({ mmPerPixel: null, spacingSource: 'none' })
  })
})
