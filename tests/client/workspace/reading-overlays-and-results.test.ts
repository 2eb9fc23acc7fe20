import { describe, expect, it } from 'vitest'
import type { PixelPoint } from '../../../shared/types/landmarks'
import { computeMeasurements, computeUncertainty } from '../../../shared/measurement'
import { readingOverlayShapes } from '../../../src/components/workspace/reading-overlay-shapes'
import { workspaceResultSections } from '../../../src/components/workspace/reading-results-rows'

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

describe('readingOverlayShapes', () => {
  const points = segment()
  const results = computeMeasurements({ mmPerPixel: 0.5, points })
  const shapes = readingOverlayShapes(points, results)

  it('draws the slip offset along the lower endplate, as long as the Taillard slip', () => {
    const offset = shapes.find((shape) => shape.id === 'slip-L5-S1')
    expect(offset?.kind).toBe('line')
    const [x1, y1, x2, y2] = offset?.kind === 'line' ? offset.points : []
    expect(Math.hypot(x2! - x1!, y2! - y1!)).toBeCloseTo(10, 9)
    const label = shapes.find((shape) => shape.id === 'slip-label-L5-S1')
    expect(label?.kind === 'label' && label.text).toBe('slip 25.0 %')
  })

  it('colours by kind of line: endplates, walls and the slip, pelvic lines', () => {
    const category = (id: string) => shapes.find((shape) => shape.id === id)?.category
    expect(category('endplate-sup-L5')).toBe('endplate')
    expect(category('endplate-sup-S1')).toBe('endplate')
    expect(category('wall-L5')).toBe('wall')
    expect(category('slip-L5-S1')).toBe('wall')
    const withHips = readingOverlayShapes(
      { ...points, FH1: [60, 220] },
      computeMeasurements({ points: { ...points, FH1: [60, 220] } }),
    )
    expect(
      withHips.filter((shape) => shape.category === 'pelvic').map((shape) => shape.id),
    ).toEqual(
      expect.arrayContaining(['sacral-plate', 'sacral-perpendicular', 'hip-axis-line', 'head-FH1']),
    )
  })

  it('labels the segmental lordosis arc with the engine value and its unit', () => {
    const label = shapes.find((shape) => shape.id === 'lordosis-label-L5-S1')
    expect(label?.kind === 'label' && label.text).toBe(
      `L5-S1 ${results.segments['L5-S1']!.segmentalLordosisDeg!.toFixed(1)}°`,
    )
    const arc = shapes.find((shape) => shape.id === 'lordosis-arc-L5-S1')
    expect(arc?.kind === 'arc' && arc.angleDeg).toBeCloseTo(10, 6)
  })

  it('draws nothing for landmarks that do not make a line yet', () => {
    expect(readingOverlayShapes({ 'L5.as': [1, 1] }, null)).toEqual([])
  })
})

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
