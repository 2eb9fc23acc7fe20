import dicomParser from 'dicom-parser'
import { describe, expect, it } from 'vitest'
import { decodeFilm } from '../../../../server/images/decode-film'
import {
  generatePhantom,
  phantomDicom,
  phantomPng,
} from '../../../../server/phantom/generate-phantom'
import type { PhantomFilm } from '../../../../server/phantom/generate-phantom'
import { LUMBAR_LEVELS } from '../../../../server/phantom/phantom-params'

const SMALL = { widthPx: 600, heightPx: 500, detectorPixelMm: 0.75, magnification: 1.15, seed: 7 }

function meanAround(film: PhantomFilm, [x, y]: [number, number], radius = 1): number {
  let sum = 0
  let count = 0
  for (let dy = -radius; dy <= radius; dy++) {
    for (let dx = -radius; dx <= radius; dx++) {
      sum += film.pixels[(Math.round(y) + dy) * film.width + Math.round(x) + dx] as number
      count++
    }
  }
  return sum / count
}

describe('phantom film', () => {
  const filmPromise = generatePhantom({ ...SMALL, implants: [{ kind: 'cage', segment: 'L5-S1' }] })

  it('draws the landmark corners as the outer corners of the bright cortical rim, with darker discs between', async () => {
    const film = await filmPromise
    const points = film.landmarks.points
    const mmPerPixel = film.landmarks.mmPerPixel as number
    let dimmestRim = Number.POSITIVE_INFINITY
    for (const level of LUMBAR_LEVELS) {
      const corners = ['as', 'ps', 'pi', 'ai'].map(
        (c) => points[`${level}.${c}`] as [number, number],
      )
      const cx = corners.reduce((sum, [x]) => sum + x, 0) / 4
      const cy = corners.reduce((sum, [, y]) => sum + y, 0) / 4
      for (const [index, [x, y]] of corners.entries()) {
        // Just inside the corner (1 mm toward the body's middle) lies the bright rim; as far
        // outside, the darker soft tissue or disc.
        const toward = Math.hypot(cx - x, cy - y)
        const step = 1 / mmPerPixel / toward
        const inside = meanAround(film, [x + (cx - x) * step, y + (cy - y) * step], 0)
        const outside = meanAround(film, [x - (cx - x) * step, y - (cy - y) * step], 0)
        expect(inside, `${level} corner ${index} inside`).toBeGreaterThan(30000)
        expect(inside - outside, `${level} corner ${index} contrast`).toBeGreaterThan(8000)
        dimmestRim = Math.min(dimmestRim, inside)
      }
    }
    // Mid-disc at L3-L4: between L3's inferior and L4's superior endplate middles.
    const [l3pi, l3ai, l4ps, l4as] = ['L3.pi', 'L3.ai', 'L4.ps', 'L4.as'].map(
      (n) => points[n] as [number, number],
    )
    const disc: [number, number] = [
      ((l3pi as number[])[0]! + l3ai![0] + l4ps![0] + l4as![0]) / 4,
      (l3pi![1] + l3ai![1] + l4ps![1] + l4as![1]) / 4,
    ]
    expect(meanAround(film, disc, 2)).toBeLessThan(dimmestRim - 8000)
  })

  it('is reproducible from its seed', async () => {
    const again = await generatePhantom({
      ...SMALL,
      implants: [{ kind: 'cage', segment: 'L5-S1' }],
    })
    expect(
      Buffer.from((await filmPromise).pixels.buffer).equals(Buffer.from(again.pixels.buffer)),
    ).toBe(true)
  })

  it('writes a 16-bit MONOCHROME2 DICOM that reads back with its calibrated spacing (PS3.3 §10.7.1.1)', async () => {
    const film = await filmPromise
    const file = phantomDicom(film)
    const raw = dicomParser.parseDicom(new Uint8Array(file))
    expect(raw.string('x00280004')).toBe('MONOCHROME2')
    expect(raw.string('x00280a02')).toBe('GEOMETRY')
    expect(raw.floatString('x00181164')).toBe(0.75)
    expect(raw.floatString('x00181114')).toBe(1.15)
    expect(raw.string('x00100010')).toBe('PHANTOM^LUMBAR')

    const decoded = await decodeFilm(file)
    expect(decoded.header?.spacing).toMatchObject({
      mmPerPixel: [film.landmarks.mmPerPixel, film.landmarks.mmPerPixel],
      spacingSource: 'dicom-pixel-spacing',
    })
    expect(decoded.header?.view).toBe('lateral-neutral')
    expect(decoded.window?.width).toBe(Math.round(film.window.width))
    expect(Buffer.from(decoded.pixels.buffer).equals(Buffer.from(film.pixels.buffer))).toBe(true)
  })

  it('writes a 16-bit PNG with the same pixels, and an 8-bit one on request', async () => {
    const film = await filmPromise
    const decoded = await decodeFilm(await phantomPng(film))
    expect(decoded.bitsStored).toBe(16)
    expect(Buffer.from(decoded.pixels.buffer).equals(Buffer.from(film.pixels.buffer))).toBe(true)
    const eight = await decodeFilm(
      await phantomPng({ ...film, params: { ...film.params, pngBits: 8 } }),
    )
    expect(eight).toMatchObject({ bitsStored: 8, width: 600, height: 500 })
  })
})
