import type { WindowLevel } from '../decoded-film'
import type { HeaderWindow } from './dicom-header'

/** How stored samples are laid out in each 8- or 16-bit word. */
export interface SampleLayout {
  /** 8 or 16: the width of the words the samples arrive in. */
  wordBits: 8 | 16
  bitsStored: number
  highBit: number
  signed: boolean
  /** Explicit VR Big Endian words read on a little-endian host. */
  swapBytes: boolean
}

export interface PixelValueMapping {
  /** Indexed by the raw word, gives the output pixel. */
  lut: Uint16Array
  bitsStored: number
  toModality: { offset: number; slope: number }
  toPixelWindow(window: HeaderWindow): WindowLevel
}

const MAX_OUTPUT = 65535

/**
 * One table folds every per-pixel step of PS3.3 C.7.6.3.1 and C.11.1 into a single lookup:
 * byte order, High Bit alignment, masking to Bits Stored, sign extension, the Modality LUT
 * (Rescale Slope/Intercept, applied before any VOI), MONOCHROME1 inversion, and the shift to
 * non-negative values. Built from the possible stored range, not the data, so two films from one
 * device map their values the same way.
 */
export function buildPixelValueMapping(
  layout: SampleLayout,
  rescale: { slope: number; intercept: number },
  photometricInterpretation: string,
): PixelValueMapping {
  const { bitsStored, signed } = layout
  const shift = Math.max(0, layout.highBit + 1 - bitsStored)
  const mask = bitsStored >= 32 ? 0xffffffff : 2 ** bitsStored - 1
  const signBit = 2 ** (bitsStored - 1)
  const storedMin = signed ? -signBit : 0
  const storedMax = signed ? signBit - 1 : mask
  const ends = [storedMin, storedMax].map((v) => v * rescale.slope + rescale.intercept)
  const modalityLow = Math.min(...ends)
  const modalityHigh = Math.max(...ends)
  const inverted = photometricInterpretation === 'MONOCHROME1'
  // Shift only when values would be negative, so an unsigned film keeps its own numbers.
  const base = inverted ? modalityHigh : Math.min(0, modalityLow)
  const span = inverted ? modalityHigh - modalityLow : modalityHigh - base
  // A fractional slope would merge neighbouring stored values; spread them back apart.
  let scale = Math.abs(rescale.slope) < 1 ? 1 / Math.abs(rescale.slope) : 1
  if (span * scale > MAX_OUTPUT) scale = MAX_OUTPUT / span
  const direction = inverted ? -1 : 1

  const size = 2 ** layout.wordBits
  const lut = new Uint16Array(size)
  for (let word = 0; word < size; word++) {
    const raw = layout.swapBytes ? ((word & 0xff) << 8) | (word >> 8) : word
    let stored = (raw >>> shift) & mask
    if (signed && stored & signBit) stored -= 2 * signBit
    const modality = stored * rescale.slope + rescale.intercept
    const value = Math.round(direction * (modality - base) * scale)
    lut[word] = value < 0 ? 0 : value > MAX_OUTPUT ? MAX_OUTPUT : value
  }

  const outputMax = Math.min(MAX_OUTPUT, Math.round(span * scale))
  return {
    lut,
    bitsStored: Math.max(1, Math.ceil(Math.log2(outputMax + 1))),
    toModality: { offset: base, slope: direction / scale },
    toPixelWindow: (window) => ({
      center: direction * (window.center - base) * scale,
      width: window.width * scale,
    }),
  }
}

function isIdentity(lut: Uint16Array): boolean {
  for (let i = 0; i < lut.length; i++) if (lut[i] !== i) return false
  return true
}

/** Maps raw words through the table into a new array the caller owns. */
export function applyPixelValueMapping(
  samples: Uint8Array | Uint16Array,
  lut: Uint16Array,
  count: number,
): Uint16Array {
  // Most DX films are unsigned, unscaled and MONOCHROME2: a straight copy is several times faster.
  if (samples instanceof Uint16Array && isIdentity(lut)) return samples.slice(0, count)
  const out = new Uint16Array(count)
  for (let i = 0; i < count; i++) out[i] = lut[samples[i] as number] as number
  return out
}
