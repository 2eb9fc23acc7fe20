import { circleFromThreePoints } from '../geometry/circle'
import { pointDistancePx } from '../geometry/point'
import type { Point } from '../geometry/types'
import type { LandmarkDocument, PixelPoint, PixelSpacingMm } from '../types/landmarks'
import { LandmarkDocumentError } from './landmark-document-error'
import {
  cagePointName,
  cornerName,
  FEMORAL_HEADS,
  frontalImplantName,
  frontalPointName,
  isKnownLandmarkName,
  LUMBAR_VERTEBRAE,
  rimPointName,
  SEGMENT_NAMES,
  SEGMENTS,
  type Vertebra,
} from './landmark-names'
import { lookUpFrame } from './frame'
import { frontalEndplateDirection } from './frontal'
import { vectorDot, vectorSubtract } from '../geometry/vector'

/** Two landmarks closer than this (image px) make a zero-length line: far below any placement. */
export const ZERO_LENGTH_TOLERANCE_PX = 1e-6

/**
 * Rim points whose triangle has 2·area / longest side² at or below this are refused as
 * collinear (see `circleFromThreePoints`). The ratio is the middle point's distance from the
 * chord over the chord length, so 1e-6 is 0.0002 px on a 200 px chord: it refuses points
 * placed on one line, not a shallow but real arc.
 */
export const RIM_COLLINEAR_TOLERANCE = 1e-6

const TOP_LEVEL_KEYS = new Set(['mmPerPixel', 'points'])

function isPlainObject(value: unknown): value is Record<string, unknown> {
  return typeof value === 'object' && value !== null && !Array.isArray(value)
}

function describe(value: unknown): string {
  if (typeof value === 'number') return String(value)
  if (typeof value === 'string') return JSON.stringify(value)
  if (value === null) return 'null'
  if (Array.isArray(value)) return 'an array'
  return typeof value
}

function parseSpacingValue(value: unknown, label: string): number {
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw new LandmarkDocumentError(
      'bad-structure',
      `${label} must be a finite number of mm per pixel, got ${describe(value)}`,
      'mmPerPixel',
    )
  }
  if (value <= 0) {
    throw new LandmarkDocumentError(
      'non-positive-spacing',
      `non-positive spacing: ${label} is ${value}; spacing must be greater than 0 mm per pixel`,
      'mmPerPixel',
    )
  }
  return value
}

function parseSpacing(value: unknown): PixelSpacingMm | null {
  if (value === undefined || value === null) return null
  if (typeof value === 'number' || !Array.isArray(value))
    return parseSpacingValue(value, 'mmPerPixel')
  if (value.length !== 2) {
    throw new LandmarkDocumentError(
      'bad-structure',
      `mmPerPixel must be one number or [row, column] spacing, got an array of ${value.length}`,
      'mmPerPixel',
    )
  }
  return [
    parseSpacingValue(value[0], 'mmPerPixel row spacing'),
    parseSpacingValue(value[1], 'mmPerPixel column spacing'),
  ]
}

function parsePoint(name: string, value: unknown): PixelPoint {
  if (!isKnownLandmarkName(name)) {
    throw new LandmarkDocumentError(
      'unknown-landmark',
      `unknown landmark name ${JSON.stringify(name)}`,
      name,
    )
  }
  if (!Array.isArray(value) || value.length !== 2) {
    throw new LandmarkDocumentError(
      'bad-structure',
      `landmark ${JSON.stringify(name)} must be an [x, y] pair, got ${describe(value)}`,
      name,
    )
  }
  const [x, y] = value as unknown[]
  for (const [axis, coordinate] of [
    ['x', x],
    ['y', y],
  ] as const) {
    if (typeof coordinate !== 'number' || !Number.isFinite(coordinate)) {
      throw new LandmarkDocumentError(
        'non-finite-coordinate',
        `landmark ${JSON.stringify(name)} has a non-finite coordinate: ${axis} is ${describe(coordinate)}`,
        name,
      )
    }
  }
  return [x as number, y as number]
}

