import sharp from 'sharp'
import { describe, expect, it } from 'vitest'
import { decodeFilm } from '../../../../server/images/decode-film'
import { writeTestDicom } from './dicom-fixture'

describe('damaged and empty uploads become typed errors', () => {
  it('an empty file', async () => {
    await expect(decodeFilm(new Uint8Array(0))).rejects.toMatchObject({
      code: 'empty-file',
      status: 422,
    })
  })

  it('a text file named .dcm (no "DICM" at offset 128, PS3.10 §7.1)', async () => {
    const text = Buffer.from('just some notes about a film\n'.repeat(10))
    await expect(decodeFilm(text)).rejects.toMatchObject({
      code: 'unsupported-file-type',
      status: 415,
    })
  })

  it('a DICOM file cut off inside its pixel data', async () => {
    const file = writeTestDicom({ width: 64, height: 64, pixels: new Uint16Array(64 * 64) })
    await expect(decodeFilm(file.subarray(0, file.length - 1000))).rejects.toMatchObject({
      code: 'corrupt-dicom',
      status: 422,
    })
  })

  it('a DICOM file whose header bytes are garbage after the marker', async () => {
    const file = Buffer.from(writeTestDicom())
    file.fill(0xff, 132, 200)
    await expect(decodeFilm(file)).rejects.toMatchObject({ code: 'corrupt-dicom' })
  })

  it('a DICOM image with zero rows', async () => {
    const file = writeTestDicom({ width: 4, height: 0, pixels: new Uint16Array(0) })
    await expect(decodeFilm(file)).rejects.toMatchObject({ code: 'zero-size-image', status: 422 })
  })

  it('a colour DICOM (PS3.3 C.7.6.3.1.2: only MONOCHROME1/2 are films here)', async () => {
    const file = writeTestDicom({ attributes: { PhotometricInterpretation: 'RGB' } })
    await expect(decodeFilm(file)).rejects.toMatchObject({
      code: 'unsupported-pixel-format',
      status: 415,
    })
  })

  it('a truncated PNG (libpng read error through sharp)', async () => {
    const png = await sharp({
      create: { width: 200, height: 100, channels: 3, background: '#808080' },
    })
      .png({ compressionLevel: 0 })
      .toBuffer()
    await expect(decodeFilm(png.subarray(0, png.length - 2000))).rejects.toMatchObject({
      code: 'corrupt-image',
      status: 422,
    })
  })

  it('a PNG whose IHDR says 0 × 0 pixels (PNG spec §11.2.2)', async () => {
    const png = Buffer.from(
      await sharp({ create: { width: 2, height: 2, channels: 3, background: '#000' } })
        .png()
        .toBuffer(),
    )
    png.writeUInt32BE(0, 16)
    png.writeUInt32BE(0, 20)
    await expect(decodeFilm(png)).rejects.toMatchObject({ code: 'zero-size-image' })
  })
})
