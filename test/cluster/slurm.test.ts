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
function sojourn(args: string[]): { status: number; stdout: string; stderr: string } {
  const env = { ...process.env, SOURCE_DATE_EPOCH: DATE, SOJOURN_SLURM_POLL: "0.5", ...("conf" in slurm ? { SLURM_CONF: slurm.conf } : {}) };
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
async function smallStudy(at: string): Promise<string> {
  for (const [s, servers] of [2, 3].entries()) {
    mkdirSync(join(at, "runs", `s${s}`), { recursive: true });
    for (const k of [1, 2]) await writeRunCsv(join(at, "runs", `s${s}`, `rep-${k}.csv`), simulateQueue({ arrivalRate: 0.9, serviceRate: 0.5, servers, horizon: 200, seed: 500 + k, decimals: 3 }));
  }
  const manifest = join(at, "study.yaml");
  writeFileSync(
    manifest,
    `version: 1
title: Slurm check
warmup: 10
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
});
