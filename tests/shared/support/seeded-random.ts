/**
 * A small seeded PRNG for reproducible Monte Carlo checks: mulberry32 (a public-domain 32-bit
 * generator, common practice for test noise), plus Box–Muller normal deviates.
 */
export function mulberry32(seed: number): () => number {
  let state = seed >>> 0
  return () => {
    state = (state + 0x6d2b79f5) >>> 0
    let t = state
    t = Math.imul(t ^ (t >>> 15), t | 1)
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61)
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296
  }
}

/** Standard normal deviates from a uniform source (Box–Muller; u1 kept away from 0). */
export function normalSource(uniform: () => number): () => number {
  let spare: number | null = null
  return () => {
    if (spare !== null) {
      const value = spare
      spare = null
      return value
    }
    const u1 = Math.max(uniform(), Number.MIN_VALUE)
    const u2 = uniform()
    const radius = Math.sqrt(-2 * Math.log(u1))
    spare = radius * Math.sin(2 * Math.PI * u2)
    return radius * Math.cos(2 * Math.PI * u2)
  }
}
