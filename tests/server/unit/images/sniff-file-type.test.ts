import { describe, expect, it } from 'vitest'
import { ImageError } from '../../../../server/images/image-error'
import { sniffFileType } from '../../../../server/images/sniff-file-type'

function bytes(...values: number[]): Uint8Array {
  return Uint8Array.from(values)
}

function dicomPreamble(): Uint8Array {
  // PS3.10 §7.1: 128-byte preamble, then "DICM".
  const out = new Uint8Array(140)
  out.set([0x44, 0x49, 0x43, 0x4d], 128)
  return out
}

describe('sniffFileType', () => {
  it('recognises DICOM by "DICM" at offset 128 (PS3.10 §7.1)', () => {
    expect(sniffFileType(dicomPreamble())).toBe('dicom')
  })

  it('recognises PNG by its 8-byte signature (PNG spec §5.2)', () => {
    expect(sniffFileType(bytes(0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0))).toBe('png')
  })

  it('recognises JPEG by SOI followed by a marker (ITU T.81 §B.1.1.3)', () => {
    expect(sniffFileType(bytes(0xff, 0xd8, 0xff, 0xe0, 0, 0x10))).toBe('jpeg')
  })

  it('recognises TIFF in both byte orders (TIFF 6.0 §2 image file header)', () => {
    expect(sniffFileType(bytes(0x49, 0x49, 0x2a, 0x00, 8, 0, 0, 0))).toBe('tiff')
    expect(sniffFileType(bytes(0x4d, 0x4d, 0x00, 0x2a, 0, 0, 0, 8))).toBe('tiff')
  })

  it('refuses a text file named .dcm with a 415-class error', () => {
    const text = new TextEncoder().encode('Patient: nobody\nThis is not an image.\n'.repeat(5))
    const error = (() => {
      try {
        sniffFileType(text)
      } catch (e) {
        return e
      }
    })()
    expect(error).toBeInstanceOf(ImageError)
    expect(error).toMatchObject({ code: 'unsupported-file-type', status: 415 })
    expect((error as Error).message).toMatch(/not a DICOM, PNG, JPEG or TIFF/)
  })

  it('refuses GIF and a DICOM marker at the wrong offset', () => {
    expect(() => sniffFileType(new TextEncoder().encode('GIF89a...'))).toThrow(ImageError)
    const early = new Uint8Array(140)
    early.set([0x44, 0x49, 0x43, 0x4d], 0)
    expect(() => sniffFileType(early)).toThrow(/not a DICOM/)
  })

  it('refuses an empty file with its own code', () => {
    expect(() => sniffFileType(new Uint8Array(0))).toThrow(
      expect.objectContaining({ code: 'empty-file', status: 422 }),
    )
  })
})
