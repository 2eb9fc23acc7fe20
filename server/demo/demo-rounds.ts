/**
 * The demo's re-reading rounds: an inter-rater round of the study's twelve lateral films read by
 * both demo fellows and a demo surgeon, complete, and an intra-rater round of the same films by
 * one fellow, first pass done and the repeat half done. Readings are the phantoms' exact
 * landmarks plus seeded placement noise of the size reported for hand-placed landmarks.
 */
import type { PixelPoint } from '../../shared/types/landmarks'
import { seededRandom } from '../phantom/seeded-random'

/**
 * Placement noise, mm SD per axis and landmark. Between raters: 1.0 mm, the first-order
 * propagation example of measurement-literature §10 (σ = 1 mm) and in line with the
 * inter-observer slip variation of 1.3 mm (SD 1.1) for L5 olisthesis (Eur J Radiol
 * 1994;18:227–231). Within a rater: 0.75 mm, scaled by the same study's intra- to
 * inter-observer ratio (1.0 mm against 1.3 mm).
 */
export const INTER_RATER_SIGMA_MM = 1.0
export const INTRA_RATER_SIGMA_MM = 0.75

export const DEMO_ROUNDS = {
  manager: 'anselm.greaves@endplate.example',
  inter: {
    name: 'Alignment re-read, three raters',
    seed: 'demo-inter-2026',
    raters: [
      'priya.lindqvist@endplate.example',
      'jonah.ferris@endplate.example',
      'rhea.calloway@endplate.example',
    ],
  },
  intra: {
    name: 'Alignment repeat reading, one fellow',
    seed: 'demo-intra-2026',
    rater: 'jonah.ferris@endplate.example',
    gapDays: 14,
    /** The first pass was read this many days before the demo starts, so the repeat is open. */
    firstPassDaysAgo: 20,
    /** Repeat readings already made (of twelve). */
    repeatsDone: 6,
  },
} as const

/** Two standard normal draws from two uniforms (Box & Muller 1958). */
function gaussianPair(random: () => number): [number, number] {
  const u = Math.max(random(), Number.EPSILON)
  const v = random()
  const radius = Math.sqrt(-2 * Math.log(u))
  return [radius * Math.cos(2 * Math.PI * v), radius * Math.sin(2 * Math.PI * v)]
}

/** The exact landmarks moved by independent normal noise of `sigmaMm` in each axis, reproducibly. */
export function placedWithNoise(
  truth: Record<string, PixelPoint>,
  names: readonly string[],
  sigmaMm: number,
  mmPerPixel: readonly [row: number, column: number],
  seed: number,
): Record<string, PixelPoint> {
  const random = seededRandom(seed)
  const placed: Record<string, PixelPoint> = {}
  for (const name of names) {
    const point = truth[name]
    if (!point) continue
    const [dx, dy] = gaussianPair(random)
    // x runs along columns, y along rows: each axis in its own pixel size.
    placed[name] = [
      point[0] + (dx * sigmaMm) / mmPerPixel[1],
      point[1] + (dy * sigmaMm) / mmPerPixel[0],
    ]
  }
  return placed
}
