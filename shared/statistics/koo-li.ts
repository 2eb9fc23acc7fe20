/**
 * Reliability bands of Koo & Li (2016, J Chiropr Med 15:155) [V]: below 0.50 poor, 0.50 to
 * 0.75 moderate, 0.75 to 0.90 good, above 0.90 excellent. The paper gives the cut points, not
 * which side a value exactly on one belongs to; here each cut point opens the band above it,
 * except 0.90, which is still good ("greater than 0.90" is excellent).
 */
export type KooLiBand = 'poor' | 'moderate' | 'good' | 'excellent'

/**
 * The band of one ICC value (dimensionless), or null for a value that is not defined (NaN: an
 * interval the approximation cannot give), which belongs to no band.
 */
export function kooLiBand(icc: number): KooLiBand | null {
  if (Number.isNaN(icc)) return null
  if (icc < 0.5) return 'poor'
  if (icc < 0.75) return 'moderate'
  if (icc <= 0.9) return 'good'
  return 'excellent'
}

export interface KooLiInterpretation {
  /** Band of the point estimate (null when it is not defined). */
  estimate: KooLiBand | null
  /**
   * Bands of the confidence bounds: Koo & Li ask for the interpretation to rest on the interval
   * (null when the interval is not defined).
   */
  lower: KooLiBand | null
  upper: KooLiBand | null
  /** "good", "moderate to excellent" when the interval spans bands, or "not defined". */
  summary: string
}

/** Koo & Li's reading of an ICC with its confidence interval. */
export function kooLiInterpretation(estimate: {
  icc: number
  lower: number
  upper: number
}): KooLiInterpretation {
  const lower = kooLiBand(estimate.lower)
  const upper = kooLiBand(estimate.upper)
  return {
    estimate: kooLiBand(estimate.icc),
    lower,
    upper,
    summary:
      lower === null || upper === null
        ? 'not defined'
        : lower === upper
          ? lower
          : `${lower} to ${upper}`,
  }
}
