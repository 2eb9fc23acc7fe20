import type { WindowLevel } from './decoded-film'
import type { VoiLutFunction } from './dicom/dicom-header'

/**
 * A window from the 1st to the 99th percentile of the pixel values: the film's own header window
 * when it has none, robust to collimator edges and burned-in labels at either end.
 */
export function percentileWindow(
  pixels: Uint16Array,
  lowFraction = 0.01,
  highFraction = 0.99,
): WindowLevel {
  const histogram = new Uint32Array(65536)
  for (let i = 0; i < pixels.length; i++) {
    const value = pixels[i] as number
    histogram[value] = (histogram[value] as number) + 1
  }
  const lowCount = Math.floor(pixels.length * lowFraction)
  const highCount = Math.ceil(pixels.length * highFraction)
  let seen = 0
  let low = 0
  let high = 0
  for (let value = 0; value < histogram.length; value++) {
    const before = seen
    seen += histogram[value] as number
    if (before <= lowCount && seen > lowCount) low = value
    if (before < highCount && seen >= highCount) {
      high = value
      break
    }
  }
  const width = Math.max(1, high - low + 1)
  return { center: low + width / 2, width }
}

/**
 * An 8-bit lookup table over every possible pixel value for a VOI window, by the functions of
 * DICOM PS3.3 C.11.2.1.2.1 (LINEAR), C.11.2.1.3.2 (LINEAR_EXACT) and C.11.2.1.3.1 (SIGMOID).
 */
export function windowLookupTable(
  window: WindowLevel,
  voiLutFunction: VoiLutFunction = 'LINEAR',
  size = 65536,
): Uint8Array {
  const lut = new Uint8Array(size)
  const { center: c, width: w } = window
  for (let x = 0; x < size; x++) {
    let y: number
    if (voiLutFunction === 'SIGMOID') {
      y = 255 / (1 + Math.exp((-4 * (x - c)) / w))
    } else if (voiLutFunction === 'LINEAR_EXACT') {
      y = ((x - c) / w + 0.5) * 255
    } else if (w <= 1) {
      y = x > c - 0.5 ? 255 : 0
    } else if (x <= c - 0.5 - (w - 1) / 2) {
      y = 0
    } else if (x > c - 0.5 + (w - 1) / 2) {
      y = 255
    } else {
      y = ((x - (c - 0.5)) / (w - 1) + 0.5) * 255
    }
    lut[x] = Math.round(Math.min(255, Math.max(0, y)))
  }
  return lut
}
