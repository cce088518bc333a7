/**
 * Run paths that are not regular files are refused by what they are when the manifest is read,
 * named plainly or matched by a glob, through a symbolic link or not; a link to a regular file is
 * a run file like any other.
 *
 * Sources: the issue (a named pipe used to be reported as "a folder"; a link to /dev/zero must not
 * be read); the kinds are the POSIX file types as `stat` reports them (common practice).
 */
import { execFileSync } from "node:child_process";
import { symlinkSync } from "node:fs";
import { createServer, type Server } from "node:net";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { loadStudy } from "../../src/manifest/loadStudy.js";
import { manifestMessages as m } from "../../src/messages/index.js";
import { pos, removeFolder, studyFolder, userError } from "./helpers.js";

const CSV = "time,series,value\n0,queue,0\n2,queue,1\n";
let dir: string;
let server: Server;

beforeAll(async () => {
  dir = studyFolder({
    "runs/rep-01.csv": CSV,
    "glob/rep-01.csv": CSV,
    "deep/a/rep-01.csv": CSV,
    "deep/b/c/rep-02.csv": CSV,
    "quiet/rep-01.csv": CSV,
  });
  // Pipes the walker of a glob never lists: one matched two folders down, and two no glob matches.
  execFileSync("mkfifo", [join(dir, "deep/b/c/rep-03.csv")]);
  execFileSync("mkfifo", [join(dir, "quiet/notes.txt")]);
  execFileSync("mkfifo", [join(dir, "quiet/.hidden.csv")]);
  execFileSync("mkfifo", [join(dir, "runs/pipe.csv")]);
  symlinkSync("/dev/zero", join(dir, "runs/zero.csv"));
  symlinkSync("/dev/zero", join(dir, "glob/rep-02.csv"));
  symlinkSync("rep-01.csv", join(dir, "runs/link.csv"));
  server = createServer();
  await new Promise<void>((done) => server.listen(join(dir, "runs/sock.csv"), done));
});
afterAll(async () => {
  await new Promise<void>((done) => server.close(() => done()));
  removeFolder(dir);
});

const MEASURES = "measures:\n  - {name: q, kind: level, series: queue}\n";
const manifest = (runs: string) => `scenarios:\n  - {name: s, end: 9, runs: ${runs}}\n${MEASURES}`;

describe("resolveRuns on paths that are not regular files", () => {
  for (const [path, kind, link] of [
    ["runs/pipe.csv", "a named pipe (FIFO)", false],
    ["runs/sock.csv", "a socket", false],
    ["runs/zero.csv", "a character device", true],
  ] as const) {
    test(`loadStudy on the run path ${path} refuses it as ${link ? "a link to " : ""}${kind}`, async () => {
      const text = manifest(`[${path}]`);
      const file = join(dir, `${path.split("/")[1]}.yaml`);
      const error = await userError(loadStudy(file, { text }));
      expect(error.message).toBe(m.runPathNotAFile({ file, ...pos(text, path), path: "scenarios[0].runs[0]" }, path, kind, link).message);
      expect(error.message).not.toContain("folder");
    });
  }

  test("loadStudy on a glob that matches a link to /dev/zero refuses that match", async () => {
    const text = manifest("glob/*.csv");
    const file = join(dir, "glob.yaml");
    const error = await userError(loadStudy(file, { text }));
    expect(error.message).toBe(m.runPathNotAFile({ file, ...pos(text, "glob/*.csv"), path: "scenarios[0].runs" }, "glob/rep-02.csv", "a character device", true).message);
  });

  test("loadStudy on a glob that matches a named pipe refuses it, at any depth the glob reaches", async () => {
    for (const pattern of ["runs/*.csv", "deep/**/*.csv", "deep/*/c/*.csv", `${dir}/deep/**/rep-0[13].csv`]) {
      const text = manifest(JSON.stringify(pattern));
      const file = join(dir, "pipes.yaml");
      const error = await userError(loadStudy(file, { text }));
      const found = pattern.startsWith("runs") ? "runs/pipe.csv" : "deep/b/c/rep-03.csv";
      expect(error.message, pattern).toBe(m.runPathNotAFile({ file, ...pos(text, JSON.stringify(pattern)), path: "scenarios[0].runs" }, found, "a named pipe (FIFO)", false).message);
    }
  });

  test("loadStudy on a glob beside pipes it does not match (another extension, a hidden name) reads the files", async () => {
    const study = await loadStudy(join(dir, "quiet.yaml"), { text: manifest("quiet/*.csv") });
    expect(study.scenarios[0].runs.map((r) => r.file)).toEqual(["quiet/rep-01.csv"]);
  });

  test("loadStudy on a link to a regular file takes it as a run with the link's name", async () => {
    const study = await loadStudy(join(dir, "link.yaml"), { text: manifest("[runs/link.csv, runs/rep-01.csv]") });
    expect(study.scenarios[0].runs.map((r) => [r.id, r.file])).toEqual([
      ["link", "runs/link.csv"],
      ["rep-01", "runs/rep-01.csv"],
    ]);
  });

  test("loadStudy on a run path that is a folder still says it is a folder", async () => {
    const text = manifest("[runs]");
    const file = join(dir, "folder.yaml");
    const error = await userError(loadStudy(file, { text }));
    expect(error.message).toBe(m.runPathIsFolder({ file, ...pos(text, "runs]"), path: "scenarios[0].runs[0]" }, "runs").message);
  });
});
