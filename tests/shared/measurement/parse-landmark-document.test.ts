import { describe, expect, it } from 'vitest'
import { LandmarkDocumentError } from '../../../shared/measurement/landmark-document-error'
import { parseLandmarkDocument } from '../../../shared/measurement/parse-landmark-document'
import { computeMeasurements } from '../../../shared/measurement/compute-measurements'
import { KNOWN_LANDMARK_NAMES } from '../../../shared/measurement/landmark-names'
import { atan2Deg } from '../support/reference-math'

const S1 = { 'S1.ps': [1000, 2000], 'S1.as': [1300, 2000] }

function refusal(input: unknown): LandmarkDocumentError {
  try {
    parseLandmarkDocument(input)
  } catch (error) {
    if (error instanceof LandmarkDocumentError) return error
    throw error
  }
  throw new Error('expected the document to be refused')
}

describe('parseLandmarkDocument accepts', () => {
  it('a valid document and returns a copy, not the input object', () => {
    const input = { mmPerPixel: 0.139, points: { ...S1 } }
    const parsed = parseLandmarkDocument(input)
    expect(parsed).toEqual({ mmPerPixel: 0.139, points: S1 })
    expect(parsed.points).not.toBe(input.points)
  })
  it('missing or null spacing as uncalibrated, and [row, column] spacing', () => {
    expect(parseLandmarkDocument({ points: {} }).mmPerPixel).toBeNull()
    expect(parseLandmarkDocument({ mmPerPixel: null, points: {} }).mmPerPixel).toBeNull()
    expect(parseLandmarkDocument({ mmPerPixel: [0.1, 0.2], points: {} }).mmPerPixel).toEqual([
      0.1, 0.2,
    ])
  })
  it('every documented name: corners, sacrum, heads, rims, cages, markers and frontal points', () => {
    expect(KNOWN_LANDMARK_NAMES.has('L3.pi')).toBe(true)
    expect(KNOWN_LANDMARK_NAMES.has('S1.pw')).toBe(true)
    expect(KNOWN_LANDMARK_NAMES.has('FH2.rim3')).toBe(true)
    expect(KNOWN_LANDMARK_NAMES.has('cage.L1-L2.inf.a')).toBe(true)
    expect(KNOWN_LANDMARK_NAMES.has('implant.L5-S1.marker')).toBe(true)
    expect(KNOWN_LANDMARK_NAMES.has('L1.il')).toBe(true)
    expect(KNOWN_LANDMARK_NAMES.has('S1.sr')).toBe(true)
    expect(KNOWN_LANDMARK_NAMES.has('L5.sp')).toBe(true)
    expect(KNOWN_LANDMARK_NAMES.has('tdr.L3-L4.r')).toBe(true)
    // L1 is never the lower vertebra of a segment, S1 never the upper one.
    expect(KNOWN_LANDMARK_NAMES.has('L1.sl')).toBe(false)
    expect(KNOWN_LANDMARK_NAMES.has('S1.il')).toBe(false)
    // 5·4 corners + 3 sacrum + 2·(1 + 3) heads + 5·(4 + 1) implants, and on the frontal film
    // 5 upper vertebrae·(il, ir, sp) + 5 lower·(sl, sr) + 5 implants·(l, r).
    expect(KNOWN_LANDMARK_NAMES.size).toBe(20 + 3 + 8 + 25 + 15 + 10 + 10)
  })
  it('a femoral head fitted from three rim points, giving the same PT as the centre itself', () => {
    // Rim points on the circle of radius 180 px about H = (1260, 1775) (Example 7's hip).
    const rim = [0, 100, 220].map((deg) => {
      const r = (deg * Math.PI) / 180
      return [1260 + 180 * Math.cos(r), 1775 + 180 * Math.sin(r)]
    })
    const points = {
      'S1.ps': [1000, 1000],
      'S1.as': [1200, 1150],
      'FH1.rim1': rim[0],
      'FH1.rim2': rim[1],
      'FH1.rim3': rim[2],
    }
    const pelvis = computeMeasurements(parseLandmarkDocument({ points })).pelvis
    expect(pelvis?.tiltDeg).toBeCloseTo(atan2Deg(1260 - 1100, 1775 - 1075), 9)
  })
})

