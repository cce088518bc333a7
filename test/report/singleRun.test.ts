import { describe, expect, it } from "vitest";
import { buildReportModel } from "../../src/report/model/index.js";
import { csv } from "../helpers/tempStudy.js";
import { studyOf } from "../helpers/runStudyFrom.js";

const MANIFEST = (runs: string) =>
  `title: t\nscenarios:\n  - {name: s, end: 10, runs: [${runs}]}\nmeasures:\n  - {name: q, kind: level, series: q}\n  - {name: n, kind: count, series: q}\n`;
const FILE = csv([[0, "q", 1], [4, "q", 3], [7, "q", 0]]);
const chartKinds = (model: ReturnType<typeof buildReportModel>) => model.measures.map((m) => m.charts.map((c) => c.id.replace(/^.*-chart-\d+-/, "")));

describe("buildReportModel charts across runs", () => {
  it("leaves out the interval and run-value charts, and the sentence on them, when no scenario has two runs (one dot, no interval)", async () => {
    const one = await studyOf(MANIFEST("a.csv"), { "a.csv": FILE });
    const model = buildReportModel(one.study, one.outcome, { toolVersion: "test", generatedAt: "2026-01-01T00:00:00Z" });
    expect(chartKinds(model)).toEqual([["trace", "time-at-value"], []]);
    for (const m of model.measures) expect(m.statement).not.toContain("Across runs");
  });

  it("keeps them with two runs", async () => {
    const two = await studyOf(MANIFEST("a.csv, b.csv"), { "a.csv": FILE, "b.csv": FILE });
    const model = buildReportModel(two.study, two.outcome, { toolVersion: "test", generatedAt: "2026-01-01T00:00:00Z" });
    expect(chartKinds(model)).toEqual([["interval", "runs", "trace", "time-at-value"], ["interval", "runs"]]);
    for (const m of model.measures) expect(m.statement).toContain("Across runs");
  });
});
