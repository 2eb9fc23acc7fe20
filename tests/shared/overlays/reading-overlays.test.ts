import { describe, expect, it } from 'vitest'
import type { PixelPoint } from '../../../shared/types/landmarks'
import { READING_TEMPLATES } from '../../../shared/types/domain'
import { computeMeasurements } from '../../../shared/measurement'
import {
  OVERLAY_BUILDERS,
  lateralOverlayShapes,
  overlayNumberText,
  readingOverlayShapes,
  type OverlayShape,
} from '../../../shared/overlays'

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

const byId = (shapes: OverlayShape[], id: string) => shapes.find((shape) => shape.id === id)

describe('readingOverlayShapes', () => {
  const points = segment()
  const results = computeMeasurements({ mmPerPixel: 0.5, points })
  const shapes = readingOverlayShapes('slip-grade', points, results)

  it('draws the slip offset along the lower endplate, as long as the Taillard slip', () => {
    const offset = byId(shapes, 'slip-L5-S1')
    expect(offset?.kind).toBe('line')
    const [x1, y1, x2, y2] = offset?.kind === 'line' ? offset.points : []
    expect(Math.hypot(x2! - x1!, y2! - y1!)).toBeCloseTo(10, 9)
    const label = byId(shapes, 'slip-label-L5-S1')
    expect(label?.kind === 'label' && label.text).toBe('slip 25.0 %')
  })

  it('colours by kind of line: endplates, walls and the slip, pelvic lines', () => {
    const category = (id: string) => byId(shapes, id)?.category
    expect(category('endplate-sup-L5')).toBe('endplate')
    expect(category('endplate-sup-S1')).toBe('endplate')
    expect(category('wall-L5')).toBe('wall')
    expect(category('slip-L5-S1')).toBe('wall')
    const withHips = { ...points, FH1: [60, 220] as PixelPoint }
    const pelvic = readingOverlayShapes(
      'lumbar-alignment',
      withHips,
      computeMeasurements({ points: withHips }),
    ).filter((shape) => shape.category === 'pelvic')
    expect(pelvic.map((shape) => shape.id)).toEqual(
      expect.arrayContaining(['sacral-plate', 'sacral-perpendicular', 'hip-axis-line', 'head-FH1']),
    )
  })

  it('puts the caudal perpendicular of the sacral plate at right angles to it (Legaye et al. 1998)', () => {
    const withHips = { ...points, FH1: [60, 220] as PixelPoint }
    const drawn = lateralOverlayShapes(withHips, computeMeasurements({ points: withHips }))
    const plate = byId(drawn, 'sacral-plate')
    const normal = byId(drawn, 'sacral-perpendicular')
    if (plate?.kind !== 'line' || normal?.kind !== 'line') throw new Error('lines missing')
    const [px1, py1, px2, py2] = plate.points as [number, number, number, number]
    const [nx1, ny1, nx2, ny2] = normal.points as [number, number, number, number]
    expect((px2 - px1) * (nx2 - nx1) + (py2 - py1) * (ny2 - ny1)).toBeCloseTo(0, 9)
    // Caudal: image y grows downwards.
    expect(ny2).toBeGreaterThan(ny1)
    // It starts at the midpoint of S1's endplate.
    expect([nx1, ny1]).toEqual([20, 100])
  })

  it('labels the segmental lordosis arc with the engine value and its unit', () => {
    const label = byId(shapes, 'lordosis-label-L5-S1')
    expect(label?.kind === 'label' && label.text).toBe(
      `L5-S1 ${results.segments['L5-S1']!.segmentalLordosisDeg!.toFixed(1)}°`,
    )
    const arc = byId(shapes, 'lordosis-arc-L5-S1')
    // The hand-built tilt is 10° (Cobb angle between the two endplates).
    expect(arc?.kind === 'arc' && arc.angleDeg).toBeCloseTo(10, 6)
  })

  it('marks a cage surface from its posterior to its anterior point, and a disc replacement marker', () => {
    const drawn = lateralOverlayShapes(
      {
        ...points,
        'cage.L5-S1.sup.p': [12, 92],
        'cage.L5-S1.sup.a': [38, 88],
        'implant.L4-L5.marker': [30, 40],
      },
      null,
    )
    expect(byId(drawn, 'cage-L5-S1-sup')).toMatchObject({
      kind: 'line',
      category: 'implant',
      points: [12, 92, 38, 88],
    })
    expect(byId(drawn, 'marker-implant.L4-L5.marker')).toMatchObject({
      kind: 'ring',
      center: [30, 40],
    })
  })

  it('draws nothing for landmarks that do not make a line yet', () => {
    expect(readingOverlayShapes('slip-grade', { 'L5.as': [1, 1] }, null)).toEqual([])
  })

  it('has a builder for every reading template', () => {
    for (const template of READING_TEMPLATES)
      expect(typeof OVERLAY_BUILDERS[template]).toBe('function')
  })
})

describe('overlayNumberText', () => {
  it('writes a true minus, drops the sign of a value that rounds to zero, and keeps the unit', () => {
    expect(overlayNumberText(-4.26, 1, '°')).toBe('−4.3°')
    expect(overlayNumberText(-0.04, 1, '%')).toBe('0.0 %')
    expect(overlayNumberText(12, 1, 'mm')).toBe('12.0 mm')
    expect(overlayNumberText(null, 1, '%')).toBeNull()
    expect(overlayNumberText(Number.NaN, 1, '%')).toBeNull()
  })
})
