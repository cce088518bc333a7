/**
 * The manifest itself is read only when it is a regular file of a sane size: a named pipe, a
 * socket or a device (also through a link) would be read without end, so each is refused by what
 * it is, at once. Sources: the issue (hostile input ends in seconds with exit 1); the kinds are the
 * POSIX file types as `stat` reports them (common practice).
 */
import { execFileSync } from "node:child_process";
import { symlinkSync, truncateSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { loadStudy, MAX_MANIFEST_BYTES } from "../../src/manifest/loadStudy.js";
import { manifestMessages as m } from "../../src/messages/index.js";
import { removeFolder, studyFolder, userError } from "./helpers.js";

let dir: string;
beforeAll(() => {
  dir = studyFolder({ "runs/r.csv": "time,series,value\n0,queue,1\n" });
  execFileSync("mkfifo", [join(dir, "pipe.yaml")]);
  symlinkSync("/dev/zero", join(dir, "zero.yaml"));
  symlinkSync("pipe.yaml", join(dir, "to-pipe.yaml"));
  // A sparse file one byte over the limit: no disk is spent on it.
  writeFileSync(join(dir, "huge.yaml"), "title: t\n");
  truncateSync(join(dir, "huge.yaml"), MAX_MANIFEST_BYTES + 1);
});
afterAll(() => removeFolder(dir));

describe("loadStudy on a manifest path that is not a regular file", () => {
  for (const [name, kind] of [
    ["pipe.yaml", "a named pipe (FIFO)"],
    ["to-pipe.yaml", "a named pipe (FIFO)"],
    ["zero.yaml", "a character device"],
  ] as const) {
    test(`refuses ${name} as ${kind}, within a second`, async () => {
      const started = Date.now();
      const error = await userError(loadStudy(join(dir, name)));
      expect(error.message).toBe(m.manifestNotAFile(join(dir, name), kind).message);
      expect(Date.now() - started).toBeLessThan(5000);
    });
  }

  test("refuses a manifest larger than MAX_MANIFEST_BYTES before reading it", async () => {
    const error = await userError(loadStudy(join(dir, "huge.yaml")));
    expect(error.message).toBe(m.manifestFileTooLarge(join(dir, "huge.yaml"), MAX_MANIFEST_BYTES + 1, MAX_MANIFEST_BYTES).message);
  });

  test("still says a folder is a folder", async () => {
    const error = await userError(loadStudy(join(dir, "runs")));
    expect(error.message).toBe(m.manifestIsFolder(join(dir, "runs")).message);
  });
});
