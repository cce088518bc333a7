import { quantileSorted as d3Quantile } from "d3-array";
import { describe, expect, it } from "vitest";
import { observationExtras } from "../../src/measures/quantiles.js";

describe("observationExtras", () => {
  it("quantiles by selection equal d3-array's type 7 quantile of the sorted values, exactly (Hyndman and Fan 1996)", () => {
    let seed = 7;
    const rnd = () => ((seed = (seed * 16807) % 2147483647) / 2147483647);
    const ps = [0.95, 0, 0.5, 1, 0.9, 0.25, 0.333];
    for (const n of [1, 2, 3, 10, 999, 4000]) {
      const values = Float64Array.from({ length: n }, (_, i) => (i % 3 === 0 ? Math.round(rnd() * 10) : rnd() * 100));
      const sorted = Float64Array.from(values).sort();
      const before = Float64Array.from(values);
      const r = observationExtras(values, ps, [5, 50], { maxRows: 100, edgeRows: 10 });
      for (const p of ps) expect(r.quantiles![String(p)]).toBe(d3Quantile(Array.from(sorted), p));
      // the fraction ≤ x: the empirical distribution function (common practice)
      for (const x of [5, 50]) expect(r.within![String(x)]).toBe(sorted.filter((v) => v <= x).length / n);
      // the values themselves are untouched (selection works on a copy)
      expect(values).toEqual(before);
    }
  });

  it("gives null figures for a run with no observation", () => {
    const r = observationExtras(new Float64Array(0), [0.5], [1], { maxRows: 10, edgeRows: 2 });
    expect(r.quantiles).toEqual({ "0.5": null });
    expect(r.within).toEqual({ "1": null });
  });
});
