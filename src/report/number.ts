/**
 * The report's one rounding rule. Every number a reader sees passes through `formatNumber`
 * (or `formatPercent`, which applies the same rule to a share times 100).
 *
 * Rule: round to 4 significant digits, but never drop a whole-number digit (1234.567 -> "1235",
 * 123456.7 -> "123457"); drop trailing zeros after the decimal point (2.500 -> "2.5"); plain
 * notation for 1e-6 <= |x| < 1e15, otherwise scientific with 4 significant digits
 * ("1.235e-7"); a missing value is shown as an em dash. `results.json` keeps full precision.
 */

/** Significant digits kept by the rounding rule. */
export const SIGNIFICANT_DIGITS = 4;

/** Shown where a number is missing (null, or not finite). */
export const MISSING = "—";

const PLAIN_MIN = 1e-6;
const PLAIN_MAX = 1e15;

function stripZeros(s: string): string {
  if (!s.includes(".")) return s;
  return s.replace(/\.?0+$/, "");
}

/**
 * Rounds a number for reading by the report's rule.
 *
 * @example formatNumber(2.34567) // "2.346"
 * @example formatNumber(12345.67) // "12346"
 * @example formatNumber(0.000123456) // "0.0001235"
 * @example formatNumber(3e-9) // "3e-9"
 */
export function formatNumber(x: number | null | undefined): string {
  if (x === null || x === undefined || !Number.isFinite(x)) return MISSING;
  if (x === 0) return "0";
  const abs = Math.abs(x);
  let s: string;
  if (abs >= PLAIN_MAX || abs < PLAIN_MIN) {
    const [mantissa, exponent] = x.toExponential(SIGNIFICANT_DIGITS - 1).split("e");
    s = `${stripZeros(mantissa)}e${exponent.replace(/^\+/, "")}`;
  } else if (abs >= 10 ** (SIGNIFICANT_DIGITS - 1)) {
    s = String(Math.sign(x) * Math.round(abs));
  } else {
    s = stripZeros(x.toPrecision(SIGNIFICANT_DIGITS));
  }
  return s === "-0" ? "0" : s;
}

/** A share (0.042) shown as a percentage by the same rule ("4.2 %"). */
export function formatPercent(share: number | null | undefined): string {
  if (share === null || share === undefined || !Number.isFinite(share)) return MISSING;
  return `${formatNumber(share * 100)} %`;
}
