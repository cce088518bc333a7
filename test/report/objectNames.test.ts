import { describe, expect, it } from "vitest";
import { buildReportModel } from "../../src/report/model.js";
import { renderHtml } from "../../src/report/html.js";
import { csv } from "../helpers/tempStudy.js";
import { studyOf } from "../helpers/runStudyFrom.js";

// Names that are also properties of every JavaScript object: a chart library that looks names up
// in a plain object breaks on them (found by fuzzing; common practice: user names are data).
const NAMES = ["constructor", "toString", "__proto__", "hasOwnProperty"];

describe("report with scenario, measure and run names like object properties", () => {
  it("renders every chart and shows every name", async () => {
    const file = (k: number) => csv([[0, "q", k], [2, "q", k + 2], [3, "w", k], [4, "w", 2 * k], [6, "q", 1]]);
    const scenarios = NAMES.map((n) => `  - {name: "${n}", end: 10, runs: ["${n}/*.csv"]}`).join("\n");
    const files: Record<string, string> = {};
    NAMES.forEach((n, i) => {
      files[`${n}/constructor.csv`] = file(i + 1);
      files[`${n}/toString.csv`] = file(i + 3);
    });
    const { study, outcome } = await studyOf(
      `title: names\nscenarios:\n${scenarios}\nmeasures:\n  - {name: constructor, kind: level, series: q, at_least: [2]}\n  - {name: __proto__, kind: observation, series: w, within: [3]}\n`,
      files,
    );
    const html = await renderHtml(buildReportModel(study, outcome, { toolVersion: "test", generatedAt: "2026-01-01T00:00:00Z" }));
    for (const n of NAMES) expect(html).toContain(n);
    // every chart became an inline SVG (none failed to render)
    expect((html.match(/<svg/g) ?? []).length).toBeGreaterThan(6);
  });
});
