/**
 * An 8-bit lookup table over every 16-bit stored value for a window of `center` and `width`
 * (stored-value units), by the LINEAR function of DICOM PS3.3 C.11.2.1.2.1: below
 * c − 0.5 − (w − 1)/2 black, above c − 0.5 + (w − 1)/2 white, linear between. `invert` swaps
 * black and white. A width below 1 is treated as 1, as the standard requires w ≥ 1.
 */
export function windowLookupTableLinear(center: number, width: number, invert = false): Uint8Array {
  const w = Math.max(1, width)
  const lut = new Uint8Array(65536)
  const low = center - 0.5 - (w - 1) / 2
  const high = center - 0.5 + (w - 1) / 2
  for (let x = 0; x < 65536; x++) {
    let y: number
    if (x <= low) y = 0
    else if (x > high) y = 255
    else y = ((x - (center - 0.5)) / (w - 1 || 1) + 0.5) * 255
    const grey = Math.round(Math.min(255, Math.max(0, y)))
    lut[x] = invert ? 255 - grey : grey
  }
  return lut
}
