import { twoSidedP } from "./confidence.js";
import { tQuantile } from "./tQuantile.js";

/** What a study should reach: an absolute half-width, or a half-width relative to |mean|. */
export type PrecisionTarget = { type: "half_width"; value: number } | { type: "relative"; value: number };

/** The most runs `runsNeeded` will propose. */
export const MAX_RUNS = 10_000_000;

/**
 * The number of runs needed for a target precision: the smallest n' ≥ n with
 *   t(1 − α/2, n' − 1) · sd / √n' ≤ h,
 * where sd is the sample standard deviation from the n runs made so far, α = 1 − confidence, and
 * h is the target half-width (`half_width`) or value·|mean| (`relative`). It assumes the
 * variance estimate will not change as runs are added, so it is a planning figure, not a promise.
 * The left side decreases in n', so the answer is found by doubling and then bisection (about
 * 2·log2(n'/n) quantile evaluations).
 *
 * Returns n when sd = 0 (and h ≥ 0); null when n < 2 (no variance estimate) or when the target
 * cannot be reached by MAX_RUNS = 10⁷ runs (for example a relative target with mean 0, or h ≤ 0).
 *
 * Reference: A. M. Law (2015), "Simulation Modeling and Analysis", 5th ed., McGraw-Hill,
 * section 9.4.1 (obtaining a specified precision, the number of replications needed).
 *
 * Example: `runsNeeded(2, 10, 50, 0.95, { type: "half_width", value: 1 })` gives 18:
 * t(0.975, 17)·2/√18 = 0.9945766014259683 ≤ 1 while t(0.975, 16)·2/√17 = 1.0283051135289227 > 1.
 *
 * Throws a plain `Error` when n is not a non-negative integer or confidence is not in (0, 1).
 */
export function runsNeeded(
  sd: number,
  n: number,
  mean: number,
  confidence: number,
  target: PrecisionTarget,
): number | null {
  const p = twoSidedP(confidence);
  if (!(Number.isInteger(n) && n >= 0)) throw new Error(`runsNeeded: n must be a non-negative integer, got ${n}`);
  if (n < 2) return null;
  const h = target.type === "half_width" ? target.value : target.value * Math.abs(mean);
  if (sd === 0 && h >= 0) return n;
  const reached = (k: number) => (tQuantile(p, k - 1) * sd) / Math.sqrt(k) <= h;
  if (reached(n)) return n;
  if (n >= MAX_RUNS || !reached(MAX_RUNS)) return null;
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
  return hi;
}
