import jstat from "jstat";
import { describe, expect, it } from "vitest";
import { tQuantile } from "../../src/stats/tQuantile.js";
import { relativeError } from "./nist.js";
import { referenceTable } from "./reference.js";

/** Agreement with the reference quantiles. */
const REFERENCE = 1e-10;

describe("tQuantile", () => {
  it("the reference file holds the expected grid of 126 quantiles", () => {
    // reference: test/reference/t-quantiles.json (6 probabilities × 21 degrees of freedom)
    expect(referenceTable).toHaveLength(126);
  });

  it.each(referenceTable.map((e) => [e.p, e.df, e] as const))("tQuantile(%s, %s) agrees with the reference to 1e-10", (_p, _df, e) => {
    // reference: t-quantiles.json (scipy.stats.t.ppf)
    expect(relativeError(tQuantile(e.p, e.df), Number(e.quantile))).toBeLessThanOrEqual(REFERENCE);
  });

  it.each([
    [0.975, 10, 2.228],
    [0.95, 5, 2.015],
    [0.995, 20, 2.845],
    [0.975, 1, 12.706],
    [0.975, 30, 2.042],
    [0.9, 4, 1.533],
  ])("tQuantile(%s, %s) rounds to the printed %s", (p, df, printed) => {
    // printed t table (from memory), 3 decimals
    expect(Math.round(tQuantile(p, df) * 1000) / 1000).toBe(printed);
  });

  it("tQuantile at non-integer df lies between its integer neighbours and inverts jstat's distribution function", () => {
    // reference: jstat studentt.cdf and .inv (an independent implementation). jstat's own inverse
    // is only good to about 3e-8 here, so it is compared at 1e-7; its distribution function at
    // our quantile returns p to 2e-10. Monotonicity in df: formula (Student 1908).
    for (const df of [1.5, 4.0754716981132075, 10.97, 57.3]) {
      const t = tQuantile(0.975, df);
      expect(t).toBeLessThan(tQuantile(0.975, Math.floor(df)));
      expect(t).toBeGreaterThan(tQuantile(0.975, Math.ceil(df)));
      expect(Math.abs(jstat.studentt.cdf(t, df) - 0.975)).toBeLessThanOrEqual(2e-10);
      expect(relativeError(t, jstat.studentt.inv(0.975, df))).toBeLessThanOrEqual(1e-7);
    }
  });

  it("tQuantile is antisymmetric: tQuantile(1 − p, df) = −tQuantile(p, df)", () => {
    // formula: the t distribution is symmetric about 0 (Student 1908)
    for (const [p, df] of [[0.9, 3], [0.975, 12], [0.6, 2.5]]) {
      expect(relativeError(tQuantile(1 - p, df), -tQuantile(p, df))).toBeLessThanOrEqual(1e-12);
    }
    expect(tQuantile(0.5, 7)).toBe(0);
  });

  it("tQuantile throws on p outside (0, 1) and df ≤ 0 or not finite", () => {
    // common practice: programming errors are thrown, not returned as NaN
    for (const [p, df] of [[0, 5], [1, 5], [-0.1, 5], [1.2, 5], [Number.NaN, 5], [0.9, 0], [0.9, -2], [0.9, Number.NaN], [0.9, Infinity]]) {
      expect(() => tQuantile(p, df)).toThrow(Error);
    }
  });
});
