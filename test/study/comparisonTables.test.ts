import { describe, expect, it } from "vitest";
import { comparisonTablePath } from "../../src/study/comparisonTables.js";
import { intervalTablePath, runTablePath } from "../../src/study/tables.js";
import { csv } from "../helpers/tempStudy.js";
import { studyOf } from "../helpers/runStudyFrom.js";

/**
 * A study whose comparison arithmetic is small enough to do by hand: observation `wait`, side
 * "=hi" with run values 4, 6, 11 and side "lo" with 3, (none), 7 (run r2 of "lo" has no
 * observation), compared paired, with Welch, and with Welch again.
 */
async function smallStudy() {
  const run = (w: number | null) => csv(w === null ? [[1, "other", 1]] : [[1, "w", w]]);
  return studyOf(
    "confidence: 0.9\nscenarios:\n" +
      "  - {name: '=hi', end: 10, runs: [runs/hi/r1.csv, runs/hi/r2.csv, runs/hi/r3.csv]}\n" +
      "  - {name: lo, end: 10, runs: [runs/lo/r1.csv, runs/lo/r2.csv, runs/lo/r3.csv]}\n" +
      "measures:\n  - {name: wait, kind: observation, series: w}\n" +
      "compare:\n" +
      "  - {measure: wait, scenarios: ['=hi', lo], method: paired}\n" +
      "  - {measure: wait, scenarios: ['=hi', lo], method: welch}\n" +
      "  - {measure: wait, scenarios: ['=hi', lo], method: welch}\n",
    {
      "runs/hi/r1.csv": run(4), "runs/hi/r2.csv": run(6), "runs/hi/r3.csv": run(11),
      "runs/lo/r1.csv": run(3), "runs/lo/r2.csv": run(null), "runs/lo/r3.csv": run(7),
    },
  );
}

