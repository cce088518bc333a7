import { Adder } from "./adder.js";
import { intervalArithmetic } from "./interval.js";
import { lag1 } from "./moments.js";

/**
 * The means of k batches of consecutive observations from one long run (the method of batch
 * means). The n mod k oldest values are dropped first (the start of a run is the part most likely
 * still influenced by the initial state), then the remaining values form k batches of
 * b = ⌊n/k⌋ consecutive values; each batch mean is a compensated sum divided by b.
 * Returns an empty array when n < k (not even one value per batch).
 *
 * Reference: A. M. Law (2015), "Simulation Modeling and Analysis", 5th ed., McGraw-Hill,
 * section 9.5.3 (the method of batch means).
 *
 * Example: `observationBatches([100, 1, 2, 3, 4, 5, 6], 3)` drops 100 and gives [1.5, 3.5, 5.5].
 *
 * Throws a plain `Error` when k is not a positive integer.
 */
export function observationBatches(values: ArrayLike<number>, k: number): number[] {
  if (!(Number.isInteger(k) && k >= 1)) throw new Error(`observationBatches: k must be a positive integer, got ${k}`);
  const n = values.length;
  const b = Math.floor(n / k);
  if (b === 0) return [];
  const skip = n % k;
  const means: number[] = new Array(k);
  const adder = new Adder();
  for (let j = 0; j < k; j++) {
    adder.reset();
    const from = skip + j * b;
    for (let i = from; i < from + b; i++) adder.add(values[i]);
    means[j] = adder.value() / b;
  }
  return means;
}

/** A batch-means confidence interval for a steady-state mean. Fields are null with fewer than two batches. */
export interface BatchMeansInterval {
  batches: number;
  /** Grand mean of the batch means; null with no batch. */
  mean: number | null;
  /** Sample standard deviation of the batch means (k − 1 divisor). */
  sd: number | null;
  /** k − 1. */
  df: number | null;
  /** t(1 − α/2, k − 1). */
  t: number | null;
  half_width: number | null;
  ci_low: number | null;
  ci_high: number | null;
  /**
   * Lag-1 autocorrelation of the batch means (NIST StRD definition); a value well above 0 says
   * the batches are too short to be treated as independent. null with fewer than two batches or
   * equal batch means.
   */
  lag1: number | null;
}

/**
 * Student t confidence interval from k batch means Y_1 … Y_k treated as independent:
 * Ȳ ± t(1 − α/2, k − 1)·s_Y/√k, with s_Y the sample standard deviation (k − 1 divisor),
 * α = 1 − confidence. Also reports the lag-1 autocorrelation of the batch means as a check of the
 * independence assumption. Sums are exactly rounded (same arithmetic as `intervalArithmetic`).
 *
 * Reference: A. M. Law (2015), "Simulation Modeling and Analysis", 5th ed., McGraw-Hill,
 * section 9.5.3; B. Schmeiser (1982), "Batch Size Effects in the Analysis of Simulation Output",
 * Operations Research 30(3), 556–568.
 *
 * Example: `batchMeansInterval([1.5, 3.5, 5.5], 0.95)` gives mean 3.5, sd 2, df 2,
 * t 4.302652729749462, half_width 4.9682754235006605, ci_low −1.4682754235006605,
 * ci_high 8.46827542350066, lag1 0.
 */
export function batchMeansInterval(batchMeans: number[], confidence: number): BatchMeansInterval {
  const a = intervalArithmetic(
    batchMeans.map((value, i) => ({ run: String(i + 1), value })),
    confidence,
  );
  return {
    batches: batchMeans.length,
    mean: a.mean,
    sd: a.sd,
    df: a.df,
    t: a.t,
    half_width: a.half_width,
    ci_low: a.ci_low,
    ci_high: a.ci_high,
    lag1: lag1(batchMeans),
  };
}
