import { twoSidedP } from "./confidence.js";
import { spread } from "./spread.js";
import { tQuantile } from "./tQuantile.js";

/**
 * The confidence level for each of K intervals so that all K hold together with probability at
 * least `confidence` (Bonferroni inequality): 1 − (1 − confidence)/K.
 *
 * Reference: O. J. Dunn (1961), "Multiple Comparisons among Means", Journal of the American
 * Statistical Association 56(293), 52–64.
 *
 * Example: `bonferroniLevel(0.9, 2)` gives 0.95 (as 1 − 0.09999999999999998/2 rounds).
 *
 * Throws a plain `Error` when confidence is not in (0, 1) or K is not a positive integer.
 */
export function bonferroniLevel(confidence: number, K: number): number {
  twoSidedP(confidence);
  if (!(Number.isInteger(K) && K >= 1)) throw new Error(`bonferroniLevel: K must be a positive integer, got ${K}`);
  return 1 - (1 - confidence) / K;
}

/** A confidence interval for the difference of two means. Interval fields are null when it cannot be formed. */
export interface DifferenceInterval {
  /** Number of values of each side (equal for a paired interval). */
  n_a: number;
  n_b: number;
  /** Mean of each side; null when that side has no value. */
  mean_a: number | null;
  mean_b: number | null;
  /** Paired: mean of the differences a_i − b_i. Welch: mean_a − mean_b. null when a side is empty. */
  diff_mean: number | null;
  /** Paired: sd of the differences. Welch: null (see sd_a, sd_b). */
  sd_diff: number | null;
  /** Sample standard deviations of each side (n − 1 divisor); null with fewer than two values. */
  sd_a: number | null;
  sd_b: number | null;
  standard_error: number | null;
  /** Degrees of freedom: n − 1 (paired) or Welch–Satterthwaite (not whole in general). */
  df: number | null;
  /** The probability of the t quantile, 1 − α/2. */
  p: number;
  t: number | null;
  half_width: number | null;
  ci_low: number | null;
  ci_high: number | null;
  /** Why the interval is missing, when it is. */
  note: string | null;
}

/** Why a difference interval is missing. */
export const differenceNotes = {
  tooFewPairs: "Fewer than two matched runs: the spread of the differences cannot be estimated.",
  tooFewValues: "One side has fewer than two runs: its spread cannot be estimated.",
  noSpread: "Both sides have no spread at all (every run gave the same value), so the degrees of freedom are undefined.",
} as const;

function withInterval(
  base: Omit<DifferenceInterval, "df" | "t" | "half_width" | "ci_low" | "ci_high" | "note">,
  df: number,
): DifferenceInterval {
  const t = tQuantile(base.p, df);
  const halfWidth = t * (base.standard_error as number);
  const diff = base.diff_mean as number;
  return { ...base, df, t, half_width: halfWidth, ci_low: diff - halfWidth, ci_high: diff + halfWidth, note: null };
}

const noInterval = { df: null, t: null, half_width: null, ci_low: null, ci_high: null };

/**
 * Paired-t confidence interval for the difference of two means when a[i] and b[i] come from the
 * same run number (e.g. common random numbers): with d_i = a_i − b_i, d̄ ± t(1 − α/2, n − 1)·s_d/√n,
 * s_d the sample standard deviation of the d_i (n − 1 divisor). Sums are exactly rounded.
 * Fewer than two pairs: interval fields null and `note` set.
 *
 * Reference: A. M. Law (2015), "Simulation Modeling and Analysis", 5th ed., McGraw-Hill,
 * section 10.2.1 (paired-t confidence interval).
 *
 * Example: a = [12, 15, 11, 14], b = [10, 12, 10, 11] at 0.95: d = [2, 3, 1, 3], diff_mean 2.25,
 * sd_diff √(2.75/3), standard_error sd_diff/2, df 3, t 3.182446305283708 (printed tables: 3.182), half_width 1.5234801808288125.
 *
 * Throws a plain `Error` when a and b differ in length.
 */
export function pairedInterval(a: number[], b: number[], confidence: number): DifferenceInterval {
  if (a.length !== b.length) throw new Error(`pairedInterval: ${a.length} values against ${b.length}`);
  const p = twoSidedP(confidence);
  const sa = spread(a);
  const sb = spread(b);
  const sd = spread(a.map((x, i) => x - b[i]));
  const base = {
    n_a: sa.n,
    n_b: sb.n,
    mean_a: sa.mean,
    mean_b: sb.mean,
    diff_mean: sd.mean,
    sd_diff: sd.sd,
    sd_a: sa.sd,
    sd_b: sb.sd,
    standard_error: sd.sd === null ? null : sd.sd / Math.sqrt(sd.n),
    p,
  };
  if (sd.n < 2) return { ...base, ...noInterval, note: differenceNotes.tooFewPairs };
  return withInterval(base, sd.n - 1);
}

/**
 * Welch's confidence interval for the difference of two means from independent samples with
 * possibly unequal variances: (ā − b̄) ± t(1 − α/2, ν)·se with se = √(s_a²/n_a + s_b²/n_b) and
 * the Welch–Satterthwaite degrees of freedom
 *   ν = (s_a²/n_a + s_b²/n_b)² / ((s_a²/n_a)²/(n_a − 1) + (s_b²/n_b)²/(n_b − 1)),
 * not whole in general. Degenerate cases give null interval fields and a `note`: a side with
 * fewer than two values (no variance), or both variances 0 (ν = 0/0; se = 0 is still reported).
 *
 * References: B. L. Welch (1947), "The Generalization of 'Student's' Problem when Several
 * Different Population Variances are Involved", Biometrika 34(1/2), 28–35; F. E. Satterthwaite
 * (1946), "An Approximate Distribution of Estimates of Variance Components", Biometrics Bulletin
 * 2(6), 110–114.
 *
 * Example: a = [1, 2, 3], b = [2, 4, 6, 8]: diff_mean −3, s_a² = 1, s_b² = 20/3,
 * se = √(1/3 + 5/3) = √2, ν = 4 / (1/18 + 25/27) = 216/53, computed as 4.075471698113207.
 */
export function welchInterval(a: number[], b: number[], confidence: number): DifferenceInterval {
  const p = twoSidedP(confidence);
  const sa = spread(a);
  const sb = spread(b);
  const diff = sa.mean === null || sb.mean === null ? null : sa.mean - sb.mean;
  const base = {
    n_a: sa.n,
    n_b: sb.n,
    mean_a: sa.mean,
    mean_b: sb.mean,
    diff_mean: diff,
    sd_diff: null,
    sd_a: sa.sd,
    sd_b: sb.sd,
    standard_error: null as number | null,
    p,
  };
  if (sa.variance === null || sb.variance === null) return { ...base, ...noInterval, note: differenceNotes.tooFewValues };
  const va = sa.variance / sa.n;
  const vb = sb.variance / sb.n;
  const total = va + vb;
  base.standard_error = Math.sqrt(total);
  if (total === 0) return { ...base, ...noInterval, note: differenceNotes.noSpread };
  // ν written with the shares of each side in se² (each in [0, 1]), so tiny variances cannot underflow.
  const ra = va / total;
  const rb = vb / total;
  const df = 1 / ((ra * ra) / (sa.n - 1) + (rb * rb) / (sb.n - 1));
  return withInterval(base, df);
}
