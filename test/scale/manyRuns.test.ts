/**
 * A study of 1000 small runs (issue 12, class 2): memory that does not grow with the number of
 * runs beyond their small results, a report page of bounded size, and the same bytes whatever
 * the number of workers. Through the built command line (`npm run build` first).
 *
 * The runs are invented by the demo's seeded queue simulation (src/demo/queue.ts). The bounds are
 * generous on purpose (the machine may be shared): before the tables were written as each run
 * ended, this study peaked at about 1 GB and wrote a 51 MB page (measured with /usr/bin/time on the
 * lead's 2-core machine); now about 270 MB and 5.7 MB.
 */
import { spawnSync } from "node:child_process";
import { mkdirSync, readdirSync, readFileSync, statSync, writeFileSync } from "node:fs";
import { join, relative } from "node:path";
import { fileURLToPath } from "node:url";
import { beforeAll, describe, expect, it } from "vitest";
import { simulateQueue } from "../../src/demo/queue.js";
import { writeRunCsv } from "../../src/demo/ferry.js";
import { PREVIEW_RUNS } from "../../src/study/tables.js";
import { tempFolder } from "../helpers/tempStudy.js";

const MAIN = fileURLToPath(new URL("../../dist/cli/main.js", import.meta.url));
const RUNS = 1000;
/** Generous bounds (see above): peak RSS of the report of 1000 runs, and its page. */
const PEAK_RSS_LIMIT_MB = 600;
const PAGE_LIMIT_MB = 12;
/** Growth of the peak from 100 to 1000 runs (measured about 90 MB; before the fix about 750 MB). */
const GROWTH_LIMIT_MB = 300;

let dir: string;

/**
 * Runs `sojourn report` and returns its peak resident memory (MB) as the process itself saw it
 * (worker threads included), through a small wrapper file: options of the node command itself
 * would pass on to the worker threads.
 */
function reportPeak(manifest: string, out: string, workers: number): number {
  const wrapper = join(dir, "peak.mjs");
  writeFileSync(
    wrapper,
    `process.argv.splice(1, 1, ${JSON.stringify(MAIN)});\n` +
      `process.on("exit", () => process.stderr.write("PEAK_RSS_KB " + process.resourceUsage().maxRSS + "\\n"));\n` +
      `await import(${JSON.stringify(MAIN)});\n`,
  );
  const r = spawnSync(process.execPath, [wrapper, "report", manifest, "--out", out, "--quiet", "--workers", String(workers)], {
    encoding: "utf8",
    env: { ...process.env, SOURCE_DATE_EPOCH: "1780000000" },
  });
  expect(r.status, r.stderr).toBe(0);
  const m = /PEAK_RSS_KB (\d+)/.exec(r.stderr);
  expect(m).not.toBeNull();
  return Number(m![1]) / 1024;
}

function manifest(name: string, pattern: string): string {
  const path = join(dir, name);
  writeFileSync(
    path,
    `title: Many small runs\ntime_unit: min\nscenarios:\n  - {name: small, end: 200, runs: "${pattern}"}\nmeasures:\n` +
      "  - {name: queue_len, kind: level, series: queue}\n  - {name: busy_use, kind: utilization, series: busy, capacity: 2}\n" +
      "  - {name: wait, kind: observation, series: wait}\n  - {name: departures, kind: count, series: depart}\n" +
      "  - {name: in_system, kind: level, from: {enter: arrive, leave: depart}}\n",
  );
  return path;
}

function files(root: string): Map<string, Buffer> {
  const out = new Map<string, Buffer>();
  const walk = (d: string) => {
    for (const e of readdirSync(d, { withFileTypes: true })) {
      const p = join(d, e.name);
      if (e.isDirectory()) walk(p);
      else if (e.name !== "record.json") out.set(relative(root, p), readFileSync(p));
    }
  };
  walk(root);
  return out;
}

beforeAll(async () => {
  dir = tempFolder({});
  mkdirSync(join(dir, "first"));
  mkdirSync(join(dir, "rest"));
  for (let k = 1; k <= RUNS; k++) {
    const id = String(k).padStart(4, "0");
    await writeRunCsv(join(dir, k <= 100 ? "first" : "rest", `rep-${id}.csv`), simulateQueue({ arrivalRate: 0.9, serviceRate: 0.5, servers: 2, horizon: 200, seed: k }));
  }
}, 120_000);

describe(`sojourn report on ${RUNS} small runs`, () => {
  it("peaks in bounded memory, writes a page of bounded size, and gives the same bytes with 1 and 2 workers", () => {
    const few = reportPeak(manifest("few.yaml", "first/*.csv"), join(dir, "few"), 1);
    const manyPath = manifest("many.yaml", "{first,rest}/*.csv");
    const one = reportPeak(manyPath, join(dir, "one"), 1);
    const two = reportPeak(manyPath, join(dir, "two"), 2);
    expect(one).toBeLessThan(PEAK_RSS_LIMIT_MB);
    expect(two).toBeLessThan(PEAK_RSS_LIMIT_MB);
    expect(one - few).toBeLessThan(GROWTH_LIMIT_MB);

    const results = JSON.parse(readFileSync(join(dir, "one", "results.json"), "utf8"));
    expect(results.scenarios[0].runs).toHaveLength(RUNS);
    const page = readFileSync(join(dir, "one", "report.html"), "utf8");
    expect(statSync(join(dir, "one", "report.html")).size / 1e6).toBeLessThan(PAGE_LIMIT_MB);
    // The page shows the tables of the first PREVIEW_RUNS runs only, and says where the others are.
    const shown = new Set([...page.matchAll(/<h4>[^<]* — small — run (rep-\d+)/g)].map((m) => m[1]));
    expect([...shown].sort()).toEqual(Array.from({ length: PREVIEW_RUNS }, (_, i) => `rep-${String(i + 1).padStart(4, "0")}`));
    expect(page).toContain('id="tables-elsewhere"');
    // Every link in the page leads to an element of the page (a later run's value to the note).
    const ids = new Set([...page.matchAll(/\sid="([^"]+)"/g)].map((m) => m[1]));
    const targets = new Set([...page.matchAll(/href="#([^"]+)"/g)].map((m) => m[1]));
    expect([...targets].filter((t) => !ids.has(t))).toEqual([]);
    expect(targets.has("tables-elsewhere")).toBe(true);
    // Every table is still a file, listed in the record.
    const record = JSON.parse(readFileSync(join(dir, "one", "record.json"), "utf8"));
    const tables = (record.outputs as { file: string }[]).filter((o) => o.file.startsWith("tables/small/runs/"));
    expect(new Set(tables.map((t) => t.file.split("/")[3])).size).toBe(RUNS);

    const a = files(join(dir, "one"));
    const b = files(join(dir, "two"));
    expect([...b.keys()].sort()).toEqual([...a.keys()].sort());
    for (const [f, bytes] of a) expect(b.get(f)!.equals(bytes), f).toBe(true);
  }, 600_000);
});
