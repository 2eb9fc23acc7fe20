import sharp from 'sharp'
import { describe, expect, it } from 'vitest'
import { decodeFilm } from '../../../../server/images/decode-film'

const raw = { raw: { width: 8, height: 4, channels: 1 as const } }
const ramp = new Uint16Array(32).map((_, i) => i * 2000)

describe('PNG, JPEG and TIFF uploads through sharp', () => {
  it('keeps all 16 bits of a 16-bit grey PNG (sharp: toColourspace grey16, raw depth ushort)', async () => {
    const png = await sharp(ramp, raw).toColourspace('grey16').png().toBuffer()
    const film = await decodeFilm(png)
    expect(film).toMatchObject({
      fileType: 'png',
      width: 8,
      height: 4,
      bitsStored: 16,
      header: null,
    })
    expect(Array.from(film.pixels)).toEqual(Array.from(ramp))
  })

  it('reads an 8-bit PNG as 8-bit grey', async () => {
    const grey = Uint8Array.from({ length: 32 }, (_, i) => i * 8)
    const film = await decodeFilm(await sharp(grey, raw).png().toBuffer())
    expect(film.bitsStored).toBe(8)
    expect(Array.from(film.pixels)).toEqual(Array.from(grey))
  })

  it('reduces a colour JPEG to one grey channel', async () => {
    const jpeg = await sharp({
      create: { width: 16, height: 8, channels: 3, background: '#808080' },
    })
      .jpeg({ quality: 100 })
      .toBuffer()
    const film = await decodeFilm(jpeg)
    expect(film).toMatchObject({ fileType: 'jpeg', width: 16, height: 8, bitsStored: 8 })
    expect(Math.abs((film.pixels[0] as number) - 128)).toBeLessThanOrEqual(2)
  })

  it('reads a TIFF', async () => {
    const grey = Uint8Array.from({ length: 32 }, (_, i) => 255 - i)
    const film = await decodeFilm(await sharp(grey, raw).tiff({ compression: 'lzw' }).toBuffer())
    expect(film.fileType).toBe('tiff')
    expect(Array.from(film.pixels)).toEqual(Array.from(grey))
  })
})
