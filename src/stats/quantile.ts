/** Where a type 7 sample quantile falls among the order statistics (0-based). */
export interface QuantilePosition {
  /** h = (n − 1)·p. */
  h: number;
  /** ⌊h⌋: the lower order statistic's index. */
  lo: number;
  /** min(⌊h⌋ + 1, n − 1): the upper order statistic's index. */
  hi: number;
  /** h − ⌊h⌋: the weight of the upper order statistic. */
  fraction: number;
}

/**
 * The position of the Hyndman–Fan type 7 sample quantile: h = (n − 1)·p, between the order
 * statistics ⌊h⌋ and ⌊h⌋ + 1 (0-based) with weight h − ⌊h⌋ on the upper one.
 *
 * Reference: R. J. Hyndman and Y. Fan (1996), "Sample Quantiles in Statistical Packages", The
 * American Statistician 50(4), 361–365.
 *
 * Example: `quantilePosition(5, 0.9)` gives h 3.6, lo 3, hi 4, fraction 0.6000000000000001
 * (3.6 − 3 in binary floating point).
 *
 * Throws a plain `Error` when n < 1 or p is outside [0, 1].
 */
export function quantilePosition(n: number, p: number): QuantilePosition {
  if (!(Number.isInteger(n) && n >= 1)) throw new Error(`quantilePosition: n must be a positive integer, got ${n}`);
  if (!(p >= 0 && p <= 1)) throw new Error(`quantilePosition: p must lie in [0, 1], got ${p}`);
  const h = (n - 1) * p;
  const lo = Math.floor(h);
  return { h, lo, hi: Math.min(lo + 1, n - 1), fraction: h - lo };
}

/**
 * Hyndman–Fan type 7 sample quantile of values sorted in increasing order: linear interpolation
 * x_(lo) + (x_(lo+1) − x_(lo))·(h − lo) between the order statistics around h = (n − 1)·p
 * (0-based); p = 0 gives the minimum, p = 1 the maximum.
 *
 * Reference: R. J. Hyndman and Y. Fan (1996), "Sample Quantiles in Statistical Packages", The
 * American Statistician 50(4), 361–365 (definition 7).
 *
 * Example: `quantileSorted([1, 2, 3, 4], 0.5)` gives 2.5; `quantileSorted([10, 20, 30, 40, 50], 0.25)`
 * gives 20.
 *
 * Throws a plain `Error` when `sorted` is empty or p is outside [0, 1]. The order is not checked.
 */
export function quantileSorted(sorted: ArrayLike<number>, p: number): number {
  const { lo, hi, fraction } = quantilePosition(sorted.length, p);
  return interpolate7(sorted[lo], sorted[hi], fraction);
}

/**
 * The type 7 interpolation between the order statistics around a quantile's position:
 * low + (high − low)·fraction, and exactly `low` when the fraction is 0.
 *
 * Example: `interpolate7(2, 3, 0.5)` gives 2.5.
 */
export function interpolate7(low: number, high: number, fraction: number): number {
  if (fraction === 0) return low;
  return low + (high - low) * fraction;
}

/**
 * The share of values at most x (the empirical distribution function at x), by binary search in
 * values sorted in increasing order: (number of values ≤ x) / n.
 *
 * Example: `shareAtMost([1, 2, 2, 5], 2)` gives 0.75; `shareAtMost([1, 2, 2, 5], 0)` gives 0.
 *
 * Throws a plain `Error` when `sorted` is empty.
 */
export function shareAtMost(sorted: ArrayLike<number>, x: number): number {
  const n = sorted.length;
  if (n === 0) throw new Error("shareAtMost: no values");
  let lo = 0;
  let hi = n;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (sorted[mid] <= x) lo = mid + 1;
    else hi = mid;
  }
  return lo / n;
}
