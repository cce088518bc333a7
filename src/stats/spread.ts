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
  /** sum_squared / (n − 1); null when n < 2. */
  variance: number | null;
  /** √variance; null when n < 2. */
  sd: number | null;
}

/**
 * Two-pass sample mean and variance with exactly rounded sums, for summaries across runs.
 *
 * mean = fsum(x) / n; variance = fsum((x_i − mean)²) / (n − 1), the unbiased sample variance with
 * n − 1 degrees of freedom. Both sums are exactly rounded (`fsum`), so reordering the values
 * changes none of the sums, the mean or the variance: the same runs listed in another order give
 * the same interval to the last bit. Unlike `describe`, no correction term for the rounding of
 * the mean is applied, so that sum_squared is exactly the sum of the `squared` column the audit
 * shows; this matters only when the values differ by a few units in the last place of the mean
 * (e.g. 1e16, 1e16 + 2, 1e16 + 2 give variance 2, not 4/3).
 *
 * Reference: T. F. Chan, G. H. Golub and R. J. LeVeque (1983), "Algorithms for Computing the
 * Sample Variance: Analysis and Recommendations", The American Statistician 37(3), 242–247
 * (the two-pass algorithm).
 *
 * Example: `spread([3, 5, 10])` gives sum 18, mean 6, deviations [−3, −1, 4], squared [9, 1, 16],
 * sum_squared 26, variance 13, sd √13 = 3.605551275463989.
 */
export function spread(values: ArrayLike<number>): Spread {
  const n = values.length;
  const sum = fsum(values);
  if (n === 0) {
    return { n, sum, mean: null, deviations: [], squared: [], sum_squared: null, variance: null, sd: null };
  }
  const mean = sum / n;
  const deviations = Array.from(values, (x) => x - mean);
  const squared = deviations.map((d) => d * d);
  const sumSquared = fsum(squared);
  const variance = n < 2 ? null : sumSquared / (n - 1);
  return {
    n,
    sum,
    mean,
    deviations,
    squared,
    sum_squared: sumSquared,
    variance,
    sd: variance === null ? null : Math.sqrt(variance),
  };
}
