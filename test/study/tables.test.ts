import { describe, expect, it } from "vitest";
import { intervalTablePath, runTablePath, safeName } from "../../src/study/tables.js";
import { csv } from "../helpers/tempStudy.js";
import { studyOf } from "../helpers/runStudyFrom.js";

/** Every suffix a run table gets and every figure an interval table gets (src/measures, summaries.ts). */
const SUFFIXES = ["", "quantiles", "within", "time_at_least", "time_at_value"];
const FIGURES = ["value", "quantiles.0.5", "quantiles.0.95", "within.3", "within.-1", "time_at_least.2", "time_at_least.1e+21"];

/** Pieces a name can be built from: the layout's suffixes, separators and folder names, cases, escapes. */
const PIECES = ["wait", "Wait", "WAIT", "quantiles", "within", "time_at_least", "time_at_value", "0.5", "csv", "runs", "intervals", "tables", ".", "..", "/", "\\", "~", "~2E", "+", "+w", "-", "_", " ", "é", "E", "con", "CON", "nul"];

function allNames(): string[] {
  const names = new Set<string>(PIECES);
  for (const a of PIECES) for (const b of PIECES) names.add(a + b);
  for (const a of ["wait", "Wait", "con"]) for (const b of [".", "~", "+", "/"]) for (const c of PIECES) names.add(a + b + c);
  return [...names];
}

describe("safeName / runTablePath / intervalTablePath: calculation-table file names", () => {
  it("maps names as docs/tables.md shows (computed by hand from the rule: a-z 0-9 _ - kept, uppercase as +x, other bytes ~XX)", () => {
    expect(safeName("lane_queue")).toBe("lane_queue");
    expect(safeName("Lane Queue")).toBe("+lane~20+queue");
    expect(safeName("wait.quantiles")).toBe("wait~2Equantiles");
    expect(safeName("é")).toBe("~C3~A9"); // U+00E9 is C3 A9 in UTF-8
    expect(safeName("a~b+c")).toBe("a~7Eb~2Bc");
    expect(safeName("con")).toBe("~63on");
    expect(safeName("COM1")).toBe("+c+o+m1");
    expect(safeName("com1")).toBe("~63om1");
    expect(safeName("..")).toBe("~2E~2E");
  });

  it("gives distinct file names, also compared without case, for names built from every suffix and separator of the layout", () => {
    const names = allNames();
    const seen = new Map<string, string>();
    for (const scenario of ["s", "S", "s.runs"]) {
      for (const run of ["rep-1", "Rep-1", "rep.1"]) {
        for (const measure of names) {
          const paths = [
            ...SUFFIXES.map((suffix) => [runTablePath(scenario, run, measure, suffix), `${scenario}|${run}|${measure}|${suffix}`]),
            ...FIGURES.map((figure) => [intervalTablePath(scenario, measure, figure), `${scenario}|${measure}|${figure}`]),
          ];
          for (const [path, what] of paths) {
            const key = path.toLowerCase();
            const before = seen.get(key);
            if (before !== undefined && before !== what) expect.fail(`${what} and ${before} share the file ${path}`);
            seen.set(key, what);
          }
        }
      }
    }
    expect(seen.size).toBeGreaterThan(names.length * 9 * SUFFIXES.length);
  });

  it("writes each part with file-name-safe characters only, never a `.`, and never a Windows device name", () => {
    for (const name of allNames()) {
      const part = safeName(name);
      expect(part, name).toMatch(/^[a-z0-9_~+A-F-]+$/);
      expect(part, name).not.toMatch(/^(con|prn|aux|nul|com\d|lpt\d)$/i);
    }
  });

  it("shortens long names to at most 100 characters with a digest, without splitting an escape, keeping them distinct", () => {
    const base = "é".repeat(60); // 360 characters once escaped
    const longs = [base, base + "a", base + "b", "x" + base, "A".repeat(200), "A".repeat(201), "a".repeat(101), "a".repeat(100)];
    const parts = longs.map(safeName);
    expect(new Set(parts.map((p) => p.toLowerCase())).size).toBe(longs.length);
    for (const [i, p] of parts.entries()) {
      expect(p.length, longs[i]).toBeLessThanOrEqual(100);
      expect(p, longs[i]).toMatch(/^[a-z0-9_~+A-F-]+$/);
    }
    expect(parts[7]).toBe("a".repeat(100)); // 100 characters: kept whole
    expect(parts[6]).toMatch(/^a{80}~~[0-9a-f]{16}$/);
    // the kept head ends on a whole escape: every ~ before the digest is followed by two hex digits
    for (const p of parts) expect(p.replace(/~~[0-9a-f]{16}$/, "")).toMatch(/^(?:[a-z0-9_-]|\+[a-z]|~[0-9A-F]{2})*$/);
  });
});

