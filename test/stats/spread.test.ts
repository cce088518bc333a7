import { describe, expect, it } from "vitest";
import { spread } from "../../src/stats/spread.js";

describe("spread", () => {
  it("spread([3, 5, 10]) gives every intermediate exactly", () => {
    // computed by hand
    expect(spread([3, 5, 10])).toEqual({
      n: 3, sum: 18, mean: 6, deviations: [-3, -1, 4], squared: [9, 1, 16], sum_squared: 26, variance: 13, sd: Math.sqrt(13),
    });
  });

  it("spread of a large offset with a small spread keeps the variance (two-pass, no cancellation)", () => {
    // computed by hand: 1e9 + {0.25, 0.75} are doubles; deviations ±0.25, variance 2·0.0625/1
    expect(spread([1e9 + 0.25, 1e9 + 0.75]).variance).toBe(0.125);
  });

  it("spread of no value and of one value", () => {
    // computed by hand
    expect(spread([])).toEqual({ n: 0, sum: 0, mean: null, deviations: [], squared: [], sum_squared: null, variance: null, sd: null });
    expect(spread([7])).toEqual({ n: 1, sum: 7, mean: 7, deviations: [0], squared: [0], sum_squared: 0, variance: null, sd: null });
  });
});
