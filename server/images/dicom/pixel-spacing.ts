import type { DataSet } from 'dicom-parser'
import { readNumbers, readText } from './dicom-attributes'

export type SpacingSource =
  'dicom-pixel-spacing' | 'dicom-imager-spacing-magnification' | 'dicom-imager-spacing' | 'none'

/** Millimetres per pixel as [row, column] (PS3.3 §10.7.1.3 order), with where it came from. */
export interface FilmSpacing {
  mmPerPixel: [row: number, column: number] | null
  spacingSource: SpacingSource
  note: string
}

/** The attributes that decide the spacing, already read from the header. */
export interface SpacingAttributes {
  pixelSpacing: number[]
  imagerPixelSpacing: number[]
  calibrationType: string | undefined
  magnificationFactor: number | undefined
}

export function readSpacingAttributes(dataSet: DataSet): SpacingAttributes {
  const magnification = readNumbers(dataSet, 'x00181114')[0]
  return {
    pixelSpacing: readNumbers(dataSet, 'x00280030'),
    imagerPixelSpacing: readNumbers(dataSet, 'x00181164'),
    calibrationType: readText(dataSet, 'x00280a02')?.toUpperCase(),
    magnificationFactor: magnification,
  }
}

function asPair(values: number[]): [number, number] | null {
  const [row, column] = values
  if (values.length !== 2 || row === undefined || column === undefined) return null
  return row > 0 && column > 0 ? [row, column] : null
}

function samePair(a: [number, number], b: [number, number]): boolean {
  const close = (x: number, y: number) => Math.abs(x - y) <= 1e-6 * Math.max(x, y)
  return close(a[0], b[0]) && close(a[1], b[1])
}

/**
 * Picks the spacing by the order of trust of the measurement reference §5:
 * 1. Pixel Spacing (0028,0030) calibrated in the patient: its Calibration Type (0028,0A02) is
 *    GEOMETRY or FIDUCIAL, or it differs from Imager Pixel Spacing (the modality corrected it).
 * 2. Imager Pixel Spacing (0018,1164) ÷ Estimated Radiographic Magnification Factor (0018,1114).
 * 3. Imager Pixel Spacing alone: the detector plane, so anatomy is magnified.
 * 4. Nothing: mm values stay empty.
 * Pixel Spacing equal to Imager Pixel Spacing without a calibration type only restates the
 * detector plane (PS3.3 §10.7.1.1), so it falls through to 2 or 3.
 */
function spacingByTrust(attributes: SpacingAttributes): FilmSpacing {
  const pixel = asPair(attributes.pixelSpacing)
  const imager = asPair(attributes.imagerPixelSpacing)
  const calibration = attributes.calibrationType
  const magnification = attributes.magnificationFactor

  if (pixel && (calibration === 'GEOMETRY' || calibration === 'FIDUCIAL')) {
    return {
      mmPerPixel: pixel,
      spacingSource: 'dicom-pixel-spacing',
      note: `Pixel Spacing calibrated in the patient plane (calibration type ${calibration}).`,
    }
  }
  if (pixel && imager && !samePair(pixel, imager)) {
    return {
      mmPerPixel: pixel,
      spacingSource: 'dicom-pixel-spacing',
      note: 'Pixel Spacing differs from Imager Pixel Spacing: corrected for magnification by the modality.',
    }
  }
  if (pixel && !imager) {
    return {
      mmPerPixel: pixel,
      spacingSource: 'dicom-pixel-spacing',
      note: 'Pixel Spacing without Imager Pixel Spacing or a calibration type: the plane it refers to is not stated and may be the detector.',
    }
  }
  if (imager && magnification !== undefined && magnification > 0) {
    return {
      mmPerPixel: [imager[0] / magnification, imager[1] / magnification],
      spacingSource: 'dicom-imager-spacing-magnification',
      note: `Estimated: Imager Pixel Spacing divided by the estimated magnification factor ${magnification}.`,
    }
  }
  if (imager) {
    return {
      mmPerPixel: imager,
      spacingSource: 'dicom-imager-spacing',
      note: 'At the detector, magnified (typically 10–25 % on lumbar films).',
    }
  }
  return {
    mmPerPixel: null,
    spacingSource: 'none',
    note: 'No usable spacing in the header: angles and percentages only until the film is calibrated.',
  }
}

/**
 * The spacings, in mm per pixel, that a radiograph can have: detector pitches are about
 * 0.05–0.2 mm and lumbar magnification 1.05–1.40 (common practice), so 0.01–5 mm leaves wide
 * room on both sides and still refuses a damaged header's 1e308 or 1e-308.
 */
export const PLAUSIBLE_SPACING_MM = { min: 0.01, max: 5 } as const

export function isPlausibleSpacingMm(mm: number): boolean {
  return mm >= PLAUSIBLE_SPACING_MM.min && mm <= PLAUSIBLE_SPACING_MM.max
}

function formatMm(mm: number): string {
  return Number.isFinite(mm) && mm >= 1e-3 && mm < 1e4
    ? String(+mm.toPrecision(4))
    : mm.toExponential(2)
}

/**
 * `spacingByTrust`, then refuses a spacing outside `PLAUSIBLE_SPACING_MM`: such a film is
 * uncalibrated (angles and percentages only) and its note says why, with the range.
 */
export function pickFilmSpacing(attributes: SpacingAttributes): FilmSpacing {
  const chosen = spacingByTrust(attributes)
  const pair = chosen.mmPerPixel
  if (pair === null || (isPlausibleSpacingMm(pair[0]) && isPlausibleSpacingMm(pair[1])))
    return chosen
  return {
    mmPerPixel: null,
    spacingSource: 'none',
    note: `The header's spacing (${formatMm(pair[0])} × ${formatMm(pair[1])} mm per pixel) lies outside the ${PLAUSIBLE_SPACING_MM.min}–${PLAUSIBLE_SPACING_MM.max} mm of radiographs, so it is not used: calibrate on a marker of known size.`,
  }
}
