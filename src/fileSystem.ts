/**
 * The file-system calls that write Sojourn's output (report folders, the PDF, `table` and
 * `summarize-run` files), gathered in one small object so that a test can make one of them fail
 * the way a full disk or a read-only mount does, without root and without filling a real disk.
 *
 * Tests pass their own `OutputFs`; the command line uses `outputFs()`, which is node:fs, unless
 * the environment variable SOJOURN_TEST_FAULT names a fault to inject:
 *
 *   SOJOURN_TEST_FAULT=CODE:CALL:TEXT   e.g. ENOSPC:write:tables/   EROFS:mkdir:report
 *
 * makes every CALL (`mkdir`, `write` or `rename`) whose target path holds TEXT fail with the
 * system error CODE. It exists for the tests of the built command line (test/badInput) and
 * changes nothing when unset.
 */
import { mkdirSync, renameSync, rmSync, writeFileSync } from "node:fs";

export interface OutputFs {
  /** Creates one folder (its parent exists). */
  mkdir(path: string): void;
  writeFile(path: string, data: string | Uint8Array): void;
  rename(from: string, to: string): void;
  /** Removes a file or a folder with everything in it; no error when there is none. */
  remove(path: string): void;
}

export const nodeFs: OutputFs = {
  mkdir: (path) => mkdirSync(path),
  writeFile: (path, data) => writeFileSync(path, data),
  rename: (from, to) => renameSync(from, to),
  remove: (path) => rmSync(path, { recursive: true, force: true, maxRetries: 3 }),
};

/** A system error as node:fs throws it. */
export function systemError(code: string, call: string, path: string): NodeJS.ErrnoException {
  const e: NodeJS.ErrnoException = new Error(`${code}: ${call} '${path}'`);
  e.code = code;
  e.syscall = call;
  e.path = path;
  return e;
}

/** `base` with every `call` on a path that holds `text` failing with `code`. */
export function faultyFs(base: OutputFs, code: string, call: "mkdir" | "write" | "rename", text: string): OutputFs {
  const hit = (path: string) => path.split("\\").join("/").includes(text);
  return {
    mkdir: (path) => (call === "mkdir" && hit(path) ? fail(code, "mkdir", path) : base.mkdir(path)),
    writeFile: (path, data) => (call === "write" && hit(path) ? fail(code, "open", path) : base.writeFile(path, data)),
    rename: (from, to) => (call === "rename" && hit(to) ? fail(code, "rename", to) : base.rename(from, to)),
    remove: (path) => base.remove(path),
  };
}

function fail(code: string, call: string, path: string): never {
  throw systemError(code, call, path);
}

/** The file system of the command line: node:fs, with SOJOURN_TEST_FAULT applied when set. */
export function outputFs(): OutputFs {
  const fault = process.env.SOJOURN_TEST_FAULT;
  if (fault === undefined || fault === "") return nodeFs;
  const m = /^(E[A-Z]+):(mkdir|write|rename):(.+)$/.exec(fault);
  if (m === null) return nodeFs;
  return faultyFs(nodeFs, m[1], m[2] as "mkdir" | "write" | "rename", m[3]);
}

/** The error code of a system error, or null for anything else. */
export function errorCode(e: unknown): string | null {
  const code = (e as NodeJS.ErrnoException | null)?.code;
  return typeof code === "string" && /^E[A-Z]+$/.test(code) ? code : null;
}
