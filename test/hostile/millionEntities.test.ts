/**
 * A million distinct entities still inside at the end of the run (entity-derived level and
 * durations, CONTRACT.md section 2): the report is written, results.json reports the million as
 * censored, and memory stays bounded.
 *
 * The bound: at most 1 GiB of resident memory for the whole command (measured about 450 MB).
 * Each open entity must be remembered until the end (its id, its enter time and line, for each of
 * the two entity measures), so memory grows with the number of open entities; 1 GiB allows about
 * 1 KB per open entity with both measures, several times what the ids and typed arrays need, and
 * is far below what would exhaust a laptop. CPU time is bounded at 20 s (measured about 4 s);
 * CPU time, not wall time, so a busy machine does not fail the test.
 */
import { spawnSync } from "node:child_process";
import { mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { afterAll, describe, expect, it } from "vitest";

const MAIN = fileURLToPath(new URL("../../dist/cli/main.js", import.meta.url));
const N = 1_000_000;
const dir = mkdtempSync(join(tmpdir(), "sojourn-million-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe("a million entities open at the end (sojourn report)", () => {
  it("is reported as censored, with bounded memory and CPU time", () => {
    // Visitor i arrives at i / 1000 and never leaves (invented data), written in 1 MB pieces.
    mkdirSync(join(dir, "runs"));
    const parts: string[] = ["time,series,value,entity\n"];
    for (let i = 0; i < N; i++) parts.push(`${i / 1000},arrive,,visitor-${i}\n`);
    writeFileSync(join(dir, "runs", "day-1.csv"), parts.join(""));
    writeFileSync(
      join(dir, "study.yaml"),
      `title: A million visitors who never leave
scenarios:
  - {name: open-day, end: 2000, runs: runs/*.csv}
measures:
  - {name: inside, kind: level, from: {enter: arrive, leave: leave}, may_be_absent: true}
  - {name: stay, kind: observation, from: {start: arrive, end: leave}, may_be_absent: true}
`,
    );
    // The command runs in a child that reports its own peak memory and CPU time when it exits.
    const wrapper = join(dir, "measure.mjs");
    writeFileSync(
      wrapper,
      `process.on("exit", () => { const u = process.resourceUsage(); process.stderr.write("USAGE " + JSON.stringify({ maxRssKb: u.maxRSS, cpuUs: u.userCPUTime + u.systemCPUTime }) + "\\n"); });
await import(${JSON.stringify(MAIN)});
`,
    );
    const r = spawnSync(process.execPath, [wrapper, "report", "study.yaml", "--out", "out", "--quiet"], { cwd: dir, encoding: "utf8" });
    expect(r.status, r.stderr).toBe(0);
    const usage = JSON.parse(/USAGE (.*)/.exec(r.stderr)![1]) as { maxRssKb: number; cpuUs: number };
    expect(usage.maxRssKb * 1024).toBeLessThan(1024 ** 3);
    expect(usage.cpuUs / 1e6).toBeLessThan(20);

    const results = JSON.parse(readFileSync(join(dir, "out", "results.json"), "utf8"));
    const m = results.scenarios[0].runs[0].measures;
    // CONTRACT.md section 2: entities with a start and no end are censored, counted, reported.
    expect(m.stay).toMatchObject({ n: 0, value: null, censored: N });
    expect(m.inside).toMatchObject({ entered: N, left: 0, inside_at_end: N, final: N, min: 1, max: N });
    // Computed by hand: level k on [(k-1)/1000, k/1000] for k = 1..999999, area 0.001 · Σk
    // = 499999500; then 1e6 on [999.999, 2000], area 1000001000. Total 1500000500 over T = 2000.
    expect(Math.abs(m.inside.area - 1500000500) / 1500000500).toBeLessThan(1e-12);
    expect(Math.abs(m.inside.mean - 750000.25) / 750000.25).toBeLessThan(1e-12);
  }, 120_000);
});