describe("report tables for measures whose names look like another measure's table", () => {
  it("keeps `wait`'s quantile table apart from the measure `wait.quantiles`, and `Wait` apart from `wait`", async () => {
    const file = csv([[1, "w", 1], [2, "w", 3], [3, "v", 10], [4, "v", 30], [5, "u", 100]]);
    const { outcome } = await studyOf(
      "scenarios:\n  - {name: s, end: 10, runs: [runs/r.csv]}\nmeasures:\n" +
        "  - {name: wait, kind: observation, series: w, quantiles: [0.5]}\n" +
        "  - {name: wait.quantiles, kind: observation, series: v, quantiles: [0.5]}\n" +
        "  - {name: Wait, kind: observation, series: u, quantiles: [0.5]}\n",
      { "runs/r.csv": file },
    );
    const files = outcome.tables.map((t) => t.file);
    expect(new Set(files.map((f) => f.toLowerCase())).size).toBe(files.length);
    const table = (measure: string, kind: string) => outcome.tables.find((t) => t.measure === measure && t.kind === kind && t.run !== null)!;
    // the median of each measure's observations (computed by hand: 2, 20 and 100)
    const median = (measure: string) => table(measure, "quantiles").preview!.find((r) => r[0] === 0.5);
    expect(median("wait")).toContain(2);
    expect(median("wait.quantiles")).toContain(20);
    expect(median("Wait")).toContain(100);
    expect(table("wait", "quantiles").file).toBe("tables/s/runs/r/wait.quantiles.csv");
    expect(table("wait.quantiles", "observation").file).toBe("tables/s/runs/r/wait~2Equantiles.csv");
    expect(table("Wait", "observation").file).toBe("tables/s/runs/r/+wait.csv");
  });
});

describe("report tables: text cells a spreadsheet would run as formulas", () => {
  it("writes run ids and entity ids that start with = + - @ with a leading apostrophe, numbers as they are", async () => {
    const run = csv([[1, "in", null, "=1+2"], [2, "in", null, "@me"], [3, "out", null, "=1+2"], [4, "out", null, "@me"], [5, "q", -3]]);
    const { tableFiles } = await studyOf(
      "scenarios:\n  - {name: s, end: 10, runs: [runs/-1.csv, runs/+2.csv]}\nmeasures:\n" +
        "  - {name: stay, kind: observation, from: {start: in, end: out}}\n  - {name: q, kind: level, series: q}\n",
      { "runs/-1.csv": run, "runs/+2.csv": run },
    );
    const text = (file: string) => tableFiles.find((f) => f.record.file === file)!.csv;
    const stay = text("tables/s/runs/-1/stay.csv").split("\n");
    // entity observation columns: index, time, entity, start_time, value, ... (docs/tables.md)
    expect(stay[1].split(",").slice(0, 3)).toEqual(["1", "3", "'=1+2"]);
    expect(stay[2].split(",").slice(0, 3)).toEqual(["2", "4", "'@me"]);
    const interval = text("tables/s/intervals/q.csv").split("\n");
    expect(interval[1].split(",").slice(0, 3)).toEqual(["run", "'-1", "-1.5"]); // level -3 on [5, 10]: mean -15 / 10 (computed by hand)
    expect(interval[2].split(",").slice(0, 2)).toEqual(["run", "'+2"]);
    expect(text("tables/s/runs/-1/q.csv")).toContain(",-3,5,10,5,-15,");
  });
});
