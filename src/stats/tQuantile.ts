import { createRequire } from "node:module";
import { precompiled } from "../precompiled.js";

type Quantile = (p: number, df: number) => number;
let quantile: Quantile | null = null;

/**
 * Loads stdlib's t quantile: the one-file bundle `npm run build` makes of it
 * (`dist/stats/tQuantileBundle.cjs`, about 0.02 s to load), else the package itself (414 small
 * modules, about 0.12 s; run from the TypeScript sources). `tQuantile` loads it on first use; a
 * command may call this earlier, at a moment when the main thread waits anyway.
 */
export function loadTQuantile(): Quantile {
  quantile ??=
    precompiled<Quantile>(import.meta.url, "./tQuantileBundle.cjs") ??
    (createRequire(import.meta.url)("@stdlib/stats-base-dists-t-quantile") as Quantile);
  return quantile;
}

/**
 * The quantile of Student's t distribution: the t with P(T ≤ t) = p for T with `df` degrees of
 * freedom. `df` may be any positive real (Welch–Satterthwaite degrees of freedom are not whole).
 *
 * Computed by stdlib's `@stdlib/stats-base-dists-t-quantile` (inverse of the regularized
 * incomplete beta function). Reference: W. S. Gosset ("Student") (1908), "The Probable Error of
 * a Mean", Biometrika 6(1), 1–25.
 *
 * Example: `tQuantile(0.975, 10)` gives 2.2281388519862744 (printed tables: 2.228).
 *
 * Throws a plain `Error` (a programming error, not a user error) when p is not strictly between
 * 0 and 1 or df is not a finite number greater than 0.
 */
export function tQuantile(p: number, df: number): number {
  if (!(p > 0 && p < 1)) throw new Error(`tQuantile: p must lie strictly between 0 and 1, got ${p}`);
  if (!(df > 0 && Number.isFinite(df))) {
    throw new Error(`tQuantile: df must be a finite number greater than 0, got ${df}`);
  }
  return (quantile ?? loadTQuantile())(p, df);
}
