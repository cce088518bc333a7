/**
 * `sojourn report --on slurm` refuses a report folder before it submits anything, with the rule
 * and the messages of a local report (src/record/outputDir.ts checkReportDir). Slurm is not
 * needed: the command runs with a PATH that holds no sbatch, so a check made after submitting
 * would show as "cannot run `sbatch`" instead of the refusal.
 */
import { spawnSync } from "node:child_process";
import { existsSync, mkdirSync, rmSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import * as outputMessages from "../../src/messages/output.js";
import { writeExample } from "../helpers/exampleStudy.js";
import { folderSnapshot, tempFolder } from "../helpers/tempStudy.js";

const MAIN = fileURLToPath(new URL("../../dist/cli/main.js", import.meta.url));

function sojourn(args: string[], cwd: string): { status: number; stderr: string } {
  // no Slurm command can be found on this PATH
  const r = spawnSync(process.execPath, [MAIN, ...args], { encoding: "utf8", cwd, env: { ...process.env, PATH: join(cwd, "no-such-bin") } });
  return { status: r.status ?? -1, stderr: r.stderr };
}

let dir: string;
let manifest: string;
beforeAll(async () => {
  dir = tempFolder({});
  manifest = await writeExample("bakery", dir);
});
afterAll(() => {
  // only the temporary folder this file made
  if (dir !== undefined) rmSync(dir, { recursive: true, force: true });
});

describe("sojourn report --on slurm: the report folder is checked before any job is submitted", () => {
  it("a folder holding a file Sojourn did not write is refused with the local report's message; nothing is written", () => {
    const out = join(dir, "mine");
    mkdirSync(out);
    writeFileSync(join(out, "notes.txt"), "my notes\n");
    const before = folderSnapshot(out);
    const r = sojourn(["report", manifest, "--out", "mine", "--on", "slurm"], dir);
    expect(r.stderr).toContain(outputMessages.outHoldsForeign("mine", "notes.txt", "no-record").message);
    expect(r.stderr).not.toContain("sbatch");
    expect(r.status).toBe(1);
    expect(folderSnapshot(out)).toEqual(before);
    // the work folder (default <out>.work) is not even made
    expect(existsSync(join(dir, "mine.work"))).toBe(false);
  });

  it("the manifest's own folder is refused, even with --force", () => {
    const r = sojourn(["report", manifest, "--out", ".", "--on", "slurm", "--force", "--work", join(dir, "w2")], dir);
    expect(r.stderr).toContain(outputMessages.outHoldsInput(".", "bakery.yaml", "manifest").message);
    expect(r.status).toBe(1);
    expect(existsSync(join(dir, "w2"))).toBe(false);
  });
});
