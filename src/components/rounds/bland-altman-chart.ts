/**
 * What a Bland–Altman plot of one pair of raters draws: each target at (mean of the two,
 * first minus second), and horizontal lines at the bias and the 95 % limits of agreement
 * (Bland & Altman 1986), across the plotted range of means.
 */
export interface PlotPoint {
  x: number
  y: number
}

export interface BlandAltmanChart {
  points: PlotPoint[]
  bias: [PlotPoint, PlotPoint]
  lower: [PlotPoint, PlotPoint]
  upper: [PlotPoint, PlotPoint]
  x: { min: number; max: number }
  y: { min: number; max: number }
}

export interface BlandAltmanPairInput {
  bias: number
  lower: number
  upper: number
  points: Array<{ mean: number; difference: number }>
}

/** Margin on each side of the data, as a share of its span. */
const MARGIN = 0.08

/** A padded range around values; a single value gets one unit either side. */
function paddedRange(values: number[]): { min: number; max: number } {
  const low = Math.min(...values)
  const high = Math.max(...values)
  const span = high - low
  const pad = span > 0 ? span * MARGIN : 1
  return { min: low - pad, max: high + pad }
}

export function blandAltmanChart(pair: BlandAltmanPairInput): BlandAltmanChart {
  const points = pair.points.map((point) => ({ x: point.mean, y: point.difference }))
  const x = paddedRange(points.map((point) => point.x))
  const y = paddedRange([...points.map((point) => point.y), pair.lower, pair.upper, 0])
  const across = (value: number): [PlotPoint, PlotPoint] => [
    { x: x.min, y: value },
    { x: x.max, y: value },
  ]
  return {
    points,
    bias: across(pair.bias),
    lower: across(pair.lower),
    upper: across(pair.upper),
    x,
    y,
  }
}
