/**
 * Reading files named by a record without trusting it: a path must stay inside a given folder
 * (after `..`, absolute paths and symbolic links are resolved), and must be a regular file. The
 * kind is checked before the file is opened, and again on the open file, so a named pipe or a
 * device is never read (opening a pipe to read would wait for a writer for ever).
 */
import { createHash } from "node:crypto";
import { closeSync, constants, createReadStream, fstatSync, openSync, realpathSync, type Stats, statSync } from "node:fs";
import { isAbsolute, relative, resolve, sep } from "node:path";

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

/** What a file system entry is, in words, for one that is not a regular file. */
export function kindOf(st: Stats): string {
  if (st.isDirectory()) return "a folder";
  if (st.isFIFO()) return "a named pipe (FIFO)";
  if (st.isCharacterDevice() || st.isBlockDevice()) return "a device";
  if (st.isSocket()) return "a socket";
  return "not a regular file";
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

/**
 * Opens a regular file to read, without waiting on a pipe: O_NONBLOCK makes opening a FIFO return
 * at once, and the open file's kind is checked before anything is read.
 */
export function openRegular(path: string): number {
  const fd = openSync(path, constants.O_RDONLY | (constants.O_NONBLOCK ?? 0));
  const st = fstatSync(fd);
  if (!st.isFile()) {
    closeSync(fd);
    throw Object.assign(new Error(`${path} is ${kindOf(st)}`), { code: "ENOTREG", kind: kindOf(st) });
  }
  return fd;
}

/** The SHA-256 of a regular file's bytes, read in 1 MiB pieces. */
export async function fileDigest(path: string): Promise<string> {
  const h = createHash("sha256");
  const fd = openRegular(path);
  for await (const chunk of createReadStream("", { fd, highWaterMark: 1 << 20 })) h.update(chunk as Buffer);
  return h.digest("hex");
}

/** A regular file's bytes. */
export async function fileBytes(path: string): Promise<Buffer> {
  const parts: Buffer[] = [];
  const fd = openRegular(path);
  for await (const chunk of createReadStream("", { fd, highWaterMark: 1 << 20 })) parts.push(chunk as Buffer);
  return Buffer.concat(parts);
}
