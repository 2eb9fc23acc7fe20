import { describe, expect, it } from 'vitest'
import { reportFilmCrop } from '../../../shared/reports/film-crop'

const inside = (crop: ReturnType<typeof reportFilmCrop>, width: number, height: number) =>
  crop.x >= 0 && crop.y >= 0 && crop.x + crop.width <= width && crop.y + crop.height <= height

describe('reportFilmCrop', () => {
  it('shows the whole film when nothing is drawn', () => {
    expect(reportFilmCrop([], {}, 3000, 2500)).toEqual({ x: 0, y: 0, width: 3000, height: 2500 })
  })

  it('frames one segment with a margin, at least 30 % of the film, in a readable aspect', () => {
    const points = { 'L5.pi': [1500, 1300], 'S1.as': [1620, 1360], 'S1.ps': [1480, 1330] } as const
    const crop = reportFilmCrop([], points, 3000, 2500)
    expect(inside(crop, 3000, 2500)).toBe(true)
    expect(Math.max(crop.width, crop.height)).toBeGreaterThanOrEqual(0.3 * 3000)
    expect(crop.width / crop.height).toBeGreaterThanOrEqual(0.75)
    expect(crop.width / crop.height).toBeLessThanOrEqual(1.6)
    for (const [x, y] of Object.values(points)) {
      expect(x).toBeGreaterThan(crop.x)
      expect(y).toBeGreaterThan(crop.y)
      expect(x).toBeLessThan(crop.x + crop.width)
      expect(y).toBeLessThan(crop.y + crop.height)
    }
    expect(Number.isInteger(crop.x) && Number.isInteger(crop.width)).toBe(true)
  })

  it('stays inside the film for landmarks at its edge', () => {
    const crop = reportFilmCrop([], { a: [2, 3], b: [40, 60] }, 800, 600)
    expect(inside(crop, 800, 600)).toBe(true)
    expect(crop.x).toBe(0)
    expect(crop.y).toBe(0)
  })
})
