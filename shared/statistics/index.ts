/**
 * Reliability statistics for re-reading studies: intraclass correlation, measurement error,
 * Bland–Altman limits of agreement and weighted kappa. Pure functions, no I/O.
 *
 * No npm package computes the intraclass correlation coefficient (the registry has none for the
 * Shrout & Fleiss / McGraw & Wong forms), so the ANOVA and the six forms are written here; the F,
 * t and normal distributions come from the @stdlib packages, and means and SDs from
 * simple-statistics. The tests check every form against Shrout & Fleiss (1979) Table 2 and
 * against R's psych package.
 *
 * Layout everywhere: rows = targets (the films rated), columns = raters (or repeated readings of
 * one rater); each value in the measure's unit; null = missing, and a target with any missing
 * value is left out and counted as excluded.
 */
export { completeTargets, type CompleteRatings, type RatingTable } from './rating-table'
export { StatisticsInputError, type NotEnoughData } from './statistics-input-error'
export { twoWayMeanSquares, type MeanSquares } from './two-way-anova'
export {
  ICC_FORM_DESCRIPTIONS,
  ICC_FORMS,
  iccFormsFromMeanSquares,
  intraclassCorrelations,
  MIN_TARGETS,
  type IccAnalysis,
  type IccEstimate,
  type IccForm,
  type IccOptions,
} from './icc'
export { kooLiBand, kooLiInterpretation, type KooLiBand, type KooLiInterpretation } from './koo-li'
export { MDC95_Z, measurementError, type MeasurementError } from './measurement-error'
export {
  blandAltman,
  LIMITS_SD_MULTIPLIER,
  type BlandAltmanOptions,
  type BlandAltmanResult,
  type Interval,
} from './bland-altman'
export {
  kappaWeights,
  weightedKappa,
  weightedKappaFromTable,
  type KappaOptions,
  type KappaResult,
  type KappaWeighting,
} from './weighted-kappa'
export { analyseReliability, type ReliabilityAnalysis } from './reliability'
