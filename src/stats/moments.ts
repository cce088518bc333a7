import { Adder } from "./adder.js";
import { fsum } from "./fsum.js";

/** Count, mean, standard deviation (n − 1 divisor), minimum and maximum of a sample. */
export interface Description {
  n: number;
  /** null when n = 0. */
  mean: number | null;
  /** null when n < 2. */
  sd: number | null;
  /** null when n = 0. */
  min: number | null;
  max: number | null;
}

/**
 * Sample mean and standard deviation by the corrected two-pass algorithm.
 *
 * Pass one: the mean is the exactly rounded sum (`fsum`) divided by n. Pass two: with deviations
 * d_i = x_i − mean, the sum of squares is S = Σ d_i² − (Σ d_i)² / n (both sums compensated); the
 * second term corrects for the rounding error left in the mean. The variance is S / (n − 1) (the
 * unbiased sample variance, n − 1 degrees of freedom) and sd its square root.
 *
 * Reference: T. F. Chan, G. H. Golub and R. J. LeVeque (1983), "Algorithms for Computing the
 * Sample Variance: Analysis and Recommendations", The American Statistician 37(3), 242–247
 * (equation 1.7, the corrected two-pass algorithm).
 *
 * Example: `describe([2, 4, 4, 4, 5, 5, 7, 9])` gives n 8, mean 5, sd √(32/7) =
 * 2.138089935299395, min 2, max 9.
 */
export function describe(values: ArrayLike<number>): Description {
  const n = values.length;
  if (n === 0) return { n, mean: null, sd: null, min: null, max: null };
  const mean = fsum(values) / n;
  let min = values[0];
  let max = values[0];
  const squares = new Adder();
  const deviations = new Adder();
  for (let i = 0; i < n; i++) {
    const x = values[i];
    if (x < min) min = x;
    if (x > max) max = x;
    const d = x - mean;
    squares.add(d * d);
    deviations.add(d);
  }
  if (n < 2) return { n, mean, sd: null, min, max };
  const e = deviations.value();
  const s = Math.max(0, squares.value() - (e * e) / n);
  return { n, mean, sd: Math.sqrt(s / (n - 1)), min, max };
}

/**
 * Lag-1 autocorrelation as defined by NIST's Statistical Reference Datasets:
 * r1 = Σ_{i=2..n} (y_i − ȳ)(y_{i−1} − ȳ) / Σ_{i=1..n} (y_i − ȳ)².
 *
 * The mean is the exactly rounded sum divided by n; deviations d_i are taken from it and both
 * sums are compensated. The rounding error left in the mean, c = Σ d_i / n, is then removed by
 * expanding the sums in c, as in the corrected two-pass variance (Chan, Golub and LeVeque 1983):
 * numerator − c·(2Σd − d_1 − d_n) + (n − 1)c², denominator − c·Σd. Without this step the end
 * terms d_1, d_n carry the mean's last-bit error into r1 (about 2e−11 relative on NIST NumAcc4).
 * Returns null when n < 2 or when all values are equal (the denominator is 0).
 *
 * Reference: NIST Statistical Reference Datasets, Univariate Summary Statistics (1999),
 * certified-value definitions.
 *
 * Example: `lag1([10000001, 10000003, 10000002])` (NIST NumAcc1) gives −0.5 exactly.
 */
export function lag1(values: ArrayLike<number>): number | null {
  const n = values.length;
  if (n < 2) return null;
  const mean = fsum(values) / n;
  const products = new Adder();
  const squares = new Adder();
  const deviations = new Adder();
  const first = values[0] - mean;
  let previous = first;
  squares.add(first * first);
  deviations.add(first);
  for (let i = 1; i < n; i++) {
    const d = values[i] - mean;
    products.add(d * previous);
    squares.add(d * d);
    deviations.add(d);
    previous = d;
  }
  // Deviations from the exact mean are d_i − c with c = Σd / n; expand both sums in c.
  const e = deviations.value();
  const c = e / n;
  const numerator = products.value() - c * (2 * e - first - previous) + (n - 1) * c * c;
  const denominator = squares.value() - e * c;
  if (!(denominator > 0)) return null;
  return numerator / denominator;
}
