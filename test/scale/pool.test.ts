import { existsSync, mkdirSync, readdirSync, readFileSync, statSync, writeFileSync } from "node:fs";
import { availableParallelism } from "node:os";
import { join, relative } from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { writeRunCsv } from "../../src/demo/ferry.js";
import { simulateQueue } from "../../src/demo/queue.js";
import * as summaryMessages from "../../src/messages/summary.js";
import { chooseWorkers, workerCount, workersAvailable } from "../../src/study/pool.js";
import * as studyMessages from "../../src/messages/study.js";
import { sojourn } from "../helpers/cli.js";
import { tempFolder } from "../helpers/tempStudy.js";

/** Every file under `dir` (relative path -> bytes), record.json left out (it names the run's Node and paths). */
function folderBytes(dir: string): Map<string, Buffer> {
  const out = new Map<string, Buffer>();
  const walk = (d: string) => {
    for (const name of readdirSync(d).sort()) {
      const p = join(d, name);
      if (statSync(p).isDirectory()) walk(p);
      else if (name !== "record.json") out.set(relative(dir, p), readFileSync(p));
    }
  };
  walk(dir);
  return out;
}

function expectSameFolders(a: string, b: string): void {
  const x = folderBytes(a);
  const y = folderBytes(b);
  expect([...y.keys()]).toEqual([...x.keys()]);
  for (const [k, v] of x) expect(y.get(k)!.equals(v), k).toBe(true);
}

let dir: string;
let manifest: string;
const RUNS = ["rep-01", "rep-02", "rep-03"];
const SCENARIOS = [
  { name: "two-booths", servers: 2 },
  { name: "three-booths", servers: 3 },
];

/** A small study of the demo's shape (six measures, a comparison), invented by the seeded queue. */
beforeAll(async () => {
  dir = tempFolder({});
  for (const sc of SCENARIOS) {
    mkdirSync(join(dir, "runs", sc.name), { recursive: true });
    for (const [k, run] of RUNS.entries()) {
      const model = { arrivalRate: 0.9, serviceRate: 0.5, servers: sc.servers, horizon: 300, seed: 1000 + k, decimals: 3 };
      await writeRunCsv(join(dir, "runs", sc.name, `${run}.csv`), simulateQueue(model));
    }
  }
  manifest = join(dir, "study.yaml");
  writeFileSync(
    manifest,
    `version: 1
title: Pool and summaries
warmup: 20
scenarios:
  - {name: two-booths, end: 300, runs: "runs/two-booths/*.csv", measures: {booth_use: {capacity: 2}}}
  - {name: three-booths, end: 300, runs: "runs/three-booths/*.csv", measures: {booth_use: {capacity: 3}}}
measures:
  - {name: lane_queue, kind: level, series: queue, at_least: [1, 5]}
  - {name: booth_use, kind: utilization, series: busy, capacity: 2}
  - {name: check_wait, kind: observation, series: wait, within: [5, 15]}
  - {name: vehicles_done, kind: count, series: depart}
  - {name: in_terminal, kind: level, from: {enter: arrive, leave: depart}}
  - {name: time_in_terminal, kind: observation, from: {start: arrive, end: depart}}
compare:
  - {measure: check_wait, scenarios: [two-booths, three-booths], method: paired}
`,
  );
});

