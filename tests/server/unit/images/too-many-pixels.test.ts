import { crc32 } from 'node:zlib'
import { describe, expect, it } from 'vitest'
import { decodeFilm } from '../../../../server/images/decode-film'
import { ImageError, MAX_FILM_PIXELS } from '../../../../server/images/image-error'

/** A PNG whose header (IHDR, PNG spec §11.2.2) claims the given size, with no pixel data behind it. */
function pngClaiming(width: number, height: number): Uint8Array {
  const chunk = (type: string, data: Buffer) => {
    const body = Buffer.concat([Buffer.from(type, 'ascii'), data])
    const length = Buffer.alloc(4)
    length.writeUInt32BE(data.length)
    const crc = Buffer.alloc(4)
    crc.writeUInt32BE(crc32(body))
    return Buffer.concat([length, body, crc])
  }
  const ihdr = Buffer.alloc(13)
  ihdr.writeUInt32BE(width, 0)
  ihdr.writeUInt32BE(height, 4)
  ihdr[8] = 8 // bit depth
  ihdr[9] = 0 // greyscale
  const signature = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a])
  return new Uint8Array(
    Buffer.concat([signature, chunk('IHDR', ihdr), chunk('IEND', Buffer.alloc(0))]),
  )
}

describe('decodeFilm pixel limit', () => {
  it('refuses a film larger than the limit from its header, before decoding a pixel', async () => {
    const side = Math.ceil(Math.sqrt(MAX_FILM_PIXELS)) + 1
    const error = await decodeFilm(pngClaiming(side, side)).catch((caught: unknown) => caught)
    expect(error).toBeInstanceOf(ImageError)
    expect((error as ImageError).code).toBe('too-many-pixels')
    expect((error as ImageError).status).toBe(422)
    expect((error as ImageError).message).toMatch(new RegExp(`${side} × ${side}`))
  })
})
