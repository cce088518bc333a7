import { normalCdf } from "./normal.js";
import { chiRatioRule, DEFAULT_RESOLUTION, solveIncreasing, type Resolution } from "./quadrature.js";

/** Rinott's constant with how it was found, for an audit. */
export interface RinottConstant {
  /** Number of scenarios k. */
  k: number;
  /** First-stage runs per scenario n0; ν = n0 − 1 degrees of freedom for each variance. */
  n0: number;
  df: number;
  /** The probability of correct selection P* the constant is for. */
  pcs: number;
  /** The constant h. */
  h: number;
  /** The left side of the equation at the h returned, minus P*: what the root finder left over. */
  residual: number;
  /** The equation solved, in words and symbols. */
  equation: string;
  /** How the integrals were computed. */
  numerics: string;
}

const EQUATION =
  "P* = ∫₀^∞ [ ∫₀^∞ Φ( h / √((n0 − 1)(1/x + 1/y)) ) f(x) dx ]^(k−1) f(y) dy, f the chi-square density with n0 − 1 degrees of freedom";

/**
 * The probability on the left side of Rinott's equation at h, for k scenarios and ν = n0 − 1:
 *   P(h) = E_Y[ (E_X[ Φ(h / √(ν(1/X + 1/Y))) ])^{k−1} ],  X, Y independent χ²_ν.
 * Written with S = √(χ²_ν/ν) (so ν(1/X + 1/Y) = 1/S_X² + 1/S_Y²), the integrand is
 * Φ(h·S_X·S_Y / √(S_X² + S_Y²)), and both expectations use the rule of `chiRatioRule`.
 */
export function rinottProbability(h: number, k: number, n0: number, resolution: Resolution = DEFAULT_RESOLUTION): number {
  const { nodes: s, weights: w } = chiRatioRule(n0 - 1, resolution);
  const m = s.length;
  let outer = 0;
  for (let j = 0; j < m; j++) {
    const sy = s[j];
    let inner = 0;
    for (let i = 0; i < m; i++) {
      const sx = s[i];
      inner += w[i] * normalCdf((h * sx * sy) / Math.sqrt(sx * sx + sy * sy));
    }
    outer += w[j] * inner ** (k - 1);
  }
  return outer;
}

const cache = new Map<string, RinottConstant>();

/**
 * Rinott's constant h for selecting the best of k normal scenarios with unknown, unequal
 * variances in two stages: with n0 first-stage runs of each scenario, N_i = max(n0, ⌈(h·S_i/δ)²⌉)
 * runs in all, and the largest (or smallest) mean of all N_i runs selected, the probability of
 * correct selection is at least P* whenever the best mean is at least δ better than every other.
 * h is the root of Rinott's equation
 *   P* = ∫₀^∞ [∫₀^∞ Φ(h / √((n0 − 1)(1/x + 1/y))) f(x) dx]^{k−1} f(y) dy,
 * f the χ² density with n0 − 1 degrees of freedom, Φ the standard normal distribution function.
 *
 * Numerics: both integrals over S = √(χ²/ν) by a composite Gauss–Legendre rule (8 panels of 20
 * points, `chiRatioRule`), Φ by Marsaglia's series (`normalCdf`), and the root by the Illinois
 * method (`solveIncreasing`) to 1e-13 relative. The left side increases in h from 2^{−(k−1)} at
 * h = 0 to 1. Tripling the resolution (24 panels of 40 points) moved h by under 1e-12 relative
 * for k ≤ 50 and n0 from 5 to 1000, by 2e-7 at k = 100, n0 = 5 and by 1e-6 at n0 = 2 (k = 2),
 * where the integrand is roughest: at least 6 significant digits everywhere we looked (the tests
 * check two cases at doubled resolution to 1e-9). Results are cached by (k, n0, P*); one
 * constant costs about 0.1–0.2 s of CPU.
 *
 * Reference: Y. Rinott (1978), "On two-stage selection procedures and related
 * probability-inequalities", Communications in Statistics — Theory and Methods A7(8), 799–811;
 * tables of h in R. E. Bechhofer, T. J. Santner and D. M. Goldsman (1995), "Design and Analysis
 * of Experiments for Statistical Selection, Screening, and Multiple Comparisons", Wiley.
 *
 * Example: `rinottH(2, 20, 0.95).h` gives 2.45247 (to 6 significant digits).
 *
 * Throws a plain `Error` when k is not an integer ≥ 2, n0 not an integer ≥ 2, or P* not in (1/k, 1).
 */
export function rinottH(k: number, n0: number, pcs: number): RinottConstant {
  if (!(Number.isInteger(k) && k >= 2)) throw new Error(`rinottH: k must be an integer of at least 2, got ${k}`);
  if (!(Number.isInteger(n0) && n0 >= 2)) throw new Error(`rinottH: n0 must be an integer of at least 2, got ${n0}`);
  if (!(pcs > 1 / k && pcs < 1)) throw new Error(`rinottH: P* must lie strictly between 1/k and 1, got ${pcs}`);
  const key = `${k} ${n0} ${pcs}`;
  const known = cache.get(key);
  if (known) return known;
  const h = solveIncreasing((x) => rinottProbability(x, k, n0), pcs, 0);
  const { panels, points } = DEFAULT_RESOLUTION;
  const result: RinottConstant = {
    k,
    n0,
    df: n0 - 1,
    pcs,
    h,
    residual: rinottProbability(h, k, n0) - pcs,
    equation: EQUATION,
    numerics: `both integrals over √(χ²/ν) by composite Gauss–Legendre quadrature (${panels} panels of ${points} points), Φ by Marsaglia's series, root by the Illinois method to 1e-13 relative`,
  };
  cache.set(key, result);
  return result;
}
