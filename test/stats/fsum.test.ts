import { describe, expect, it } from "vitest";
import { fsum } from "../../src/stats/fsum.js";
import { fromDouble, sum, toNumber } from "./exact.js";
import { mixedMagnitudes, mulberry32, shuffled } from "./random.js";

describe("fsum", () => {
  it("fsum([1e16, 1, -1e16]) is 1", () => {
    // computed by hand: the exact sum is 1
    expect(fsum([1e16, 1, -1e16])).toBe(1);
  });

  it("fsum([0.1, 0.2, 0.3]) is 0.6, the double nearest the exact sum", () => {
    // reference: exact rational sum of the three doubles (BigInt), rounded once
    expect(fsum([0.1, 0.2, 0.3])).toBe(toNumber(sum([0.1, 0.2, 0.3].map(fromDouble))));
    expect(fsum([0.1, 0.2, 0.3])).toBe(0.6);
  });

  it("fsum of mixed magnitudes equals the exactly rounded sum and is the same for every order", () => {
    // reference: exact rational sum (BigInt) rounded once to nearest (Shewchuk 1997; Python math.fsum)
    const uniform = mulberry32(20240611);
    for (let trial = 0; trial < 20; trial++) {
      const values = mixedMagnitudes(1000, uniform);
      const exact = toNumber(sum(values.map(fromDouble)));
      expect(fsum(values)).toBe(exact);
      for (let k = 0; k < 5; k++) expect(fsum(shuffled(values, uniform))).toBe(exact);
    }
  });

  it("fsum rounds a half-way sum to even", () => {
    // computed by hand: 1 + 2^-53 is half-way between 1 and 1 + 2^-52 and rounds to even (1);
    // with a further 2^-106 the exact sum lies above half-way and rounds up
    expect(fsum([1, 2 ** -53])).toBe(1);
    expect(fsum([1, 2 ** -53, 2 ** -106])).toBe(1 + 2 ** -52);
    expect(fsum([2 ** -106, 2 ** -53, 1])).toBe(1 + 2 ** -52);
  });

  it("fsum([]) is 0 and non-finite terms give their IEEE 754 sum", () => {
    // common practice (as Python's math.fsum)
    expect(fsum([])).toBe(0);
    expect(fsum([1, Infinity])).toBe(Infinity);
    expect(fsum([Infinity, -Infinity])).toBeNaN();
    expect(fsum([Number.MAX_VALUE, Number.MAX_VALUE])).toBe(Infinity);
  });
});
