/**
 * The uncertainty propagation moves each landmark only in the parts of the result that read it.
 * It must give exactly what the textbook first-order (delta-method) propagation gives when every
 * coordinate is moved in the whole result: SD² = Σᵢ (∂f/∂xᵢ · σᵢ)², each ∂f/∂xᵢ by a central
 * difference (measurement-literature §10 [D]). The reference below is that sum written plainly.
 */
import { readFileSync } from 'node:fs'
import { describe, expect, it } from 'vitest'
import { angleWrapDeg } from '../../../shared/geometry/angle'
import { pointPxToMm } from '../../../shared/geometry/transform'
import type { Point } from '../../../shared/geometry/types'
import { measurePrepared } from '../../../shared/measurement/compute-measurements'
import { landmarkReadsOf } from '../../../shared/measurement/landmark-reads'
import { numberAtPath, numericLeafPaths } from '../../../shared/measurement/numeric-leaves'
import { parseLandmarkDocument } from '../../../shared/measurement/parse-landmark-document'
import {
  preparePoints,
  prepareDocument,
  type PreparedPoints,
} from '../../../shared/measurement/prepared-points'
import { computeUncertainty, DEFAULT_SIGMA_MM } from '../../../shared/measurement/uncertainty'
import type { LandmarkDocument } from '../../../shared/types/landmarks'
import { constructSpineDocument, DEFAULT_SHAPE } from '../support/constructed-spine'

const fixture = (name: string): LandmarkDocument =>
  JSON.parse(
    readFileSync(new URL(`../../fixtures/landmarks/${name}`, import.meta.url), 'utf8'),
  ) as LandmarkDocument

/** SD of every numeric value, every coordinate moved in the whole result (null: undefined). */
function wholeResultSds(doc: LandmarkDocument, sigmaMm: number): Array<number | null> {
  const prepared = prepareDocument(parseLandmarkDocument(doc))
  const spacing = prepared.spacing
  if (spacing === null) throw new Error('the reference is written for calibrated documents')
  const paths = numericLeafPaths(measurePrepared(prepared))
  const sums = paths.map(() => 0)
  const undefinedAt = paths.map(() => false)
  for (const name of Object.keys(prepared.px)) {
    for (const axis of [0, 1]) {
      const sigma = axis === 0 ? sigmaMm / spacing.columnMm : sigmaMm / spacing.rowMm
      const step = sigma * 1e-3
      const moved = (delta: number): PreparedPoints => {
        const point = prepared.px[name] as Point
        const shifted: Point =
          axis === 0 ? [point[0] + delta, point[1]] : [point[0], point[1] + delta]
        return {
          spacing,
          px: { ...prepared.px, [name]: shifted },
          work: { ...prepared.work, [name]: pointPxToMm(shifted, spacing) },
        }
      }
      const plus = measurePrepared(moved(step), 'signed')
      const minus = measurePrepared(moved(-step), 'signed')
      paths.forEach((path, k) => {
        const difference = numberAtPath(plus, path) - numberAtPath(minus, path)
        if (!Number.isFinite(difference)) undefinedAt[k] = true
        const angle = (path[path.length - 1] ?? '').endsWith('Deg')
        const derivative = (angle ? angleWrapDeg(difference) : difference) / (2 * step)
        sums[k] = (sums[k] as number) + (derivative * sigma) ** 2
      })
    }
  }
  return sums.map((sum, k) => (undefinedAt[k] ? null : Math.sqrt(sum)))
}

function partWiseSds(doc: LandmarkDocument, sigmaMm: number): Array<number | null> {
  const { measurements } = computeUncertainty(doc, { sigmaMm })
  return numericLeafPaths(measurements)
    .filter((path) => path[path.length - 1] === 'standardDeviation')
    .map((path) => numberAtPath(measurements, path))
}

describe('part-wise propagation equals the whole-result Jacobian', () => {
  it.each([
    [
      'the full lumbar fixture (L1–S1 corners, both femoral heads)',
      fixture('lumbar-alignment.json'),
    ],
    ['a frontal film of two levels', fixture('frontal-two-levels.json')],
    ['a constructed spine (phantom geometry)', constructSpineDocument(DEFAULT_SHAPE)],
  ])('%s: every SD to the last bit', (_label, doc) => {
    const reference = wholeResultSds(doc, DEFAULT_SIGMA_MM)
    expect(reference.length).toBeGreaterThan(5)
    expect(partWiseSds(doc, DEFAULT_SIGMA_MM)).toEqual(reference)
  })
})

describe('landmarkReadsOf', () => {
  const prepared = preparePoints({ a: [0, 0], b: [1, 1], c: [2, 2] }, null)

  it('names the landmarks a computation reads, by lookup or by `in`', () => {
    const reads = landmarkReadsOf((points) => [points.work['a'], 'c' in points.px], prepared)
    expect(reads).toEqual(new Set(['a', 'c']))
  })
  it("answers 'all' when the computation lists the points", () => {
    expect(landmarkReadsOf((points) => Object.keys(points.work).length, prepared)).toBe('all')
  })
})
