/** Shared helpers for the manifest tests: a temporary study folder and source positions. */
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { dirname, join } from "node:path";
import { afterEach, expect } from "vitest";
import { UserError } from "../../src/messages/index.js";

/** A fresh folder holding `files` (relative path -> content). */
export function studyFolder(files: Record<string, string>): string {
  const dir = mkdtempSync(join(tmpdir(), "sojourn-manifest-"));
  for (const [path, content] of Object.entries(files)) {
    mkdirSync(dirname(join(dir, path)), { recursive: true });
    writeFileSync(join(dir, path), content);
  }
  return dir;
}

export function removeFolder(dir: string): void {
  rmSync(dir, { recursive: true, force: true });
}

/** 1-based line and column of the `nth` (0-based) occurrence of `needle` in `text`. */
export function pos(text: string, needle: string, nth = 0): { line: number; column: number } {
  let index = -1;
  for (let k = 0; k <= nth; k++) {
    index = text.indexOf(needle, index + 1);
    if (index < 0) throw new Error(`test setup: ${JSON.stringify(needle)} not found`);
  }
  const before = text.slice(0, index);
  const line = before.split("\n").length;
  return { line, column: index - before.lastIndexOf("\n") };
}

/** The UserError a promise rejects with (fails the test when it resolves or throws anything else). */
export async function userError(promise: Promise<unknown>): Promise<UserError> {
  const outcome = await promise.then(
    () => null,
    (error: unknown) => error,
  );
  expect(outcome).toBeInstanceOf(UserError);
  return outcome as UserError;
}

const CSV = "time,series,value\n0,queue,0\n";

/** Run files used by most tests. */
export const RUN_FILES: Record<string, string> = {
  "runs/two/rep-02.csv": CSV,
  "runs/two/rep-01.csv": CSV,
  "runs/three/rep-01.csv": CSV,
  "runs/three/rep-02.csv": CSV,
  "runs/odd/rep-01.csv": CSV,
  "runs/odd/rep-09.csv": CSV,
  "runs/mixed/rep-01.csv": CSV,
  "runs/mixed/notes.txt": "not a run",
  "runs/twins/x/rep-01.csv": CSV,
  "runs/twins/y/rep-01.jsonl.gz": "",
};

/**
 * A writer of study manifests for one test file: each call makes a fresh folder holding
 * `RUN_FILES` and `study.yaml` with `text`, and returns the manifest's path; the folders go after
 * each test.
 */
export function manifestWriter(): (text: string) => string {
  const folders: string[] = [];
  afterEach(() => {
    while (folders.length > 0) removeFolder(folders.pop() as string);
  });
  return (text: string) => {
    const dir = studyFolder(RUN_FILES);
    folders.push(dir);
    const file = join(dir, "study.yaml");
    writeFileSync(file, text);
    return file;
  };
}
