/**
 * Exact rational arithmetic with BigInt, to compute reference values in the tests without any
 * rounding: every double is a rational number m·2^e, every decimal string a rational number
 * m/10^k, and sums, products and quotients of rationals are exact. Only the final conversion to
 * a double rounds (once, to nearest).
 */
export interface Rational {
  num: bigint;
  /** Always > 0. */
  den: bigint;
}

const ZERO: Rational = { num: 0n, den: 1n };

function gcd(a: bigint, b: bigint): bigint {
  if (a < 0n) a = -a;
  while (b !== 0n) [a, b] = [b, a % b];
  return a;
}

function make(num: bigint, den: bigint): Rational {
  if (den < 0n) [num, den] = [-num, -den];
  const g = gcd(num, den);
  return g > 1n ? { num: num / g, den: den / g } : { num, den };
}

export const add = (a: Rational, b: Rational): Rational =>
  a.den === b.den ? make(a.num + b.num, a.den) : make(a.num * b.den + b.num * a.den, a.den * b.den);
export const sub = (a: Rational, b: Rational): Rational => add(a, { num: -b.num, den: b.den });
export const mul = (a: Rational, b: Rational): Rational => make(a.num * b.num, a.den * b.den);
export const div = (a: Rational, b: Rational): Rational => make(a.num * b.den, a.den * b.num);
export const integer = (n: number): Rational => ({ num: BigInt(n), den: 1n });
export const abs = (a: Rational): Rational => ({ num: a.num < 0n ? -a.num : a.num, den: a.den });
export const compare = (a: Rational, b: Rational): number => {
  const d = a.num * b.den - b.num * a.den;
  return d < 0n ? -1 : d > 0n ? 1 : 0;
};

/** The exact value of a finite double. */
export function fromDouble(x: number): Rational {
  if (!Number.isFinite(x)) throw new Error(`not finite: ${x}`);
  const view = new DataView(new ArrayBuffer(8));
  view.setFloat64(0, x);
  const bits = view.getBigUint64(0);
  const negative = bits >> 63n === 1n;
  const exponent = Number((bits >> 52n) & 0x7ffn);
  let mantissa = bits & 0xfffffffffffffn;
  let e: number;
  if (exponent === 0) e = -1074;
  else {
    mantissa |= 1n << 52n;
    e = exponent - 1075;
  }
  const m = negative ? -mantissa : mantissa;
  return e >= 0 ? make(m << BigInt(e), 1n) : make(m, 1n << BigInt(-e));
}

/** The exact value of a plain decimal string such as "-177.435" or "2.00180". */
export function fromDecimal(s: string): Rational {
  const match = /^([+-]?)(\d*)(?:\.(\d*))?$/.exec(s.trim());
  if (!match) throw new Error(`not a plain decimal: ${s}`);
  const [, sign, whole, fraction = ""] = match;
  const digits = BigInt(`${whole}${fraction}` || "0");
  return make(sign === "-" ? -digits : digits, 10n ** BigInt(fraction.length));
}

const bitLength = (n: bigint): number => (n === 0n ? 0 : n.toString(2).length);

/** The double nearest to a rational (ties to even), for results in the normal range. */
export function toNumber(r: Rational): number {
  if (r.num === 0n) return 0;
  const negative = r.num < 0n;
  const num = negative ? -r.num : r.num;
  // Scale so the integer quotient has at least 64 bits; a sticky bit keeps the rounding exact.
  const k = Math.max(0, 66 + bitLength(r.den) - bitLength(num));
  const scaled = num << BigInt(k);
  let q = scaled / r.den;
  if (scaled % r.den !== 0n) q |= 1n;
  let value = Number(q);
  for (let left = k; left > 0; left -= Math.min(left, 1000)) value /= 2 ** Math.min(left, 1000);
  return negative ? -value : value;
}

function isqrt(n: bigint): bigint {
  if (n < 2n) return n;
  let x = 1n << BigInt(Math.ceil(bitLength(n) / 2));
  while (true) {
    const y = (x + n / x) >> 1n;
    if (y >= x) return x;
    x = y;
  }
}

/** √r rounded to a double (relative error below 2^-60 before the final rounding). */
export function sqrtToNumber(r: Rational): number {
  if (r.num < 0n) throw new Error("square root of a negative number");
  // √(num/den) = √(num·den·4^k) / (den·2^k)
  const k = 70n + BigInt(bitLength(r.den));
  return toNumber({ num: isqrt(r.num * r.den << (2n * k)), den: r.den << k });
}

export const sum = (values: Rational[]): Rational => values.reduce(add, ZERO);

/** Exact mean, n − 1 sample variance and NIST lag-1 autocorrelation of rational data. */
export function exactMoments(values: Rational[]): { mean: Rational; variance: Rational; lag1: Rational } {
  const n = integer(values.length);
  const mean = div(sum(values), n);
  const deviations = values.map((x) => sub(x, mean));
  const squares = sum(deviations.map((d) => mul(d, d)));
  const products = sum(deviations.slice(1).map((d, i) => mul(d, deviations[i])));
  return {
    mean,
    variance: div(squares, integer(values.length - 1)),
    lag1: div(products, squares),
  };
}
