import { describe, expect, it } from "vitest";
import { fsum } from "../../src/stats/fsum.js";
import { simulateQueue } from "../../src/demo/queue.js";
import { csv } from "../helpers/tempStudy.js";
import { figures, studyOf } from "../helpers/runStudyFrom.js";

// Our own trace: 3 from t=0, 6 from t=2, 1 then 4 at t=4 (a tie), 2 from t=7; window [0, 10],
// warm-up 2, so the threshold 6 is crossed exactly at the warm-up time.
const trace = csv([[0, "level", 3], [2, "level", 6], [4, "level", 1], [4, "level", 4], [7, "level", 2]]);
const manifest = `title: shares
warmup: 2
scenarios:
  - {name: a, end: 10, runs: [r.csv]}
measures:
  - {name: L, kind: level, series: level, at_least: [6, 4, 3, 2]}
`;

describe("time at least and time at value (issue 8)", () => {
  it("shares on a hand-worked trace with a crossing at the warm-up and a tie", async () => {
    const { outcome } = await studyOf(manifest, { "r.csv": trace });
    const L = figures(outcome.results, "L");
    // computed by hand: c = 2, T = 8; 6 on [2,4], 1 on [4,4] (tie, zero length), 4 on [4,7], 2 on [7,10]
    expect(L.time_at_least).toEqual({ "6": 2 / 8, "4": 5 / 8, "3": 5 / 8, "2": 1 });
    expect(L.time_at_value).toEqual([
      { value: 2, time: 3, share: 3 / 8 },
      { value: 4, time: 3, share: 3 / 8 },
      { value: 6, time: 2, share: 2 / 8 },
    ]);
    const t = outcome.tables.find((x) => x.run === "r" && x.kind === "time_at_least")!;
    // computed by hand: intervals of positive duration at or above each threshold
    expect(t.preview!.map((r) => [r[0], r[1], r[2]])).toEqual([[6, 1, 2], [4, 2, 5], [3, 2, 5], [2, 3, 8]]);
  });

  it("shares over all values add up to 1 and time at least the minimum is 1 (common practice: a distribution's total mass)", async () => {
    const rows = [...simulateQueue({ arrivalRate: 1, serviceRate: 0.55, servers: 2, horizon: 300, seed: 11, decimals: 4 })];
    const file = csv(rows.map((r) => [r.time, r.series, r.value, r.entity]));
    const m = `title: q\nwarmup: 13.37\nscenarios:\n  - {name: a, end: 300, runs: [r.csv]}\nmeasures:\n  - {name: q, kind: level, series: queue, at_least: [0]}\n`;
    const { outcome } = await studyOf(m, { "r.csv": file });
    const q = figures(outcome.results, "q");
    const shares = (q.time_at_value as { share: number }[]).map((v) => v.share);
    expect(Math.abs(fsum(shares) - 1)).toBeLessThan(1e-12);
    expect(q.min).toBe(0);
    expect((q.time_at_least as Record<string, number>)["0"]).toBe(1);
  });

  it("summaries of quantiles, within and time-at-least shares across runs carry intervals", async () => {
    const files: Record<string, string> = {};
    for (let k = 1; k <= 4; k++) files[`r${k}.csv`] = csv([[0, "w", k], [1, "w", 2 * k], [2, "w", 10 - k], [3, "lvl", k % 3], [5, "lvl", 2]]);
    const m = `title: s\nscenarios:\n  - {name: a, end: 10, runs: "*.csv"}\nmeasures:\n  - {name: w, kind: observation, series: w, quantiles: [0.5], within: [5]}\n  - {name: l, kind: level, series: lvl, at_least: [2]}\n`;
    const { outcome } = await studyOf(m, files);
    const s = outcome.results.scenarios[0].summary;
    // computed by hand: per-run medians are the middle of {k, 2k, 10 − k}: 2, 4, 6, 6 → mean 4.5
    expect((s.w.quantiles as Record<string, { mean: number; n: number }>)["0.5"]).toMatchObject({ n: 4, mean: 4.5 });
    // computed by hand: shares ≤ 5 per run: 2/3, 2/3, 1/3, 1/3 → mean 1/2
    expect((s.w.within as Record<string, { mean: number }>)["5"].mean).toBeCloseTo(0.5, 14);
    // computed by hand: level ≥ 2 on [5,10] always, plus [3,5] when k % 3 = 2 (k = 2): shares .5,.7,.5,.5
    expect((s.l.time_at_least as Record<string, { mean: number }>)["2"].mean).toBeCloseTo(2.2 / 4, 14);
  });
});
