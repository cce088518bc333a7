import { describe, expect, it } from "vitest";
import { Adder } from "../../src/stats/adder.js";
import { fromDouble, integer, mul, sum, toNumber } from "./exact.js";
import { mixedMagnitudes, mulberry32 } from "./random.js";

const sumOf = (values: number[]): number => {
  const adder = new Adder();
  for (const x of values) adder.add(x);
  return adder.value();
};

describe("Adder", () => {
  it("add(1e16), add(1), add(-1e16) gives value() 1 where the naive sum gives 0", () => {
    // computed by hand: 1e16 + 1 rounds to 1e16 (ulp 2), so the naive sum loses the 1
    expect(1e16 + 1 - 1e16).toBe(0);
    expect(sumOf([1e16, 1, -1e16])).toBe(1);
  });

  it("value() of 10^6 terms 0.1 is the exactly rounded sum; the naive sum is off", () => {
    // reference: exact rational sum of the double 0.1 taken 10^6 times (BigInt arithmetic)
    const values = new Array<number>(1_000_000).fill(0.1);
    const exact = toNumber(mul(fromDouble(0.1), integer(1_000_000)));
    expect(sumOf(values)).toBe(exact);
    let naive = 0;
    for (const x of values) naive += x;
    expect(Math.abs(naive - exact)).toBeGreaterThan(1e-7);
  });

  it("value() of mixed magnitudes is within Neumaier's error bound of the exact sum", () => {
    // reference: exact rational sum (BigInt); bound: Neumaier 1974, error ≤ 2u·|sum| + O(n u²)Σ|x|
    const uniform = mulberry32(7);
    for (let trial = 0; trial < 20; trial++) {
      const values = mixedMagnitudes(500, uniform);
      const exact = toNumber(sum(values.map(fromDouble)));
      const abs = values.reduce((s, x) => s + Math.abs(x), 0);
      const tolerance = 2 * Number.EPSILON * Math.abs(exact) + 500 * 500 * Number.EPSILON ** 2 * abs;
      expect(Math.abs(sumOf(values) - exact)).toBeLessThanOrEqual(tolerance);
    }
  });

  it("reset() starts a new sum at 0", () => {
    // computed by hand
    const adder = new Adder();
    adder.add(1e16);
    adder.add(1);
    adder.reset();
    expect(adder.value()).toBe(0);
    adder.add(0.5);
    expect(adder.value()).toBe(0.5);
  });

  it("value() is Infinity once an infinite term is added (no NaN from the compensation)", () => {
    // common practice: IEEE 754 sum of a finite number and +Infinity is +Infinity
    expect(sumOf([1, Infinity, 2])).toBe(Infinity);
  });
});
