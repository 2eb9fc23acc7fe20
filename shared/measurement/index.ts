export { computeMeasurements } from './compute-measurements'
export { computeUncertainty, meyerdingUncertainty } from './uncertainty'
export {
  BORDERLINE_PROBABILITY,
  DEFAULT_SIGMA_MM,
  DEFAULT_SIGMA_PX,
  Z_95,
  type UncertaintyOptions,
} from './uncertainty'
export { computeMotionPair, instabilityCriteria, INSTABILITY_CRITERIA } from './motion-pair'
export {
  computeSubsidence,
  DEFAULT_SUBSIDENCE_THRESHOLD_MM,
  subsidenceFromDiscHeightsMm,
  type SubsidenceOptions,
} from './subsidence'
export {
  checkSegmentPlan,
  DYNAMIC_TRANSLATION_LIMIT_MM,
  estimatePlannedLordosis,
  RESIDUAL_DISC_HEIGHT_LIMIT_MM,
  type PlannedLordosisInput,
  type PlannedSegment,
  type SegmentPlanCheckInput,
} from './plan-checks'
export {
  DEFAULT_IMPLANT_CENTRING_THRESHOLD_MM,
  frontalImageRightSide,
  frontalSideWords,
  implantCentring,
  isImplantOffCentre,
  type FrontalImageRightSide,
  type ImplantCentringOptions,
} from './implant-centring'
export {
  parseLandmarkDocument,
  RIM_COLLINEAR_TOLERANCE,
  ZERO_LENGTH_TOLERANCE_PX,
} from './parse-landmark-document'
export { LandmarkDocumentError, type LandmarkDocumentErrorCode } from './landmark-document-error'
export {
  cagePointName,
  cornerName,
  frontalImplantName,
  frontalPointName,
  implantMarkerName,
  isKnownLandmarkName,
  KNOWN_LANDMARK_NAMES,
  rimPointName,
  SEGMENT_NAMES,
  SEGMENTS,
} from './landmark-names'
export {
  HIGH_GRADE_SLIP_PERCENT,
  isHighGradeSlip,
  MEYERDING_RULE,
  meyerdingGradeFromSlipPercent,
  roundSlipPercent,
  slipDirectionFromSlipPercent,
} from './meyerding'
export {
  PI_LL_MARKED_MISMATCH_DEG,
  PI_LL_MODERATE_MISMATCH_DEG,
  piLlBandFromMismatchDeg,
  targetLordosisDeg,
} from './alignment'
export { pelvicParameters } from './pelvis'
export { SOURCES } from './sources'
