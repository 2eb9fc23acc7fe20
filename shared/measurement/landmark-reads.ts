import type { PreparedPoints } from './prepared-points'

/** The landmark names a computation read, or 'all' when it listed the points (read them all). */
export type LandmarkReads = ReadonlySet<string> | 'all'

/**
 * Runs `measure` once on points that note which landmark names it reads, in either space. A
 * measure is a pure function of the points it reads, so a landmark it did not read cannot change
 * its value: the uncertainty propagation moves only the landmarks each part of the result reads.
 */
export function landmarkReadsOf(
  measure: (prepared: PreparedPoints) => unknown,
  prepared: PreparedPoints,
): LandmarkReads {
  const names = new Set<string>()
  let listed = false
  const noting = (points: PreparedPoints['px']): PreparedPoints['px'] =>
    new Proxy(points, {
      get(target, key, receiver) {
        if (typeof key === 'string') names.add(key)
        return Reflect.get(target, key, receiver)
      },
      has(target, key) {
        if (typeof key === 'string') names.add(key)
        return Reflect.has(target, key)
      },
      ownKeys(target) {
        listed = true
        return Reflect.ownKeys(target)
      },
    })
  const px = noting(prepared.px)
  measure({
    spacing: prepared.spacing,
    px,
    work: prepared.work === prepared.px ? px : noting(prepared.work),
  })
  return listed ? 'all' : names
}
