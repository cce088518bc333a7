/**
 * The interval of a single long run from its batch means, in the summary and in comparisons
 * (issue 13). The runs are AR(1) sequences made here with a seeded generator, so every expected
 * number is computed in the test from the written values, independently of src/stats.
 */
import jstat from "jstat";
import { describe, expect, it } from "vitest";
import * as batchMessages from "../../src/messages/batchMeans.js";
import type { BatchMeansSummary, Comparison, Summary } from "../../src/outcome/index.js";
import { runBatchMeans } from "../../src/study/summaries.js";
import { csv } from "../helpers/tempStudy.js";
import { studyOf } from "../helpers/runStudyFrom.js";
import { referenceT } from "../stats/reference.js";
import { mulberry32, normals } from "../stats/random.js";

/** Relative tolerance for sums of a few thousand terms done naively here against compensated sums in Sojourn. */
const REL = 1e-12;

/**
 * An AR(1) sequence x_i = mu + phi (x_{i−1} − mu) + e_i with standard normal e_i (our own
 * construction), starting at mu; one value per time unit. Values are rounded to 6 decimals so
 * that the CSV text is exactly what the test computes with.
 */
function ar1(seed: number, n: number, mu: number, phi: number): number[] {
  const z = normals(mulberry32(seed));
  const out: number[] = [];
  let x = mu;
  for (let i = 0; i < n; i++) {
    x = mu + phi * (x - mu) + z();
    out.push(Number(x.toFixed(6)));
  }
  return out;
}

const runCsv = (values: number[]) => csv(values.map((v, i): [number, string, number] => [i + 1, "w", v]));

/** Batch means by the definition: drop the n mod k oldest, then k groups of ⌊n/k⌋ consecutive values. */
function batchMeansByHand(values: number[], k: number): number[] {
  const b = Math.floor(values.length / k);
  const skip = values.length % k;
  return Array.from({ length: k }, (_, j) => {
    let s = 0;
    for (let i = skip + j * b; i < skip + (j + 1) * b; i++) s += values[i];
    return s / b;
  });
}

function meanAndVariance(y: number[]): { mean: number; variance: number } {
  const mean = y.reduce((s, v) => s + v, 0) / y.length;
  const variance = y.reduce((s, v) => s + (v - mean) ** 2, 0) / (y.length - 1);
  return { mean, variance };
}

function close(actual: number | null, expected: number, rel = REL) {
  expect(actual).not.toBeNull();
  expect(Math.abs((actual as number) - expected)).toBeLessThanOrEqual(rel * Math.max(1, Math.abs(expected)));
}

const oneScenario = (analysis: string, runs: string) =>
  `title: long run\n${analysis}scenarios:\n  - {name: long, runs: ${runs}}\nmeasures:\n  - {name: wait, kind: observation, series: w}\n`;

