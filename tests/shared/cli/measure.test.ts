/// <reference types="node" />
// The command-line contract of measurement-reference §10, exercised through a real process.
import { spawnSync } from 'node:child_process'
import { fileURLToPath } from 'node:url'
import { describe, expect, it } from 'vitest'
import { atan2Deg } from '../support/reference-math'

const root = fileURLToPath(new URL('../../../', import.meta.url))
const tsx = fileURLToPath(new URL('../../../node_modules/.bin/tsx', import.meta.url))

function measure(...args: string[]) {
  const run = spawnSync(tsx, ['server/cli/measure.ts', ...args], {
    cwd: root,
    encoding: 'utf8',
    timeout: 30_000,
  })
  return { status: run.status, stdout: run.stdout, stderr: run.stderr }
}

const fixture = (name: string) => `tests/fixtures/landmarks/${name}`

describe('npm run measure', () => {
  it('prints the unrounded result JSON for a lumbar alignment fixture', { timeout: 30_000 }, () => {
    const run = measure(fixture('lumbar-alignment.json'))
    expect(run.status).toBe(0)
    expect(run.stderr).toBe('')
    const result = JSON.parse(run.stdout)
    expect(Object.keys(result.segments)).toEqual(['L1-L2', 'L2-L3', 'L3-L4', 'L4-L5', 'L5-S1'])
    expect(result.segments['L5-S1']).toHaveProperty('slipAngleDeg')
    expect(result.segments['L4-L5']).not.toHaveProperty('slipAngleDeg')
    for (const key of ['lumbarLordosisDeg', 'distalLordosisDeg', 'pelvis', 'piLlMismatchDeg']) {
      expect(result).toHaveProperty(key)
    }
    // Unrounded: SS of S1.ps (1500, 1900) → S1.as (1715.4, 2068.3) is atan2(168.3, 215.4).
    expect(result.pelvis.sacralSlopeDeg).toBeCloseTo(atan2Deg(168.3, 215.4), 12)
  })
  it(
    'prints null mm values for an uncalibrated fixture (Example 1 geometry: 10 % slip)',
    { timeout: 30_000 },
    () => {
      const result = JSON.parse(measure(fixture('uncalibrated-slip.json')).stdout)
      expect(result.segments['L5-S1'].slipPercent).toBeCloseTo((100 * 30) / 300, 10)
      expect(result.segments['L5-S1'].slipMm).toBeNull()
      expect(result.segments['L5-S1'].discHeightMm).toBeNull()
    },
  )
  it(
    'prints the frontal block: the seven keys per measured segment, {} for a lateral film',
    { timeout: 30_000 },
    () => {
      const result = JSON.parse(measure(fixture('frontal-two-levels.json')).stdout)
      expect(Object.keys(result.frontal)).toEqual(['L3-L4', 'L4-L5'])
      for (const segment of Object.values(result.frontal)) {
        expect(Object.keys(segment as object)).toEqual([
          'endplateWidthMm',
          'lateralOffsetMm',
          'lateralOffsetPx',
          'lateralOffsetPercent',
          'implantTiltDeg',
          'segmentCoronalAngleDeg',
          'rotationPercent',
        ])
      }
      // L4-L5 by hand: m = (200, 450), q = (210, 450): 10 px = 2 mm at 0.2 mm/px, of a
      // 200 px = 40 mm endplate 5 %; spinous process (230 − 200)/100 = 30 %.
      expect(result.frontal['L4-L5'].lateralOffsetMm).toBeCloseTo(2, 12)
      expect(result.frontal['L4-L5'].lateralOffsetPercent).toBeCloseTo(5, 12)
      expect(result.frontal['L4-L5'].rotationPercent).toBeCloseTo(30, 12)
      // L3-L4 has no spinous process point, and a centred implant.
      expect(result.frontal['L3-L4'].rotationPercent).toBeNull()
      expect(result.frontal['L3-L4'].lateralOffsetPx).toBeCloseTo(0, 12)
      expect(JSON.parse(measure(fixture('lumbar-alignment.json')).stdout).frontal).toEqual({})
    },
  )
  it('adds intervals with --uncertainty', { timeout: 30_000 }, () => {
    const result = JSON.parse(
      measure(fixture('lumbar-alignment.json'), '--uncertainty', '--sigma-mm=0.5').stdout,
    )
    expect(result.uncertainty.sigma).toEqual({ value: 0.5, unit: 'mm' })
    expect(
      result.uncertainty.measurements.segments['L5-S1'].slipPercent.standardDeviation,
    ).toBeGreaterThan(0)
  })
  it.each([
    ['an unknown landmark', fixture('unknown-landmark.json'), /unknown landmark name "L6.as"/],
    ['malformed JSON', fixture('malformed.json'), /is not valid JSON/],
    ['a missing file', fixture('does-not-exist.json'), /cannot read .*no such file/],
  ])(
    'exits non-zero with the message on stderr for %s',
    { timeout: 30_000 },
    (_label, file, message) => {
      const run = measure(file)
      expect(run.status).not.toBe(0)
      expect(run.stdout).toBe('')
      expect(run.stderr).toMatch(message)
    },
  )
  it('exits non-zero with usage when no file is given', { timeout: 30_000 }, () => {
    const run = measure()
    expect(run.status).toBe(2)
    expect(run.stderr).toMatch(/usage: measure FILE.json/)
  })
})
