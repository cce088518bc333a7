/**
 * The unit in the last place of a double: the gap between |x| and the next larger double, 2^(e − 52)
 * for a normal |x| in [2^e, 2^(e+1)), and 2^−1074 below the normal range. A time t read as a
 * double is within ulp(t)/2 of the number written; a duration between two such times is within
 * ulp(t) of the true one, so it keeps about log10(duration / ulp(t)) significant digits.
 *
 * Reference: IEEE 754-2008 binary64 (52 fraction bits); ulp as in D. Goldberg (1991), "What every
 * computer scientist should know about floating-point arithmetic", ACM Computing Surveys 23(1),
 * section 1.2 (the gap between consecutive doubles of the exponent of x).
 *
 * Example: `ulp(1)` is 2^−52 = 2.220446049250313e-16; `ulp(1e9)` is 2^−23 = 1.1920928955078125e-7.
 */
export function ulp(x: number): number {
  const a = Math.abs(x);
  if (!Number.isFinite(a)) return NaN;
  if (a < 2 ** -1022) return 2 ** -1074;
  // The exponent from the bits, so no rounding of log2 can be off by one at a power of 2.
  const view = new DataView(new ArrayBuffer(8));
  view.setFloat64(0, a);
  const exponent = ((view.getUint16(0) >> 4) & 0x7ff) - 1023;
  return 2 ** (exponent - 52);
}