describe("summary of a single long run with batch means", () => {
  it("batch_means holds the t interval of the batch means with k − 1 degrees of freedom, and interval_method says so", async () => {
    // 2005 values and 20 batches: the 5 oldest are dropped, batches of 100
    const values = ar1(11, 2005, 10, 0.6);
    const { outcome } = await studyOf(oneScenario("analysis: {method: batch-means, batches: 20}\n", "[long.csv]"), { "long.csv": runCsv(values) });
    const s = outcome.results.scenarios[0].summary.wait as Summary;
    // the contract's fields stay across the runs: one run, no interval (CONTRACT section 4)
    expect(s.n).toBe(1);
    expect([s.sd, s.half_width, s.ci_low, s.ci_high]).toEqual([null, null, null, null]);
    expect(s.interval_method).toBe("batch-means");
    expect(s.interval_note).toBe(batchMessages.fromBatchMeans("long", 20));

    const y = batchMeansByHand(values, 20);
    const { mean, variance } = meanAndVariance(y);
    // t(0.975, 19) = 2.093 in the printed t tables of statistics handbooks (from memory); the full
    // digits are from test/reference/t-quantiles.json (scipy.stats.t.ppf)
    const t = referenceT(0.975, 19);
    expect(Number(t.toFixed(3))).toBe(2.093);
    const h = (t * Math.sqrt(variance)) / Math.sqrt(20); // formula: Law 2015, §9.5.3
    const bm = s.batch_means as BatchMeansSummary;
    expect(bm.method).toBe("batch-means");
    expect(bm.run).toBe("long");
    expect(bm.batches).toBe(20);
    expect(bm.df).toBe(19);
    close(bm.mean, mean);
    close(bm.sd, Math.sqrt(variance));
    close(bm.t, t, 1e-9); // the reference file's 17 digits against Sojourn's quantile
    close(bm.half_width, h, 1e-9);
    close(bm.ci_low, mean - h, 1e-9);
    close(bm.ci_high, mean + h, 1e-9);
    // the same numbers as the run's own batch_means figures
    const run = runBatchMeans(outcome.results.scenarios[0].runs[0], "wait")!;
    expect([bm.mean, bm.sd, bm.half_width, bm.lag1]).toEqual([run.mean, run.sd, run.half_width, run.lag1]);
  });

  it("a level's batch means: equal stretches of time give the time average of each stretch", async () => {
    // a level changing every time unit over [0, 400], 8 batches of 50 time units each
    const values = ar1(5, 400, 4, 0.8);
    const rows = values.map((v, i): [number, string, number] => [i, "q", v]);
    const { outcome } = await studyOf(
      `title: level\nanalysis: {method: batch-means, batches: 8}\nscenarios:\n  - {name: long, end: 400, runs: [r.csv]}\nmeasures:\n  - {name: q, kind: level, series: q}\n`,
      { "r.csv": csv(rows) },
    );
    const s = outcome.results.scenarios[0].summary.q as Summary;
    // by hand: each value holds for one time unit, so a stretch of 50 averages its 50 values
    const y = Array.from({ length: 8 }, (_, j) => values.slice(50 * j, 50 * (j + 1)).reduce((a, v) => a + v, 0) / 50);
    const { mean, variance } = meanAndVariance(y);
    const t = referenceT(0.975, 7); // test/reference/t-quantiles.json; printed t tables: 2.365 (from memory)
    expect(Number(t.toFixed(3))).toBe(2.365);
    expect(s.interval_method).toBe("batch-means");
    close(s.batch_means!.mean, mean);
    close(s.batch_means!.half_width, (t * Math.sqrt(variance)) / Math.sqrt(8), 1e-9);
  });

  it("several runs with batch means keep the across-run interval and say why", async () => {
    const files = { "long/r1.csv": runCsv(ar1(1, 300, 10, 0.5)), "long/r2.csv": runCsv(ar1(2, 300, 10, 0.5)), "long/r3.csv": runCsv(ar1(3, 300, 10, 0.5)) };
    const { outcome } = await studyOf(oneScenario("analysis: {method: batch-means, batches: 10}\n", '"long/*.csv"'), files);
    const s = outcome.results.scenarios[0].summary.wait as Summary;
    expect(s.interval_method).toBe("across-runs");
    expect(s.batch_means).toBeUndefined();
    expect(s.interval_note).toBe(batchMessages.severalRuns(3));
    // the contract's interval across the three run means is there
    const means = outcome.results.scenarios[0].runs.map((r) => r.measures.wait.value as number);
    close(s.mean, meanAndVariance(means).mean);
    expect(s.half_width).not.toBeNull();
  });

  it("a run with fewer observations than batches has no batch-means interval, and the note says why", async () => {
    const { outcome } = await studyOf(oneScenario("analysis: {method: batch-means, batches: 20}\n", "[long.csv]"), { "long.csv": runCsv(ar1(4, 12, 1, 0.2)) });
    const s = outcome.results.scenarios[0].summary.wait as Summary;
    expect(s.interval_method).toBe("across-runs");
    expect(s.batch_means).toBeUndefined();
    expect(s.interval_note).toBe(batchMessages.noBatchMeans("long", "observation"));
  });

  it("replications add none of the new keys (results.json of such studies does not change)", async () => {
    const { outcome } = await studyOf(oneScenario("", "[long.csv]"), { "long.csv": runCsv(ar1(4, 50, 1, 0.2)) });
    const s = outcome.results.scenarios[0].summary.wait as Summary;
    expect(Object.keys(s)).toEqual(["n", "mean", "sd", "half_width", "ci_low", "ci_high", "quantiles"]);
  });
});

