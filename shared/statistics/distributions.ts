// Thin, typed wrappers over the @stdlib distribution functions, so the rest of the module names
// the quantity it wants (a quantile, an upper-tail probability) rather than a library call.
import betainc from '@stdlib/math-base-special-betainc'
import fQuantileStdlib from '@stdlib/stats-base-dists-f-quantile'
import tQuantileStdlib from '@stdlib/stats-base-dists-t-quantile'
import normalQuantileStdlib from '@stdlib/stats-base-dists-normal-quantile'

/** The p-quantile of the F distribution with (df1, df2) degrees of freedom. */
export function fQuantile(p: number, df1: number, df2: number): number {
  return fQuantileStdlib(p, df1, df2)
}

/**
 * P(F ≥ f) for F ~ F(df1, df2): the p-value of an upper-tailed F test; 0 for f = +∞. Taken as
 * the regularized incomplete beta I_x(df2/2, df1/2) with x = df2 / (df2 + df1·f) rather than
 * 1 − CDF, which loses every digit once p falls below about 1e-16.
 */
export function fUpperTail(f: number, df1: number, df2: number): number {
  if (f === Infinity) return 0
  if (f <= 0) return 1
  return betainc(df2 / (df2 + df1 * f), df2 / 2, df1 / 2)
}

/** The p-quantile of Student's t distribution with df degrees of freedom. */
export function tQuantile(p: number, df: number): number {
  return tQuantileStdlib(p, df)
}

/** The p-quantile of the standard normal distribution. */
export function standardNormalQuantile(p: number): number {
  return normalQuantileStdlib(p, 0, 1)
}