function refuseZeroLength(
  points: Readonly<Record<string, Point>>,
  from: string,
  to: string,
  what: string,
): void {
  const a = points[from]
  const b = points[to]
  if (a !== undefined && b !== undefined && pointDistancePx(a, b) <= ZERO_LENGTH_TOLERANCE_PX) {
    throw new LandmarkDocumentError(
      'zero-length-endplate',
      `zero-length ${what}: ${JSON.stringify(from)} and ${JSON.stringify(to)} coincide`,
      to,
    )
  }
}

function checkLineLengths(points: Readonly<Record<string, Point>>): void {
  for (const vertebra of LUMBAR_VERTEBRAE) {
    const ps = cornerName(vertebra, 'ps')
    const pi = cornerName(vertebra, 'pi')
    refuseZeroLength(points, ps, cornerName(vertebra, 'as'), `${vertebra} superior endplate`)
    refuseZeroLength(points, pi, cornerName(vertebra, 'ai'), `${vertebra} inferior endplate`)
  }
  refuseZeroLength(points, 'S1.ps', 'S1.as', 'S1 superior endplate')
  refuseZeroLength(points, 'S1.pw', 'S1.ps', 'S1 posterior wall')
  for (const segment of SEGMENT_NAMES) {
    for (const surface of ['sup', 'inf'] as const) {
      refuseZeroLength(
        points,
        cagePointName(segment, `${surface}.p`),
        cagePointName(segment, `${surface}.a`),
        `cage ${segment} ${surface === 'sup' ? 'superior' : 'inferior'} surface`,
      )
    }
  }
}

/**
 * Frontal film: every line runs from its `l` to its `r` end, so the lines of one segment point
 * the same way. Lines meeting at more than 90° mean one pair was swapped (l nearer the image's
 * right edge), which would silently flip the sign of the offset; such a document is refused.
 */
function checkFrontalLines(points: Readonly<Record<string, Point>>): void {
  for (const { name: segment, upper, lower } of SEGMENTS) {
    const upperLeft = frontalPointName(upper, 'il')
    const upperRight = frontalPointName(upper, 'ir')
    const lowerLeft = frontalPointName(lower, 'sl')
    const lowerRight = frontalPointName(lower, 'sr')
    refuseZeroLength(points, upperLeft, upperRight, `${upper} inferior endplate (frontal)`)
    refuseZeroLength(points, lowerLeft, lowerRight, `${lower} superior endplate (frontal)`)
    const implantLeft = frontalImplantName(segment, 'l')
    const implantRight = frontalImplantName(segment, 'r')
    refuseZeroLength(points, implantLeft, implantRight, `disc replacement ${segment} (frontal)`)
    const [ul, ur, ll, lr] = [upperLeft, upperRight, lowerLeft, lowerRight].map(
      (name) => points[name],
    )
    if (!ul || !ur || !ll || !lr) continue
    if (vectorDot(vectorSubtract(ur, ul), vectorSubtract(lr, ll)) <= 0) {
      throw new LandmarkDocumentError(
        'crossed-frontal-lines',
        `the ${upper} and ${lower} endplate lines (${upperLeft} → ${upperRight}, ${lowerLeft} → ${lowerRight}) run in opposite directions: l and r are swapped on one of them (l is the end nearer the image's left edge)`,
        lowerRight,
      )
    }
    const il = points[implantLeft]
    const ir = points[implantRight]
    const direction = frontalEndplateDirection(ul, ur, ll, lr)
    if (il && ir && direction && vectorDot(vectorSubtract(ir, il), direction) <= 0) {
      throw new LandmarkDocumentError(
        'crossed-frontal-lines',
        `the disc replacement ${segment} runs against its endplates (${implantLeft} → ${implantRight}): its l and r ends are swapped (l is the end nearer the image's left edge)`,
        implantRight,
      )
    }
  }
}

