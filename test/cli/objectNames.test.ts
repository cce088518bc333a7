/**
 * Scenarios, runs, series and measures named after members of every JavaScript object
 * (`constructor`, `valueOf`, `hasOwnProperty`, `toString`, `isPrototypeOf`, `__proto__`) work in
 * every command, through the built command line: check (and --json), report, at (and --json),
 * table, summarize-run, report --from-summaries and verify, with per-scenario overrides keyed by
 * such names and a paired comparison between two of them.
 *
 * Reference values computed by hand from the run file below (contract sections 2-4).
 */
import { mkdirSync, readFileSync, rmSync } from "node:fs";
import { dirname, join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { summaryPath } from "../../src/study/runSummary.js";
import { runTablePath } from "../../src/study/tables.js";
import { sojourn } from "../helpers/cli.js";
import { tempFolder } from "../helpers/tempStudy.js";

// Every run file: level "__proto__" 2 from 1, 4 from 4; observations "valueOf" 1 and 3; two
// "isPrototypeOf" events; entity e1 has "constructor" at 3 and "toString" at 7. Window [0, 10].
const RUN = `time,series,value,entity
1,__proto__,2,
2,valueOf,1,
3,constructor,,e1
4,__proto__,4,
5,valueOf,3,
6,isPrototypeOf,,
7,toString,,e1
8,isPrototypeOf,,
`;
const SCENARIOS = ["__proto__", "constructor", "valueOf"];
const RUNS = ["hasOwnProperty", "toString"]; // in file-name order
const MANIFEST = `title: valueOf
scenarios:
${SCENARIOS.map((s) => `  - {name: ${s}, end: 10, runs: "runs/${s}/*.csv"${s === "valueOf" ? ", measures: {constructor: {initial: 1}}" : ""}}`).join("\n")}
measures:
  - {name: constructor, kind: level, series: __proto__, scenarios: {__proto__: {initial: 2}}}
  - {name: __proto__, kind: observation, series: valueOf, quantiles: [0.5], within: [2]}
  - {name: hasOwnProperty, kind: count, series: isPrototypeOf}
  - {name: valueOf, kind: level, from: {enter: constructor, leave: toString}}
  - {name: toString, kind: observation, from: {start: constructor, end: toString}}
  - {name: isPrototypeOf, kind: utilization, series: __proto__, capacity: 4}
compare:
  - {measure: constructor, scenarios: [__proto__, constructor], method: paired}
`;
/** The level "constructor" before its first row, per scenario (the overrides above); a Map, since `{__proto__: 2}` would set a prototype. */
const INITIAL = new Map([["__proto__", 2], ["constructor", 0], ["valueOf", 1]]);

const dirs: string[] = [];
afterAll(() => dirs.forEach((d) => rmSync(d, { recursive: true, force: true })));

function study(): string {
  const files: Record<string, string> = { "study.yaml": MANIFEST };
  for (const s of SCENARIOS) for (const r of RUNS) files[`runs/${s}/${r}.csv`] = RUN;
  const dir = tempFolder(files);
  dirs.push(dir);
  return dir;
}

type Measures = Record<string, Record<string, unknown>>;
interface Results {
  title: string;
  scenarios: { name: string; runs: { id: string; measures: Measures }[]; summary: Measures }[];
  comparisons: Record<string, unknown>[];
}

/** The figures computed by hand for one scenario (every run is the same file). */
function checkScenario(sc: Results["scenarios"][number]): void {
  const I = INITIAL.get(sc.name)!;
  expect(sc.runs.map((r) => r.id)).toEqual(RUNS);
  for (const run of sc.runs) {
    const m = run.measures;
    expect(Object.keys(m)).toEqual(["constructor", "__proto__", "hasOwnProperty", "valueOf", "toString", "isPrototypeOf"]);
    // I on [0, 1], 2 on [1, 4], 4 on [4, 10]: area I + 6 + 24
    expect(m.constructor).toMatchObject({ kind: "level", area: 30 + I, mean: (30 + I) / 10, duration: 10, min: Math.min(I, 2), max: 4, final: 4 });
    // 1 and 3: mean 2, sd sqrt(2); median 2 (type 7); half of them at most 2
    expect(m.__proto__).toMatchObject({ kind: "observation", n: 2, mean: 2, min: 1, max: 3, quantiles: { "0.5": 2 }, within: { "2": 0.5 } });
    expect(m.hasOwnProperty).toMatchObject({ kind: "count", n: 2, rate: 0.2 });
    // e1 inside on [3, 7]
    expect(m.valueOf).toMatchObject({ kind: "level", area: 4, mean: 0.4, final: 0 });
    expect(m.toString).toMatchObject({ kind: "observation", n: 1, mean: 4 });
    // busy area 30 over capacity area 4 · 10
    expect(m.isPrototypeOf).toMatchObject({ kind: "utilization", value: 0.75 });
  }
  expect(Object.keys(sc.summary)).toEqual(["constructor", "__proto__", "hasOwnProperty", "valueOf", "toString", "isPrototypeOf"]);
  expect(sc.summary.constructor).toMatchObject({ n: 2, mean: (30 + I) / 10, sd: 0 });
  expect(sc.summary.__proto__).toMatchObject({ n: 2, mean: 2, sd: 0 });
}

describe("every command with names like object members", () => {
  it("check and check --json read every name", () => {
    const dir = study();
    const text = sojourn(["check", "study.yaml"], dir);
    expect(text.status, text.stderr).toBe(0);
    expect(text.stderr).toBe("");
    for (const s of SCENARIOS) expect(text.stdout).toContain(`scenario ${s}: 2 run(s)`);
    expect(text.stdout).toContain("compare constructor: __proto__ vs constructor (paired)");
    const json = sojourn(["check", "study.yaml", "--json"], dir);
    const plan = JSON.parse(json.stdout) as { title: string; scenarios: { name: string; runs: { id: string }[]; measures: { name: string }[] }[] };
    expect(plan.title).toBe("valueOf");
    expect(plan.scenarios.map((s) => s.name)).toEqual(SCENARIOS);
    expect(plan.scenarios[0].runs.map((r) => r.id)).toEqual(RUNS);
    expect(plan.scenarios[0].measures.map((m) => m.name)).toEqual(["constructor", "__proto__", "hasOwnProperty", "valueOf", "toString", "isPrototypeOf"]);
  });

  it("report, at, table and verify agree with the hand computation", () => {
    const dir = study();
    const report = sojourn(["report", "study.yaml", "--out", "out", "--quiet"], dir);
    expect(report.status, report.stderr).toBe(0);
    const results = JSON.parse(readFileSync(join(dir, "out/results.json"), "utf8")) as Results;
    expect(results.title).toBe("valueOf");
    expect(results.scenarios.map((s) => s.name)).toEqual(SCENARIOS);
    results.scenarios.forEach(checkScenario);
    // paired: each pair differs by (2 - 0) / 10 = 0.2 in the time average
    expect(results.comparisons[0]).toMatchObject({ measure: "constructor", a: "__proto__", b: "constructor", method: "paired", pairs: 2, df: 1, half_width: 0 });
    expect(results.comparisons[0].diff_mean as number).toBeCloseTo(0.2, 14);
    const html = readFileSync(join(dir, "out/report.html"), "utf8");
    for (const n of [...SCENARIOS, ...RUNS, "hasOwnProperty", "isPrototypeOf"]) expect(html).toContain(n);
    const levelTable = readFileSync(join(dir, "out", runTablePath("valueOf", "hasOwnProperty", "constructor", "")), "utf8").split("\n");
    expect(levelTable[1].split(",").slice(0, 5)).toEqual(["1", "1", "0", "1", "1"]); // the override: 1 on [0, 1]

    // at: I·1 + 2·3 + 4·1 = 12 over [0, 5] in scenario __proto__ (I = 2)
    const at = sojourn(["at", "study.yaml", "--scenario", "__proto__", "--run", "toString", "--measure", "constructor", "--time", "5", "--json"], dir);
    expect(at.status, at.stderr).toBe(0);
    expect(JSON.parse(at.stdout)).toEqual({ time: 5, area: 12, duration: 5, mean: 2.4 });
    const atText = sojourn(["at", "study.yaml", "--scenario", "valueOf", "--run", "hasOwnProperty", "--measure", "valueOf", "--time", "5"], dir);
    expect(atText.stdout).toContain("= 2 / 5 = 0.4"); // e1 inside on [3, 5]

    const table = sojourn(["table", "study.yaml", "--scenario", "constructor", "--run", "toString", "--measure", "__proto__"], dir);
    expect(table.status, table.stderr).toBe(0);
    expect(table.stdout.split("\n").slice(1, 3).map((l) => l.split(",").slice(0, 3))).toEqual([["1", "2", "1"], ["2", "5", "3"]]);

    const verify = sojourn(["verify", "out"], dir);
    expect(verify.status, verify.stdout).toBe(0);
    expect(verify.stdout).toMatch(/VERIFIED: \d+ items checked, all match\./);
  }, 180_000);

  it("summarize-run of each run and report --from-summaries give the same results.json as report", () => {
    const dir = study();
    expect(sojourn(["report", "study.yaml", "--out", "out", "--quiet"], dir).status).toBe(0);
    for (const s of SCENARIOS) {
      for (const r of RUNS) {
        const out = join("sums", summaryPath(s, r));
        mkdirSync(join(dir, dirname(out)), { recursive: true });
        const made = sojourn(["summarize-run", "study.yaml", "--scenario", s, "--run", r, "--out", out], dir);
        expect(made.status, made.stderr).toBe(0);
      }
    }
    const again = sojourn(["report", "study.yaml", "--out", "again", "--from-summaries", "sums", "--quiet"], dir);
    expect(again.status, again.stderr).toBe(0);
    expect(readFileSync(join(dir, "again/results.json"), "utf8")).toBe(readFileSync(join(dir, "out/results.json"), "utf8"));
    const verify = sojourn(["verify", "again"], dir);
    expect(verify.status, verify.stdout).toBe(0);
  }, 180_000);
});
