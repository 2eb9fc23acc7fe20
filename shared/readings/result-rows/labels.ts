// Words several result sections share. The calibration-source labels beside mm values are
// the one set in shared/format/spacing-source-labels, used there directly.

/** Segmental range of motion, as the motion rows define it. */
export const ROM_DEFINITION =
  '|segmental lordosis on extension − on flexion|, the same endplates on both films'
/** Translation between the two films, as the motion rows define it. */
export const TRANSLATION_DEFINITION =
  '|slip on flexion − slip on extension| along the lower endplate (Taillard distance)'

/** Beside a px value of an uncalibrated film. */
export const UNCALIBRATED_LABEL = 'uncalibrated: film pixels'
