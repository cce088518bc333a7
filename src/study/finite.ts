/**
 * Results hold finite numbers only (contract section 8: JSON numbers; JSON would write NaN or
 * Infinity as null without a word). Finite inputs can still overflow: a level of 1e308 held for
 * 10 time units has an area beyond the largest double. The study checks each figure it computes
 * and turns an overflow into an input error that says which figure.
 */

/** The path of the first NaN or ±Infinity inside `x` (`area`, `quantiles.0.9`), or null. */
export function nonFinitePath(x: unknown, path = ""): string | null {
  if (typeof x === "number") return Number.isFinite(x) ? null : path;
  if (x === null || typeof x !== "object") return null;
  for (const [k, v] of Object.entries(x)) {
    const found = nonFinitePath(v, path === "" ? k : `${path}.${k}`);
    if (found !== null) return found;
  }
  return null;
}