describe("workerCount and the in-process fallback", () => {
  it("workerCount(runs, n) takes the flag, then SOJOURN_WORKERS, then the cores; never more than the cores or the runs, never less than 1", () => {
    expect(workerCount(16, 2)).toBe(2);
    expect(workerCount(1, 2)).toBe(1);
    expect(workerCount(16, 40)).toBe(Math.min(16, availableParallelism())); // never more than the cores
    const before = process.env.SOJOURN_WORKERS;
    process.env.SOJOURN_WORKERS = "3";
    try {
      expect(workerCount(16)).toBe(Math.min(3, availableParallelism()));
      expect(workerCount(16, 1)).toBe(1);
    } finally {
      if (before === undefined) delete process.env.SOJOURN_WORKERS;
      else process.env.SOJOURN_WORKERS = before;
    }
    expect(workerCount(16)).toBeGreaterThanOrEqual(1);
  });

  it("chooseWorkers(runs, n, cores) never gives more than the cores or the runs, and notes when it gives fewer than asked", () => {
    // Computed by hand: min(asked, cores, runs), at least 1.
    expect(chooseWorkers(16, 2, 4)).toEqual({ count: 2, note: null });
    expect(chooseWorkers(16, 64, 4)).toEqual({ count: 4, note: studyMessages.workersCapped("--workers", 64, 4, 4, 16) });
    expect(chooseWorkers(3, 64, 4)).toEqual({ count: 3, note: studyMessages.workersCapped("--workers", 64, 3, 4, 3) });
    expect(chooseWorkers(2, 64, 2).count).toBe(2);
    expect(chooseWorkers(1, 1, 8)).toEqual({ count: 1, note: null });
    expect(chooseWorkers(5, undefined, 8)).toEqual({ count: 5, note: null }); // the default asks for nothing
    expect(studyMessages.workersCapped("--workers", 64, 4, 4, 16)).toContain("this machine has 4 cores");
    expect(studyMessages.workersCapped("--workers", 64, 3, 4, 3)).toContain("the study has 3 runs");
    const before = process.env.SOJOURN_WORKERS;
    process.env.SOJOURN_WORKERS = "12";
    try {
      expect(chooseWorkers(16, undefined, 4)).toEqual({ count: 4, note: studyMessages.workersCapped("SOJOURN_WORKERS", 12, 4, 4, 16) });
    } finally {
      if (before === undefined) delete process.env.SOJOURN_WORKERS;
      else process.env.SOJOURN_WORKERS = before;
    }
  });

  it("workersAvailable() is false when the module is a TypeScript source (the pool then runs in process)", () => {
    expect(workersAvailable()).toBe(false);
  });
});

describe("sojourn report --workers (built command line)", () => {
  it("1 and 2 workers give byte-identical results.json, calculation tables and report.html", () => {
    const one = join(dir, "r1");
    const two = join(dir, "r2");
    expect(sojourn(["report", manifest, "--out", one, "--workers", "1", "--quiet"]).status).toBe(0);
    expect(sojourn(["report", manifest, "--out", two, "--workers", "2", "--quiet"]).status).toBe(0);
    expectSameFolders(one, two);
    expect(existsSync(join(two, "tables"))).toBe(true);
  });

  it("--workers 64 on a study of 6 runs uses at most the cores and the runs, and says so on standard error", () => {
    const r = sojourn(["check", manifest, "--workers", "64"]);
    expect(r.status).toBe(0);
    const used = Math.min(64, availableParallelism(), 6);
    expect(r.stderr).toContain(`sojourn: ${studyMessages.workersCapped("--workers", 64, used, availableParallelism(), 6)}\n`);
    expect(sojourn(["check", manifest, "--workers", "1"]).stderr).not.toContain("note:");
  });

  it("an input error found by a worker gives the same message and status as in process", () => {
    const bad = join(dir, "runs", "three-booths", "rep-02.csv");
    const text = readFileSync(bad, "utf8");
    try {
      writeFileSync(bad, text.replace(/\n([0-9.]+),queue,/, "\n$1,queue,x"));
      const a = sojourn(["check", manifest, "--workers", "1"]);
      const b = sojourn(["check", manifest, "--workers", "2"]);
      expect(a.status).toBe(1);
      expect(b.status).toBe(1);
      expect(b.stderr).toBe(a.stderr);
      expect(a.stderr).toContain("rep-02.csv:");
    } finally {
      writeFileSync(bad, text);
    }
  });

  it("with several broken runs, 2 workers report the same (earliest) one as 1 worker, whichever thread met it", () => {
    const files = SCENARIOS.flatMap((sc) => RUNS.map((run) => join(dir, "runs", sc.name, `${run}.csv`)));
    const texts = files.map((f) => readFileSync(f, "utf8"));
    try {
      for (const [i, j] of [[0, 5], [2, 3], [1, 4], [3, 5]]) {
        for (const k of [i, j]) writeFileSync(files[k], texts[k].replace(/\n([0-9.]+),queue,/, "\n$1,queue,x"));
        const a = sojourn(["check", manifest, "--workers", "1"]);
        const b = sojourn(["check", manifest, "--workers", "2"]);
        expect(a.status).toBe(1);
        expect(b.stderr, `broken runs ${i} and ${j}`).toBe(a.stderr);
        expect(a.stderr).toContain(relative(dir, files[i]));
        for (const k of [i, j]) writeFileSync(files[k], texts[k]);
      }
    } finally {
      files.forEach((f, k) => writeFileSync(f, texts[k]));
    }
  });

  it("--workers 0 is a usage error (status 2)", () => {
    expect(sojourn(["report", manifest, "--out", join(dir, "r0"), "--workers", "0"]).status).toBe(2);
  });
});

