import { describe, expect, it } from 'vitest'
import { blandAltmanChart } from '@/components/rounds/bland-altman-chart'

// Hand-computed example (common practice: the plot of Bland & Altman 1986, Lancet i:307, Fig. 2,
// puts each subject at the mean of the two methods against their difference, with lines at the
// mean difference and at mean ± 1.96 SD). Three films rated 10/12, 20/19 and 30/32:
// means 11, 19.5, 31; differences −2, 1, −2; bias −1; SD √3 ≈ 1.7321;
// limits −1 ± 1.96·1.7321 = −4.3948 and 2.3948.
const pair = {
  bias: -1,
  lower: -1 - 1.96 * Math.sqrt(3),
  upper: -1 + 1.96 * Math.sqrt(3),
  points: [
    { mean: 11, difference: -2 },
    { mean: 19.5, difference: 1 },
    { mean: 31, difference: -2 },
  ],
}

describe('blandAltmanChart', () => {
  const chart = blandAltmanChart(pair)

  it('puts each film at (mean, difference)', () => {
    expect(chart.points).toEqual([
      { x: 11, y: -2 },
      { x: 19.5, y: 1 },
      { x: 31, y: -2 },
    ])
  })

  it('pads the range of means by 8 % of its span on each side', () => {
    // Span 31 − 11 = 20; 8 % of it is 1.6.
    expect(chart.x.min).toBeCloseTo(9.4, 10)
    expect(chart.x.max).toBeCloseTo(32.6, 10)
  })

  it('draws bias and limits as horizontal lines across the plotted means', () => {
    expect(chart.bias).toEqual([
      { x: chart.x.min, y: -1 },
      { x: chart.x.max, y: -1 },
    ])
    expect(chart.lower[0].y).toBeCloseTo(-4.3948, 4)
    expect(chart.upper[1].y).toBeCloseTo(2.3948, 4)
    expect(chart.lower[0].x).toBe(chart.x.min)
    expect(chart.upper[1].x).toBe(chart.x.max)
  })

  it('keeps both limits and zero inside the y range', () => {
    // Values −4.3948 … 2.3948, span 6.7897, pad 0.5432.
    expect(chart.y.min).toBeCloseTo(-4.3948 - 0.5432, 3)
    expect(chart.y.max).toBeCloseTo(2.3948 + 0.5432, 3)
  })

  it('gives a single film one unit either side rather than an empty axis', () => {
    const single = blandAltmanChart({
      bias: 0,
      lower: 0,
      upper: 0,
      points: [{ mean: 5, difference: 0 }],
    })
    expect(single.x).toEqual({ min: 4, max: 6 })
    expect(single.y).toEqual({ min: -1, max: 1 })
  })
})
