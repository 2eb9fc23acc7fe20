import { describe, expect, it } from 'vitest'
import {
  differenceWithInterval,
  valueWithInterval,
} from '../../../shared/compare/difference-interval'
import { Z_95 } from '../../../shared/measurement'
import { mulberry32, normalSource } from '../support/seeded-random'

describe('differenceWithInterval', () => {
  it('is later minus earlier, with half-widths added in quadrature (3 and 4 give 5)', () => {
    const change = differenceWithInterval(
      { value: 10, halfWidth95: 3 },
      { value: 16.5, halfWidth95: 4 },
    )
    expect(change.value).toBeCloseTo(6.5, 12)
    expect(change.halfWidth95).toBeCloseTo(5, 12)
  })

  it('keeps the change but drops the interval when either interval is unknown', () => {
    expect(
      differenceWithInterval({ value: 2, halfWidth95: null }, { value: 5, halfWidth95: 1 }),
    ).toEqual({ value: 3, halfWidth95: null })
  })

  it('covers 95 % of the differences of two independent normal errors (seeded Monte Carlo)', () => {
    // Var(a − b) = Var(a) + Var(b) for independent a, b (any probability text); check the
    // resulting half-width against 20 000 simulated pairs.
    const normal = normalSource(mulberry32(20261201))
    const sdBefore = 2.1
    const sdAfter = 3.4
    const change = differenceWithInterval(
      { value: 0, halfWidth95: Z_95 * sdBefore },
      { value: 0, halfWidth95: Z_95 * sdAfter },
    )
    const draws = 20_000
    let inside = 0
    for (let i = 0; i < draws; i++) {
      const difference = normal() * sdAfter - normal() * sdBefore
      if (Math.abs(difference) <= (change.halfWidth95 as number)) inside += 1
    }
    // Binomial SD of the coverage at n = 20 000 is about 0.0015; allow four of them.
    expect(inside / draws).toBeGreaterThan(0.944)
    expect(inside / draws).toBeLessThan(0.956)
  })
})

describe('valueWithInterval', () => {
  it("takes half of the engine's interval and refuses missing values", () => {
    expect(valueWithInterval(4, { value: 4, standardDeviation: 1, low: 2.5, high: 5.5 })).toEqual({
      value: 4,
      halfWidth95: 1.5,
    })
    expect(valueWithInterval(4, null)).toEqual({ value: 4, halfWidth95: null })
    expect(valueWithInterval(null, null)).toBeNull()
    expect(valueWithInterval(Number.NaN, null)).toBeNull()
  })
})
