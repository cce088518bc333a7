import { describe, expect, it } from "vitest";
import { intervalArithmetic, intervalNotes, summarize } from "../../src/stats/interval.js";
import { relativeError } from "./nist.js";
import { mixedMagnitudes, mulberry32, shuffled } from "./random.js";
import { referenceT } from "./reference.js";

/** Agreement of quantities that pass through the t quantile with a hand computation. */
const T_TOLERANCE = 1e-10;

const runs = (values: number[]) => values.map((value, i) => ({ run: `ferry-${i + 1}`, value }));

describe("intervalArithmetic", () => {
  it("intervalArithmetic returns every step the appendix shows, and nothing else", () => {
    // common practice: the study module spreads these steps into its IntervalArithmetic records
    expect(Object.keys(intervalArithmetic(runs([1, 2]), 0.95)).sort()).toEqual(
      ["rows", "n", "sum", "mean", "sum_squared", "mean_correction", "variance", "sd", "df", "p", "t", "standard_error", "half_width", "ci_low", "ci_high", "note"].sort(),
    );
  });

  it("intervalArithmetic of boarding times 3, 5, 10 at 0.95 shows every step", () => {
    // computed by hand: sum 18, mean 6, deviations −3, −1, 4, squares 9, 1, 16, sum 26,
    // variance 13, df 2, p 0.975; t from t-quantiles.json; se = √13/√3; h = t·se
    const a = intervalArithmetic(runs([3, 5, 10]), 0.95);
    expect(a.rows).toEqual([
      { run: "ferry-1", value: 3, deviation: -3, squared: 9 },
      { run: "ferry-2", value: 5, deviation: -1, squared: 1 },
      { run: "ferry-3", value: 10, deviation: 4, squared: 16 },
    ]);
    expect([a.n, a.sum, a.mean, a.sum_squared, a.variance, a.df, a.p]).toEqual([3, 18, 6, 26, 13, 2, 0.975]);
    expect(a.sd).toBe(Math.sqrt(13));
    expect(a.standard_error).toBe(Math.sqrt(13) / Math.sqrt(3));
    const t = referenceT(0.975, 2);
    expect(relativeError(a.t!, t)).toBeLessThanOrEqual(T_TOLERANCE);
    const h = (t * Math.sqrt(13)) / Math.sqrt(3);
    expect(relativeError(a.half_width!, h)).toBeLessThanOrEqual(T_TOLERANCE);
    expect(relativeError(a.ci_low!, 6 - h)).toBeLessThanOrEqual(T_TOLERANCE);
    expect(relativeError(a.ci_high!, 6 + h)).toBeLessThanOrEqual(T_TOLERANCE);
    expect(a.half_width).toBe(a.t! * a.standard_error!);
    expect(a.note).toBeNull();
  });

  it("intervalArithmetic at 0.90 uses p = 0.95 and t(0.95, n − 1)", () => {
    // formula: p = 1 − α/2, α = 1 − confidence; t from t-quantiles.json
    const a = intervalArithmetic(runs([1, 2, 3, 4, 5, 6]), 0.9);
    expect(a.p).toBe(0.95);
    expect(relativeError(a.t!, referenceT(0.95, 5))).toBeLessThanOrEqual(T_TOLERANCE);
  });

  it("intervalArithmetic of no values gives n 0, sum 0 and a note", () => {
    // contract: interval fields null; computed by hand
    expect(intervalArithmetic([], 0.95)).toEqual({
      rows: [], n: 0, sum: 0, mean: null, sum_squared: null, mean_correction: null, variance: null, sd: null, df: null, p: null,
      t: null, standard_error: null, half_width: null, ci_low: null, ci_high: null, note: intervalNotes.noValues,
    });
  });

  it("intervalArithmetic of one value gives the mean, no interval and a note", () => {
    // contract: "With one run the interval fields are null"; computed by hand
    expect(intervalArithmetic([{ run: "bakery-1", value: 41.5 }], 0.95)).toEqual({
      rows: [{ run: "bakery-1", value: 41.5, deviation: 0, squared: 0 }], n: 1, sum: 41.5, mean: 41.5,
      sum_squared: 0, mean_correction: 0, variance: null, sd: null, df: null, p: null, t: null, standard_error: null,
      half_width: null, ci_low: null, ci_high: null, note: intervalNotes.oneValue,
    });
  });

  it("intervalArithmetic of equal values gives a zero-width interval, not NaN", () => {
    // computed by hand: sd 0, half-width t·0 = 0
    const a = intervalArithmetic(runs([2.5, 2.5, 2.5, 2.5]), 0.95);
    expect([a.sd, a.half_width, a.ci_low, a.ci_high]).toEqual([0, 0, 2.5, 2.5]);
  });

  it("intervalArithmetic gives the same sums and interval for every order of the runs", () => {
    // formula: exactly rounded sums (Shewchuk 1997) do not depend on the order of the terms
    const uniform = mulberry32(99);
    for (let trial = 0; trial < 10; trial++) {
      const values = mixedMagnitudes(40, uniform).map((x) => 1000 + x / 1e9);
      const { rows: _rows, ...first } = intervalArithmetic(runs(values), 0.95);
      for (let k = 0; k < 5; k++) {
        const { rows, ...again } = intervalArithmetic(shuffled(runs(values), uniform), 0.95);
        expect(again).toEqual(first);
        expect(rows.map((r) => r.run).sort()).toEqual(runs(values).map((r) => r.run).sort());
      }
    }
  });

  it("intervalArithmetic keeps the rows in input order", () => {
    // common practice: the audit table lists runs as given
    expect(intervalArithmetic(runs([9, 1, 5]), 0.95).rows.map((r) => r.value)).toEqual([9, 1, 5]);
  });

  it("intervalArithmetic throws on a confidence outside (0, 1)", () => {
    // common practice: the manifest edge validates the level; anything else is a programming error
    for (const c of [0, 1, 95, -0.5, Number.NaN]) expect(() => intervalArithmetic(runs([1, 2]), c)).toThrow(Error);
  });
});

describe("summarize", () => {
  it("summarize gives the summary fields of intervalArithmetic, bit for bit", () => {
    // same method: summary fields copied from the step-by-step arithmetic
    const uniform = mulberry32(5);
    for (const n of [0, 1, 2, 3, 10, 57]) {
      const values = Array.from({ length: n }, () => 20 + 5 * uniform());
      const a = intervalArithmetic(runs(values), 0.9);
      expect(summarize(values, 0.9)).toEqual({
        n: a.n, mean: a.mean, sd: a.sd, half_width: a.half_width, ci_low: a.ci_low, ci_high: a.ci_high,
      });
    }
  });
});
