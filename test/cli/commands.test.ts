import { spawnSync } from "node:child_process";
import { createHash } from "node:crypto";
import { existsSync, readFileSync, writeFileSync, mkdirSync, readdirSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { sojourn } from "../helpers/cli.js";
import { csv, tempFolder } from "../helpers/tempStudy.js";
import * as outputMessages from "../../src/messages/output.js";
import { writeFerryStudy } from "../../src/demo/ferry.js";

const MAIN_JS = fileURLToPath(new URL("../../dist/cli/main.js", import.meta.url));

const manifest = `title: Bike repair shop
time_unit: h
warmup: 1
scenarios:
  - {name: one-mechanic, end: 10, runs: "runs/one/*.csv"}
  - {name: two-mechanics, end: 10, runs: "runs/two/*.csv", measures: {bench: {capacity: 2}}}
measures:
  - {name: queue, kind: level, series: waiting}
  - {name: bench, kind: utilization, series: busy, capacity: 1}
  - {name: fix_time, kind: observation, series: fix}
  - {name: bikes, kind: count, series: done}
`;
function shop(): string {
  const files: Record<string, string> = { "study.yaml": manifest };
  for (const [sc, cap] of [["one", 1], ["two", 2]] as const) {
    for (let k = 1; k <= 3; k++) {
      files[`runs/${sc}/day-${k}.csv`] = csv([
        [0, "waiting", k], [0, "busy", 1], [0.5 + k / 10, "fix", 0.7 * k], [2, "waiting", k + 1], [2.5, "done", null],
        [3, "busy", cap], [4.25, "fix", 1.1 + k / 4], [5, "waiting", 0], [6, "done", null], [7.5, "busy", 0], [11, "done", null],
      ]);
    }
  }
  return tempFolder(files);
}

describe("sojourn report", () => {
  it("writes results.json, tables, report.html and record.json; two runs give byte-identical results.json", () => {
    const dir = shop();
    const a = sojourn(["report", join(dir, "study.yaml"), "--out", join(dir, "out1"), "--quiet"]);
    expect(a.stderr).toBe("");
    expect(a.status).toBe(0);
    const b = sojourn(["report", join(dir, "study.yaml"), "--out", join(dir, "out2"), "--quiet"]);
    expect(b.status).toBe(0);
    for (const f of ["results.json", "report.html", "record.json"]) expect(existsSync(join(dir, "out1", f))).toBe(true);
    const r1 = readFileSync(join(dir, "out1", "results.json"), "utf8");
    expect(readFileSync(join(dir, "out2", "results.json"), "utf8")).toBe(r1);
    // CONTRACT.md section 8: no absolute paths inside results.json
    expect(r1).not.toContain(dir);
    const results = JSON.parse(r1);
    expect(results.format).toBe("sojourn-results/1");
    expect(results.scenarios.map((s: { name: string }) => s.name)).toEqual(["one-mechanic", "two-mechanics"]);
    expect(readdirSync(join(dir, "out1", "tables"))).toEqual(["one-mechanic", "two-mechanics"]);
  });

  it("a failing report leaves the earlier report folder exactly as it was", () => {
    const dir = shop();
    const out = join(dir, "out");
    expect(sojourn(["report", join(dir, "study.yaml"), "--out", out, "--quiet"]).status).toBe(0);
    const before = readFileSync(join(out, "results.json"));
    writeFileSync(join(dir, "runs", "two", "day-2.csv"), "time,series,value\n0,waiting,1\nnot-a-time,waiting,2\n");
    const r = sojourn(["report", join(dir, "study.yaml"), "--out", out, "--quiet"]);
    expect(r.status).toBe(1);
    expect(r.stderr).toContain("runs/two/day-2.csv:3");
    expect(r.stderr).not.toMatch(/\n\s+at /); // no stack trace
    expect(readFileSync(join(out, "results.json"))).toEqual(before);
    expect(readdirSync(dir).filter((f) => f.includes("sojourn-tmp"))).toEqual([]);
  });

  it("refuses to write into a non-empty folder that is not an earlier report, unless --force", () => {
    const dir = shop();
    const out = join(dir, "mine");
    mkdirSync(out);
    writeFileSync(join(out, "notes.txt"), "keep me");
    const r = sojourn(["report", join(dir, "study.yaml"), "--out", out, "--quiet"]);
    expect(r.status).toBe(1);
    expect(r.stderr).toBe(`sojourn: ${outputMessages.outHoldsForeign(out, "notes.txt", "no-record").message}\n`);
    expect(readFileSync(join(out, "notes.txt"), "utf8")).toBe("keep me");
  });
});

describe("exit statuses (CONTRACT.md section 7)", () => {
  it("an unknown command or flag is a usage error: status 2", () => {
    expect(sojourn(["frobnicate"]).status).toBe(2);
    expect(sojourn(["check", "x.yaml", "--no-such-flag"]).status).toBe(2);
  });
  it("--help on every command exits 0", () => {
    for (const c of ["report", "check", "at", "verify", "demo", "table"]) {
      const r = sojourn([c, "--help"]);
      expect(r.status).toBe(0);
      expect(r.stdout).toContain("Usage: sojourn " + c);
    }
  });
  it("a missing manifest is an input error: status 1, a message, no stack trace", () => {
    const r = sojourn(["check", "/nonexistent/study.yaml"]);
    expect(r.status).toBe(1);
    expect(r.stderr).toContain("/nonexistent/study.yaml");
    expect(r.stderr).not.toMatch(/\n\s+at /);
  });
  it("a time that decreases within a series names the file and line", () => {
    const dir = tempFolder({
      "s.yaml": "title: t\nscenarios:\n  - {name: a, end: 10, runs: [r.csv]}\nmeasures:\n  - {name: q, kind: level, series: q}\n",
      "r.csv": csv([[0, "q", 1], [5, "q", 1], [2, "other", 1], [4, "q", 2]]),
    });
    const r = sojourn(["check", join(dir, "s.yaml")]);
    expect(r.status).toBe(1);
    expect(r.stderr).toContain("r.csv:5");
  });
});

describe("sojourn check, at, table", () => {
  it("check prints the plan; --json gives it to scripts", () => {
    const dir = shop();
    const r = sojourn(["check", join(dir, "study.yaml"), "--json"]);
    expect(r.status).toBe(0);
    const plan = JSON.parse(r.stdout);
    expect(plan.scenarios[0].runs.map((x: { id: string }) => x.id)).toEqual(["day-1", "day-2", "day-3"]);
    // computed by hand: the row at t = 11 is after the end (10)
    expect(plan.scenarios[0].runs[0].left_out.after_end).toBe(1);
  });

  it("at --json prints time, area, duration and mean; the words version shows the arithmetic", () => {
    const dir = shop();
    const r = sojourn(["at", join(dir, "study.yaml"), "--scenario", "one-mechanic", "--run", "day-2", "--measure", "queue", "--time", "4", "--json"]);
    expect(r.status).toBe(0);
    // computed by hand: c = 1 (warm-up); level 2 on [1, 2], 3 on [2, 4]: area 2 + 6 = 8 over 3
    expect(JSON.parse(r.stdout)).toEqual({ time: 4, area: 8, duration: 3, mean: 8 / 3 });
    const words = sojourn(["at", join(dir, "study.yaml"), "--scenario", "one-mechanic", "--run", "day-2", "--measure", "queue", "--time", "4"]);
    expect(words.stdout).toContain("8 / 3");
  });

  it("at refuses a time outside the window and a measure that is not a level", () => {
    const dir = shop();
    const base = ["at", join(dir, "study.yaml"), "--scenario", "one-mechanic", "--run", "day-2"];
    expect(sojourn([...base, "--measure", "queue", "--time", "0.5"]).status).toBe(1);
    expect(sojourn([...base, "--measure", "fix_time", "--time", "3"]).status).toBe(1);
    expect(sojourn([...base, "--measure", "queue", "--time", "abc"]).status).toBe(2);
  });

  it("table writes the full calculation table as CSV", () => {
    const dir = shop();
    const r = sojourn(["table", join(dir, "study.yaml"), "--scenario", "two-mechanics", "--run", "day-1", "--measure", "bench"]);
    expect(r.status).toBe(0);
    const lines = r.stdout.trim().split("\n");
    expect(lines[0]).toBe("index,value,capacity,from,to,duration,area,capacity_area,running_area,running_capacity_area,running_mean,running_utilization,line");
    // computed by hand: intervals [1,3], [3,7.5], [7.5,10] after the warm-up at 1, their levels set
    // by the busy rows on lines 3, 7 and 11 of the run file (line 1 is the header)
    expect(lines.length).toBe(4);
    expect(lines.slice(1).map((l) => l.split(",").slice(3, 5).concat(l.split(",").at(-1)!))).toEqual([
      ["1", "3", "3"],
      ["3", "7.5", "7"],
      ["7.5", "10", "11"],
    ]);
  });
});

describe("sojourn verify", () => {
  it("verifies an untouched report, then names a changed input and fails", () => {
    const dir = shop();
    const out = join(dir, "out");
    expect(sojourn(["report", join(dir, "study.yaml"), "--out", out, "--quiet"]).status).toBe(0);
    const ok = sojourn(["verify", out]);
    expect(ok.stdout).toContain("VERIFIED");
    expect(ok.status).toBe(0);
    writeFileSync(join(dir, "runs", "one", "day-3.csv"), readFileSync(join(dir, "runs", "one", "day-3.csv"), "utf8").replace("2.5,done", "2.6,done"));
    const bad = sojourn(["verify", out]);
    expect(bad.status).toBe(1);
    expect(bad.stdout).toMatch(/FAILED\s+input runs\/one\/day-3\.csv: changed/);
  });

  it("names an altered output and an extra input", () => {
    const dir = shop();
    const out = join(dir, "out");
    expect(sojourn(["report", join(dir, "study.yaml"), "--out", out, "--quiet"]).status).toBe(0);
    writeFileSync(join(out, "results.json"), readFileSync(join(out, "results.json"), "utf8").replace('"confidence": 0.95', '"confidence": 0.9'));
    writeFileSync(join(dir, "runs", "one", "day-4.csv"), readFileSync(join(dir, "runs", "one", "day-1.csv")));
    const r = sojourn(["verify", out]);
    expect(r.status).toBe(1);
    expect(r.stdout).toMatch(/FAILED\s+input runs\/one\/day-4\.csv: extra/);
  });

  it("finds moved inputs with --inputs", () => {
    const dir = shop();
    const out = join(dir, "out");
    expect(sojourn(["report", join(dir, "study.yaml"), "--out", out, "--quiet"]).status).toBe(0);
    const elsewhere = tempFolder({});
    for (const sc of ["one", "two"]) {
      mkdirSync(join(elsewhere, "runs", sc), { recursive: true });
      for (const f of readdirSync(join(dir, "runs", sc))) writeFileSync(join(elsewhere, "runs", sc, f), readFileSync(join(dir, "runs", sc, f)));
    }
    const r = sojourn(["verify", out, "--inputs", elsewhere]);
    expect(r.stdout).toContain("VERIFIED");
    expect(r.status).toBe(0);
  });
});

describe("reading a run file on two threads (pipeline.ts)", () => {
  const run = (dir: string, out: string, parallel: boolean, args: string[] = []) =>
    spawnSync(process.execPath, [MAIN_JS, "report", join(dir, "study.yaml"), "--out", join(dir, out), "--quiet", "--workers", "1", ...args], {
      encoding: "utf8",
      // SOJOURN_PARALLEL_BYTES=1 sends every file through the reader thread; a huge value keeps all in one thread
      env: { ...process.env, SOURCE_DATE_EPOCH: "1780000000", SOJOURN_PARALLEL_BYTES: parallel ? "1" : "1000000000000" },
    });

  it("gives byte-identical results and tables, and the file's SHA-256 (FIPS 180-4 via node:crypto)", () => {
    const dir = shop();
    expect(run(dir, "one", false).status).toBe(0);
    expect(run(dir, "two", true).status).toBe(0);
    const a = readFileSync(join(dir, "one", "results.json"), "utf8");
    expect(readFileSync(join(dir, "two", "results.json"), "utf8")).toBe(a);
    const recA = JSON.parse(readFileSync(join(dir, "one", "record.json"), "utf8"));
    const recB = JSON.parse(readFileSync(join(dir, "two", "record.json"), "utf8"));
    expect(recB.outputs).toEqual(recA.outputs);
    for (const sc of JSON.parse(a).scenarios) {
      for (const r of sc.runs) expect(r.sha256).toBe(createHash("sha256").update(readFileSync(join(dir, r.file))).digest("hex"));
    }
  });

  it("gives the same results for entity-derived measures (the invented ferry demo study)", async () => {
    const dir = tempFolder({});
    const manifestPath = await writeFerryStudy(dir);
    const runWith = (out: string, parallel: boolean) =>
      spawnSync(process.execPath, [MAIN_JS, "report", manifestPath, "--out", join(dir, out), "--quiet", "--workers", "1"], {
        encoding: "utf8",
        env: { ...process.env, SOURCE_DATE_EPOCH: "1780000000", SOJOURN_PARALLEL_BYTES: parallel ? "1" : "1000000000000" },
      });
    expect(runWith("one", false).status).toBe(0);
    expect(runWith("two", true).status).toBe(0);
    expect(readFileSync(join(dir, "two", "results.json"), "utf8")).toBe(readFileSync(join(dir, "one", "results.json"), "utf8"));
  });

  it("reports an input error with the same message, file and line", () => {
    const dir = shop();
    writeFileSync(join(dir, "runs", "two", "day-2.csv"), "time,series,value\n0,waiting,1\n3,waiting,2\n2,waiting,4\n");
    const a = run(dir, "one", false);
    const b = run(dir, "two", true);
    expect(a.status).toBe(1);
    expect(b.status).toBe(1);
    expect(b.stderr).toBe(a.stderr);
    expect(a.stderr).toContain("runs/two/day-2.csv:4");
  });
});
