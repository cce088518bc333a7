/**
 * Reading files named by a record without trusting it: a path must stay inside a given folder
 * (after `..`, absolute paths and symbolic links are resolved), and must be a regular file. The
 * kind is checked before the file is opened, and again on the open file (`regularFile.ts`), so a
 * named pipe or a device is never read (opening a pipe to read would wait for a writer for ever).
 */
import { realpathSync, type Stats, statSync } from "node:fs";
import { isAbsolute, relative, resolve, sep } from "node:path";
import { kindOf } from "../regularFile.js";

/** Where a record's path leads: a regular file inside the folder, or why it is not read. */
export type Placed =
  | { ok: true; path: string }
  | { ok: false; why: "outside" }
  | { ok: false; why: "missing" }
  | { ok: false; why: "not-a-file"; kind: string }
  | { ok: false; why: "unreadable"; reason: string };

/** True when `path` is `folder` or lies under it (both absolute, resolved the same way). */
export function isInside(folder: string, path: string): boolean {
  const r = relative(folder, path);
  return r === "" || (!isAbsolute(r) && r !== ".." && !r.startsWith(".." + sep));
}

function code(e: unknown): string {
  return (e as NodeJS.ErrnoException).code ?? String(e);
}

/**
 * Places `rel` (a record entry, `/` separators) relative to `base`, and checks that it stays in
 * `folder` both as written and once links are followed (`realFolder` is `folder`'s real path).
 */
export function place(base: string, rel: string, folder: string, realFolder: string): Placed {
  const path = resolve(base, ...rel.split("/"));
  if (isAbsolute(rel) || !isInside(folder, path)) return { ok: false, why: "outside" };
  let real: string;
  try {
    real = realpathSync(path);
  } catch (e) {
    if (code(e) === "ENOENT" || code(e) === "ENOTDIR") return { ok: false, why: "missing" };
    return { ok: false, why: "unreadable", reason: code(e) };
  }
  if (!isInside(realFolder, real)) return { ok: false, why: "outside" };
  let st: Stats;
  try {
    st = statSync(real);
  } catch (e) {
    return { ok: false, why: "unreadable", reason: code(e) };
  }
  if (!st.isFile()) return { ok: false, why: "not-a-file", kind: kindOf(st) };
  return { ok: true, path: real };
}
