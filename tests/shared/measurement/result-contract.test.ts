/**
 * The JSON contract of measurement-reference §10 and §3: a segment appears only when it can be
 * computed (U's four corners, W's `as` and `ps`); within it and at the top level keys stay
 * present with null for missing landmarks or calibration, `slipAngleDeg` only at L5-S1 with
 * S1.pw, and never NaN or Infinity.
 */
import { readFileSync } from 'node:fs'
import { describe, expect, it } from 'vitest'
import { computeMeasurements } from '../../../shared/measurement/compute-measurements'
import type { LandmarkDocument } from '../../../shared/types/landmarks'
import { constructSpineDocument } from '../support/constructed-spine'

const fixture = JSON.parse(
  readFileSync(new URL('../../fixtures/landmarks/lumbar-alignment.json', import.meta.url), 'utf8'),
) as LandmarkDocument

const SEGMENT_KEYS = [
  'slipPercent',
  'slipMm',
  'slipPx',
  'meyerdingGrade',
  'slipDirection',
  'highGrade',
  'segmentalLordosisDeg',
  'discAngleDeg',
  'discHeightPx',
  'discHeightMm',
  'cageLordosisDeg',
  'implantPositionPercent',
  'implantOffsetMm',
]

function everyNumber(value: unknown): number[] {
  if (typeof value === 'number') return [value]
  if (typeof value !== 'object' || value === null) return []
  return Object.values(value).flatMap(everyNumber)
}

describe('computeMeasurements result contract', () => {
  it('has no segment and every top-level key, with nulls, for a document with no points', () => {
    const result = computeMeasurements({ points: {} })
    expect(result.segments).toEqual({})
    expect(result).toMatchObject({
      lumbarLordosisDeg: null,
      distalLordosisDeg: null,
      pelvis: null,
      piLlMismatchDeg: null,
      piLlBand: null,
      targetLordosisDeg: null,
      calibration: null,
    })
  })
  it('lists every segment of a full document in cranial order, with every key', () => {
    const result = computeMeasurements(fixture)
    expect(Object.keys(result.segments)).toEqual(['L1-L2', 'L2-L3', 'L3-L4', 'L4-L5', 'L5-S1'])
    for (const segment of Object.values(result.segments)) {
      expect(Object.keys(segment).filter((key) => key !== 'slipAngleDeg')).toEqual(SEGMENT_KEYS)
      expect(segment.slipPercent).toEqual(expect.any(Number))
      // No implant points in the fixture: those values are null, their keys still present.
      expect(segment.cageLordosisDeg).toBeNull()
      expect(segment.implantPositionPercent).toBeNull()
    }
  })
  it("keeps a computed segment's mm values null, with their keys, when uncalibrated", () => {
    const { mmPerPixel: _spacing, ...uncalibrated } = fixture
    const segment = computeMeasurements(uncalibrated).segments['L4-L5']!
    expect(segment.slipPx).toEqual(expect.any(Number))
    expect(segment.slipMm).toBeNull()
    expect(segment.discHeightMm).toBeNull()
    expect(segment.discHeightPx.mean).toEqual(expect.any(Number))
  })
  it('has slipAngleDeg only at L5-S1, and only when S1.pw is given', () => {
    const withWall = computeMeasurements(fixture)
    expect('slipAngleDeg' in withWall.segments['L5-S1']!).toBe(true)
    expect(typeof withWall.segments['L5-S1']!.slipAngleDeg).toBe('number')
    expect('slipAngleDeg' in withWall.segments['L4-L5']!).toBe(false)
    const { 'S1.pw': _wall, ...withoutWall } = fixture.points
    expect(
      'slipAngleDeg' in computeMeasurements({ ...fixture, points: withoutWall }).segments['L5-S1']!,
    ).toBe(false)
    // With the wall but without L5 there is no L5-S1 segment to carry the slip angle.
    const onlySacrum = {
      points: { 'S1.ps': [0, 0], 'S1.as': [10, 1], 'S1.pw': [-1, 10] },
    } as LandmarkDocument
    expect(computeMeasurements(onlySacrum).segments['L5-S1']).toBeUndefined()
  })
  it('holds no NaN or Infinity for the full fixture, and survives a JSON round trip', () => {
    const result = computeMeasurements(fixture)
    const numbers = everyNumber(result)
    expect(numbers.length).toBeGreaterThan(60)
    expect(numbers.every(Number.isFinite)).toBe(true)
    expect(JSON.parse(JSON.stringify(result))).toEqual(result)
  })
  it('computes a segment only when U has four corners and W has as and ps', () => {
    const { 'L4.ai': _corner, ...missingCorner } = fixture.points
    const result = computeMeasurements({ ...fixture, points: missingCorner })
    expect(result.segments['L4-L5']).toBeUndefined()
    // L4 is the lower vertebra of L3-L4, which needs only its superior endplate corners.
    expect(result.segments['L3-L4']!.slipPercent).toEqual(expect.any(Number))
    const { 'L5.as': _endplate, ...missingEndplate } = fixture.points
    expect(
      computeMeasurements({ ...fixture, points: missingEndplate }).segments['L4-L5'],
    ).toBeUndefined()
  })
  it('leaves segmental lordosis null without the lower vertebra inferior endplate', () => {
    const { 'L5.pi': _pi, 'L5.ai': _ai, ...points } = constructSpineDocument().points
    const segment = computeMeasurements({ mmPerPixel: 0.139, points }).segments['L4-L5']!
    expect(segment.segmentalLordosisDeg).toBeNull()
    expect(segment.discAngleDeg).not.toBeNull()
    expect(segment.slipPercent).not.toBeNull()
  })
  it('gives the pelvis with only a sacral slope when no femoral head is marked', () => {
    const { FH1: _a, FH2: _b, ...points } = fixture.points
    const result = computeMeasurements({ ...fixture, points })
    expect(result.pelvis?.sacralSlopeDeg).toEqual(expect.any(Number))
    expect(result.pelvis?.incidenceDeg).toBeNull()
    expect(result.pelvis?.tiltDeg).toBeNull()
    expect(result.piLlMismatchDeg).toBeNull()
    expect(result.targetLordosisDeg).toBeNull()
  })
  it('reports the calibration used for the mm values', () => {
    expect(computeMeasurements(fixture).calibration).toEqual({
      rowMm: 0.139,
      columnMm: 0.139,
      square: true,
    })
    expect(computeMeasurements({ mmPerPixel: [0.1, 0.2], points: {} }).calibration).toEqual({
      rowMm: 0.1,
      columnMm: 0.2,
      square: false,
    })
  })
})
