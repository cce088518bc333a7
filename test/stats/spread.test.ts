import { describe, expect, it } from "vitest";
import { spread } from "../../src/stats/spread.js";
import { exactMoments, fromDouble, sqrtToNumber } from "./exact.js";
import { mulberry32, shuffled } from "./random.js";

describe("spread", () => {
  it("spread([3, 5, 10]) gives every intermediate exactly", () => {
    // computed by hand
    expect(spread([3, 5, 10])).toEqual({
      n: 3, sum: 18, mean: 6, deviations: [-3, -1, 4], squared: [9, 1, 16], sum_squared: 26, mean_correction: 0, variance: 13, sd: Math.sqrt(13),
    });
  });

  it("spread of a large offset with a small spread keeps the variance (two-pass, no cancellation)", () => {
    // computed by hand: 1e9 + {0.25, 0.75} are doubles; deviations ±0.25, variance 2·0.0625/1
    expect(spread([1e9 + 0.25, 1e9 + 0.75]).variance).toBe(0.125);
  });

  it("spread corrects for the rounding of the mean: 1e16, 1e16 + 2, 1e16 + 2 give the exact variance 4/3 to an ulp", () => {
    // computed by hand: the mean 1e16 + 4/3 rounds to 1e16 + 2 (doubles are 2 apart there);
    // deviations −2, 0, 0: Σd² = 4, (Σd)²/3 = 4/3, variance (4 − 4/3)/2 = 4/3 (exact: mean 1e16 + 4/3,
    // squares 16/9 + 4/9 + 4/9 = 8/3, / 2 = 4/3)
    const s = spread([1e16, 1e16 + 2, 1e16 + 2]);
    expect([s.mean, s.sum_squared, s.mean_correction]).toEqual([1e16 + 2, 4, 4 / 3]);
    // (4 − 4/3) / 2 in doubles is one ulp above 4/3 (two roundings); the uncorrected variance would be 2
    expect(Math.abs(s.variance! - 4 / 3)).toBeLessThanOrEqual(2 ** -52);
  });

  it("spread keeps at least 12 significant digits of the sd for values near 1e9 and 1e12 differing by 1e-3, in any order", () => {
    // reference: exact rational arithmetic (BigInt fractions) on the same doubles; seeded data (mulberry32)
    const uniform = mulberry32(4242);
    for (const base of [1e9, -4e9, 1e12]) {
      const values = Array.from({ length: 400 }, () => base + Math.floor(uniform() * 7 - 3) * 1e-3);
      const exact = sqrtToNumber(exactMoments(values.map(fromDouble)).variance);
      const sd = spread(values).sd!;
      expect(-Math.log10(Math.abs(sd - exact) / exact), `base ${base}`).toBeGreaterThanOrEqual(12);
      expect(spread(shuffled(values, uniform)).sd).toBe(sd);
    }
  });

  it("spread of no value and of one value", () => {
    // computed by hand
    expect(spread([])).toEqual({ n: 0, sum: 0, mean: null, deviations: [], squared: [], sum_squared: null, mean_correction: null, variance: null, sd: null });
    expect(spread([7])).toEqual({ n: 1, sum: 7, mean: 7, deviations: [0], squared: [0], sum_squared: 0, mean_correction: 0, variance: null, sd: null });
  });
});
