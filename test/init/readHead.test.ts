/**
 * `sojourn init` on hostile files: a named pipe, a link to /dev/zero and a gzip file that expands
 * to one endless line are skipped with the reader's reason, in seconds and bounded memory, and the
 * regular file beside them still makes the manifest.
 *
 * Sources: the brief (nothing hangs; a run path that is not a regular file is refused by
 * what it is; a row longer than the limit is an error); expected reasons from the message
 * catalogue; the good file's rows written by hand.
 */
import { execFileSync } from "node:child_process";
import { createWriteStream, mkdirSync, mkdtempSync, rmSync, symlinkSync, writeFileSync } from "node:fs";
import { once } from "node:events";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { createGzip } from "node:zlib";
import { afterAll, describe, expect, it } from "vitest";
import { DEFAULT_ROW_LIMIT, ROW_LIMIT_MAX } from "../../src/ingest/feeder.js";
import { scanRuns } from "../../src/init/scanRuns.js";
import { ingestMessages, initMessages } from "../../src/messages/index.js";

const dir = mkdtempSync(join(tmpdir(), "sojourn-init-hostile-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe("scanRuns on files that are not run files", () => {
  it("skips a pipe, a link to /dev/zero and a gzip bomb with the reader's reason, in seconds, and keeps the good run", async () => {
    const runs = join(dir, "runs", "morning");
    mkdirSync(runs, { recursive: true });
    writeFileSync(join(runs, "good.csv"), "time,series,value\n0,queue,1\n2,queue,0\n");
    execFileSync("mkfifo", [join(runs, "pipe.csv")]);
    symlinkSync("/dev/zero", join(runs, "zero.jsonl"));
    const z = createGzip({ level: 1 });
    const out = z.pipe(createWriteStream(join(runs, "bomb.csv.gz")));
    z.write("time,series,value\n0,queue,1\n");
    const block = Buffer.alloc(1 << 20, 0x61);
    for (let i = 0; i < 256; i++) if (!z.write(block)) await once(z, "drain");
    z.end();
    await once(out, "close");

    const started = Date.now();
    const before = process.memoryUsage().rss;
    const scan = await scanRuns(join(dir, "runs"));
    expect(Date.now() - started).toBeLessThan(15_000);
    expect((process.memoryUsage().rss - before) / 2 ** 20).toBeLessThan(400);
    const reason = (name: string) => scan.skipped.find((s) => s.display.endsWith(name));
    const display = (name: string) => reason(name)!.display;
    expect(reason("pipe.csv")?.reason).toBe(initMessages.skipUnreadable(display("pipe.csv"), ingestMessages.notARegularFile(display("pipe.csv"), "a named pipe (FIFO)", false).message));
    expect(reason("zero.jsonl")?.reason).toBe(initMessages.skipUnreadable(display("zero.jsonl"), ingestMessages.notARegularFile(display("zero.jsonl"), "a character device", true).message));
    expect(reason("bomb.csv.gz")?.reason).toBe(initMessages.skipUnreadable(display("bomb.csv.gz"), ingestMessages.rowTooLong(display("bomb.csv.gz"), 3, DEFAULT_ROW_LIMIT, ROW_LIMIT_MAX).message));
    expect(scan.scenarios.map((s) => [s.name, s.runs.map((r) => r.id)])).toEqual([["morning", ["good"]]]);
  }, 60_000);
});
