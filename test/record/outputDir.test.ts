/**
 * A report folder is replaced whole or not at all (src/record/outputDir.ts, publish.ts), also
 * when the system fails: a full disk, a read-only place, a name too long. The failures come
 * through the file-system seam (src/fileSystem.ts), and, where the machine lets us mount
 * a small tmpfs (root on Linux), from a real full or read-only disk. The study is invented.
 */
import { execFileSync } from "node:child_process";
import { existsSync, mkdirSync, mkdtempSync, readdirSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { dirname, join } from "node:path";
import { afterAll, afterEach, describe, expect, it } from "vitest";
import { loadStudy } from "../../src/manifest/loadStudy.js";
import { UserError } from "../../src/messages/index.js";
import * as msg from "../../src/messages/output.js";
import { faultyFs, nodeFs, type OutputFs, systemError } from "../../src/fileSystem.js";
import { reportStudy } from "../../src/story/makeReport.js";
import { stagePrefix } from "../../src/record/outputDir.js";
import { folderSnapshot } from "../helpers/tempStudy.js";

const folders: string[] = [];
afterEach(() => {
  while (folders.length > 0) rmSync(folders.pop() as string, { recursive: true, force: true });
});

const MANIFEST = (end: number) => `title: Bakery counter\ntables: {max_rows: 100000}\nscenarios:\n  - {name: morning, end: ${end}, runs: runs/*.csv}\nmeasures:\n  - {name: queue, kind: level, series: queue}\n  - {name: sold, kind: count, series: sale}\n`;

/** A study folder: `rows` queue changes and sales over [0, rows]. */
function bakery(rows: number, end = rows): string {
  const dir = mkdtempSync(join(tmpdir(), "sojourn-outdir-"));
  folders.push(dir);
  mkdirSync(join(dir, "runs"));
  let csv = "time,series,value\n";
  for (let i = 0; i < rows; i++) csv += `${i},queue,${i % 5}\n${i + 0.5},sale,\n`;
  writeFileSync(join(dir, "runs", "day-1.csv"), csv);
  writeFileSync(join(dir, "study.yaml"), MANIFEST(end));
  return dir;
}

async function publish(dir: string, out: string, fs?: OutputFs, manifest = "study.yaml") {
  const study = await loadStudy(join(dir, manifest));
  return reportStudy(study, { out, force: false, pdf: false, paper: "A4", workers: 1, generatedAt: "2026-01-01T00:00:00.000Z", fs });
}


async function failure(promise: Promise<unknown>): Promise<UserError> {
  const e = await promise.then(
    () => null,
    (x: unknown) => x,
  );
  expect(e).toBeInstanceOf(UserError);
  return e as UserError;
}

/** Names beside `out` left by a report (temporary folders, scratch files). */
const leftovers = (out: string) => readdirSync(dirname(out)).filter((n) => n.startsWith(stagePrefix("report")));

describe("reportStudy when the disk fails", () => {
  it("reportStudy on a disk that fills up at the first table: the message names the table, the earlier report is intact byte for byte, nothing is left beside it", async () => {
    const dir = bakery(20);
    const out = join(dir, "report");
    await publish(dir, out);
    const before = folderSnapshot(out);
    const e = await failure(publish(dir, out, faultyFs(nodeFs, "ENOSPC", "write", "tables/")));
    expect(e.message).toBe(msg.reportDiskFull(out, "tables/morning/runs/day-1/queue.csv", "ENOSPC", true).message);
    expect(e.message).toContain("The earlier report in the folder is intact.");
    expect(folderSnapshot(out)).toEqual(before);
    expect(leftovers(out)).toEqual([]);
  });

  it("reportStudy on a disk that fills up with no earlier report: 'Nothing was written' and no folder", async () => {
    const dir = bakery(20);
    const out = join(dir, "report");
    const e = await failure(publish(dir, out, faultyFs(nodeFs, "EDQUOT", "write", "report.html")));
    expect(e.message).toBe(msg.reportDiskFull(out, "report.html", "EDQUOT", false).message);
    expect(existsSync(out)).toBe(false);
    expect(leftovers(out)).toEqual([]);
  });

  it("reportStudy into a read-only place says read-only (EROFS), not ENOENT, and names the folder that exists", async () => {
    const dir = bakery(5);
    const out = join(dir, "new", "report");
    const e = await failure(publish(dir, out, faultyFs(nodeFs, "EROFS", "mkdir", "/new")));
    expect(e.message).toBe(msg.outReadOnly(out, dir, "EROFS").message);
    expect(e.message).not.toContain("ENOENT");
  });

  it("reportStudy with a table file name the file system refuses names that file and leaves the earlier report", async () => {
    const dir = bakery(5);
    const out = join(dir, "report");
    await publish(dir, out);
    const before = folderSnapshot(out);
    const e = await failure(publish(dir, out, faultyFs(nodeFs, "ENAMETOOLONG", "write", "sold.csv")));
    expect(e.message).toBe(msg.reportFileNameTooLong(out, "tables/morning/runs/day-1/sold.csv", Buffer.byteLength(join(out, "tables/morning/runs/day-1/sold.csv"))).message);
    expect(folderSnapshot(out)).toEqual(before);
  });

  it("reportStudy whose second rename fails puts the earlier folder back (the commit is all or nothing)", async () => {
    const dir = bakery(5);
    const out = join(dir, "report");
    await publish(dir, out);
    const before = folderSnapshot(out);
    let renames = 0;
    const fs: OutputFs = {
      ...nodeFs,
      rename: (from, to) => {
        renames++;
        if (renames === 2) throw systemError("EIO", "rename", to); // the new folder into place
        nodeFs.rename(from, to);
      },
    };
    const e = await failure(publish(dir, out, fs));
    expect(e.message).toBe(msg.cannotWrite(out, `${msg.writeReason("EIO")}, EIO`).message);
    expect(folderSnapshot(out)).toEqual(before);
    expect(leftovers(out)).toEqual([]);
  });

  it("reportStudy into a folder whose name is close to the 255-byte limit works: the temporary names are shortened", async () => {
    const dir = bakery(5);
    const out = join(dir, "q".repeat(250));
    expect(stagePrefix("q".repeat(250))).toMatch(/^\.[0-9a-f]{16}\.sojourn-$/);
    await publish(dir, out);
    await publish(dir, out);
    expect(existsSync(join(out, "results.json"))).toBe(true);
    expect(readdirSync(dir).filter((n) => n.includes(".sojourn-"))).toEqual([]);
  });
});

// --- a real small disk: root on Linux can mount a tmpfs; elsewhere these tests say why they skip ---
const mountPoint = mkdtempSync(join(tmpdir(), "sojourn-tmpfs-"));
let mounted = false;
try {
  execFileSync("mount", ["-t", "tmpfs", "-o", "size=1m", "tmpfs", mountPoint], { stdio: "pipe" });
  mounted = true;
} catch (e) {
  console.warn(`real full-disk and read-only tests skipped: cannot mount a tmpfs (${(e as Error).message.split("\n")[0]})`);
}
afterAll(() => {
  if (mounted) execFileSync("umount", [mountPoint]);
  rmSync(mountPoint, { recursive: true, force: true });
});

describe.skipIf(!mounted)("reportStudy on a real small disk (a 1 MB tmpfs)", () => {
  it("reportStudy that fills a real disk keeps the earlier report byte for byte and frees the space it took", async () => {
    const small = bakery(10);
    const big = bakery(40_000); // its tables, 40,000 rows each in full (max_rows), do not fit in 1 MB
    const out = join(mountPoint, "report");
    await publish(small, out);
    const before = folderSnapshot(out);
    const free = Number(execFileSync("df", ["--output=avail", "-B1", mountPoint], { encoding: "utf8" }).split("\n")[1]);
    const e = await failure(publish(big, out));
    expect(e.message).toMatch(/: the disk is full \(ENOSPC\): Sojourn could not write tables\/.+ The earlier report in the folder is intact\./);
    expect(folderSnapshot(out)).toEqual(before);
    expect(readdirSync(mountPoint)).toEqual(["report"]);
    expect(Number(execFileSync("df", ["--output=avail", "-B1", mountPoint], { encoding: "utf8" }).split("\n")[1])).toBe(free);
  });

  it("reportStudy onto a real read-only mount says read-only (EROFS)", async () => {
    const dir = bakery(5);
    execFileSync("mount", ["-o", "remount,ro", mountPoint]);
    try {
      const e = await failure(publish(dir, join(mountPoint, "other")));
      expect(e.message).toBe(msg.outReadOnly(join(mountPoint, "other"), mountPoint, "EROFS").message);
    } finally {
      execFileSync("mount", ["-o", "remount,rw", mountPoint]);
    }
  });
});
