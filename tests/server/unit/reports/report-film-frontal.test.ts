import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import sharp from 'sharp'
import { computeMeasurements } from '@shared/measurement/index'
import { OVERLAY_COLOURS, readingOverlayShapes, type OverlayShape } from '@shared/overlays/index'
import { reportFilmCrop } from '@shared/reports/film-crop'
import { templateLandmarks } from '@shared/readings/templates'
import type { ReportFilm } from '@shared/types/reports'
import { generatePhantom, phantomPng } from '../../../../server/phantom/generate-phantom'
import { phantomPreset } from '../../../../server/phantom/presets'
import { decodeFilm } from '../../../../server/images/decode-film'
import { makeFilmRenditions } from '../../../../server/images/renditions'
import { createLocalFileStore } from '../../../../server/storage/local-file-store'
import { composeReportFilm, type ComposedFilm } from '../../../../server/reports/report-film-image'

// The frontal counterpart of report-film-image.test.ts: the report's picture of an AP film read
// for implant centring carries the endplate lines, the implant line and the body midline of the
// shared overlay geometry where the landmarks are.

type Rgb = [number, number, number]
type Line = Extract<OverlayShape, { kind: 'line' }>

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

const lineOf = (id: string): Line => {
  const shape = film.shapes.find((candidate) => candidate.id === id)
  if (shape?.kind !== 'line') throw new Error(`no line ${id}`)
  return shape
}
const along = (line: Line, t: number): [number, number] => {
  const [x1, y1, x2, y2] = line.points as [number, number, number, number]
  return [x1 + (x2 - x1) * t, y1 + (y2 - y1) * t]
}
const isColour = (at: [number, number], colour: string) =>
  distance(sample(pixels, at), hex(colour)) < 60

beforeAll(async () => {
  // The demo's invented hybrid construct on its post-op AP film, disc replacements at L3-L4 and
  // L4-L5 at known offsets (server/phantom presets), 1200 × 1440 px at a
  // 0.3 mm detector pitch so the crop is scaled.
  const phantom = await generatePhantom({
    ...phantomPreset('hybrid-post-op-ap'),
    widthPx: 1200,
    heightPx: 1440,
    detectorPixelMm: 0.3,
  })
  const renditions = await makeFilmRenditions(await decodeFilm(await phantomPng(phantom)))
  root = mkdtempSync(join(tmpdir(), 'endplate-report-frontal-'))
  const store = createLocalFileStore(root)
  await store.put('films/display.png', renditions.display.buffer)
  const names = templateLandmarks('implant-centring', {
    discReplacements: ['L3-L4', 'L4-L5'],
  }).map((spec) => spec.name)
  const truth = phantom.landmarks.points
  const points = Object.fromEntries(
    names.filter((name) => truth[name]).map((name) => [name, truth[name]!]),
  )
  const shapes = readingOverlayShapes(
    'implant-centring',
    points,
    computeMeasurements({ mmPerPixel: phantom.landmarks.mmPerPixel, points }),
  )
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

describe('composeReportFilm on a frontal film', () => {
  it('places every landmark inside the crop', () => {
    expect(Object.keys(film.points)).toContain('tdr.L4-L5.l')
    for (const [x, y] of Object.values(film.points)) {
      expect(x).toBeGreaterThan(film.crop.x)
      expect(x).toBeLessThan(film.crop.x + film.crop.width)
      expect(y).toBeGreaterThan(film.crop.y)
      expect(y).toBeLessThan(film.crop.y + film.crop.height)
    }
  })

  it('draws the endplate and implant lines in their colours between their landmarks, where the film is grey', () => {
    const ids = ['L3-L4', 'L4-L5'].flatMap((segment) => [
      `frontal-upper-${segment}`,
      `frontal-lower-${segment}`,
      `frontal-implant-${segment}`,
    ])
    const offColour: string[] = []
    const colourfulFilm: string[] = []
    for (const id of ids) {
      const line = lineOf(id)
      // The line joins its two landmarks exactly (the shared geometry).
      expect(line.points.length).toBe(4)
      // Away from the dots at the ends and from the midline crossing the middle.
      for (const t of [0.25, 0.75]) {
        const at = outputPixel(along(line, t))
        if (!isColour(at, OVERLAY_COLOURS[line.category])) offColour.push(`${id} at ${t}`)
        const [r, g, b] = sample(plain, at)
        if (Math.max(Math.abs(r - g), Math.abs(g - b)) >= 8) colourfulFilm.push(`${id} at ${t}`)
      }
    }
    expect(offColour).toEqual([])
    expect(colourfulFilm).toEqual([])
  })

  it('draws the dashed body midline through the mean of the four corners', () => {
    for (const segment of ['L3-L4', 'L4-L5']) {
      const midline = lineOf(`frontal-midline-${segment}`)
      expect(midline.dashed).toBe(true)
      // A dash covers 6 of every 10 stroke units: of 21 samples along the line most are on a dash.
      const hits = Array.from({ length: 21 }, (_, i) => i / 20).filter((t) =>
        isColour(outputPixel(along(midline, t)), OVERLAY_COLOURS.wall),
      )
      expect(hits.length).toBeGreaterThanOrEqual(6)
    }
  })

  it('marks each landmark with a light dot on its own position', () => {
    const missed = Object.entries(film.points)
      .filter(([, point]) => distance(sample(pixels, outputPixel(point)), hex('#f4f6f8')) >= 45)
      .map(([name]) => name)
    expect(missed).toEqual([])
  })
})
