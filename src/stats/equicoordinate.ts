import { normalCdf } from "./normal.js";
import { chiRatioRule, DEFAULT_RESOLUTION, normalRule, solveIncreasing, type Resolution } from "./quadrature.js";
import { tQuantile } from "./tQuantile.js";

/** An equicoordinate critical value with how it was found, for an audit. */
export interface EquicoordinatePoint {
  /** Dimension m of the multivariate t (the number of comparisons, k − 1). */
  dimension: number;
  /** Degrees of freedom ν of the common variance estimate; null for a known variance (normal). */
  df: number | null;
  /** The common correlation of the coordinates (always 1/2 here). */
  correlation: number;
  /** The probability P(T_1 ≤ g, …, T_m ≤ g) the point is for. */
  probability: number;
  /** The critical value g. */
  value: number;
  /** The left side of the equation at g, minus the probability. */
  residual: number;
  equation: string;
  numerics: string;
}

const EQUATION =
  "p = ∫₀^∞ ∫ φ(z) Φ(√2·g·s + z)^m dz dF(s), F the distribution of s = √(χ²_ν/ν) (s = 1 for a known variance)";

/**
 * P(T_1 ≤ g, …, T_m ≤ g) for T_i = Z_i / S, (Z_1, …, Z_m) standard normal with every correlation
 * 1/2 and S = √(χ²_ν/ν) independent of them (S = 1 when ν is Infinity). Correlation 1/2 means
 * Z_i = (Z_0 + W_i)/√2 with Z_0, W_1, …, W_m independent standard normals, so given S and Z_0 the
 * events are independent and
 *   P = E_S E_Z[ Φ(√2·g·S + Z)^m ],
 * both expectations by the composite Gauss–Legendre rules of `chiRatioRule` and `normalRule`.
 */
export function equicoordinateProbability(g: number, m: number, nu: number, resolution: Resolution = DEFAULT_RESOLUTION): number {
  const z = normalRule(resolution);
  const s = Number.isFinite(nu) ? chiRatioRule(nu, resolution) : { nodes: Float64Array.of(1), weights: Float64Array.of(1) };
  let total = 0;
  for (let j = 0; j < s.nodes.length; j++) {
    const a = Math.SQRT2 * g * s.nodes[j];
    let inner = 0;
    for (let i = 0; i < z.nodes.length; i++) inner += z.weights[i] * normalCdf(a + z.nodes[i]) ** m;
    total += s.weights[j] * inner;
  }
  return total;
}

const cache = new Map<string, EquicoordinatePoint>();

/**
 * The one-sided equicoordinate critical value g of the m-variate t distribution with ν degrees of
 * freedom and every correlation 1/2: P(T_1 ≤ g, …, T_m ≤ g) = p. It is the one-sided
 * many-to-one constant of comparisons with a control (Dunnett 1955) and the constant of
 * the selection and comparison procedures for k = m + 1 scenarios with a common variance:
 * Nelson and Matejcik's procedure NM (ν = (k − 1)(n0 − 1)), Hsu's multiple comparisons with
 * the best and Gupta's subset (ν = k(n − 1)). With ν = Infinity it is the normal (known
 * variance) value.
 *
 * The probability is `equicoordinateProbability`; it increases in g from 1/(m + 1) at g = 0
 * (E[U^m] with U = Φ(−Z_0) uniform) to 1, and g is its root by
 * the Illinois method to 1e-13 relative. For m = 1 it is the t quantile t(p, ν) exactly, and
 * the function returns `tQuantile(p, ν)` (or the normal quantile) itself. Doubling the
 * quadrature resolution (24 panels of 40 points) moved g by under 1e-13 relative for m up to 99,
 * ν from 4 to 1000 and ν = Infinity.
 * Results are cached.
 *
 * References: C. W. Dunnett (1955), "A Multiple Comparison Procedure for Comparing Several
 * Treatments with a Control", Journal of the American Statistical Association 50(272),
 * 1096–1121 (the tables); Y. L. Tong (1990), "The Multivariate Normal Distribution", Springer,
 * section 8.2 (the one-dimensional integral for equal correlations).
 *
 * Example: `equicoordinateT(2, Infinity, 0.95).value` gives 1.916 (to 4 significant digits;
 * Dunnett's table: 1.92).
 *
 * Throws a plain `Error` when m is not a positive integer, ν not positive, or p not in (1/(m + 1), 1).
 */
export function equicoordinateT(m: number, nu: number, p: number): EquicoordinatePoint {
  if (!(Number.isInteger(m) && m >= 1)) throw new Error(`equicoordinateT: m must be a positive integer, got ${m}`);
  if (!(nu > 0)) throw new Error(`equicoordinateT: nu must be greater than 0, got ${nu}`);
  if (!(p > 1 / (m + 1) && p < 1)) throw new Error(`equicoordinateT: p must lie strictly between 1/(m + 1) and 1, got ${p}`);
  const key = `${m} ${nu} ${p}`;
  const known = cache.get(key);
  if (known) return known;
  const { panels, points } = DEFAULT_RESOLUTION;
  let value: number;
  let numerics: string;
  if (m === 1) {
    value = Number.isFinite(nu) ? tQuantile(p, nu) : solveIncreasing(normalCdf, p, 0);
    numerics = Number.isFinite(nu) ? "one coordinate: the t quantile t(p, ν)" : "one coordinate: the normal quantile, by the Illinois method on Φ";
  } else {
    value = solveIncreasing((g) => equicoordinateProbability(g, m, nu), p, 0);
    numerics = `the integrals over z and over √(χ²/ν) by composite Gauss–Legendre quadrature (${panels} panels of ${points} points each), Φ by Marsaglia's series, root by the Illinois method to 1e-13 relative`;
  }
  const result: EquicoordinatePoint = {
    dimension: m,
    df: Number.isFinite(nu) ? nu : null,
    correlation: 0.5,
    probability: p,
    value,
    residual: equicoordinateProbability(value, m, nu) - p,
    equation: EQUATION,
    numerics,
  };
  cache.set(key, result);
  return result;
}
