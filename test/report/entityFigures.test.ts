import { describe, expect, it } from "vitest";
import { buildReportModel } from "../../src/report/model/index.js";
import { csv } from "../helpers/tempStudy.js";
import { studyOf } from "../helpers/runStudyFrom.js";

describe("buildReportModel with entity-derived measures", () => {
  it("shows the censored count and the entities entered, left and inside (CONTRACT.md section 2: censored entities are counted and reported)", async () => {
    const file = csv([[1, "in", null, "a"], [4, "out", null, "a"], [6, "in", null, "b"]]);
    const { study, outcome } = await studyOf(
      `title: t\nscenarios:\n  - {name: s, end: 10, runs: [r.csv]}\nmeasures:\n  - {name: stay, kind: observation, from: {start: in, end: out}}\n  - {name: inside, kind: level, from: {enter: in, leave: out}}\n`,
      { "r.csv": file },
    );
    const model = JSON.stringify(buildReportModel(study, outcome, { toolVersion: "test", generatedAt: "2026-01-01T00:00:00Z" }));
    expect(model).toContain("censored (still open at the end)");
    expect(model).toContain("inside at the end");
    // computed by hand: b entered at 6 and never left
    const stay = outcome.results.scenarios[0].runs[0].measures.stay;
    expect(stay.kind === "observation" ? stay.censored : undefined).toBe(1);
  });
});
