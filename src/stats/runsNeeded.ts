import { twoSidedP } from "./confidence.js";
import { tQuantile } from "./tQuantile.js";

/**
 * What a study should reach: an absolute half-width, or a relative error γ of the mean (the
 * estimate within γ·|μ| of the true mean μ, at the study's confidence).
 */
export type PrecisionTarget = { type: "half_width"; value: number } | { type: "relative"; value: number };

/** The most runs `runsNeeded` will propose. */
export const MAX_RUNS = 10_000_000;

/**
 * Why there is no number of runs (results.json `runs_needed_reason`; the report says it in words):
 * - `no-runs`: no run gave a value;
 * - `one-run`: one run gave a value, and one value has no spread to plan from;
 * - `no-spread`: every run gave the same value (sd 0), so the spread is unknown, not zero;
 * - `mean-zero`: a relative target of a mean of 0 asks for a half-width of 0;
 * - `beyond-limit`: more than MAX_RUNS runs would be needed at the current spread.
 */
export type RunsNeededReason = "no-runs" | "one-run" | "no-spread" | "mean-zero" | "beyond-limit";

export interface RunsNeeded {
  /** The number of runs, or null (then `reason` says why). */
  runs: number | null;
  reason: RunsNeededReason | null;
  /** The half-width aimed at: the target's, or γ/(1 + γ)·|mean| for a relative one (null without a mean). */
  halfWidth: number | null;
}

/**
 * The half-width that meets a relative error γ: h = γ/(1 + γ)·|x̄|. If the interval's half-width
 * is at most γ′·|x̄| with γ′ = γ/(1 + γ) and it covers μ, then |x̄ − μ| ≤ γ′|x̄| ≤ γ′(|μ| + |x̄ − μ|),
 * so |x̄ − μ| ≤ γ′/(1 − γ′)·|μ| = γ|μ|: the error is at most γ of the true mean, which is what the
 * target asks (dividing by |x̄| instead of the unknown |μ| alone would allow more than γ).
 *
 * Reference: the adjusted relative error γ/(1 + γ) of the sequential procedure for a relative
 * precision in A. M. Law (2015), "Simulation Modeling and Analysis", 5th ed., section 9.4.1 (from
 * memory; the derivation above is ours and checks it).
 *
 * Example: `relativeHalfWidth(0.1, 50)` gives 50/11 = 4.545454545454546.
 */
export function relativeHalfWidth(gamma: number, mean: number): number {
  return (gamma / (1 + gamma)) * Math.abs(mean);
}

/**
 * The number of runs needed for a target precision: the smallest n' ≥ n with
 *   t(1 − α/2, n' − 1) · sd / √n' ≤ h,
 * where sd is the sample standard deviation from the n runs made so far, α = 1 − confidence, and
 * h is the target half-width (`half_width`) or γ/(1 + γ)·|mean| for a relative error γ
 * (`relativeHalfWidth`). It assumes the variance estimate will not change as runs are added, so it
 * is a planning figure, not a promise. The left side decreases in n', so the answer is found by
 * doubling and then bisection (about 2·log2(n'/n) quantile evaluations).
 *
 * No number (runs null) and a `reason` when n < 2, when sd = 0 (one value repeated gives no
 * spread to plan from), when a relative target meets a mean of 0, or when MAX_RUNS = 10⁷ runs
 * would not be enough; sd and mean are null with fewer than two values.
 *
 * Reference: A. M. Law (2015), "Simulation Modeling and Analysis", 5th ed., McGraw-Hill,
 * section 9.4.1 (obtaining a specified precision, the number of replications needed).
 *
 * Example: `runsNeeded(2, 10, 50, 0.95, { type: "half_width", value: 1 })` gives runs 18:
 * t(0.975, 17)·2/√18 = 0.9945766014259683 ≤ 1 while t(0.975, 16)·2/√17 = 1.0283051135289227 > 1.
 *
 * Throws a plain `Error` when n is not a non-negative integer or confidence is not in (0, 1).
 */
export function runsNeeded(
  sd: number | null,
  n: number,
  mean: number | null,
  confidence: number,
  target: PrecisionTarget,
): RunsNeeded {
  const p = twoSidedP(confidence);
  if (!(Number.isInteger(n) && n >= 0)) throw new Error(`runsNeeded: n must be a non-negative integer, got ${n}`);
  const h = target.type === "half_width" ? target.value : mean === null ? null : relativeHalfWidth(target.value, mean);
  const none = (reason: RunsNeededReason): RunsNeeded => ({ runs: null, reason, halfWidth: h });
  if (n === 0) return none("no-runs");
  if (n < 2 || sd === null) return none("one-run");
  if (sd === 0) return none("no-spread");
  if (h === null || !(h > 0)) return none("mean-zero");
  const reached = (k: number) => (tQuantile(p, k - 1) * sd) / Math.sqrt(k) <= h;
  if (reached(n)) return { runs: n, reason: null, halfWidth: h };
  if (n >= MAX_RUNS || !reached(MAX_RUNS)) return none("beyond-limit");
  // Invariant: not reached at lo, reached at hi.
  let lo = n;
  let hi = Math.min(2 * n, MAX_RUNS);
  while (!reached(hi)) {
    lo = hi;
    hi = Math.min(2 * hi, MAX_RUNS);
  }
  while (hi - lo > 1) {
    const mid = Math.floor((lo + hi) / 2);
    if (reached(mid)) hi = mid;
    else lo = mid;
  }
  return { runs: hi, reason: null, halfWidth: h };
}
