import { describe, expect, it } from 'vitest'
import type { LandmarkDocument, PixelPoint } from '@shared/types/landmarks'
import { phantomGroundTruth } from '../../../../server/phantom/generate-phantom'
import type { PhantomParamsInput } from '../../../../server/phantom/phantom-params'

// Independent arithmetic straight from the measurement reference (§2 frames, §3 segment
// measures, §4 pelvis), on the image coordinates of the landmark document: nothing here comes
// from the generator's own geometry code.

type P = PixelPoint
const sub = (a: P, b: P): P => [a[0] - b[0], a[1] - b[1]]
const dot = (a: P, b: P) => a[0] * b[0] + a[1] * b[1]
const norm = (a: P) => Math.hypot(a[0], a[1])
const unit = (a: P): P => [a[0] / norm(a), a[1] / norm(a)]
const mid = (a: P, b: P): P => [(a[0] + b[0]) / 2, (a[1] + b[1]) / 2]
const deg = (rad: number) => (rad * 180) / Math.PI

const SMALL: PhantomParamsInput = {
  widthPx: 600,
  heightPx: 500,
  detectorPixelMm: 0.75,
  magnification: 1.15,
}

function point(doc: LandmarkDocument, name: string): P {
  const p = doc.points[name]
  if (!p) throw new Error(`missing ${name}`)
  return p
}

/** Reference §2: a along W's superior endplate, c perpendicular pointing toward U. */
function frame(doc: LandmarkDocument, upper: string, lower: string) {
  const a = unit(sub(point(doc, `${lower}.as`), point(doc, `${lower}.ps`)))
  const corners = ['as', 'ps', 'pi', 'ai'].map((c) => point(doc, `${upper}.${c}`))
  const centroid: P = [
    corners.reduce((s, p) => s + p[0], 0) / 4,
    corners.reduce((s, p) => s + p[1], 0) / 4,
  ]
  let c: P = [-a[1], a[0]]
  if (dot(c, sub(centroid, mid(point(doc, `${lower}.ps`), point(doc, `${lower}.as`)))) < 0)
    c = [a[1], -a[0]]
  const theta = (e: P) => deg(Math.atan2(dot(e, c), dot(e, a)))
  return { a, c, theta }
}

function slipPercent(doc: LandmarkDocument, upper: string, lower: string): number {
  const { a } = frame(doc, upper, lower)
  const d = dot(sub(point(doc, `${upper}.pi`), point(doc, `${lower}.ps`)), a)
  return (100 * d) / norm(sub(point(doc, `${lower}.as`), point(doc, `${lower}.ps`)))
}

function segmentalAngle(doc: LandmarkDocument, upper: string, lower: string): number {
  const { theta } = frame(doc, upper, lower)
  const superior = theta(sub(point(doc, `${upper}.as`), point(doc, `${upper}.ps`)))
  const reference =
    lower === 'S1'
      ? theta(sub(point(doc, 'S1.as'), point(doc, 'S1.ps')))
      : theta(sub(point(doc, `${lower}.ai`), point(doc, `${lower}.pi`)))
  return superior - reference
}

function pelvis(doc: LandmarkDocument) {
  const a = unit(sub(point(doc, 'S1.as'), point(doc, 'S1.ps')))
  const f = Math.sign(a[0])
  const hip = mid(point(doc, 'FH1'), point(doc, 'FH2'))
  const v = sub(hip, mid(point(doc, 'S1.ps'), point(doc, 'S1.as')))
  return { ss: deg(Math.atan2(a[1], Math.abs(a[0]))), pt: deg(Math.atan2(f * v[0], v[1])) }
}

const SEGMENTS: [string, string, string][] = [
  ['L1-L2', 'L1', 'L2'],
  ['L2-L3', 'L2', 'L3'],
  ['L3-L4', 'L3', 'L4'],
  ['L4-L5', 'L4', 'L5'],
  ['L5-S1', 'L5', 'S1'],
]

