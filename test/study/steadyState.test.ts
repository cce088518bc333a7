import { describe, expect, it } from "vitest";
import { fsum } from "../../src/stats/fsum.js";
import { bonferroniLevel } from "../../src/stats/compare.js";
import { csv } from "../helpers/tempStudy.js";
import { figures, studyOf } from "../helpers/runStudyFrom.js";
import { Random } from "../../src/demo/random.js";

/**
 * A level that starts at 20 for 40 time units, then moves around 3 (our own construction). With
 * `exact`, it alternates 2 and 4 every 0.5, so every slice of width 2 averages exactly 3; otherwise
 * it steps ±1 at random.
 */
function transientRun(seed: number, exact = false): string {
  const rnd = new Random(seed);
  const rows: [number, string, number][] = [];
  for (let i = 0; i < 800; i++) {
    const t = i / 2;
    rows.push([t, "stock", t < 40 ? 20 : exact ? (i % 2 === 0 ? 2 : 4) : 3 + (rnd.next() < 0.5 ? -1 : 1)]);
  }
  return csv(rows);
}

describe("MSER-5 warm-up (White 1997) inside a study", () => {
  it("finds the end of a transient known by construction and uses it for every statistic", async () => {
    const files = { "r1.csv": transientRun(1, true), "r2.csv": transientRun(2, true), "r3.csv": transientRun(3, true) };
    const { outcome } = await studyOf(
      `title: mser\nwarmup: {method: mser-5, measure: s, slice: 2}\nscenarios:\n  - {name: a, end: 400, runs: "*.csv"}\nmeasures:\n  - {name: s, kind: level, series: stock}\n`,
      files,
    );
    const sc = outcome.results.scenarios[0];
    const est = sc.warmup_estimate as { d: number; batches: number; time: number };
    // by construction: slices of width 2, batches of 5 slices = 10 time units; the transient ends at 40,
    // after which every batch mean is exactly 3, so MSER(d) = 0 for every d ≥ 4 and the tie goes to d = 4
    expect(est.batches).toBe(40);
    expect(est.d).toBe(4);
    expect(est.time).toBe(40);
    expect(figures(outcome.results, "s").duration).toBe(360);
    expect(figures(outcome.results, "s").mean).toBe(3);
  });
});

describe("batch means inside a run (Schmeiser 1982)", () => {
  it("the grand mean of level batch means equals the time average when batches are of equal time", async () => {
    const { outcome } = await studyOf(
      `title: bm\nwarmup: 7\nanalysis: {method: batch-means, batches: 10}\nscenarios:\n  - {name: a, end: 400, runs: [r.csv]}\nmeasures:\n  - {name: s, kind: level, series: stock}\n  - {name: o, kind: observation, series: stock}\n`,
      { "r.csv": transientRun(9) },
    );
    const s = figures(outcome.results, "s");
    const bm = s.batch_means as { batches: number; mean: number; batch_values: number[]; half_width: number; lag1: number };
    expect(bm.batches).toBe(10);
    // formula: mean of k equal-time batch averages = (Σ area_j / (T/k)) / k = area / T
    expect(Math.abs(bm.mean - (s.mean as number)) / (s.mean as number)).toBeLessThan(1e-12);
    expect(bm.half_width).toBeGreaterThan(0);
    // observations: n = 786 after the warm-up (t ≥ 7 in steps of 0.5 up to 399.5); 786 mod 10 = 6 oldest dropped
    const o = figures(outcome.results, "o");
    expect(o.n).toBe(786);
    const obm = o.batch_means as { batch_values: number[] };
    expect(obm.batch_values.length).toBe(10);
  });
});

describe("comparisons with Bonferroni levels", () => {
  it("paired and Welch comparisons carry the per-comparison level 1 − (1 − confidence)/K", async () => {
    const files: Record<string, string> = {};
    for (let k = 1; k <= 5; k++) {
      files[`a/rep-${k}.csv`] = csv([[0, "w", 10 + k], [1, "w", 11 + k * 0.5]]);
      files[`b/rep-${k}.csv`] = csv([[0, "w", 12 + k], [1, "w", 13.5 + k * 0.25]]);
    }
    const { outcome } = await studyOf(
      `title: cmp\nconfidence: 0.9\nscenarios:\n  - {name: A, runs: "a/*.csv"}\n  - {name: B, runs: "b/*.csv"}\nmeasures:\n  - {name: wait, kind: observation, series: w}\ncompare:\n  - {measure: wait, scenarios: [A, B], method: paired}\n  - {measure: wait, scenarios: [A, B], method: welch}\n`,
      files,
    );
    const cmp = outcome.results.comparisons as unknown as Record<string, number | string>[];
    expect(cmp).toHaveLength(2);
    // Bonferroni: each at 1 − 0.1/2 = 0.95
    expect(cmp[0].confidence_each).toBe(bonferroniLevel(0.9, 2));
    // computed by hand: run means A_k = 10.5 + 0.75k, B_k = 12.75 + 0.625k; differences −2.25 + 0.125k, mean −1.875
    expect(cmp[0].diff_mean as number).toBeCloseTo(-1.875, 12);
    expect(cmp[0].df).toBe(4);
    expect(cmp[0].ci_high as number).toBeLessThan(0);
    expect(String(cmp[0].verdict)).toContain('"A" is lower than "B"');
    const meansA = [1, 2, 3, 4, 5].map((k) => 10.5 + 0.75 * k);
    expect(cmp[1].diff_mean as number).toBeCloseTo(fsum(meansA) / 5 - fsum([1, 2, 3, 4, 5].map((k) => 12.75 + 0.625 * k)) / 5, 12);
  });
});
