import { twoSidedP } from "./confidence.js";
import { spread, spreadSteps, type SpreadSteps } from "./spread.js";
import { tQuantile } from "./tQuantile.js";

/**
 * The arithmetic of one across-run interval, before it is labelled with scenario and measure
 * (`IntervalArithmetic` in src/outcome/studyOutcome.ts extends it with those labels).
 */
export interface IntervalSteps extends SpreadSteps {
  rows: { run: string; value: number; deviation: number; squared: number }[];
  df: number | null;
  /** The probability of the t quantile, 1 − α/2. */
  p: number | null;
  t: number | null;
  standard_error: number | null;
  half_width: number | null;
  ci_low: number | null;
  ci_high: number | null;
  /** Why the interval is missing, when it is. */
  note: string | null;
}

/** The contract's summary fields of an across-run interval. */
export interface IntervalSummary {
  n: number;
  mean: number | null;
  sd: number | null;
  half_width: number | null;
  ci_low: number | null;
  ci_high: number | null;
}

/** Why an interval is missing; the report shows these beside the empty fields. */
export const intervalNotes = {
  noValues: "No run gave a value, so there is no mean and no interval.",
  oneValue:
    "Only one run gave a value: its spread cannot be estimated, so there is no interval. Add runs to get one.",
} as const;

/**
 * Student t confidence interval for a mean across independent replications, with every step.
 *
 * With values x_1 … x_n (one per run): mean x̄ = Σx / n; sample variance
 * s² = (Σ(x_i − x̄)² − (Σ(x_i − x̄))² / n) / (n − 1), the second term (`mean_correction`) taking off
 * the rounding of x̄ (see `spread`; 0 unless the values are close together far from 0); standard error s / √n; half-width h = t(1 − α/2, n − 1) · s / √n
 * with α = 1 − confidence; interval [x̄ − h, x̄ + h]. Sums are exactly rounded (`fsum`), so the
 * result does not depend on the order of the runs; `rows` keep the input order.
 * n = 0: only n = 0 and sum = 0 are set. n = 1: sum, mean, sum_squared (0) are set; variance, sd
 * and the interval fields are null; `note` says why.
 *
 * Reference: A. M. Law (2015), "Simulation Modeling and Analysis", 5th ed., McGraw-Hill,
 * section 9.4.1 (fixed-sample-size procedure); W. S. Gosset ("Student") (1908), "The Probable
 * Error of a Mean", Biometrika 6(1), 1–25.
 *
 * Example: values 3, 5, 10 at confidence 0.95 give mean 6, sum_squared 26, variance 13,
 * sd 3.605551275463989, df 2, p 0.975, t 4.302652729749462 (printed tables: 4.303),
 * standard_error 2.0816659994661326, half_width 8.956685895029597, ci_low −2.9566858950295973,
 * ci_high 14.956685895029597.
 */
export function intervalArithmetic(values: { run: string; value: number }[], confidence: number): IntervalSteps {
  const p = twoSidedP(confidence);
  const s = spread(values.map((v) => v.value));
  const rows = values.map((v, i) => ({ run: v.run, value: v.value, deviation: s.deviations[i], squared: s.squared[i] }));
  const empty = {
    rows,
    ...spreadSteps(s),
    variance: null,
    sd: null,
    df: null,
    p: null,
    t: null,
    standard_error: null,
    half_width: null,
    ci_low: null,
    ci_high: null,
  };
  if (s.n === 0) return { ...empty, note: intervalNotes.noValues };
  if (s.n === 1 || s.sd === null || s.mean === null) return { ...empty, note: intervalNotes.oneValue };
  const df = s.n - 1;
  const t = tQuantile(p, df);
  const standardError = s.sd / Math.sqrt(s.n);
  const halfWidth = t * standardError;
  return {
    rows,
    ...spreadSteps(s),
    df,
    p,
    t,
    standard_error: standardError,
    half_width: halfWidth,
    ci_low: s.mean - halfWidth,
    ci_high: s.mean + halfWidth,
    note: null,
  };
}

/**
 * The summary fields of `intervalArithmetic` (same method, same numbers), for callers that need
 * no audit rows. Example: `summarize([3, 5, 10], 0.95)` gives n 3, mean 6, sd 3.605551275463989,
 * half_width 8.956685895029597, ci_low −2.9566858950295973, ci_high 14.956685895029597.
 */
export function summarize(values: number[], confidence: number): IntervalSummary {
  const a = intervalArithmetic(
    values.map((value, i) => ({ run: String(i), value })),
    confidence,
  );
  return { n: a.n, mean: a.mean, sd: a.sd, half_width: a.half_width, ci_low: a.ci_low, ci_high: a.ci_high };
}
