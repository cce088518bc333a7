import { describe, expect, it } from "vitest";
import { csv } from "../helpers/tempStudy.js";
import { figures, studyOf } from "../helpers/runStudyFrom.js";

describe("invariances (common practice)", () => {
  it("a constant level averages to itself with sd 0, whatever the warm-up", async () => {
    const file = csv([[0, "stock", 7], [3.3, "stock", 7], [9.1, "stock", 7]]);
    for (const w of [0, 1.7, 5]) {
      const { outcome } = await studyOf(`title: c\nwarmup: ${w}\nscenarios:\n  - {name: a, end: 10, runs: [r.csv]}\nmeasures:\n  - {name: s, kind: level, series: stock}\n`, { "r.csv": file });
      const s = figures(outcome.results, "s");
      expect(s.mean).toBe(7);
      expect(s.sd).toBe(0);
    }
  });

  it("listing the runs in another order changes no summary figure", async () => {
    const files: Record<string, string> = {};
    for (let k = 0; k < 7; k++) files[`r${k}.csv`] = csv([[0, "q", k], [1 + k / 7, "q", 2 * k + 1], [5, "q", (k * 37) % 11]]);
    const m = (list: string[]) => `title: order\nscenarios:\n  - {name: a, end: 10, runs: [${list.join(", ")}]}\nmeasures:\n  - {name: q, kind: level, series: q}\n`;
    const names = Object.keys(files);
    const a = await studyOf(m(names), files);
    const b = await studyOf(m([...names].reverse()), files);
    expect(b.outcome.results.scenarios[0].summary).toEqual(a.outcome.results.scenarios[0].summary);
  });
});
