/**
 * Run summaries read back (`report --from-summaries`, issue 12): a summary is checked against its
 * run file's digest when the file can be read, and a summary that is not what `summarize-run`
 * writes gets the catalogue's message, even when its own digest was made to match.
 *
 * The study is invented (hand-made rows); expected messages come from src/messages/summary.ts.
 */
import { createHash } from "node:crypto";
import { mkdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { dirname, join } from "node:path";
import { describe, expect, it } from "vitest";
import { loadStudy } from "../../src/manifest/loadStudy.js";
import * as msg from "../../src/messages/summary.js";
import { UserError } from "../../src/messages/index.js";
import { runStudy } from "../../src/study/runStudy.js";
import { summarizeRun, summaryPath } from "../../src/study/runSummary.js";
import { csv, tempFolder } from "../helpers/tempStudy.js";

const MANIFEST = `title: Ferry check-in
time_unit: min
scenarios:
  - {name: two-booths, end: 10, runs: "runs/*.csv"}
measures:
  - {name: lane, kind: level, series: queue}
  - {name: wait, kind: observation, series: wait}
`;

const RUN = (k: number) => csv([[0, "queue", k], [1, "wait", 0.5 * k], [3, "queue", k + 2], [4, "wait", 1.25], [9.5, "queue", 1]]);
const sha = (text: string) => createHash("sha256").update(text).digest("hex");

/** A study folder with two runs and their summaries under `sums/`. */
async function withSummaries() {
  const dir = tempFolder({ "study.yaml": MANIFEST, "runs/r1.csv": RUN(1), "runs/r2.csv": RUN(2) });
  const study = await loadStudy(join(dir, "study.yaml"));
  const sums = join(dir, "sums");
  for (const run of ["r1", "r2"]) {
    const file = join(sums, summaryPath("two-booths", run));
    mkdirSync(dirname(file), { recursive: true });
    writeFileSync(file, (await summarizeRun(study, "two-booths", run)).text);
  }
  return { dir, study, sums, file: (run: string) => `${sums}/${summaryPath("two-booths", run)}` };
}

async function failure(p: Promise<unknown>): Promise<UserError> {
  const e = await p.then(() => null, (err: unknown) => err);
  expect(e).toBeInstanceOf(UserError);
  return e as UserError;
}

/** Edits a summary's JSON and writes it back with its own digest made to match again. */
function forge(file: string, edit: (s: Record<string, unknown>) => void): void {
  const s = JSON.parse(readFileSync(file, "utf8")) as Record<string, unknown>;
  delete s.digest;
  edit(s);
  // The digest is the SHA-256 of the summary's JSON without it (src/study/runSummary.ts, encodeSummary).
  s.digest = sha(JSON.stringify(s));
  writeFileSync(file, JSON.stringify(s) + "\n");
}

describe("runStudy with fromSummaries: each summary against its run file", () => {
  it("gives the same results as the run files when the run files are those the summaries were made from", async () => {
    const { study, sums } = await withSummaries();
    const fromSums = (await runStudy(study, { fromSummaries: sums })).outcome;
    const raw = (await runStudy(study)).outcome;
    expect(JSON.stringify(fromSums.results)).toBe(JSON.stringify(raw.results));
    expect(fromSums.warnings).toEqual(raw.warnings);
  });

  it("refuses a stale summary: its run file changed after the summary was made", async () => {
    const { dir, study, sums, file } = await withSummaries();
    const changed = RUN(1).replace("3,queue,3", "3,queue,4");
    expect(changed).not.toBe(RUN(1));
    writeFileSync(join(dir, "runs", "r1.csv"), changed);
    const e = await failure(runStudy(study, { fromSummaries: sums }));
    expect(e.message).toBe(msg.summaryStale(file("r1"), "runs/r1.csv", sha(changed), sha(RUN(1))).message);
  });

  it("uses a summary whose run file cannot be read here, and says so in a warning", async () => {
    const { dir, study, sums } = await withSummaries();
    // The manifest was read while the file was there; now its contents are out of reach.
    rmSync(join(dir, "runs", "r2.csv"));
    const { outcome } = await runStudy(study, { fromSummaries: sums });
    expect(outcome.results.scenarios[0].runs.map((r) => r.id)).toEqual(["r1", "r2"]);
    expect(outcome.warnings).toContainEqual({ scenario: "two-booths", run: "r2", measure: null, message: msg.summaryUnchecked("runs/r2.csv", "ENOENT") });
    const unchecked = outcome.warnings.filter((w) => w.run !== null && w.message === msg.summaryUnchecked(`runs/${w.run}.csv`, "ENOENT"));
    expect(unchecked.map((w) => w.run)).toEqual(["r2"]);
  });
});

describe("runStudy with fromSummaries: a malformed summary gets a message", () => {
  const cases: [string, (s: Record<string, unknown>) => void, string][] = [
    ["the analysis is missing", (s) => void delete s.analysis, "at analysis: expected an object, found nothing (the key is missing)"],
    ["the rows of the input record are text", (s) => void (((s.analysis as Record<string, unknown>).input as Record<string, unknown>).rows = "many"), 'at analysis.input.rows: expected a finite number, found the string "many"'],
    ["the window's end is text", (s) => void (((s.analysis as Record<string, unknown>).window as Record<string, unknown>).end = "10"), 'at analysis.window.end: expected a finite number or null, found the string "10"'],
    ["the outputs are a plain object", (s) => void ((s.analysis as Record<string, unknown>).outputs = {}), "at analysis.outputs: expected the measures' outputs, found an object"],
    ["the warnings are not a list", (s) => void ((s.analysis as Record<string, unknown>).warnings = "none"), 'at analysis.warnings: expected a list, found the string "none"'],
    ["the run's result has no measures", (s) => void (((s.analysis as Record<string, unknown>).result as Record<string, unknown>).measures = null), "at analysis.result.measures: expected an object, found null"],
    [
      "an output lacks its tables",
      (s) => {
        const outputs = (s.analysis as { outputs: { $map: [string, Record<string, unknown>][] } }).outputs.$map;
        delete outputs[0][1].tables;
      },
      "at analysis.outputs.lane.tables: expected a list, found nothing (the key is missing)",
    ],
    [
      "a measure is missing from the outputs",
      (s) => {
        const outputs = (s.analysis as { outputs: { $map: [string, unknown][] } }).outputs;
        outputs.$map = outputs.$map.filter(([name]) => name !== "wait");
      },
      "at analysis.outputs.wait: expected an object, found nothing (the key is missing)",
    ],
    [
      "a list of doubles is cut short",
      (s) => {
        const outputs = (s.analysis as { outputs: { $map: [string, Record<string, { $f64: string }>][] } }).outputs.$map;
        outputs[1][1].observations = { $f64: Buffer.alloc(12).toString("base64") };
      },
      "a list of doubles is 12 bytes long, not a multiple of 8",
    ],
    [
      "a map's entries are not pairs",
      (s) => void ((s.analysis as Record<string, unknown>).outputs = { $map: [1, 2] }),
      "a map's entries are not [name, value] pairs",
    ],
  ];
  for (const [what, edit, why] of cases) {
    it(`${what}, though the summary's digest matches`, async () => {
      const { study, sums, file } = await withSummaries();
      forge(file("r1"), edit);
      const e = await failure(runStudy(study, { fromSummaries: sums }));
      expect(e.message).toBe(msg.summaryMalformed(file("r1"), why).message);
    });
  }

  it("a summary that is a list, a number or null, and one cut short", async () => {
    const { study, sums, file } = await withSummaries();
    const good = readFileSync(file("r1"), "utf8");
    for (const text of ["[1, 2]", "7", "null"]) {
      writeFileSync(file("r1"), text);
      const e = await failure(runStudy(study, { fromSummaries: sums }));
      expect(e.message).toBe(msg.summaryUnreadable(file("r1"), '"format" is not "sojourn-run-summary/1"').message);
    }
    writeFileSync(file("r1"), good.slice(0, good.length / 2));
    const e = await failure(runStudy(study, { fromSummaries: sums }));
    expect(e.message.startsWith(`${file("r1")}: this is not a run summary written by \`sojourn summarize-run\` (not JSON: `)).toBe(true);
  });
});
