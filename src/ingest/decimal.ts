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
 * `"12.375"` -> m = 12375, k = -3, 12375 / 1000 = 12.375. A wide path (`wideDecimal`) takes the
 * 16-18 digit mantissas that doubles printed in full have, with an exact residual check. Anything
 * else goes to `Number()` on the text, after the grammar is checked.
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
export const scanned = { end: 0, negative: false };

/**
 * The fast path: reads a decimal from `buf[p..lim)` and returns its value, or NaN when it cannot
 * (no digits, a malformed exponent, a mantissa of 2^53 or more, or a scale beyond 10^±22). Leading
 * spaces and tabs are skipped; trailing spaces, tabs and a carriage return are skipped too, and
 * `scanned.end` is set to the byte after them. The caller checks that this byte ends the field.
 *
 * @example scanDecimal(Buffer.from("-0.25,x"), 0, 7) // -0.25, scanned.end === 5
 */
export function scanDecimal(buf: Uint8Array, p: number, lim: number): number {
  // Kept small enough for the optimizing compiler to inline it into the row parsers: the rare
  // parts (leading spaces and signs, exponents, trailing spaces, long mantissas) are helpers.
  let negative = false;
  let c = p < lim ? buf[p] : 0;
  if (c === SPACE || c === TAB || c === 45 || c === 43) {
    p = skipLead(buf, p, lim);
    negative = scanned.negative;
  }
  // Digits gather in `a`, a small integer (kept within int32 arithmetic), nine at a time; each
  // full group of nine moves into the double `m`. That keeps the per-digit work on integers.
  let m = 0;
  let a = 0;
  let inA = 0;
  let dot = -1;
  const start = p;
  for (; p < lim; p++) {
    c = buf[p] - 48;
    if (c >= 0 && c <= 9) {
      if (inA === 9) {
        m = m * 1e9 + a;
        a = 0;
        inA = 0;
      }
      a = a * 10 + c;
      inA++;
    } else if (c === -2 && dot < 0) dot = p; // "."
    else break;
  }
  const fraction = dot < 0 ? 0 : p - dot - 1;
  if (p - start - (dot < 0 ? 0 : 1) === 0) return NaN;
  let exponent = 0;
  if (p < lim) {
    c = buf[p];
    if ((c | 32) === 101) {
      exponent = readExponent(buf, p + 1, lim);
      if (exponent !== exponent) return NaN;
      p = scanned.end;
      c = p < lim ? buf[p] : 0;
    }
    if (c === SPACE || c === TAB || c === CR) p = skipTrail(buf, p, lim);
  }
  scanned.end = p;
  return scaled(m, a, inA, exponent - fraction, negative);
}

/** Skips leading spaces and tabs and one sign; sets `scanned.negative`; returns the position after. */
function skipLead(buf: Uint8Array, p: number, lim: number): number {
  let c: number;
  while (p < lim && ((c = buf[p]) === SPACE || c === TAB)) p++;
  scanned.negative = false;
  if (p < lim) {
    c = buf[p];
    if (c === 45) {
      scanned.negative = true;
      p++;
    } else if (c === 43) p++;
  }
  return p;
}

/** The exponent digits after "e" at `p`, with their sign; NaN when there are none. Sets `scanned.end`. */
function readExponent(buf: Uint8Array, p: number, lim: number): number {
  let negative = false;
  let c: number;
  if (p < lim) {
    c = buf[p];
    if (c === 45) {
      negative = true;
      p++;
    } else if (c === 43) p++;
  }
  const start = p;
  let exponent = 0;
  while (p < lim && (c = buf[p] - 48) >= 0 && c <= 9) {
    exponent = exponent * 10 + c;
    p++;
  }
  scanned.end = p;
  if (p === start) return NaN;
  return negative ? -exponent : exponent;
}

function skipTrail(buf: Uint8Array, p: number, lim: number): number {
  let c: number;
  while (p < lim && ((c = buf[p]) === SPACE || c === TAB || c === CR)) p++;
  return p;
}

