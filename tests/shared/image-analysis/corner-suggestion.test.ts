/**
 * The corner detector against corners whose position is known exactly: a wedge rendered with
 * its exact area coverage per pixel (each pixel square clipped by the wedge's two half-planes,
 * Sutherland & Hodgman 1974, area by the shoelace formula), so the apex sits at a known
 * sub-pixel position. Pixel centres are at integer coordinates (the landmark convention).
 */
import { describe, expect, it } from 'vitest'
import { suggestCorner } from '../../../shared/image-analysis/corner-suggestion'
import { mulberry32 } from '../support/seeded-random'

type Xy = [number, number]

/** Clips a convex polygon to the half-plane (p − origin)·normal ≥ 0. */
function clip(polygon: Xy[], origin: Xy, normal: Xy): Xy[] {
  const side = ([x, y]: Xy) => (x - origin[0]) * normal[0] + (y - origin[1]) * normal[1]
  const out: Xy[] = []
  polygon.forEach((current, i) => {
    const next = polygon[(i + 1) % polygon.length] as Xy
    const a = side(current)
    const b = side(next)
    if (a >= 0) out.push(current)
    if (a >= 0 !== b >= 0) {
      const t = a / (a - b)
      out.push([current[0] + t * (next[0] - current[0]), current[1] + t * (next[1] - current[1])])
    }
  })
  return out
}

function area(polygon: Xy[]): number {
  let twice = 0
  polygon.forEach(([x, y], i) => {
    const [nx, ny] = polygon[(i + 1) % polygon.length] as Xy
    twice += x * ny - nx * y
  })
  return Math.abs(twice) / 2
}

/**
 * A bright wedge on a dark ground: its apex at `apex`, its two edges leaving it at `firstDeg`
 * and `secondDeg` (image angles, y down), the wedge between them. 16-bit pixels.
 */
function renderWedge(
  size: number,
  apex: Xy,
  firstDeg: number,
  secondDeg: number,
  noiseSd = 0,
): { width: number; height: number; pixels: Uint16Array } {
  const direction = (deg: number): Xy => [
    Math.cos((deg * Math.PI) / 180),
    Math.sin((deg * Math.PI) / 180),
  ]
  const [d1, d2] = [direction(firstDeg), direction(secondDeg)]
  // Inward normals: each edge's normal that points toward the other edge.
  const inward = (d: Xy, other: Xy): Xy => {
    const n: Xy = [-d[1], d[0]]
    return n[0] * other[0] + n[1] * other[1] >= 0 ? n : [d[1], -d[0]]
  }
  const n1 = inward(d1, d2)
  const n2 = inward(d2, d1)
  const random = mulberry32(99)
  const pixels = new Uint16Array(size * size)
  for (let y = 0; y < size; y++) {
    for (let x = 0; x < size; x++) {
      const square: Xy[] = [
        [x - 0.5, y - 0.5],
        [x + 0.5, y - 0.5],
        [x + 0.5, y + 0.5],
        [x - 0.5, y + 0.5],
      ]
      const covered = area(clip(clip(square, apex, n1), apex, n2))
      const gaussian =
        Math.sqrt(-2 * Math.log(1 - random())) * Math.cos(2 * Math.PI * random()) * noiseSd
      const value = 12000 + covered * 36000 + gaussian * 65535
      pixels[y * size + x] = Math.max(0, Math.min(65535, Math.round(value)))
    }
  }
  return { width: size, height: size, pixels }
}

describe('suggestCorner on an exactly rendered corner', () => {
  const cases: Array<[string, Xy, number, number]> = [
    ['a right angle', [30.37, 28.81], 0, 90],
    ['an obtuse corner like a vertebral body rim (100°)', [31.62, 29.14], -10, 90],
    ['an acute corner (70°), turned', [29.08, 30.55], 25, 95],
    ['a corner opening up and left', [30.5, 30.5], 180, 270],
  ]
  it.each(cases)('finds %s within 0.25 px from a click 6 px away', (_name, apex, first, second) => {
    const image = renderWedge(64, apex, first, second)
    const found = suggestCorner(image, [apex[0] + 4.2, apex[1] - 4.5], { radiusPx: 12 })
    expect(found).not.toBeNull()
    expect(found!.refined).toBe(true)
    expect(Math.hypot(found!.x - apex[0], found!.y - apex[1])).toBeLessThan(0.25)
  })

  it('stays within 0.25 px under 1 % detector noise', () => {
    const apex: Xy = [32.3, 31.7]
    const image = renderWedge(64, apex, -8, 95, 0.01)
    const found = suggestCorner(image, [apex[0] - 5, apex[1] + 3], { radiusPx: 12 })
    expect(Math.hypot(found!.x - apex[0], found!.y - apex[1])).toBeLessThan(0.25)
  })

  it('suggests nothing on a flat film, or for a click off the film', () => {
    const flat = { width: 40, height: 40, pixels: new Uint16Array(1600).fill(20000) }
    expect(suggestCorner(flat, [20, 20], { radiusPx: 8 })).toBeNull()
    const image = renderWedge(40, [20, 20], 0, 90)
    expect(suggestCorner(image, [-3, 20], { radiusPx: 8 })).toBeNull()
    expect(suggestCorner(image, [20, 20], { radiusPx: 0 })).toBeNull()
  })

  it('looks only within the radius: a click far along an edge does not jump to the corner', () => {
    const apex: Xy = [20.2, 20.6]
    const image = renderWedge(80, apex, 0, 90)
    const click: Xy = [60, 21]
    const found = suggestCorner(image, click, { radiusPx: 6 })
    const placed: Xy = found ? [found.x, found.y] : click
    expect(Math.hypot(placed[0] - apex[0], placed[1] - apex[1])).toBeGreaterThan(30)
    expect(suggestCorner(image, [24, 24], { radiusPx: 8 })?.distancePx).toBeLessThan(8)
  })
})
