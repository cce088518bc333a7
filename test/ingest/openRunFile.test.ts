/**
 * readRun opens regular files only: a named pipe, a socket or a device (itself or through a link)
 * is refused by what it is before a byte is read, at once (a pipe without a writer used to block
 * the open forever; /dev/zero used to be read without end). A link to a regular file reads as the
 * file itself.
 *
 * Sources: the brief; the file kinds are the POSIX file types as `stat` reports them
 * (common practice); expected rows computed by hand from the file's text.
 */
import { execFileSync } from "node:child_process";
import { symlinkSync } from "node:fs";
import { createServer, type Server } from "node:net";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import * as messages from "../../src/messages/ingest.js";
import { gzip, record, rejection, scratch } from "./helpers.js";

const dir = scratch();
const D = "runs/rep-01";
const QUEUE = [{ name: "queue", entity: false }];
let server: Server;

beforeAll(async () => {
  dir.file("real.csv", "time,series,value\n0,queue,1\n2,queue,3\n");
  dir.file("real.csv.gz", gzip("time,series,value\n0,queue,1\n2,queue,3\n"));
  execFileSync("mkfifo", [join(dir.dir, "pipe.csv")]);
  execFileSync("mkfifo", [join(dir.dir, "pipe.jsonl.gz")]);
  symlinkSync("/dev/zero", join(dir.dir, "zero.csv"));
  symlinkSync("/dev/zero", join(dir.dir, "zero.jsonl.gz"));
  symlinkSync("/dev/null", join(dir.dir, "null.jsonl"));
  symlinkSync("real.csv", join(dir.dir, "link.csv"));
  symlinkSync("real.csv.gz", join(dir.dir, "link.csv.gz"));
  server = createServer();
  await new Promise<void>((done) => server.listen(join(dir.dir, "sock.csv"), done));
});
afterAll(async () => {
  await new Promise<void>((done) => server.close(() => done()));
  dir.remove();
});

describe("readRun on paths that are not regular files", () => {
  for (const [name, kind, link] of [
    ["pipe.csv", "a named pipe (FIFO)", false],
    ["pipe.jsonl.gz", "a named pipe (FIFO)", false],
    ["sock.csv", "a socket", false],
    ["zero.csv", "a character device", true],
    ["zero.jsonl.gz", "a character device", true],
    ["null.jsonl", "a character device", true],
  ] as const) {
    it(`readRun refuses ${name} as ${link ? "a link to " : ""}${kind}, within a second`, async () => {
      const started = Date.now();
      const error = await rejection(record(join(dir.dir, name), QUEUE));
      expect(error.message).toBe(messages.notARegularFile(D, kind, link).message);
      expect(Date.now() - started).toBeLessThan(1000);
    }, 5000);
  }

  it("readRun reads a link to a regular file as the file, plain and gzip", async () => {
    for (const [linkName, target] of [
      ["link.csv", "real.csv"],
      ["link.csv.gz", "real.csv.gz"],
    ]) {
      const viaLink = await record(join(dir.dir, linkName), QUEUE);
      const direct = await record(join(dir.dir, target), QUEUE);
      expect(viaLink.calls.map((c) => [c.time, c.value, c.line])).toEqual([
        [0, 1, 2],
        [2, 3, 3],
      ]);
      expect(viaLink.report).toEqual(direct.report);
    }
  });
});
