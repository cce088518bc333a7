/**
 * The exactly rounded sum of floating-point numbers: Shewchuk's adaptive partials, with the final
 * round-half-even correction as in Python's `math.fsum`.
 *
 * The running sum is kept exactly as a list of non-overlapping partials (each new term is added
 * with error-free two-sums); at the end the partials are added from the largest down and the last
 * rounding is corrected. The result is the exact real sum rounded once to the nearest double, so
 * it does not depend on the order of the terms.
 *
 * Reference: J. R. Shewchuk (1997), "Adaptive Precision Floating-Point Arithmetic and Fast Robust
 * Geometric Predicates", Discrete & Computational Geometry 18, 305–363.
 *
 * Example: `fsum([1e16, 1, -1e16]) === 1`; `fsum([0.1, 0.2, 0.3]) === 0.6` (the naive sum gives
 * 0.6000000000000001).
 *
 * Non-finite terms: the result is the naive sum of the non-finite terms (±Infinity or NaN). A sum
 * whose intermediate partials overflow returns ±Infinity.
 */
export function fsum(values: ArrayLike<number>): number {
  // The partials live in a typed array with a count (no array resizing per term); they are
  // non-overlapping doubles, so there are at most about 40 of them.
  let partials = new Float64Array(32);
  let count = 0;
  let special = 0;
  let hasSpecial = false;
  for (let k = 0; k < values.length; k++) {
    let x = values[k];
    if (!Number.isFinite(x)) {
      special += x;
      hasSpecial = true;
      continue;
    }
    let i = 0;
    for (let j = 0; j < count; j++) {
      let y = partials[j];
      if (Math.abs(x) < Math.abs(y)) {
        const t = x;
        x = y;
        y = t;
      }
      const hi = x + y;
      if (!Number.isFinite(hi)) return hi;
      const lo = y - (hi - x);
      if (lo !== 0) partials[i++] = lo;
      x = hi;
    }
    if (i === partials.length) {
      const bigger = new Float64Array(partials.length * 2);
      bigger.set(partials);
      partials = bigger;
    }
    partials[i] = x;
    count = i + 1;
  }
  if (hasSpecial) return special;
  return roundPartials(partials, count);
}

/** Adds non-overlapping partials (increasing magnitude) into one correctly rounded double. */
function roundPartials(partials: Float64Array, n: number): number {
  if (n === 0) return 0;
  let hi = partials[--n];
  let lo = 0;
  while (n > 0) {
    const x = hi;
    const y = partials[--n];
    hi = x + y;
    lo = y - (hi - x);
    if (lo !== 0) break;
  }
  // Half-way case: the remaining partials push the exact sum past the rounding point.
  if (n > 0 && ((lo < 0 && partials[n - 1] < 0) || (lo > 0 && partials[n - 1] > 0))) {
    const y = lo * 2;
    const x = hi + y;
    if (y === x - hi) hi = x;
  }
  return hi;
}
