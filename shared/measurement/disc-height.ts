import { pointMidpoint } from '../geometry/point'
import type { Point } from '../geometry/types'
import { vectorLength, vectorSubtract } from '../geometry/vector'

/**
 * Point-to-point disc heights of a segment, in the unit and space of the points (pixels of the
 * image grid, or mm after `pointPxToMm`): anterior |U.ai − W.as|, posterior |U.pi − W.ps|,
 * middle |mid(U.pi, U.ai) − mid(W.ps, W.as)|, mean = (anterior + posterior)/2, the two-point
 * method (Dabbs & Dabbs 1990, Spine 15:1366 [M]; compared in Spahn et al. 2024 [V]).
 */
export function discHeights(
  upperPi: Point,
  upperAi: Point,
  lowerPs: Point,
  lowerAs: Point,
): { anterior: number; middle: number; posterior: number; mean: number } {
  const anterior = vectorLength(vectorSubtract(upperAi, lowerAs))
  const posterior = vectorLength(vectorSubtract(upperPi, lowerPs))
  const middle = vectorLength(
    vectorSubtract(pointMidpoint(upperPi, upperAi), pointMidpoint(lowerPs, lowerAs)),
  )
  return { anterior, middle, posterior, mean: (anterior + posterior) / 2 }
}
