/**
 * Complementary error function, erfc(x), by the Chebyshev-fitted rational approximation
 * "erfcc" of Numerical Recipes (Press et al., 2nd ed., §6.2 [M]); fractional error below
 * 1.2e-7 for every real x, which is far below what a 10 % borderline rule can resolve.
 */
export function erfc(x: number): number {
  const z = Math.abs(x)
  const t = 1 / (1 + 0.5 * z)
  const polynomial =
    -1.26551223 +
    t *
      (1.00002368 +
        t *
          (0.37409196 +
            t *
              (0.09678418 +
                t *
                  (-0.18628806 +
                    t *
                      (0.27886807 +
                        t *
                          (-1.13520398 + t * (1.48851587 + t * (-0.82215223 + t * 0.17087277))))))))
  const value = t * Math.exp(-z * z + polynomial)
  return x >= 0 ? value : 2 - value
}

/**
 * P(X ≤ x) for X ~ N(mean, sd²), dimensionless; `x`, `mean` and `sd` share one unit. With
 * sd = 0 the distribution is a point mass: 1 for x ≥ mean, else 0.
 */
export function normalCdf(x: number, mean: number, sd: number): number {
  if (sd === 0) return x >= mean ? 1 : 0
  return 0.5 * erfc(-(x - mean) / (sd * Math.SQRT2))
}
