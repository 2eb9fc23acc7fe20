/// <reference types="node" />
// The reliability command line, exercised through a real process.
import { spawnSync } from 'node:child_process'
import { fileURLToPath } from 'node:url'
import { describe, expect, it } from 'vitest'
import golden from '../../fixtures/statistics/psych-golden.json'

const root = fileURLToPath(new URL('../../../', import.meta.url))
const tsx = fileURLToPath(new URL('../../../node_modules/.bin/tsx', import.meta.url))

function reliability(...args: string[]) {
  const run = spawnSync(tsx, ['server/cli/reliability.ts', ...args], {
    cwd: root,
    encoding: 'utf8',
    timeout: 30_000,
  })
  return { status: run.status, stdout: run.stdout, stderr: run.stderr }
}

const fixture = (name: string) => `tests/fixtures/reliability/${name}`

describe('npm run reliability', () => {
  it(
    'prints n, k, excluded and the six forms for the Shrout & Fleiss (1979) example',
    { timeout: 30_000 },
    () => {
      const run = reliability(fixture('shrout-fleiss.json'))
      expect(run.status).toBe(0)
      expect(run.stderr).toBe('')
      const result = JSON.parse(run.stdout)
      expect(Object.keys(result)).toEqual(['n', 'k', 'excluded', 'forms', 'blandAltman'])
      expect(result).toMatchObject({ n: 6, k: 4, excluded: 0, blandAltman: null })
      // psych::ICC on the same table (fixture psych-golden.json, R psych 2.2.9).
      const expected = golden.icc.find((c) => c.name === 'shrout-fleiss-1979')!.forms
      for (const form of ['1,1', '2,1', '3,1', '1,k', '2,k', '3,k'] as const) {
        expect(Object.keys(result.forms[form])).toEqual([
          'icc',
          'lower',
          'upper',
          'f',
          'df1',
          'df2',
          'p',
        ])
        for (const key of ['icc', 'lower', 'upper', 'f', 'df1', 'df2'] as const) {
          expect(result.forms[form][key]).toBeCloseTo(expected[form][key], 10)
        }
      }
    },
  )

  it(
    'prints null where an ICC or its interval is not defined (targets that barely differ)',
    { timeout: 30_000 },
    () => {
      // Three targets whose ratings differ far more within a target than between targets
      // (derived: F ≈ 0.0015, ICC(2,1) ≈ −0.29, below the Spearman–Brown pole −1/(k − 1) = −0.25).
      const run = reliability(fixture('targets-barely-differ.json'))
      expect(run.status).toBe(0)
      const { forms } = JSON.parse(run.stdout)
      expect(forms['2,1'].icc).toBeCloseTo(-0.2899, 4)
      expect([forms['2,1'].lower, forms['2,1'].upper]).toEqual([null, null])
      expect([forms['2,k'].icc, forms['2,k'].lower, forms['2,k'].upper]).toEqual([null, null, null])
      expect(forms['3,1'].lower).toBeLessThanOrEqual(forms['3,1'].icc)
    },
  )

  it(
    'adds Bland–Altman (first column minus second) for two raters and counts missing targets',
    { timeout: 30_000 },
    () => {
      const result = JSON.parse(reliability(fixture('pefr-with-missing.json')).stdout)
      expect(result).toMatchObject({ n: 17, k: 2, excluded: 2 })
      // Bland & Altman 1986: Wright minus mini Wright, mean −2.1 and SD 38.8 l/min.
      expect(result.blandAltman.bias).toBeCloseTo(-2.1, 1)
      expect(result.blandAltman.sd).toBeCloseTo(38.8, 1)
      expect(result.blandAltman.lower).toBeCloseTo(
        result.blandAltman.bias - 1.96 * result.blandAltman.sd,
        10,
      )
      expect(result.blandAltman.upper).toBeCloseTo(
        result.blandAltman.bias + 1.96 * result.blandAltman.sd,
        10,
      )
    },
  )

  it.each([
    ['ragged rows', fixture('ragged.json'), /row 2 has 3 ratings; row 1 has 2/],
    [
      'one complete target',
      fixture('one-complete-target.json'),
      /not enough data: 1 complete target/,
    ],
    ['malformed JSON', fixture('malformed.json'), /is not valid JSON/],
    ['no ratings key', fixture('no-ratings-key.json'), /must be an object with a "ratings" array/],
    ['a missing file', fixture('does-not-exist.json'), /cannot read .*no such file/],
  ])(
    'exits non-zero with the message on stderr for %s',
    { timeout: 30_000 },
    (_label, file, message) => {
      const run = reliability(file)
      expect(run.status).toBe(1)
      expect(run.stdout).toBe('')
      expect(run.stderr).toMatch(message)
    },
  )

  it('exits non-zero with usage when no file is given', { timeout: 30_000 }, () => {
    const run = reliability()
    expect(run.status).toBe(2)
    expect(run.stderr).toMatch(/usage: reliability FILE.json/)
  })
})
