/**
 * `sojourn report --on slurm` on a real one-node Slurm (scripts/slurm-one-node.sh starts it, or
 * finds it running): the report folder is the local report byte for byte; a broken run fails
 * the command, names the run and its log, and replaces nothing; a cancelled task is run again,
 * alone, by the same command. Skipped, with the reason in the titles, when Slurm cannot start here.
 */
import { spawnSync } from "node:child_process";
import { mkdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { writeRunCsv } from "../../src/demo/ferry.js";
import { simulateQueue } from "../../src/demo/queue.js";
import { writeExample } from "../helpers/exampleStudy.js";
import { folderSnapshot, tempFolder } from "../helpers/tempStudy.js";

const SCRIPT = fileURLToPath(new URL("../../scripts/slurm-one-node.sh", import.meta.url));
const MAIN = fileURLToPath(new URL("../../dist/cli/main.js", import.meta.url));
const DATE = "1780000000";

/** Starts (or finds) the one-node Slurm; its SLURM_CONF, or why it cannot run here. */
function startSlurm(): { conf: string } | { why: string } {
  const r = spawnSync("bash", [SCRIPT], { encoding: "utf8", timeout: 120_000 });
  if (r.error !== undefined) return { why: `scripts/slurm-one-node.sh did not run: ${r.error.message}` };
  const conf = /^SLURM_CONF=(.+)$/m.exec(r.stdout)?.[1];
  if (r.status !== 0 || conf === undefined) return { why: (r.stderr.trim().split("\n")[0] ?? "") || `scripts/slurm-one-node.sh exited with ${r.status}` };
  return { conf };
}

const slurm = startSlurm();
const skip = "why" in slurm ? slurm.why : null;
if (skip !== null) console.warn(`test/cluster/slurm.test.ts: SKIPPED, Slurm cannot start on this machine: ${skip}`);
const title = (t: string) => (skip === null ? t : `${t} (skipped: Slurm cannot start here: ${skip})`);

/** The built command line with the one-node Slurm's config and a fixed report date (both sides alike). */
function sojourn(args: string[], date = DATE): { status: number; stdout: string; stderr: string } {
  const env = { ...process.env, SOURCE_DATE_EPOCH: date, SOJOURN_SLURM_POLL: "0.5", ...("conf" in slurm ? { SLURM_CONF: slurm.conf } : {}) };
  const r = spawnSync(process.execPath, [MAIN, ...args], { encoding: "utf8", env, timeout: 600_000 });
  return { status: r.status ?? -1, stdout: r.stdout, stderr: r.stderr };
}

/** Every file of two folders, byte for byte (record.json, report.html and the tables included). */
function expectSameBytes(local: string, cluster: string): void {
  const a = folderSnapshot(local);
  const b = folderSnapshot(cluster);
  expect(Object.keys(b)).toEqual(Object.keys(a));
  expect(Object.keys(a)).toContain("record.json");
  for (const k of Object.keys(a)) expect(b[k] === a[k], k).toBe(true);
}

let dir: string;
beforeAll(() => {
  dir = tempFolder({});
});
afterAll(() => {
  // only the temporary folder this file made
  if (dir !== undefined) rmSync(dir, { recursive: true, force: true });
});

/** A small study (2 scenarios x 2 runs) of the demo's shape, invented by the seeded queue. */
async function smallStudy(at: string, warmup = "warmup: 10"): Promise<string> {
  for (const [s, servers] of [2, 3].entries()) {
    mkdirSync(join(at, "runs", `s${s}`), { recursive: true });
    for (const k of [1, 2]) await writeRunCsv(join(at, "runs", `s${s}`, `rep-${k}.csv`), simulateQueue({ arrivalRate: 0.9, serviceRate: 0.5, servers, horizon: 200, seed: 500 + k, decimals: 3 }));
  }
  const manifest = join(at, "study.yaml");
  writeFileSync(
    manifest,
    `version: 1
title: Slurm check
${warmup}
scenarios:
  - {name: s0, end: 200, runs: "runs/s0/*.csv", measures: {use: {capacity: 2}}}
  - {name: s1, end: 200, runs: "runs/s1/*.csv", measures: {use: {capacity: 3}}}
measures:
  - {name: queue, kind: level, series: queue}
  - {name: use, kind: utilization, series: busy, capacity: 2}
  - {name: wait, kind: observation, series: wait}
`,
  );
  return manifest;
}

describe.skipIf(skip !== null)("sojourn report --on slurm (one-node Slurm)", { timeout: 300_000 }, () => {
  it(title("the demo study: every file of DIR, record.json included, is the --on local report's byte for byte"), () => {
    const demo = join(dir, "demo");
    expect(sojourn(["demo", demo, "--quiet"]).status).toBe(0);
    const manifest = join(demo, "ferry-study.yaml");
    const local = join(dir, "demo-local");
    const cluster = join(dir, "demo-slurm");
    expect(sojourn(["report", manifest, "--out", local, "--quiet"]).status).toBe(0);
    const r = sojourn(["report", manifest, "--out", cluster, "--on", "slurm", "--work", join(dir, "demo-work")]);
    expect(r.stderr).toMatch(/runs summarised on Slurm: 16 of 16/);
    expect(r.status).toBe(0);
    expectSameBytes(local, cluster);
  });

  it(title("the bakery example, with --max-running 2 and --partition: the same bytes as --on local"), async () => {
    const at = join(dir, "bakery");
    mkdirSync(at);
    const manifest = await writeExample("bakery", at);
    const local = join(dir, "bakery-local");
    const cluster = join(dir, "bakery-slurm");
    expect(sojourn(["report", manifest, "--out", local, "--quiet"]).status).toBe(0);
    const r = sojourn(["report", manifest, "--out", cluster, "--on", "slurm", "--max-running", "2", "--partition", "debug", "--quiet"]);
    expect(r.stderr).toBe("");
    expect(r.status).toBe(0);
    expectSameBytes(local, cluster);
  });

  it(title("a broken run fails the command with its scenario, run and log; the earlier DIR is untouched; the rerun runs only that run"), async () => {
    const at = join(dir, "broken");
    mkdirSync(at);
    const manifest = await smallStudy(at);
    const out = join(dir, "broken-out");
    const work = join(dir, "broken-work");
    const local = join(dir, "broken-local");
    expect(sojourn(["report", manifest, "--out", local, "--quiet"]).status).toBe(0);
    expect(sojourn(["report", manifest, "--out", out, "--quiet"]).status).toBe(0);
    const before = folderSnapshot(out);
    const bad = join(at, "runs", "s1", "rep-2.csv");
    const good = readFileSync(bad, "utf8");
    writeFileSync(bad, good.replace(/\n([0-9.]+),queue,/, "\n$1,queue,x"));
    const r = sojourn(["report", manifest, "--out", out, "--on", "slurm", "--work", work]);
    expect(r.status).toBe(1);
    // the message of messages/cluster.ts taskFailed: the run, the scenario, the task's log, the run file's own error
    expect(r.stderr).toContain(`run "rep-2" of scenario "s1" failed on Slurm`);
    expect(r.stderr).toContain(`log: ${join(work, "logs", "run-3.log")}`);
    expect(r.stderr).toContain("rep-2.csv:");
    expect(r.stderr).not.toMatch(/\n\s+at /); // no stack trace
    expect(folderSnapshot(out)).toEqual(before);

    writeFileSync(bad, good);
    const again = sojourn(["report", manifest, "--out", out, "--on", "slurm", "--work", work]);
    expect(again.stderr).toContain(`reusing 3 of 4 run summaries already in ${work}`);
    expect(again.stderr).toContain("runs summarised on Slurm: 1 of 1");
    expect(again.status).toBe(0);
    expectSameBytes(local, out);
  });

  it(title("--no-wait prints the job ids and the command that follows them; a cancelled task fails that command, and its rerun runs the cancelled run alone"), async () => {
    const at = join(dir, "cancel");
    mkdirSync(at);
    const manifest = await smallStudy(at);
    const out = join(dir, "cancel-out");
    const work = join(dir, "cancel-work");
    const local = join(dir, "cancel-local");
    expect(sojourn(["report", manifest, "--out", local, "--quiet"]).status).toBe(0);
    // one task at a time, so that the last one is still queued when it is cancelled
    const r = sojourn(["report", manifest, "--out", out, "--on", "slurm", "--work", work, "--max-running", "1", "--no-wait", "--quiet"]);
    expect(r.status).toBe(0);
    const ids = /job array (\d+) \(4 runs\) and report job (\d+)/.exec(r.stdout);
    expect(ids, r.stdout).not.toBeNull();
    const follow = `sojourn report ${manifest} --out ${out} --on slurm --work ${work} --max-running 1`;
    expect(r.stdout).toContain(follow);
    expect(spawnSync("scancel", [`${ids![1]}_3`], { env: { ...process.env, SLURM_CONF: (slurm as { conf: string }).conf } }).status).toBe(0);

    // the printed command follows the submission (it does not submit again) and fails on the cancelled run
    const args = follow.split(" ").slice(1);
    const failed = sojourn(args);
    expect(failed.stderr).toContain(`following the submission already in ${work} (jobs ${ids![1]}, ${ids![2]})`);
    expect(failed.status).toBe(1);
    expect(failed.stderr).toContain(`run "rep-2" of scenario "s1" failed on Slurm (job ${ids![1]}_3): the job ended without finishing`);
    expect(() => readFileSync(join(out, "results.json"))).toThrow();

    const again = sojourn(args);
    expect(again.stderr).toContain(`reusing 3 of 4 run summaries already in ${work}`);
    expect(again.status).toBe(0);
    expectSameBytes(local, out);
  });

  it(title("a rerun after the report ended follows it while the run files are unchanged, and makes the report again after one changed"), async () => {
    const at = join(dir, "rerun");
    mkdirSync(at);
    const manifest = await smallStudy(at);
    const out = join(dir, "rerun-out");
    const work = join(dir, "rerun-work");
    const args = ["report", manifest, "--out", out, "--on", "slurm", "--work", work];
    expect(sojourn(args).status).toBe(0);
    const same = sojourn(args);
    expect(same.stderr).toContain(`following the submission already in ${work}`);
    expect(same.status).toBe(0);

    // a run file changed after the report: the same command reports the file as it is now
    await writeRunCsv(join(at, "runs", "s1", "rep-2.csv"), simulateQueue({ arrivalRate: 0.9, serviceRate: 0.5, servers: 3, horizon: 200, seed: 777, decimals: 3 }));
    const local = join(dir, "rerun-local");
    expect(sojourn(["report", manifest, "--out", local, "--quiet"]).status).toBe(0);
    const again = sojourn(args);
    expect(again.stderr).not.toContain("following the submission");
    expect(again.stderr).toContain(`reusing 3 of 4 run summaries already in ${work}`);
    expect(again.status).toBe(0);
    expectSameBytes(local, out);
  });

  it(title("MSER-5 warm-ups (a level and an observation measure): warm-up array, warm-up job, then the runs; DIR is the --on local report byte for byte, and a rerun reuses every part"), async () => {
    const at = join(dir, "mser");
    mkdirSync(at);
    const manifest = await smallStudy(at, "warmup: {method: mser-5, measure: queue, slice: 4}");
    // the second scenario estimates its warm-up from the waiting times instead (MSER-5 on each run's observations)
    writeFileSync(manifest, readFileSync(manifest, "utf8").replace('{name: s1, end: 200,', '{name: s1, end: 200, warmup: {method: mser-5, measure: wait, slice: 1},'));
    const local = join(dir, "mser-local");
    const out = join(dir, "mser-out");
    const work = join(dir, "mser-work");
    expect(sojourn(["report", manifest, "--out", local, "--quiet"]).status).toBe(0);
    const results = JSON.parse(readFileSync(join(local, "results.json"), "utf8")) as { scenarios: { warmup_estimate?: { method: string } }[] };
    // both scenarios really estimate a warm-up (else this test would not exercise the warm-up stage)
    expect(results.scenarios.map((sc) => sc.warmup_estimate?.method)).toEqual(["mser-5", "mser-5"]);
    const r = sojourn(["report", manifest, "--out", out, "--on", "slurm", "--work", work]);
    expect(r.stderr).toMatch(/warm-up slices made on Slurm: 4 of 4/);
    expect(r.stderr).toMatch(/runs summarised on Slurm: 4 of 4/);
    expect(r.status).toBe(0);
    expectSameBytes(local, out);

    // a changed run file: its part and every summary of its scenario are made again, the rest reused
    const file = join(at, "runs", "s0", "rep-1.csv");
    writeFileSync(file, readFileSync(file, "utf8").replace(/\n([0-9.]+),queue,(\d+)/, (_m, t: string, v: string) => `\n${t},queue,${Number(v) + 1}`));
    const local2 = join(dir, "mser-local2");
    expect(sojourn(["report", manifest, "--out", local2, "--quiet"]).status).toBe(0);
    // (another report folder: with the same one, the ended submission would only be followed)
    const out2 = join(dir, "mser-out2");
    const again = sojourn(["report", manifest, "--out", out2, "--on", "slurm", "--work", work]);
    expect(again.stderr).toContain(`reusing 3 of 4 warm-up parts already in ${work}`);
    expect(again.stderr).toContain(`reusing 2 of 4 run summaries already in ${work}`);
    expect(again.stderr).toContain("warm-up slices made on Slurm: 1 of 1");
    expect(again.status).toBe(0);
    expectSameBytes(local2, out2);
  });

  it(title("the report date is the one of the submission: submitted with --no-wait under one SOURCE_DATE_EPOCH and followed under another, DIR carries the first"), async () => {
    const at = join(dir, "date");
    mkdirSync(at);
    const manifest = await smallStudy(at);
    const out = join(dir, "date-out");
    const work = join(dir, "date-work");
    const later = "1790000000";
    const local = join(dir, "date-local");
    const localLater = join(dir, "date-local-later");
    expect(sojourn(["report", manifest, "--out", local, "--quiet"]).status).toBe(0);
    expect(sojourn(["report", manifest, "--out", localLater, "--quiet"], later).status).toBe(0);
    // the two dates give different pages (else this test could not tell which date was used)
    expect(readFileSync(join(localLater, "report.html"), "utf8")).not.toBe(readFileSync(join(local, "report.html"), "utf8"));
    // the jobs themselves run under the later date too (sbatch --export), so only the recorded date can give the first
    const flags = ["--out", out, "--on", "slurm", "--work", work, `--sbatch-arg=--export=ALL,SOURCE_DATE_EPOCH=${later}`];
    expect(sojourn(["report", manifest, ...flags, "--no-wait", "--quiet"]).status).toBe(0);
    const followed = sojourn(["report", manifest, ...flags], later);
    expect(followed.stderr).toContain(`following the submission already in ${work}`);
    expect(followed.status).toBe(0);
    // SOURCE_DATE_EPOCH is seconds since 1970-01-01 UTC (reproducible-builds.org specification)
    const record = JSON.parse(readFileSync(join(out, "record.json"), "utf8")) as { report: { generated_at: string } };
    expect(record.report.generated_at).toBe(new Date(Number(DATE) * 1000).toISOString());
    expectSameBytes(local, out);
  });
});
