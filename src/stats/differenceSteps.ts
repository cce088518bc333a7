import { pairedInterval, welchInterval } from "./compare.js";
import { spread, spreadSteps as stepsOf, type SpreadSteps } from "./spread.js";

/**
 * Every step of a difference interval (paired-t or Welch), for an audit: the values it used,
 * each intermediate sum, and the interval itself. The interval fields are the ones
 * `pairedInterval` and `welchInterval` return for the same values, to the last bit.
 */

/** The fields both kinds of difference interval end with. Null when the interval cannot be formed. */
export interface DifferenceEnd {
  /** Degrees of freedom: n − 1 (paired) or Welch–Satterthwaite. */
  df: number | null;
  /** The probability of the t quantile, 1 − α/2, at the level of this one comparison. */
  p: number;
  t: number | null;
  standard_error: number | null;
  half_width: number | null;
  ci_low: number | null;
  ci_high: number | null;
  /** Why the interval is missing, when it is. */
  note: string | null;
}

/** The spread of one list of values: sum, mean and sample variance with every intermediate. */
export type { SpreadSteps };

export interface PairedSteps extends DifferenceEnd, SpreadSteps {
  method: "paired";
  /** One row per pair, in input order: both values, d = a − b, d − d̄ and its square. */
  rows: { run: string; a: number; b: number; difference: number; deviation: number; squared: number }[];
  /** Mean of each side over the pairs. */
  mean_a: number | null;
  mean_b: number | null;
}

export interface WelchSide extends SpreadSteps {
  /** One row per value, in input order: the value, its deviation from the side's mean, its square. */
  rows: { run: string; value: number; deviation: number; squared: number }[];
  /** s² / n, the side's share of the squared standard error; null with fewer than two values. */
  variance_over_n: number | null;
}

export interface WelchSteps extends DifferenceEnd {
  method: "welch";
  a: WelchSide;
  b: WelchSide;
  /** ā − b̄; null when a side is empty. */
  difference: number | null;
  /** se² = s_a²/n_a + s_b²/n_b. */
  standard_error_squared: number | null;
  /** Each side's part of se² ((s²/n) / se²), in [0, 1]; null when se² is 0 or missing. */
  share_a: number | null;
  share_b: number | null;
  /** share²/(n − 1) of each side: ν = 1 / (df_term_a + df_term_b). */
  df_term_a: number | null;
  df_term_b: number | null;
}

function spreadSteps(values: number[]): SpreadSteps & { deviations: number[]; squared: number[] } {
  const s = spread(values);
  return { ...stepsOf(s), deviations: s.deviations, squared: s.squared };
}

function endOf(iv: ReturnType<typeof pairedInterval>): DifferenceEnd {
  return {
    df: iv.df,
    p: iv.p,
    t: iv.t,
    standard_error: iv.standard_error,
    half_width: iv.half_width,
    ci_low: iv.ci_low,
    ci_high: iv.ci_high,
    note: iv.note,
  };
}

/**
 * The paired-t interval of `pairedInterval` with its arithmetic: d_i = a_i − b_i for each pair,
 * d̄ = Σ d_i / n, s_d² = (Σ (d_i − d̄)² − (Σ (d_i − d̄))² / n) / (n − 1), se = s_d / √n,
 * df = n − 1, half-width t(p, n − 1) · se.
 *
 * Reference: A. M. Law (2015), "Simulation Modeling and Analysis", 5th ed., McGraw-Hill,
 * section 10.2.1 (paired-t confidence interval).
 *
 * Example: pairs (12, 10), (15, 12), (11, 10), (14, 11) at 0.95 give differences 2, 3, 1, 3,
 * deviations −0.25, 0.75, −1.25, 0.75, sum_squared 2.75, variance 2.75/3, df 3 and half_width
 * 1.5234801808288125, as `pairedInterval`.
 */
export function pairedSteps(pairs: { run: string; a: number; b: number }[], confidence: number): PairedSteps {
  const iv = pairedInterval(pairs.map((p) => p.a), pairs.map((p) => p.b), confidence);
  const d = spreadSteps(pairs.map((p) => p.a - p.b));
  const { deviations, squared, ...steps } = d;
  return {
    method: "paired",
    rows: pairs.map((p, i) => ({ run: p.run, a: p.a, b: p.b, difference: p.a - p.b, deviation: deviations[i], squared: squared[i] })),
    mean_a: iv.mean_a,
    mean_b: iv.mean_b,
    ...steps,
    ...endOf(iv),
  };
}

function welchSide(values: { run: string; value: number }[]): WelchSide {
  const { deviations, squared, ...steps } = spreadSteps(values.map((v) => v.value));
  return {
    rows: values.map((v, i) => ({ run: v.run, value: v.value, deviation: deviations[i], squared: squared[i] })),
    ...steps,
    variance_over_n: steps.variance === null ? null : steps.variance / steps.n,
  };
}

/**
 * Welch's interval of `welchInterval` with its arithmetic: each side's n, mean, sample variance
 * s² (n − 1 divisor) and s²/n; se² = s_a²/n_a + s_b²/n_b; the Welch–Satterthwaite degrees of
 * freedom ν = (se²)² / ((s_a²/n_a)²/(n_a − 1) + (s_b²/n_b)²/(n_b − 1)), computed, as
 * `welchInterval` does, divided through by (se²)²: with the shares w = (s²/n)/se² of each side,
 * ν = 1 / (w_a²/(n_a − 1) + w_b²/(n_b − 1)); half-width t(p, ν) · se.
 *
 * References: B. L. Welch (1947), Biometrika 34(1/2), 28–35; F. E. Satterthwaite (1946),
 * Biometrics Bulletin 2(6), 110–114.
 *
 * Example: a = [1, 2, 3], b = [2, 4, 6, 8] give variance_over_n 1/3 and 5/3, se² 2, shares 1/6
 * and 5/6, df terms 1/72 and 25/108, ν = 216/53 (4.075471698113207), as `welchInterval`.
 */
export function welchSteps(a: { run: string; value: number }[], b: { run: string; value: number }[], confidence: number): WelchSteps {
  const iv = welchInterval(a.map((v) => v.value), b.map((v) => v.value), confidence);
  const sa = welchSide(a);
  const sb = welchSide(b);
  const total = sa.variance_over_n === null || sb.variance_over_n === null ? null : sa.variance_over_n + sb.variance_over_n;
  const shareA = total === null || total === 0 ? null : (sa.variance_over_n as number) / total;
  const shareB = total === null || total === 0 ? null : (sb.variance_over_n as number) / total;
  return {
    method: "welch",
    a: sa,
    b: sb,
    difference: iv.diff_mean,
    standard_error_squared: total,
    share_a: shareA,
    share_b: shareB,
    df_term_a: shareA === null ? null : (shareA * shareA) / (sa.n - 1),
    df_term_b: shareB === null ? null : (shareB * shareB) / (sb.n - 1),
    ...endOf(iv),
  };
}
