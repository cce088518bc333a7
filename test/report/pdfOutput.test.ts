/**
 * The PDF step of `sojourn report --pdf` (src/record/publish.ts, src/report/pdf.ts): the PDF is
 * recorded in record.json so that the next report may replace it; an interruption (SIGINT,
 * SIGTERM) while the browser runs stops the browser and removes its temporary profile, and
 * leaves the finished report folder without a PDF; a full disk is said in words. These tests
 * need a Chromium-family browser and skip, saying so, when none is found. The study is invented.
 */
import { spawn } from "node:child_process";
import { existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { afterEach, describe, expect, it } from "vitest";
import { sha256 } from "../../src/digest.js";
import { loadStudy } from "../../src/manifest/loadStudy.js";
import { UserError } from "../../src/messages/index.js";
import * as msg from "../../src/messages/output.js";
import { faultyFs, nodeFs } from "../../src/fileSystem.js";
import { publishStudy } from "../../src/record/publish.js";
import { findChrome } from "../../src/report/pdf.js";
import { sojourn } from "../helpers/cli.js";

const MAIN = fileURLToPath(new URL("../../dist/cli/main.js", import.meta.url));
const chrome = findChrome();
if (chrome === null) console.warn("PDF output tests skipped: no Chromium found (install chromium or set SOJOURN_CHROME)");

const folders: string[] = [];
afterEach(() => {
  while (folders.length > 0) rmSync(folders.pop() as string, { recursive: true, force: true });
});

function temp(prefix: string): string {
  const dir = mkdtempSync(join(tmpdir(), prefix));
  folders.push(dir);
  return dir;
}

function bakery(): string {
  const dir = temp("sojourn-pdf-out-");
  mkdirSync(join(dir, "runs"));
  writeFileSync(join(dir, "runs", "day-1.csv"), "time,series,value\n0,queue,2\n3,queue,5\n6,queue,1\n");
  writeFileSync(join(dir, "study.yaml"), "title: Bakery counter\nscenarios:\n  - {name: morning, end: 10, runs: runs/*.csv}\nmeasures:\n  - {name: queue, kind: level, series: queue}\n");
  return dir;
}

/** Processes whose command line mentions `text` (Linux /proc), other than this one. */
function processesWith(text: string): number[] {
  if (!existsSync("/proc/self/cmdline")) return [];
  const found: number[] = [];
  for (const name of readdirSync("/proc")) {
    if (!/^\d+$/.test(name) || Number(name) === process.pid) continue;
    try {
      if (readFileSync(`/proc/${name}/cmdline`, "utf8").includes(text)) found.push(Number(name));
    } catch {
      // the process ended meanwhile
    }
  }
  return found;
}

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

describe.skipIf(chrome === null)("report --pdf", () => {
  it("report --pdf records the PDF's digest in record.json, and the next report replaces the folder without --force", () => {
    const dir = bakery();
    expect(sojourn(["report", "study.yaml", "--out", "report", "--pdf", "--quiet"], dir).status).toBe(0);
    const record = JSON.parse(readFileSync(join(dir, "report", "record.json"), "utf8"));
    expect(record.pdf).toEqual({ file: "report.pdf", sha256: sha256(readFileSync(join(dir, "report", "report.pdf"))), pages: expect.any(Number) });
    expect(record.pdf.pages).toBeGreaterThan(0);
    const again = sojourn(["report", "study.yaml", "--out", "report", "--quiet"], dir);
    expect(again.stderr).toBe("");
    expect(again.status).toBe(0);
    expect(existsSync(join(dir, "report", "report.pdf"))).toBe(false);
    expect(readdirSync(dir).filter((n) => n.includes(".sojourn-"))).toEqual([]);
  }, 120_000);

  for (const [signal, status] of [
    ["SIGINT", 130],
    ["SIGTERM", 143],
  ] as const) {
    it(`${signal} while the browser starts: exit ${status}, the browser stopped, its profile removed, the report folder complete without a PDF`, async () => {
      const dir = bakery();
      const scratch = temp("sojourn-pdf-tmpdir-");
      const child = spawn(process.execPath, [MAIN, "report", "study.yaml", "--out", "report", "--pdf"], {
        cwd: dir,
        env: { ...process.env, TMPDIR: scratch, SOURCE_DATE_EPOCH: "1780000000" },
      });
      let stderr = "";
      child.stderr.setEncoding("utf8").on("data", (s: string) => (stderr += s));
      const exited = new Promise<number | null>((r) => child.on("exit", (code) => r(code)));
      // wait until the browser has begun to fill its profile folder
      let profile = "";
      for (let i = 0; i < 3000 && profile === ""; i++) {
        const p = readdirSync(scratch).find((n) => n.startsWith("sojourn-chrome-"));
        if (p !== undefined && readdirSync(join(scratch, p)).length > 0) profile = join(scratch, p);
        else await sleep(20);
      }
      expect(profile, stderr).not.toBe("");
      child.kill(signal);
      expect(await exited).toBe(status);
      expect(stderr).toContain(msg.pdfInterrupted("report").message);
      expect(readdirSync(scratch)).toEqual([]);
      await sleep(500);
      expect(processesWith(profile)).toEqual([]);
      expect(existsSync(join(dir, "report", "results.json"))).toBe(true);
      expect(existsSync(join(dir, "report", "report.pdf"))).toBe(false);
      expect(JSON.parse(readFileSync(join(dir, "report", "record.json"), "utf8")).pdf).toBeUndefined();
      expect(readdirSync(dir).filter((n) => n.includes(".sojourn-"))).toEqual([]);
    }, 120_000);
  }

  it("publishStudy --pdf on a disk that fills up while the PDF is written: the message says so, the folder is complete without it, no scratch file", async () => {
    const dir = bakery();
    const study = await loadStudy(join(dir, "study.yaml"));
    const out = join(dir, "report");
    const e = await publishStudy(study, { out, force: false, pdf: true, paper: "A4", workers: 1, fs: faultyFs(nodeFs, "ENOSPC", "write", ".sojourn-pdf-") }).then(
      () => null,
      (x: unknown) => x,
    );
    expect(e).toBeInstanceOf(UserError);
    expect((e as UserError).message).toBe(msg.pdfUnwritable(out, "ENOSPC").message);
    expect(readdirSync(out).sort()).toEqual(["charts", "record.json", "report.html", "results.json", "tables"]);
    expect(readdirSync(dir).filter((n) => n.includes(".sojourn-"))).toEqual([]);
  }, 120_000);
});
