/**
 * Response curves (results.json `response_curves`): each point is its scenario's summary interval
 * to the last bit, points are grouped by the other factors and ordered by the factor, and the
 * manifest's `factors` are checked. Reference: the study's own summaries (the curve adds no
 * arithmetic, common practice for a plot of scenario means against a design factor).
 */
import { describe, expect, it } from "vitest";
import { studyOf } from "../helpers/runStudyFrom.js";
import { manifestMessages } from "../../src/messages/index.js";

const run = (v: number) => `time,series,value\n0,w,${v}\n1,w,${v + 1}\n`;
const files: Record<string, string> = {};
for (const s of ["a", "b", "c", "d"]) for (const k of [1, 2, 3]) files[`runs/${s}/r${k}.csv`] = run(k * (s.charCodeAt(0) - 96));

function manifest(factors: string[]): string {
  const names = ["a", "b", "c", "d"];
  return "title: curves\nscenarios:\n" + names.map((n, i) => `  - {name: ${n}, runs: runs/${n}/*.csv${factors[i] === "" ? "" : `, factors: ${factors[i]}`}}`).join("\n") +
    "\nmeasures:\n  - {name: w, kind: observation, series: w}\n";
}

describe("responseCurves", () => {
  it("each point's mean, ci_low, ci_high and n are exactly its scenario's summary, grouped by the other factor and in factor order", async () => {
    const { outcome } = await studyOf(manifest(["{x: 3, y: 1}", "{x: 1, y: 1}", "{x: 2, y: 1}", "{x: 1, y: 2}"]), files);
    const r = outcome.results;
    const curves = r.response_curves!;
    const byX = curves.find((c) => c.factor === "x")!;
    expect(byX.groups.map((g) => g.fixed)).toEqual([{ y: 1 }]);
    expect(byX.groups[0].points.map((p) => [p.scenario, p.value])).toEqual([["b", 1], ["c", 2], ["a", 3]]);
    expect(byX.alone).toEqual(["d"]);
    for (const c of curves) for (const g of c.groups) for (const p of g.points) {
      const s = r.scenarios.find((x) => x.name === p.scenario)!.summary.w;
      expect([p.mean, p.ci_low, p.ci_high, p.n]).toEqual([s.mean, s.ci_low, s.ci_high, s.n]);
    }
    expect(r.scenarios[0].factors).toEqual({ x: 3, y: 1 });
    expect(outcome.tables.filter((t) => t.kind === "response-curve").map((t) => t.file)).toEqual(["tables/response.curves/w.x.csv", "tables/response.curves/w.y.csv"]);
  });

  it("a scenario without factors while others have them is an error naming both scenarios", async () => {
    await expect(studyOf(manifest(["{x: 1}", "{x: 2}", "", "{x: 3}"]), files)).rejects.toThrow(/scenario "c" lacks the factor "x".*scenario "a"/s);
    const err = await studyOf(manifest(["{x: 1}", "{x: 2, z: 1}", "{x: 2}", "{x: 3}"]), files).catch((e: unknown) => e as Error);
    expect(String((err as Error).message)).toContain('names the factor "z" that scenario "a" does not');
    expect(typeof manifestMessages.factorsDiffer).toBe("function");
  });

  it("a factor value that is not a finite number is a schema error", async () => {
    await expect(studyOf(manifest(["{x: .inf}", "{x: 2}", "{x: 2}", "{x: 3}"]), files)).rejects.toThrow(/not a finite number/);
    await expect(studyOf(manifest(["{x: two}", "{x: 2}", "{x: 2}", "{x: 3}"]), files)).rejects.toThrow(/a number/);
  });
});
