import { fsum } from "./fsum.js";

/** Sum, mean and sample variance of a small sample, with every intermediate kept for an audit. */
export interface Spread {
  n: number;
  /** Exactly rounded sum; 0 when n = 0. */
  sum: number;
  /** sum / n; null when n = 0. */
  mean: number | null;
  /** x_i − mean, in input order (empty when n = 0). */
  deviations: number[];
  /** (x_i − mean)², in input order. */
  squared: number[];
  /** Exactly rounded Σ (x_i − mean)²; null when n = 0. */
  sum_squared: number | null;
  /**
   * (Σ (x_i − mean))² / n with the sum exactly rounded: the part of sum_squared that comes from the
   * rounding of the mean (0 when the deviations add up to 0); null when n = 0.
   */
  mean_correction: number | null;
  /** (sum_squared − mean_correction) / (n − 1); null when n < 2. */
  variance: number | null;
  /** √variance; null when n < 2. */
  sd: number | null;
}

/** The figures of a `Spread` without its per-value lists: what an audit lists after the rows. */
export type SpreadSteps = Omit<Spread, "deviations" | "squared">;

/** `s` without its per-value lists, keys in the same order. */
export function spreadSteps(s: Spread): SpreadSteps {
  return { n: s.n, sum: s.sum, mean: s.mean, sum_squared: s.sum_squared, mean_correction: s.mean_correction, variance: s.variance, sd: s.sd };
}

/**
 * Corrected two-pass sample mean and variance with exactly rounded sums, for summaries across runs.
 *
 * mean = fsum(x) / n; with deviations d_i = x_i − mean, variance = (fsum(d_i²) − fsum(d_i)² / n)
 * / (n − 1), the unbiased sample variance with n − 1 degrees of freedom. The second term removes
 * what the rounding of the mean adds to the sum of squares: values near 1e9 that differ by 1e-3
 * have deviations within 1e-4 relative of the mean's rounding, and without the term their sd kept
 * about 9 significant digits (near 1e12, about 4). The audit shows sum_squared (the sum of the
 * `squared` column) and mean_correction separately. Every sum is exactly rounded (`fsum`), so
 * reordering the values changes none of the sums, the mean or the variance: the same runs listed
 * in another order give the same interval to the last bit.
 *
 * Reference: T. F. Chan, G. H. Golub and R. J. LeVeque (1983), "Algorithms for Computing the
 * Sample Variance: Analysis and Recommendations", The American Statistician 37(3), 242–247
 * (equation 1.7, the corrected two-pass algorithm).
 *
 * Example: `spread([3, 5, 10])` gives sum 18, mean 6, deviations [−3, −1, 4], squared [9, 1, 16],
 * sum_squared 26, mean_correction 0, variance 13, sd √13 = 3.605551275463989. `spread([1e16,
 * 1e16 + 2, 1e16 + 2])` has mean 1e16 + 2 (the nearest double to 1e16 + 4/3), deviations
 * [−2, 0, 0], sum_squared 4, mean_correction 4/3 and variance 1.3333333333333335, an ulp from
 * the exact 4/3 (the uncorrected sum gives 2).
 */
export function spread(values: ArrayLike<number>): Spread {
  const n = values.length;
  const sum = fsum(values);
  if (n === 0) {
    return { n, sum, mean: null, deviations: [], squared: [], sum_squared: null, mean_correction: null, variance: null, sd: null };
  }
  const mean = sum / n;
  const deviations = Array.from(values, (x) => x - mean);
  const squared = deviations.map((d) => d * d);
  const sumSquared = fsum(squared);
  const e = fsum(deviations);
  const correction = (e * e) / n;
  const variance = n < 2 ? null : Math.max(0, sumSquared - correction) / (n - 1);
  return {
    n,
    sum,
    mean,
    deviations,
    squared,
    sum_squared: sumSquared,
    mean_correction: correction,
    variance,
    sd: variance === null ? null : Math.sqrt(variance),
  };
}