describe("comparison tables (tables/<a>/comparisons/)", () => {
  it("writes a paired comparison's pairs, the run without a partner and every step, computed by hand", async () => {
    const { tableFiles, outcome } = await smallStudy();
    const file = "tables/~3Dhi/comparisons/1-wait-vs-lo.csv";
    expect(outcome.comparisons[0].file).toBe(file);
    const lines = tableFiles.find((f) => f.record.file === file)!.csv.split("\n");
    // computed by hand: pairs r1 (4 − 3 = 1) and r3 (11 − 7 = 4); d̄ = 2.5; deviations ∓1.5;
    // Σ(d − d̄)² = 4.5 = s²; df 1; three comparisons at 0.9: each at 1 − 0.1/3 (Bonferroni)
    expect(lines.slice(0, 10)).toEqual([
      "item,run,value_a,value_b,difference,deviation,squared_deviation",
      "scenarios,,'=hi,lo,,,",
      "pair,r1,4,3,1,-1.5,2.25",
      "pair,r3,11,7,4,1.5,2.25",
      "unpaired,r2,6,,,,",
      "n,,,,2,,",
      "sum,,,,5,,",
      "mean,,7.5,5,2.5,,",
      "sum_squared_deviations,,,,4.5,,",
      "variance,,,,4.5,,",
    ]);
    const step = (item: string) => Number(lines.find((l) => l.startsWith(item + ","))!.split(",")[4]);
    expect(step("sd")).toBe(Math.sqrt(4.5));
    expect(step("standard_error")).toBe(Math.sqrt(4.5) / Math.sqrt(2));
    expect(step("df")).toBe(1);
    expect(step("comparisons")).toBe(3);
    expect(step("confidence_each")).toBe(1 - (1 - 0.9) / 3);
    const row = outcome.results.comparisons!;
    expect([step("t"), step("half_width"), step("ci_low"), step("ci_high")]).toEqual([row[0].t, row[0].half_width, row[0].ci_low, row[0].ci_high]);
    expect(outcome.comparisons[0].unpaired).toEqual([{ scenario: "=hi", run: "r2", value: 6 }]);
  });

  it("writes a Welch comparison's runs of each side, each side's spread and the Welch–Satterthwaite steps, computed by hand", async () => {
    const { tableFiles, outcome } = await smallStudy();
    const file = "tables/~3Dhi/comparisons/2-wait-vs-lo.csv";
    const lines = tableFiles.find((f) => f.record.file === file)!.csv.split("\n");
    // computed by hand: "=hi" 4, 6, 11: mean 7, deviations −3, −1, 4, s² = 26/2 = 13;
    // "lo" 3, 7: mean 5, s² = 8; s²/n = 13/3 and 4; se² = 25/3; ν = 1/(w_a²/2 + w_b²/1) with w_a = 13/25, w_b = 12/25
    expect(lines.slice(0, 6)).toEqual([
      "item,scenario,run,value,deviation,squared_deviation",
      "run,'=hi,r1,4,-3,9",
      "run,'=hi,r2,6,-1,1",
      "run,'=hi,r3,11,4,16",
      "run,lo,r1,3,-2,4",
      "run,lo,r3,7,2,4",
    ]);
    const step = (item: string, scenario = "") => Number(lines.find((l) => l.startsWith(`${item},${scenario},`))!.split(",")[3]);
    expect([step("n", "'=hi"), step("mean", "'=hi"), step("variance", "'=hi"), step("n", "lo"), step("mean", "lo"), step("variance", "lo")]).toEqual([3, 7, 13, 2, 5, 8]);
    expect(step("variance_over_n", "'=hi")).toBe(13 / 3);
    expect(step("difference")).toBe(2);
    expect(step("standard_error_squared")).toBeCloseTo(25 / 3, 14);
    expect(step("share", "'=hi")).toBeCloseTo(13 / 25, 15);
    expect(step("share", "lo")).toBeCloseTo(12 / 25, 15);
    expect(step("df")).toBeCloseTo(1 / ((13 / 25) ** 2 / 2 + (12 / 25) ** 2), 13);
    const row = (outcome.results.comparisons!)[1];
    expect([step("df"), step("t"), step("half_width"), step("ci_low"), step("ci_high")]).toEqual([row.df, row.t, row.half_width, row.ci_low, row.ci_high]);
  });

  it("lists every comparison table in the table index, one file per comparison even when two are alike", async () => {
    const { outcome, tableFiles } = await smallStudy();
    const records = outcome.tables.filter((t) => t.kind === "comparison");
    expect(records.map((t) => [t.file, t.comparison?.index, t.run, t.preview])).toEqual([
      ["tables/~3Dhi/comparisons/1-wait-vs-lo.csv", 0, null, null],
      ["tables/~3Dhi/comparisons/2-wait-vs-lo.csv", 1, null, null],
      ["tables/~3Dhi/comparisons/3-wait-vs-lo.csv", 2, null, null],
    ]);
    // the second and third are the same comparison: same arithmetic, same text, two files
    const text = (i: number) => tableFiles.find((f) => f.record.file === records[i].file)!.csv;
    expect(text(2)).toBe(text(1));
    expect(outcome.comparisons.map((c) => [c.index, c.method, c.file])).toEqual(records.map((t) => [t.comparison?.index, t.comparison?.method, t.file]));
  });

  it("comparisonTablePath never gives the file of a run or interval table, also compared without case", () => {
    const names = ["comparisons", "Comparisons", "runs", "intervals", "1-x-vs-y", "1-x", "x-vs-y", "x", "X", "y", "1", "a.b", "~", "-vs-"];
    const others = new Set<string>();
    for (const s of names) for (const m of names) {
      others.add(intervalTablePath(s, m, "value").toLowerCase());
      for (const r of names) others.add(runTablePath(s, r, m, "").toLowerCase());
    }
    const indexOf = new Map<string, number>();
    for (const i of [0, 1, 9, 10]) for (const a of names) for (const m of names) for (const b of names) {
      const path = comparisonTablePath(i, m, a, b).toLowerCase();
      expect(others.has(path), path).toBe(false);
      // two comparisons (two positions in results.json) never share a file
      expect(indexOf.get(path) ?? i, path).toBe(i);
      indexOf.set(path, i);
    }
  });
});
