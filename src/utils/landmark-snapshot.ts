import type { PixelPoint } from '@shared/types/landmarks'
import type { SuggestionAcceptance } from '@shared/types/readings'

/** Which film of the reading: the image, or the paired (extension) image of a motion pair. */
export type FilmSide = 'primary' | 'paired'

export type PointMap = Record<string, PixelPoint>

/** Everything one Undo step brings back: both films' landmarks and their suggestion records. */
export interface LandmarkSnapshot {
  points: PointMap
  pairedPoints: PointMap
  accepted: SuggestionAcceptance
  pairedAccepted: SuggestionAcceptance
}

/** A copy that shares no arrays with the original, so a later edit cannot reach back into it. */
export function copyPoints(points: PointMap): PointMap {
  const copy: PointMap = {}
  for (const [name, [x, y]] of Object.entries(points)) copy[name] = [x, y]
  return copy
}

export function copySnapshot(state: LandmarkSnapshot): LandmarkSnapshot {
  return {
    points: copyPoints(state.points),
    pairedPoints: copyPoints(state.pairedPoints),
    accepted: { ...state.accepted },
    pairedAccepted: { ...state.pairedAccepted },
  }
}

function samePoints(a: PointMap, b: PointMap): boolean {
  const names = Object.keys(a)
  if (names.length !== Object.keys(b).length) return false
  return names.every((name) => {
    const other = b[name]
    const mine = a[name] as PixelPoint
    return other !== undefined && other[0] === mine[0] && other[1] === mine[1]
  })
}

function sameAcceptance(a: SuggestionAcceptance, b: SuggestionAcceptance): boolean {
  const names = Object.keys(a)
  return names.length === Object.keys(b).length && names.every((name) => a[name] === b[name])
}

/** True when nothing an Undo step would restore differs (exact coordinates, no tolerance). */
export function sameSnapshot(a: LandmarkSnapshot, b: LandmarkSnapshot): boolean {
  return (
    samePoints(a.points, b.points) &&
    samePoints(a.pairedPoints, b.pairedPoints) &&
    sameAcceptance(a.accepted, b.accepted) &&
    sameAcceptance(a.pairedAccepted, b.pairedAccepted)
  )
}
