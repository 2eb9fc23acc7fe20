// The limits the result flags quote. Where the engine decides (a borderline grade, a high-grade
// slip, the PI − LL band), its constant is used, so the words cannot drift from the verdict.

export {
  BORDERLINE_PROBABILITY,
  HIGH_GRADE_SLIP_PERCENT,
  PI_LL_MARKED_MISMATCH_DEG,
  PI_LL_MODERATE_MISMATCH_DEG,
} from '../../measurement/index'

/**
 * Probabilities above this read "> 99 %" and below PROBABILITY_NONE_BELOW "< 1 %": rounded to
 * whole percent they would claim a certainty (100 %, 0 %) that placement error does not give.
 */
export const PROBABILITY_CERTAIN_ABOVE = 0.995
export const PROBABILITY_NONE_BELOW = 0.005