describe('parseLandmarkDocument refuses, naming the problem', () => {
  it.each([
    ['null', null],
    ['an array', []],
    ['a string', 'points'],
  ])('a document that is %s', (_label, input) => {
    const error = refusal(input)
    expect(error.code).toBe('bad-structure')
    expect(error.message).toMatch(/must be an object/)
  })
  it('a document without an object of points', () => {
    expect(refusal({}).message).toMatch(/"points" must be an object/)
    expect(refusal({ points: [[1, 2]] }).code).toBe('bad-structure')
  })
  it('an unknown top-level key such as a misspelt mmPerPixel', () => {
    const error = refusal({ mmPerPixels: 0.1, points: {} })
    expect(error.code).toBe('bad-structure')
    expect(error.message).toMatch(/unknown top-level key "mmPerPixels"/)
  })
  it.each([
    'L6.as',
    'l5.as',
    'S1.ai',
    'FH3',
    'FH1.rim4',
    'cage.L5-L6.sup.p',
    'implant.L4-L5.core',
    '__proto__',
  ])('the unknown landmark name %s', (name) => {
    const error = refusal(JSON.parse(`{"points": {${JSON.stringify(name)}: [1, 2]}}`))
    expect(error.code).toBe('unknown-landmark')
    expect(error.message).toContain(`unknown landmark name ${JSON.stringify(name)}`)
    expect(error.landmark).toBe(name)
  })
  it.each([
    ['NaN', [Number.NaN, 1]],
    ['Infinity', [1, Number.POSITIVE_INFINITY]],
    ['a string', ['12', 1]],
    ['null', [1, null]],
  ])('a non-finite coordinate (%s)', (_label, value) => {
    const error = refusal({ points: { 'L5.as': value } })
    expect(error.code).toBe('non-finite-coordinate')
    expect(error.message).toMatch(/landmark "L5.as" has a non-finite coordinate/)
  })
  it('a landmark that is not an [x, y] pair', () => {
    expect(refusal({ points: { 'L5.as': [1, 2, 3] } }).message).toMatch(/must be an \[x, y\] pair/)
    expect(refusal({ points: { 'L5.as': { x: 1, y: 2 } } }).code).toBe('bad-structure')
  })
  it.each([
    ['zero', 0],
    ['negative', -0.1],
    ['a zero row spacing', [0, 0.1]],
    ['a negative column spacing', [0.1, -0.2]],
  ])('a non-positive spacing (%s)', (_label, mmPerPixel) => {
    const error = refusal({ mmPerPixel, points: {} })
    expect(error.code).toBe('non-positive-spacing')
    expect(error.message).toMatch(/non-positive spacing/)
  })
  it('a spacing that is not a number or a pair', () => {
    expect(refusal({ mmPerPixel: '0.1', points: {} }).code).toBe('bad-structure')
    expect(refusal({ mmPerPixel: [0.1, 0.1, 0.1], points: {} }).message).toMatch(/\[row, column\]/)
    expect(refusal({ mmPerPixel: Number.NaN, points: {} }).message).toMatch(/finite number/)
  })
  it.each([
    ['L4 superior endplate', { 'L4.ps': [5, 5], 'L4.as': [5, 5] }],
    ['L4 inferior endplate', { 'L4.pi': [5, 5], 'L4.ai': [5, 5] }],
    ['S1 superior endplate', { 'S1.ps': [5, 5], 'S1.as': [5, 5] }],
    ['S1 posterior wall', { 'S1.ps': [5, 5], 'S1.pw': [5, 5] }],
    ['cage L5-S1 superior surface', { 'cage.L5-S1.sup.p': [5, 5], 'cage.L5-S1.sup.a': [5, 5] }],
  ])('a zero-length %s', (what, points) => {
    const error = refusal({ points })
    expect(error.code).toBe('zero-length-endplate')
    expect(error.message).toContain(`zero-length ${what}`)
  })
  it('collinear rim points', () => {
    const error = refusal({
      points: { 'FH1.rim1': [0, 0], 'FH1.rim2': [10, 10], 'FH1.rim3': [20, 20] },
    })
    expect(error.code).toBe('collinear-rim-points')
    expect(error.message).toMatch(/collinear rim points: FH1.rim1, FH1.rim2, FH1.rim3/)
  })
  it('an incomplete rim', () => {
    const error = refusal({ points: { 'FH2.rim1': [0, 0], 'FH2.rim3': [10, 10] } })
    expect(error.code).toBe('incomplete-rim')
    expect(error.message).toMatch(/FH2.rim2 missing/)
  })
  it('a femoral head given both as a centre and as rim points', () => {
    const error = refusal({
      points: { FH1: [5, 5], 'FH1.rim1': [0, 0], 'FH1.rim2': [10, 0], 'FH1.rim3': [5, 8] },
    })
    expect(error.code).toBe('conflicting-femoral-head')
    expect(error.message).toMatch(/FH1 is given both as a centre and as rim points/)
  })
  it('upper corners lying on the lower endplate line, where cranial is undefined', () => {
    const error = refusal({ points: { ...S1, 'L5.pi': [1100, 2000], 'L5.ai': [1200, 2000] } })
    expect(error.code).toBe('degenerate-frame')
    expect(error.message).toMatch(/L5 lie on the line of the S1 superior endplate/)
  })
  it('through computeMeasurements as well, so untyped input cannot slip through', () => {
    expect(() => computeMeasurements({ points: { 'L6.as': [1, 2] } })).toThrow(
      LandmarkDocumentError,
    )
  })
})