const twoScenarios = (method: string) =>
  `title: two long runs\nanalysis: {method: batch-means, batches: 10}\nscenarios:\n  - {name: A, runs: [a/long.csv]}\n  - {name: B, runs: [b/long.csv]}\nmeasures:\n  - {name: wait, kind: observation, series: w}\ncompare:\n  - {measure: wait, scenarios: [A, B], method: ${method}}\n`;

describe("comparison of two single long runs", () => {
  const a = ar1(21, 1000, 10, 0.5);
  const b = ar1(22, 1203, 10.4, 0.5); // 1203 mod 10 = 3 oldest dropped, batches of 120
  const files = { "a/long.csv": runCsv(a), "b/long.csv": runCsv(b) };

  it("Welch on the two sets of batch means, with the Welch–Satterthwaite degrees of freedom", async () => {
    const { outcome } = await studyOf(twoScenarios("welch"), files);
    const c = outcome.results.comparisons![0] as Comparison;
    const ya = meanAndVariance(batchMeansByHand(a, 10));
    const yb = meanAndVariance(batchMeansByHand(b, 10));
    // Welch (1947), Satterthwaite (1946): se² = s_a²/n_a + s_b²/n_b, ν = se⁴ / ((s_a²/n_a)²/(n_a − 1) + (s_b²/n_b)²/(n_b − 1))
    const va = ya.variance / 10;
    const vb = yb.variance / 10;
    const se = Math.sqrt(va + vb);
    const df = (va + vb) ** 2 / (va ** 2 / 9 + vb ** 2 / 9);
    const t = jstat.studentt.inv(0.975, df); // one comparison: Bonferroni level 0.95; jstat good to about 3e-8
    expect(c.basis).toBe("batch-means");
    expect(c.values).toBe(batchMessages.comparedBatches("A", "long", 10, "B", "long", 10));
    expect(c.assumes).toBe(batchMessages.welchOnBatchesAssumes);
    expect([c.n_a, c.n_b]).toEqual([10, 10]);
    close(c.diff_mean as number, ya.mean - yb.mean);
    close(c.standard_error as number, se, 1e-10);
    close(c.df as number, df, 1e-10);
    close(c.t as number, t, 1e-7);
    close(c.half_width as number, t * se, 1e-7);
    const runA = runBatchMeans(outcome.results.scenarios[0].runs[0], "wait")!;
    expect(c.lag1_a).toBe(runA.lag1);
    // Its calculation table is the arithmetic of the same batch means and ends with the same numbers.
    const steps = outcome.comparisons[0].steps;
    if (steps.method !== "welch") throw new Error(`expected Welch steps, got ${steps.method}`);
    expect(steps.a.rows.map((r) => r.value)).toEqual(batchMeansByHand(a, 10).map((v) => expect.closeTo(v, 12)));
    expect(steps.a.rows[0].run).toBe("long batch 1");
    expect([steps.df, steps.half_width, steps.ci_low, steps.ci_high]).toEqual([c.df, c.half_width, c.ci_low, c.ci_high]);
  });

  it("a paired comparison of two single long runs gives no interval and says why", async () => {
    const { outcome } = await studyOf(twoScenarios("paired"), files);
    const c = outcome.results.comparisons![0] as Comparison;
    expect(c.basis).toBe("batch-means");
    expect([c.half_width, c.ci_low, c.ci_high, c.df]).toEqual([null, null, null, null]);
    expect(c.verdict).toBe(`no interval: ${batchMessages.pairedLongRuns}`);
    // No interval, so no arithmetic table either (the entry's verdict says why).
    expect(outcome.comparisons).toEqual([]);
  });
});