/** The value of the digits (m * 10^inA + a) times 10^k, when one exact step or the wide path gives it. */
function scaled(m: number, a: number, inA: number, k: number, negative: boolean): number {
  const prefix = m;
  m = m * POW10[inA] + a;
  let v: number;
  // m only grows (rounding is monotone), so m < 2^53 at the end means every step was exact.
  if (m >= TWO_53) {
    // 16 to 18 digits, as a double printed in full has: the wide path when the digits before the
    // last group were exact.
    if (prefix >= TWO_53 || k > 0 || k < -22 || m === Infinity) return NaN;
    v = wideDecimal(prefix, inA, a, -k);
  } else if (k === 0) v = m;
  else if (k > 0 && k <= 22) v = m * POW10[k];
  else if (k < 0 && k >= -22) v = m / POW10[-k];
  else return NaN;
  return negative ? -v : v;
}

/** Veltkamp's splitter 2^27 + 1: splits a double into two halves of at most 26 bits. */
const SPLITTER = 134217729;
const bits = new Float64Array(1);
const words = new Uint32Array(bits.buffer);
/** Index of the word holding the sign, the exponent and the top of the significand. */
const HIGH = new Uint8Array(new Uint16Array([1]).buffer)[0] === 1 ? 1 : 0;

/**
 * The exact product a * b as p + e, p = fl(a * b) (Dekker 1971, "A floating-point technique for
 * extending the available precision", Numerische Mathematik 18; no overflow at these sizes).
 */
function twoProduct(a: number, b: number): number {
  const p = a * b;
  let c = SPLITTER * a;
  const ah = c - (c - a);
  const al = a - ah;
  c = SPLITTER * b;
  const bh = c - (c - b);
  const bl = b - bh;
  productError = al * bl - (((p - ah * bh) - al * bh) - ah * bl);
  return p;
}
let productError = 0;

/**
 * The correctly rounded value of the integer M = prefix * 10^inA + a divided by 10^f (0 <= f <= 22),
 * for M >= 2^53 and prefix < 2^53 (so prefix is exact); NaN when the check below cannot decide.
 *
 * M is held exactly as s + t (Dekker's product, then Knuth's two-sum; t is a small integer). The
 * candidate is x = fl(s / 10^f). x is the nearest double to M / 10^f when |M - x * 10^f| is below
 * half a unit in the last place of x times 10^f (x not a power of two, so both of its neighbours are
 * one unit away); else, when the residual is beyond that half on one side, the neighbour of x on
 * that side may be (its residual is one unit less). Residuals are exact except for one rounding of
 * relative size 2^-53, so a margin of 2^-40 decides safely; a residual near a half (a tie, or a
 * doubt), or x a power of two, goes to `Number()`. Digits that long are what a double printed in
 * full gives.
 */
function wideDecimal(prefix: number, inA: number, a: number, f: number): number {
  const p1 = twoProduct(prefix, POW10[inA]);
  const e1 = productError;
  const s = p1 + a;
  const bb = s - p1;
  const e2 = p1 - (s - bb) + (a - bb); // Knuth's two-sum: p1 + a = s + e2 exactly
  const t = e1 + e2; // both integers below 2^40 here: exact
  if (f === 0) return s + t; // one rounding of the exact M
  const D = POW10[f];
  const x = s / D;
  const p = twoProduct(x, D);
  const r = s - p + t - productError; // s - p exact (Sterbenz), + t exact (small integers)
  bits[0] = x;
  const high = words[HIGH];
  const exp = (high >>> 20) & 0x7ff;
  if (((high & 0xfffff) === 0 && words[1 - HIGH] === 0) || exp <= 52) return NaN;
  words[HIGH] = (exp - 52) << 20;
  words[1 - HIGH] = 0;
  const ulp = bits[0];
  const unit = ulp * D; // ulp(x) * 10^f, exact
  const near = unit * (0.5 - MARGIN);
  if (Math.abs(r) < near) return x;
  // The division rounded s, not M: the answer may be the neighbour on the residual's side.
  const r2 = r > 0 ? r - unit : r + unit;
  if (Math.abs(r) > unit * (0.5 + MARGIN) && Math.abs(r2) < near) return r > 0 ? x + ulp : x - ulp;
  return NaN;
}

/** Relative doubt allowed for in the residual (its one rounding is 2^-53 at most). */
const MARGIN = 2 ** -40;

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
