/**
 * Rigid and similarity transforms of landmark documents for the invariance properties, written
 * with mathjs matrices so the tests do not borrow the engine's geometry.
 */
import { add, multiply, subtract } from 'mathjs'
import type { Xy } from './reference-math'

export interface TestDocument {
  mmPerPixel?: number | [number, number] | null
  points: Record<string, Xy>
}

function mapPoints(doc: TestDocument, map: (point: Xy) => Xy): TestDocument {
  const points: Record<string, Xy> = {}
  for (const [name, point] of Object.entries(doc.points)) points[name] = map(point)
  return { ...doc, points }
}

/** Rotation by `deg` about `centre` in image coordinates (clockwise on screen for deg > 0). */
export function rotateDocument(doc: TestDocument, deg: number, centre: Xy): TestDocument {
  const r = (deg * Math.PI) / 180
  const matrix = [
    [Math.cos(r), -Math.sin(r)],
    [Math.sin(r), Math.cos(r)],
  ]
  return mapPoints(doc, (point) => add(multiply(matrix, subtract(point, centre)), centre) as Xy)
}

/** Left–right mirror about the vertical line x = axisX. */
export function mirrorDocument(doc: TestDocument, axisX: number): TestDocument {
  return mapPoints(doc, ([x, y]) => [2 * axisX - x, y])
}

export function translateDocument(doc: TestDocument, offset: Xy): TestDocument {
  return mapPoints(doc, (point) => add(point, offset) as Xy)
}

/** Scales the image by `factor` and the spacing by 1/factor, so physical sizes are unchanged. */
export function scaleDocument(doc: TestDocument, factor: number): TestDocument {
  const scaled = mapPoints(doc, (point) => multiply(point, factor) as Xy)
  const spacing = doc.mmPerPixel
  if (typeof spacing === 'number') return { ...scaled, mmPerPixel: spacing / factor }
  if (Array.isArray(spacing))
    return { ...scaled, mmPerPixel: [spacing[0] / factor, spacing[1] / factor] }
  return scaled
}
