import { describe, expect, it } from "vitest";
import { parseDecimalBytes, parseDecimalText, scanDecimal, scanned } from "../../src/ingest/decimal.js";
import { seeded } from "./helpers.js";

/** A random decimal in the run-file grammar: sign, long or short mantissa, point, exponent, spaces. */
function randomDecimal(random: () => number): string {
  const pick = <T>(xs: T[]): T => xs[Math.floor(random() * xs.length)];
  const digits = (n: number): string => Array.from({ length: n }, () => String(Math.floor(random() * 10))).join("");
  const sign = pick(["", "", "-", "+"]);
  const whole = digits(pick([0, 1, 1, 2, 3, 5, 8, 12, 16, 17, 20, 25]));
  const point = random() < 0.7;
  let fraction = point ? digits(pick([0, 1, 2, 3, 4, 6, 9, 15, 17, 22, 23, 30])) : "";
  if (whole === "" && fraction === "") fraction = digits(1 + Math.floor(random() * 5));
  const body = point || whole === "" ? `${whole}.${fraction}` : whole;
  const exponent =
    random() < 0.35 ? `${pick(["e", "E"])}${pick(["", "+", "-"])}${Math.floor(random() ** 3 * 420)}` : "";
  const pad = () => pick(["", "", "", " ", "  ", "\t"]);
  return `${pad()}${sign}${body}${exponent}${pad()}`;
}

describe("scanDecimal / parseDecimalBytes", () => {
  it("agree with Number() exactly on 50,000 seeded random decimal strings, and the fast path takes most short ones", () => {
    const random = seeded(20240611);
    let fast = 0;
    let short = 0;
    for (let i = 0; i < 50_000; i++) {
      const text = randomDecimal(random);
      const bytes = Buffer.from(text, "latin1");
      const expected = Number(text); // ECMAScript StringToNumber: the correctly rounded double (common practice)
      const slow = parseDecimalBytes(bytes, 0, bytes.length);
      // CONTRACT.md section 1: a non-finite number (1e400) is rejected; a finite one is Number()'s value
      if (Number.isFinite(expected)) expect(Object.is(slow, expected), text).toBe(true);
      else expect(slow, text).toBeUndefined();
      const quick = scanDecimal(bytes, 0, bytes.length);
      if (quick === quick) {
        fast++;
        expect(Object.is(quick, expected), text).toBe(true); // Clinger 1990: one exact operation, correctly rounded
        expect(scanned.end).toBe(bytes.length); // trailing spaces are part of the number's span
      }
      // computed by hand: at most 12 characters and no exponent means a mantissa < 10^12 < 2^53 and a
      // scale of at most 10^-11, so the fast path must take it
      if (text.trim().length <= 12 && !/[eE]/.test(text)) {
        short++;
        expect(quick, text).not.toBeNaN();
      }
    }
    expect(short).toBeGreaterThan(10_000);
    expect(fast).toBeGreaterThanOrEqual(short);
  });

  it("parseDecimalText reads signs, '.5', '5.', spaces and negative zero as Number() does", () => {
    // computed by hand
    expect(Object.is(parseDecimalText("-0"), -0)).toBe(true);
    expect(Object.is(parseDecimalText("-0.0e5"), -0)).toBe(true);
    expect(parseDecimalText("+7")).toBe(7);
    expect(parseDecimalText(".5")).toBe(0.5);
    expect(parseDecimalText("5.")).toBe(5);
    expect(parseDecimalText("  12.25\t")).toBe(12.25);
    expect(parseDecimalText("1E3")).toBe(1000);
    expect(parseDecimalText("1e-400")).toBe(0); // underflow is finite (common practice: IEEE 754 rounding)
    // common practice: Number() of the same text is the correctly rounded double
    expect(parseDecimalText("9007199254740993")).toBe(Number("9007199254740993"));
    expect(parseDecimalText("0.1")).toBe(0.1);
    expect(parseDecimalText("1e23")).toBe(1e23);
  });

  it("parseDecimalText treats blank as NaN and rejects hex, Infinity, NaN, overflow and malformed text", () => {
    // CONTRACT.md section 1 (finite numbers only) and the reader's grammar (no hex, no Infinity)
    expect(parseDecimalText("")).toBeNaN();
    expect(parseDecimalText("   ")).toBeNaN();
    for (const bad of ["0x10", "Infinity", "-Infinity", "NaN", "1e400", "1.2.3", "e5", ".", "1e", "--1", "1 2", "1,5", "½"]) {
      expect(parseDecimalText(bad), bad).toBeUndefined();
      const bytes = Buffer.from(bad, "utf8");
      expect(parseDecimalBytes(bytes, 0, bytes.length), bad).toBeUndefined();
      const quick = scanDecimal(bytes, 0, bytes.length);
      // the fast path either declines or stops before the bad part, never consuming all of it
      expect(quick !== quick || scanned.end < bytes.length, bad).toBe(true);
    }
  });

  it("scanDecimal stops at the comma after a number and reports where", () => {
    // computed by hand: "-0.25" is 5 bytes, then 2 spaces, then the comma at index 7
    const bytes = Buffer.from("-0.25  ,x");
    expect(scanDecimal(bytes, 0, bytes.length)).toBe(-0.25);
    expect(scanned.end).toBe(7);
  });

  it("reads doubles printed in full (16 to 18 digits) exactly, on the wide path, near halfway points too", () => {
    const random = seeded(20261201);
    let wide = 0;
    let total = 0;
    const check = (text: string) => {
      const bytes = Buffer.from(text, "latin1");
      const quick = scanDecimal(bytes, 0, bytes.length);
      total++;
      if (quick === quick) {
        wide++;
        // common practice: Number() of the same text is the correctly rounded double
        expect(Object.is(quick, Number(text)), text).toBe(true);
      }
    };
    for (let i = 0; i < 20_000; i++) {
      const x = random() * 10 ** Math.floor(random() * 12 - 3);
      check(String(x)); // the shortest round-trip form: up to 17 significant digits
      check(x.toPrecision(17));
      // The exact decimal of the midpoint between x and the next double up, cut to 16-18
      // significant digits and nudged by one in the last digit: the hardest cases for rounding.
      // Midpoint of M * 2^E and (M + 1) * 2^E is (2M + 1) * 2^(E - 1), written with BigInt.
      const bitsOf = new DataView(new ArrayBuffer(8));
      bitsOf.setFloat64(0, x);
      const raw = bitsOf.getBigUint64(0);
      const exp = Number((raw >> 52n) & 0x7ffn);
      if (exp === 0) continue;
      const M = (raw & ((1n << 52n) - 1n)) | (1n << 52n);
      const E = exp - 1075;
      const twoE = E - 1;
      // midpoint = (2M + 1) * 2^twoE = (2M + 1) * 5^-twoE / 10^-twoE  when twoE < 0
      if (twoE >= 0) continue;
      const digits = ((2n * M + 1n) * 5n ** BigInt(-twoE)).toString();
      const point = digits.length + twoE; // digits before the decimal point
      for (const keep of [16, 17, 18]) {
        for (const nudge of [-1n, 0n, 1n]) {
          const cut = (BigInt(digits.slice(0, keep)) + nudge).toString().padStart(keep, "0");
          const text = point <= 0 ? `0.${"0".repeat(-point)}${cut}` : point >= keep ? cut + "0".repeat(point - keep) : `${cut.slice(0, point)}.${cut.slice(point)}`;
          check(text);
        }
      }
    }
    // the wide path takes nearly all of them (measured: over 95 %); the rest go to Number()
    expect(wide / total).toBeGreaterThan(0.9);
  });
});
