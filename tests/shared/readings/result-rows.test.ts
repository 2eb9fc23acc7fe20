import { describe, expect, it } from 'vitest'
import type { PixelPoint } from '../../../shared/types/landmarks'
import { computeMeasurements, computeUncertainty } from '../../../shared/measurement'
import { workspaceResultSections } from '../../../shared/readings/result-rows'

/**
 * A hand-built L5-S1 segment: S1's endplate horizontal, 40 px deep, anterior to +x; L5 shifted
 * 10 px forward, so the Taillard slip is 10/40 = 25 % (Butt & Saifuddin 2005 [V], reference §3)
 * and L5 is tilted by 10° against S1 (lordosis).
 */
function segment(): Record<string, PixelPoint> {
  const tilt = (10 * Math.PI) / 180
  const rotate = ([x, y]: PixelPoint): PixelPoint => [
    10 + x * Math.cos(tilt) + y * Math.sin(tilt),
    90 - x * Math.sin(tilt) + y * Math.cos(tilt),
  ]
  return {
    'S1.ps': [0, 100],
    'S1.as': [40, 100],
    'S1.pw': [-6, 140],
    'L5.pi': [10, 90],
    'L5.ai': rotate([40, 0]),
    'L5.ps': rotate([0, -30]),
    'L5.as': rotate([40, -30]),
  }
}

describe('workspaceResultSections', () => {
  const points = segment()
  const doc = { mmPerPixel: 0.5, points }
  const sections = workspaceResultSections({
    template: 'slip-grade',
    options: { segment: 'L5-S1' },
    primary: {
      measurements: computeMeasurements(doc),
      uncertainty: computeUncertainty(doc),
      spacingSource: 'manual',
    },
    paired: null,
    motion: null,
  })
  const rows = sections.flatMap((section) => section.rows)

  it('gives every value its unit (product design: every number carries its unit)', () => {
    for (const row of rows) {
      expect(row.value).toMatch(/(%|°| mm| px)$|^Grade [IV]+$|^—$|^none/)
    }
  })

  it('grades 25.0 % as Meyerding I (upper-inclusive boundary, reference §3) and shows the rule', () => {
    expect(rows.find((row) => row.id === 'L5-S1-grade')?.value).toBe('Grade I')
    expect(sections[0]?.rule).toContain('≤ 25 I')
    // On a boundary, the neighbouring grade has about half the probability: borderline.
    expect(sections[0]?.flags.map((flag) => flag.id)).toContain('L5-S1-borderline')
  })

  it('shows the calibration source beside every mm value and a 95 % interval beside each value', () => {
    for (const row of rows.filter((candidate) => candidate.value.endsWith(' mm'))) {
      expect(row.calibration).toBe('manual calibration')
    }
    expect(rows.find((row) => row.id === 'L5-S1-slip')?.interval).toMatch(/^± \d+\.\d %$/)
  })
})
