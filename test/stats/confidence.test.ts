import { describe, expect, it } from "vitest";
import { twoSidedP } from "../../src/stats/confidence.js";

describe("twoSidedP", () => {
  it("twoSidedP gives 1 − α/2 with α = 1 − confidence", () => {
    // computed by hand: 0.95 → 0.975, 0.90 → 0.95, 0.99 → 0.995
    expect(twoSidedP(0.95)).toBe(0.975);
    expect(twoSidedP(0.9)).toBe(0.95);
    expect(twoSidedP(0.99)).toBe(0.995);
  });

  it("twoSidedP throws on a confidence outside (0, 1)", () => {
    // common practice: programming errors are thrown
    for (const c of [0, 1, -0.1, 95, Number.NaN]) expect(() => twoSidedP(c)).toThrow(Error);
  });
});