function checkFemoralHeads(points: Readonly<Record<string, Point>>): void {
  for (const head of FEMORAL_HEADS) {
    const names = [rimPointName(head, 1), rimPointName(head, 2), rimPointName(head, 3)]
    const rim = names.map((name) => points[name]).filter((point) => point !== undefined)
    if (rim.length === 0) continue
    if (rim.length < 3) {
      const missing = names.filter((name) => points[name] === undefined)
      throw new LandmarkDocumentError(
        'incomplete-rim',
        `incomplete femoral head rim ${head}: ${missing.join(', ')} missing (three rim points are needed)`,
        missing[0] ?? head,
      )
    }
    if (points[head] !== undefined) {
      throw new LandmarkDocumentError(
        'conflicting-femoral-head',
        `femoral head ${head} is given both as a centre and as rim points; give one or the other`,
        head,
      )
    }
    const [a, b, c] = rim as [Point, Point, Point]
    if (circleFromThreePoints(a, b, c, RIM_COLLINEAR_TOLERANCE) === null) {
      throw new LandmarkDocumentError(
        'collinear-rim-points',
        `collinear rim points: ${names.join(', ')} lie on one line, so no femoral head centre can be fitted`,
        head,
      )
    }
  }
}

function checkFrames(points: Readonly<Record<string, Point>>): void {
  const pairs: [Vertebra, Vertebra][] = SEGMENTS.map((segment) => [segment.upper, segment.lower])
  pairs.push(['L1', 'S1'], ['L4', 'S1'])
  for (const [upper, lower] of pairs) {
    if (lookUpFrame(points, upper, lower).kind === 'degenerate') {
      throw new LandmarkDocumentError(
        'degenerate-frame',
        `the corners of ${upper} lie on the line of the ${lower} superior endplate, so the cranial direction is undefined`,
        cornerName(lower, 'as'),
      )
    }
  }
}

/**
 * Validates an untrusted landmark document (from JSON, the API or the database) and returns a
 * fresh copy in image pixels (x right, y down). Throws `LandmarkDocumentError` naming the
 * problem: bad structure (including unknown top-level keys, so a misspelt `mmPerPixel` is not
 * silently ignored), an unknown landmark name, a non-finite coordinate, non-positive spacing, a
 * zero-length endplate, wall, cage surface or frontal line (within `ZERO_LENGTH_TOLERANCE_PX`),
 * frontal lines of one segment running in opposite directions (l and r swapped), an incomplete
 * or collinear femoral head rim (`RIM_COLLINEAR_TOLERANCE`), a head given both ways, or upper
 * corners lying on the lower endplate line.
 */
export function parseLandmarkDocument(input: unknown): LandmarkDocument {
  if (!isPlainObject(input)) {
    throw new LandmarkDocumentError(
      'bad-structure',
      `a landmark document must be an object with "points", got ${describe(input)}`,
    )
  }
  for (const key of Object.keys(input)) {
    if (!TOP_LEVEL_KEYS.has(key)) {
      throw new LandmarkDocumentError(
        'bad-structure',
        `unknown top-level key ${JSON.stringify(key)}; a landmark document has only "mmPerPixel" and "points"`,
        key,
      )
    }
  }
  const rawPoints = input['points']
  if (!isPlainObject(rawPoints)) {
    throw new LandmarkDocumentError(
      'bad-structure',
      `"points" must be an object of name → [x, y], got ${describe(rawPoints)}`,
      'points',
    )
  }
  const mmPerPixel = parseSpacing(input['mmPerPixel'])
  const points: Record<string, PixelPoint> = {}
  for (const [name, value] of Object.entries(rawPoints)) points[name] = parsePoint(name, value)
  checkLineLengths(points)
  checkFrontalLines(points)
  checkFemoralHeads(points)
  checkFrames(points)
  return { mmPerPixel, points }
}