describe('phantom ground truth, re-derived by hand', () => {
  it('places S1 by hand arithmetic: 40 mm at 30° sacral slope at 0.75/1.15 mm per pixel', () => {
    const { landmarks } = phantomGroundTruth({ ...SMALL, sacralSlopeDeg: 30, sacrumDepthMm: 40 })
    // 0.75 / 1.15 = 0.652173913 (10 significant digits, as DICOM DS holds it).
    expect(landmarks.mmPerPixel).toBe(0.652173913)
    // 40·cos 30° = 34.6410 mm, 40·sin 30° = 20 mm; ÷ 0.652173913 = 53.1162 px and 30.6667 px.
    const d = sub(point(landmarks, 'S1.as'), point(landmarks, 'S1.ps'))
    expect(d[0]).toBeCloseTo(53.1162, 3)
    expect(d[1]).toBeCloseTo(30.6667, 3)
  })

  it.each([
    ['a normal spine', {}],
    [
      'a grade III slip facing left',
      { facing: 'left', segments: { 'L5-S1': { slipPercent: 62, segmentalAngleDeg: 10 } } },
    ],
    [
      'a retrolisthesis at L2-L3',
      { segments: { 'L2-L3': { slipPercent: -14, segmentalAngleDeg: 3 } } },
    ],
  ] as [string, PhantomParamsInput][])(
    'gives back every segment’s slip % (Taillard) and segmental angle for %s',
    (_, input) => {
      const { params, landmarks } = phantomGroundTruth({ ...SMALL, ...input })
      for (const [name, upper, lower] of SEGMENTS) {
        const segment = params.segments[name as keyof typeof params.segments]
        expect(slipPercent(landmarks, upper, lower)).toBeCloseTo(segment.slipPercent, 9)
        expect(segmentalAngle(landmarks, upper, lower)).toBeCloseTo(segment.segmentalAngleDeg, 9)
        // Posterior disc height: U.pi above W's superior endplate along c, in mm.
        const { c } = frame(landmarks, upper, lower)
        const height = dot(sub(point(landmarks, `${upper}.pi`), point(landmarks, `${lower}.ps`)), c)
        expect(height * (landmarks.mmPerPixel as number)).toBeCloseTo(
          segment.posteriorDiscHeightMm,
          9,
        )
      }
    },
  )

  it('gives back sacral slope, pelvic tilt and PI = PT + SS (Legaye et al. 1998)', () => {
    const { landmarks } = phantomGroundTruth({
      ...SMALL,
      sacralSlopeDeg: 41,
      pelvicIncidenceDeg: 57,
    })
    const { ss, pt } = pelvis(landmarks)
    expect(ss).toBeCloseTo(41, 9)
    expect(pt).toBeCloseTo(16, 9)
  })

  it('draws the vertebral bodies and femoral heads at the sizes asked for', () => {
    const { params, landmarks } = phantomGroundTruth({ ...SMALL, femoralHeadSeparationMm: 8 })
    const mm = (a: P, b: P) => norm(sub(a, b)) * (landmarks.mmPerPixel as number)
    const l4 = params.vertebrae.L4
    expect(mm(point(landmarks, 'L4.pi'), point(landmarks, 'L4.ai'))).toBeCloseTo(l4.depthMm, 9)
    expect(mm(point(landmarks, 'L4.pi'), point(landmarks, 'L4.ps'))).toBeCloseTo(
      l4.posteriorHeightMm,
      9,
    )
    expect(mm(point(landmarks, 'L4.ai'), point(landmarks, 'L4.as'))).toBeCloseTo(
      l4.anteriorHeightMm,
      9,
    )
    expect(mm(point(landmarks, 'FH1'), point(landmarks, 'FH2'))).toBeCloseTo(8, 9)
    const hip = mid(point(landmarks, 'FH1'), point(landmarks, 'FH2'))
    expect(mm(hip, mid(point(landmarks, 'S1.ps'), point(landmarks, 'S1.as')))).toBeCloseTo(
      params.hipAxisDistanceMm,
      9,
    )
  })

  it('mirrors every point when the patient faces the other way', () => {
    const right = phantomGroundTruth({ ...SMALL, facing: 'right' }).landmarks
    const left = phantomGroundTruth({ ...SMALL, facing: 'left' }).landmarks
    for (const [name, p] of Object.entries(right.points)) {
      expect(point(left, name)[0]).toBeCloseTo(599 - p[0], 9)
      expect(point(left, name)[1]).toBeCloseTo(p[1], 9)
    }
  })

  it('puts cage surfaces on the endplates and the disc-replacement marker where asked (reference §7)', () => {
    const { landmarks } = phantomGroundTruth({
      ...SMALL,
      implants: [
        { kind: 'cage', segment: 'L5-S1' },
        { kind: 'disc-replacement', segment: 'L4-L5', positionPercent: 42 },
      ],
    })
    const { theta } = frame(landmarks, 'L5', 'S1')
    const cage = (surface: string) =>
      theta(
        sub(
          point(landmarks, `cage.L5-S1.${surface}.a`),
          point(landmarks, `cage.L5-S1.${surface}.p`),
        ),
      )
    const discAngle = theta(sub(point(landmarks, 'L5.ai'), point(landmarks, 'L5.pi')))
    // A cage filling the disc space has the disc's angle; its inferior surface lies on S1's plate.
    expect(cage('sup') - cage('inf')).toBeCloseTo(discAngle, 9)
    expect(cage('inf')).toBeCloseTo(0, 9)
    const l5 = frame(landmarks, 'L4', 'L5')
    const marker = sub(point(landmarks, 'implant.L4-L5.marker'), point(landmarks, 'L5.ps'))
    const depth = norm(sub(point(landmarks, 'L5.as'), point(landmarks, 'L5.ps')))
    expect((100 * dot(marker, l5.a)) / depth).toBeCloseTo(42, 9)
  })

  it('refuses parameters it cannot draw, naming the problem', () => {
    expect(() =>
      phantomGroundTruth({ ...SMALL, segments: { 'L4-L5': { segmentalAngleDeg: -30 } } }),
    ).toThrow(/L4-L5: the disc would be/)
    expect(() => phantomGroundTruth({ ...SMALL, detectorPixelMm: 0.2 })).toThrow(/Enlarge the film/)
    expect(() => phantomGroundTruth({ ...SMALL, tilt: 3 } as PhantomParamsInput)).toThrow(
      /Unknown phantom parameter tilt/,
    )
  })
})
