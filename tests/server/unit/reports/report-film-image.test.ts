import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import sharp from 'sharp'
import { computeMeasurements } from '@shared/measurement/index'
import { OVERLAY_COLOURS, readingOverlayShapes, type OverlayShape } from '@shared/overlays/index'
import { reportFilmCrop } from '@shared/reports/film-crop'
import type { ReportFilm } from '@shared/types/reports'
import { generatePhantom, phantomPng } from '../../../../server/phantom/generate-phantom'
import { decodeFilm } from '../../../../server/images/decode-film'
import { makeFilmRenditions } from '../../../../server/images/renditions'
import { createLocalFileStore } from '../../../../server/storage/local-file-store'
import { composeReportFilm, type ComposedFilm } from '../../../../server/reports/report-film-image'

type Rgb = [number, number, number]

let root: string
let film: ReportFilm
let composed: ComposedFilm
let pixels: Buffer
let plain: Buffer

const hex = (colour: string): Rgb =>
  [1, 3, 5].map((i) => parseInt(colour.slice(i, i + 2), 16)) as Rgb
const distance = (a: Rgb, b: Rgb) => Math.hypot(a[0] - b[0], a[1] - b[1], a[2] - b[2])

/** Image px → the composed picture's pixel (the picture spans the crop's pixel edges). */
function outputPixel([x, y]: readonly [number, number]): [number, number] {
  const s = composed.scale
  return [
    Math.round((x - film.crop.x + 0.5) * s - 0.5),
    Math.round((y - film.crop.y + 0.5) * s - 0.5),
  ]
}

function sample(buffer: Buffer, [x, y]: [number, number]): Rgb {
  const at = (y * composed.widthPx + x) * 3
  return [buffer[at] as number, buffer[at + 1] as number, buffer[at + 2] as number]
}

beforeAll(async () => {
  // A 1500 × 1250 px phantom (so the crop is scaled, not copied) with a 30 % slip at L5-S1.
  const phantom = await generatePhantom({
    widthPx: 1500,
    heightPx: 1250,
    detectorPixelMm: 0.3,
    segments: { 'L5-S1': { slipPercent: 30 } },
  })
  const renditions = await makeFilmRenditions(await decodeFilm(await phantomPng(phantom)))
  root = mkdtempSync(join(tmpdir(), 'endplate-report-film-'))
  const store = createLocalFileStore(root)
  await store.put('films/display.png', renditions.display.buffer)
  const names = ['L5.as', 'L5.ps', 'L5.pi', 'L5.ai', 'S1.as', 'S1.ps', 'S1.pw']
  const points = Object.fromEntries(names.map((name) => [name, phantom.landmarks.points[name]!]))
  const shapes = readingOverlayShapes('slip-grade', points, computeMeasurements({ points }))
  film = {
    imageId: 1,
    imageUrl: '',
    widthPx: phantom.width,
    heightPx: phantom.height,
    caption: '',
    calibration: '',
    shapes,
    points,
    crop: reportFilmCrop(shapes, points, phantom.width, phantom.height),
  }
  composed = await composeReportFilm(store, 'films/display.png', film)
  pixels = await sharp(composed.jpeg).removeAlpha().toColourspace('srgb').raw().toBuffer()
  // The same crop without overlays, to show the colours come from them.
  plain = await sharp(renditions.display.buffer)
    .extract({
      left: film.crop.x,
      top: film.crop.y,
      width: film.crop.width,
      height: film.crop.height,
    })
    .resize(composed.widthPx, composed.heightPx, { fit: 'fill' })
    .toColourspace('srgb')
    .raw()
    .toBuffer()
}, 60_000)
afterAll(() => rmSync(root, { recursive: true, force: true }))

describe('composeReportFilm', () => {
  it('crops round the landmarks and enlarges the crop to the report size', () => {
    expect(film.crop.width).toBeLessThan(1500)
    expect(Math.max(composed.widthPx, composed.heightPx)).toBe(1400)
    for (const [x, y] of Object.values(film.points)) {
      expect(x).toBeGreaterThan(film.crop.x)
      expect(x).toBeLessThan(film.crop.x + film.crop.width)
      expect(y).toBeGreaterThan(film.crop.y)
      expect(y).toBeLessThan(film.crop.y + film.crop.height)
    }
  })

  it('draws every solid line in its colour along the landmarks it joins, where the film is grey', () => {
    const solid = film.shapes.filter(
      (shape): shape is Extract<OverlayShape, { kind: 'line' }> =>
        shape.kind === 'line' && !shape.dashed && shape.category !== 'disc',
    )
    expect(solid.map((shape) => shape.id)).toEqual(
      expect.arrayContaining(['endplate-sup-L5', 'endplate-sup-S1', 'wall-L5', 'slip-L5-S1']),
    )
    const offColour: string[] = []
    const colourfulFilm: string[] = []
    for (const line of solid) {
      const [x1, y1, x2, y2] = line.points as [number, number, number, number]
      // Away from the dots at the ends, and past the first 30 % of S1's endplate, where the slip
      // offset (a wall-coloured line) lies over it.
      for (const t of [0.45, 0.75]) {
        const at = outputPixel([x1 + (x2 - x1) * t, y1 + (y2 - y1) * t])
        if (distance(sample(pixels, at), hex(OVERLAY_COLOURS[line.category])) >= 60)
          offColour.push(`${line.id} at ${t}`)
        const [r, g, b] = sample(plain, at)
        if (Math.max(Math.abs(r - g), Math.abs(g - b)) >= 8)
          colourfulFilm.push(`${line.id} at ${t}`)
      }
    }
    expect(offColour).toEqual([])
    expect(colourfulFilm).toEqual([])
  })

  it('leaves the film grey away from the overlays', () => {
    const [r, g, b] = sample(pixels, [2, 2])
    expect(Math.max(Math.abs(r - g), Math.abs(g - b))).toBeLessThan(8)
  })

  it('marks each landmark with a light dot on its own position', () => {
    const missed = Object.entries(film.points)
      .filter(([, point]) => distance(sample(pixels, outputPixel(point)), hex('#f4f6f8')) >= 45)
      .map(([name]) => name)
    expect(missed).toEqual([])
  })
})
