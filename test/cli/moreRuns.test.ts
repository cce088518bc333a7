/**
 * `sojourn more-runs`: for each select: entry the runs each scenario needs in all and how many
 * more, for each measure with a target the runs its precision needs; as text and --json, and it
 * writes nothing.
 */
import { readdirSync, readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { rinottH } from "../../src/stats/rinott.js";
import { sojourn } from "../helpers/cli.js";
import { csv, tempFolder } from "../helpers/tempStudy.js";

// Each run holds one observation of `wait`, so the run's value is that number.
const WAITS: Record<string, number[]> = {
  calm: [1.0, 1.2, 0.8, 1.1, 0.9],
  busy: [3.0, 4.0, 2.0, 5.0, 1.0],
};
const manifest = `title: Bakery counter
time_unit: min
scenarios:
  - {name: calm, runs: "runs/calm/*.csv"}
  - {name: busy, runs: "runs/busy/*.csv"}
measures:
  - {name: wait, kind: observation, series: wait, target: {half_width: 0.5}}
select:
  - {measure: wait, better: smaller, indifference: 0.5, probability: 0.9}
`;
function bakery(): string {
  const files: Record<string, string> = { "study.yaml": manifest };
  for (const [sc, waits] of Object.entries(WAITS)) waits.forEach((w, k) => (files[`runs/${sc}/day-${k + 1}.csv`] = csv([[1, "wait", w]])));
  return tempFolder(files);
}

/** Sample variance, n − 1 divisor (computed here, independently of the code under test). */
function variance(xs: number[]): number {
  const m = xs.reduce((a, b) => a + b, 0) / xs.length;
  return xs.reduce((a, b) => a + (b - m) ** 2, 0) / (xs.length - 1);
}

describe("sojourn more-runs", () => {
  it("--json gives N_i = max(n0, ceil((h S_i / δ)²)) per scenario and the runs still to make, and writes nothing", () => {
    const dir = bakery();
    const before = readdirSync(dir).sort();
    const r = sojourn(["more-runs", join(dir, "study.yaml"), "--json"]);
    expect(r.stderr).toBe("");
    expect(r.status).toBe(0);
    expect(readdirSync(dir).sort()).toEqual(before); // brief: computes the run values but writes nothing
    const plan = JSON.parse(r.stdout);
    const h = rinottH(2, 5, 0.9).h;
    const [sel] = plan.selections;
    expect(sel.constant).toEqual({ symbol: "h", value: h });
    for (const [i, name] of ["calm", "busy"].entries()) {
      // Rinott (1978): N_i = max(n0, ceil((h S_i / δ)²)), S_i² the first-stage sample variance
      const needed = Math.max(5, Math.ceil((h * Math.sqrt(variance(WAITS[name])) / 0.5) ** 2));
      expect(sel.scenarios[i]).toEqual({ scenario: name, runs_present: 5, runs_needed: needed, runs_more: needed - 5 });
    }
    expect(sel.scenarios[0].runs_more).toBe(0); // calm: sd 0.158, so n0 = 5 is enough (computed by hand: (2.4 · 0.158 / 0.5)² < 5)
    expect(sel.scenarios[1].runs_more).toBeGreaterThan(0); // busy: sd 1.58, far more (computed by hand)
    expect(sel.complete).toBe(false);
  });

  it("--json gives each target's runs_needed as the report's results.json has it", () => {
    const dir = bakery();
    const plan = JSON.parse(sojourn(["more-runs", join(dir, "study.yaml"), "--json"]).stdout);
    expect(sojourn(["report", join(dir, "study.yaml"), "--out", join(dir, "out"), "--quiet"]).status).toBe(0);
    const results = JSON.parse(readFileSync(join(dir, "out", "results.json"), "utf8"));
    const [target] = plan.targets;
    expect(target.measure).toBe("wait");
    for (const [i, sc] of results.scenarios.entries()) {
      const need = sc.summary.wait.runs_needed;
      expect(typeof need).toBe("number");
      expect(target.scenarios[i]).toMatchObject({ scenario: sc.name, runs_present: 5, runs_needed: need, runs_more: Math.max(0, need - 5) }); // brief: results' runs_needed
    }
  });

  it("prints the same numbers as text, one line per scenario", () => {
    const dir = bakery();
    const plan = JSON.parse(sojourn(["more-runs", join(dir, "study.yaml"), "--json"]).stdout);
    const r = sojourn(["more-runs", join(dir, "study.yaml")]);
    expect(r.status).toBe(0);
    for (const s of plan.selections[0].scenarios) expect(r.stdout).toContain(`  ${s.scenario}: ${s.runs_needed} runs in all, 5 present, ${s.runs_more} more`);
    expect(r.stdout).toContain("select entry 1: the best wait (smaller is better)");
    expect(r.stdout).toContain("target of wait:");
  });
});
