import { describe, expect, it } from "vitest";
import type { Results } from "../../src/outcome/index.js";
import { differenceReading, lag1TooLarge, LAG1_LIMIT, readResults } from "../../src/study/readings.js";
import { studyOf } from "../helpers/runStudyFrom.js";

describe("study readings", () => {
  it("differenceReading says above, below, contains 0 or missing, from the interval's ends", () => {
    expect(differenceReading(0.5, 2)).toBe("higher");
    expect(differenceReading(-2, -0.5)).toBe("lower");
    expect(differenceReading(-1, 1)).toBe("no-difference");
    expect(differenceReading(0, 1)).toBe("no-difference");
    expect(differenceReading(null, 1)).toBe("no-interval");
  });

  it("lag1TooLarge flags a lag-1 above LAG1_LIMIT in size only", () => {
    expect(lag1TooLarge(LAG1_LIMIT)).toBe(false);
    expect(lag1TooLarge(-(LAG1_LIMIT + 0.01))).toBe(true);
    expect(lag1TooLarge(LAG1_LIMIT + 0.01)).toBe(true);
    expect(lag1TooLarge(null)).toBe(false);
  });

  it("readResults averages each value's share of time over the runs that have the table, 0 where a run never took the value", () => {
    const level = (shares: [number, number][]) => ({
      kind: "level" as const, value: 0, mean: 0, area: 0, duration: 10, sd: 0, min: 0, max: 0, final: 0,
      time_at_value: shares.map(([value, share]) => ({ value, time: share * 10, share })),
    });
    const results: Results = {
      format: "sojourn-results/1", title: "t", time_unit: "min", confidence: 0.95, warmup: null,
      scenarios: [{
        name: "s",
        runs: [
          { id: "a", file: "a.csv", sha256: "", start: 0, end: 10, rows: 0, left_out: { after_end: 0, before_window: 0, unused_series: 0 }, measures: { q: level([[0, 0.5], [1, 0.5]]) } },
          { id: "b", file: "b.csv", sha256: "", start: 0, end: 10, rows: 0, left_out: { after_end: 0, before_window: 0, unused_series: 0 }, measures: { q: level([[0, 1]]) } },
        ],
        summary: {},
      }],
    };
    // computed by hand: value 0 → (0.5 + 1) / 2 = 0.75, value 1 → (0.5 + 0) / 2 = 0.25
    expect(readResults(results).timeAtValue).toEqual([{ scenario: "s", measure: "q", runs: 2, of: 2, shares: [{ value: 0, share: 0.75 }, { value: 1, share: 0.25 }] }]);
  });

  it("runStudy lists a failed consistency check once among the warnings and reads each comparison", async () => {
    const manifest = [
      "version: 1", "title: t", "time_unit: min",
      "scenarios:",
      "  - {name: full, end: 10, runs: [full-1.csv, full-2.csv]}",
      "  - {name: half, end: 10, runs: [half-1.csv, half-2.csv]}",
      "measures:",
      "  - {name: use, kind: utilization, series: busy, capacity: 1}",
      "compare:",
      "  - {measure: use, scenarios: [full, half], method: welch}",
      "",
    ].join("\n");
    const run = (v: number) => `time,series,value\n0,busy,${v}\n`;
    // "full" is busy with 2 units of a capacity of 1: utilization 2, outside [0, 1].
    const { outcome } = await studyOf(manifest, { "full-1.csv": run(2), "full-2.csv": run(2), "half-1.csv": run(0.5), "half-2.csv": run(0.5) });
    const failed = outcome.results.scenarios[0].checks!.filter((c) => !c.passed);
    expect(failed.map((c) => c.check)).toEqual(["utilization-range", "utilization-range"]);
    for (const c of failed) expect(outcome.warnings.filter((w) => w.message === c.message && w.run === c.run)).toHaveLength(1);
    expect(outcome.readings.comparisons).toHaveLength(outcome.results.comparisons!.length);
    const c = outcome.results.comparisons![0];
    expect(outcome.readings.comparisons[0]).toBe(differenceReading(c.ci_low, c.ci_high));
  });
});
