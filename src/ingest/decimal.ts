/**
 * Decimal numbers of run files, read straight from bytes.
 *
 * Grammar (contract section 1, "a number"): optional spaces, `[+-]?(digits[.digits]|.digits)`,
 * an optional exponent `[eE][+-]?digits`, optional spaces. No hex, no `Infinity`, no `NaN`. The
 * value is the one `Number()` gives for the same text: the correctly rounded double.
 *
 * Fast path (Clinger 1990, "How to read floating point numbers accurately"): when the decimal
 * digits form an integer mantissa m < 2^53 and the scale is 10^k with |k| <= 22, both m and 10^|k|
 * are exact doubles, so one IEEE multiplication or division rounds m * 10^k correctly. Example:
 * `"12.375"` -> m = 12375, k = -3, 12375 / 1000 = 12.375. Anything else goes to `Number()` on the
 * text, after the grammar is checked.
 */

const POW10 = [
  1e0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19,
  1e20, 1e21, 1e22,
];
const TWO_53 = 9007199254740992;

const SPACE = 32;
const TAB = 9;
const CR = 13;

/** Where the last `scanDecimal` stopped: the first byte after the number and its trailing spaces. */
export const scanned = { end: 0 };

/**
 * The fast path: reads a decimal from `buf[p..lim)` and returns its value, or NaN when it cannot
 * (no digits, a malformed exponent, a mantissa of 2^53 or more, or a scale beyond 10^±22). Leading
 * spaces and tabs are skipped; trailing spaces, tabs and a carriage return are skipped too, and
 * `scanned.end` is set to the byte after them. The caller checks that this byte ends the field.
 *
 * @example scanDecimal(Buffer.from("-0.25,x"), 0, 7) // -0.25, scanned.end === 5
 */
export function scanDecimal(buf: Uint8Array, p: number, lim: number): number {
  let c: number;
  while (p < lim && ((c = buf[p]) === SPACE || c === TAB)) p++;
  let negative = false;
  if (p < lim) {
    c = buf[p];
    if (c === 45) {
      negative = true;
      p++;
    } else if (c === 43) p++;
  }
  let m = 0;
  let digits = 0;
  let fraction = 0;
  while (p < lim && (c = buf[p] - 48) >= 0 && c <= 9) {
    m = m * 10 + c;
    p++;
    digits++;
  }
  if (p < lim && buf[p] === 46) {
    p++;
    while (p < lim && (c = buf[p] - 48) >= 0 && c <= 9) {
      m = m * 10 + c;
      p++;
      digits++;
      fraction++;
    }
  }
  if (digits === 0) return NaN;
  let exponent = 0;
  if (p < lim && (buf[p] | 32) === 101) {
    p++;
    let negativeExponent = false;
    if (p < lim) {
      c = buf[p];
      if (c === 45) {
        negativeExponent = true;
        p++;
      } else if (c === 43) p++;
    }
    let exponentDigits = 0;
    while (p < lim && (c = buf[p] - 48) >= 0 && c <= 9) {
      exponent = exponent * 10 + c;
      p++;
      exponentDigits++;
    }
    if (exponentDigits === 0) return NaN;
    if (negativeExponent) exponent = -exponent;
  }
  while (p < lim && ((c = buf[p]) === SPACE || c === TAB || c === CR)) p++;
  scanned.end = p;
  // m only grows digit by digit (rounding is monotone), so m < 2^53 at the end means every step was exact.
  if (m >= TWO_53) return NaN;
  const k = exponent - fraction;
  let v: number;
  if (k === 0) v = m;
  else if (k > 0 && k <= 22) v = m * POW10[k];
  else if (k < 0 && k >= -22) v = m / POW10[-k];
  else return NaN;
  return negative ? -v : v;
}

const DECIMAL = /^[ \t]*[+-]?(?:[0-9]+(?:\.[0-9]*)?|\.[0-9]+)(?:[eE][+-]?[0-9]+)?[ \t]*$/;
const BLANK = /^[ \t\r]*$/;

/**
 * A decimal cell given as text (a quoted CSV field, a JSON string): NaN when blank, the value when
 * it follows the grammar and is finite, `undefined` when it is not a finite decimal number.
 *
 * @example parseDecimalText(" 1.5e3 ") // 1500
 * @example parseDecimalText("0x10") // undefined
 */
export function parseDecimalText(text: string): number | undefined {
  if (BLANK.test(text)) return NaN;
  if (text.endsWith("\r")) text = text.slice(0, -1);
  if (!DECIMAL.test(text)) return undefined;
  const x = Number(text);
  return Number.isFinite(x) ? x : undefined;
}

/**
 * The slow path for an unquoted field `buf[a..b)`: same result as `parseDecimalText` on its text.
 * Blank fields return NaN without making a string.
 */
export function parseDecimalBytes(buf: Buffer, a: number, b: number): number | undefined {
  let c: number;
  while (a < b && ((c = buf[a]) === SPACE || c === TAB || c === CR)) a++;
  while (b > a && ((c = buf[b - 1]) === SPACE || c === TAB || c === CR)) b--;
  if (a === b) return NaN;
  return parseDecimalText(buf.toString("latin1", a, b));
}