describe("sojourn summarize-run and report --from-summaries (built command line)", () => {
  it("a report built from per-run summaries equals the report built from the run files, byte for byte", () => {
    const sums = join(dir, "summaries");
    for (const sc of ["two-booths", "three-booths"]) {
      for (const run of RUNS) {
        const r = sojourn(["summarize-run", manifest, "--scenario", sc, "--run", run, "--out", join(sums, sc, `${run}.json`)]);
        expect(r.status, r.stderr).toBe(0);
      }
    }
    const raw = join(dir, "raw");
    const fromSums = join(dir, "from-summaries");
    expect(sojourn(["report", manifest, "--out", raw, "--workers", "1", "--quiet"]).status).toBe(0);
    const r = sojourn(["report", manifest, "--out", fromSums, "--from-summaries", sums, "--quiet"]);
    expect(r.status, r.stderr).toBe(0);
    expect(readFileSync(join(fromSums, "results.json"), "utf8")).toBe(readFileSync(join(raw, "results.json"), "utf8"));
    expectSameFolders(raw, fromSums);
    const record = (d: string) => JSON.parse(readFileSync(join(d, "record.json"), "utf8")).inputs;
    expect(record(fromSums)).toEqual(record(raw));
  });

  it("a changed summary, a summary of another run and a missing summary are refused with their messages", () => {
    const sums = join(dir, "summaries");
    const file = join(sums, "two-booths", "rep-01.json");
    const good = readFileSync(file, "utf8");
    const out = join(dir, "refused");
    try {
      writeFileSync(file, good.replace(/"rows":(\d+)/, (_m, n: string) => `"rows":${Number(n) + 1}`));
      let r = sojourn(["report", manifest, "--out", out, "--from-summaries", sums, "--quiet"]);
      expect(r.status).toBe(1);
      expect(r.stderr).toContain(summaryMessages.summaryTampered(file).message.split("\n")[0]);

      writeFileSync(file, readFileSync(join(sums, "two-booths", "rep-02.json")));
      r = sojourn(["report", manifest, "--out", out, "--from-summaries", sums, "--quiet"]);
      expect(r.status).toBe(1);
      expect(r.stderr).toContain(summaryMessages.summaryOtherRun(file, "run id", '"rep-02"', '"rep-01"').message.split("\n")[0]);

      r = sojourn(["report", manifest, "--out", out, "--from-summaries", join(dir, "nowhere"), "--quiet"]);
      expect(r.status).toBe(1);
      expect(r.stderr).toContain("no summary of run \"rep-01\" of scenario \"two-booths\"");
      expect(existsSync(out)).toBe(false);
    } finally {
      writeFileSync(file, good);
    }
  });
});
