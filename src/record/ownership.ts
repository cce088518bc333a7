/**
 * What Sojourn may replace: only what it can show it wrote, and never an input of the study.
 *
 * - A report folder is Sojourn's when its `record.json` is a study record and every other entry
 *   of the folder, at any depth, is a file the record lists with the digest the record gives
 *   (the outputs, and the PDF once it is written). An empty folder is free to use. Anything else
 *   (a file of the user's, a file changed since, a folder of the user's, a link) is foreign: the
 *   first one in name order is named to the user.
 * - The inputs of a study are its manifest, its run files and, with `--from-summaries`, its run
 *   summaries. Their real locations (links resolved) are compared with the real location of the
 *   output, so a folder reached through a link, or a link to the study's folder, is seen for what
 *   it is.
 */
import { closeSync, existsSync, lstatSync, openSync, readdirSync, readFileSync, readSync, realpathSync } from "node:fs";
import { createHash } from "node:crypto";
import { basename, dirname, join, relative, resolve, sep } from "node:path";
import type { Study } from "../manifest/types.js";
import type { ForeignReason, InputKind } from "../messages/output.js";
import { summaryPath } from "../study/runSummary.js";

export interface StudyInput {
  /** Absolute path. */
  path: string;
  kind: InputKind;
}

/** Every input of a study: the manifest, the run files and (from a summaries folder) the run summaries. */
export function studyInputs(study: Study, fromSummaries?: string): StudyInput[] {
  const inputs: StudyInput[] = [{ path: study.manifestPath, kind: "manifest" }];
  for (const sc of study.scenarios) {
    for (const run of sc.runs) {
      inputs.push({ path: run.path, kind: "run file" });
      if (fromSummaries !== undefined) inputs.push({ path: resolve(fromSummaries, ...summaryPath(sc.name, run.id).split("/")), kind: "run summary" });
    }
  }
  return inputs;
}

/**
 * Where a path really is: links resolved. For a path that does not exist (yet), its nearest
 * existing ancestor is resolved and the rest appended.
 */
export function realLocation(path: string): string {
  const absolute = resolve(path);
  const rest: string[] = [];
  let at = absolute;
  for (;;) {
    try {
      return join(realpathSync(at), ...rest.reverse());
    } catch {
      const up = dirname(at);
      if (up === at) return absolute;
      rest.push(basename(at));
      at = up;
    }
  }
}

/** Whether `path` is `folder` or inside it (both real locations). */
export function isInside(path: string, folder: string): boolean {
  if (path === folder) return true;
  const prefix = folder.endsWith(sep) ? folder : folder + sep;
  return path.startsWith(prefix);
}

/** The first input of the study at or below `folder` (a real location), with its path relative to it. */
export function inputInside(folder: string, inputs: StudyInput[]): { input: StudyInput; relative: string } | null {
  for (const input of inputs) {
    const real = realLocation(input.path);
    if (isInside(real, folder)) return { input, relative: relative(folder, real).split(sep).join("/") || basename(real) };
  }
  return null;
}

/** The input that `file` (a real location) is, if any. */
export function inputAt(file: string, inputs: StudyInput[]): StudyInput | null {
  return inputs.find((input) => realLocation(input.path) === file) ?? null;
}

/** Hex SHA-256 of a file, read in pieces (a table may be large). */
export function fileSha256(path: string): string {
  const h = createHash("sha256");
  const buffer = Buffer.allocUnsafe(1 << 20);
  const fd = openSync(path, "r");
  try {
    for (;;) {
      const n = readSync(fd, buffer, 0, buffer.length, null);
      if (n === 0) break;
      h.update(buffer.subarray(0, n));
    }
  } finally {
    closeSync(fd);
  }
  return h.digest("hex");
}

const DIGEST = /^[0-9a-f]{64}$/;

/** The files a study record says Sojourn wrote (path with `/` -> digest), or null if it is not a record. */
export function recordedFiles(recordPath: string): Map<string, string> | null {
  let record: unknown;
  try {
    if (!lstatSync(recordPath).isFile()) return null;
    record = JSON.parse(readFileSync(recordPath, "utf8"));
  } catch {
    return null;
  }
  const r = record as { format?: unknown; outputs?: unknown; pdf?: unknown } | null;
  if (r === null || typeof r !== "object" || r.format !== "sojourn-record/1" || !Array.isArray(r.outputs)) return null;
  const files = new Map<string, string>();
  for (const entry of [...r.outputs, ...(r.pdf !== undefined ? [r.pdf] : [])]) {
    const e = entry as { file?: unknown; sha256?: unknown } | null;
    if (e === null || typeof e !== "object" || typeof e.file !== "string" || typeof e.sha256 !== "string" || !DIGEST.test(e.sha256)) return null;
    files.set(e.file, e.sha256);
  }
  return files;
}

/**
 * The first entry (in name order, depth first) of an existing folder that is not a file of an
 * earlier report, or null when the folder is empty or wholly Sojourn's. Folders are named with
 * a trailing `/`.
 */
export function firstForeign(folder: string): { file: string; why: ForeignReason } | null {
  const top = readdirSync(folder).sort();
  if (top.length === 0) return null;
  const recordPath = join(folder, "record.json");
  const hasRecord = existsSync(recordPath) || isLink(recordPath);
  const files = hasRecord ? recordedFiles(recordPath) : null;
  if (hasRecord && files === null) return { file: "record.json", why: "bad-record" };
  if (files === null) {
    const first = top[0];
    return { file: lstatSync(join(folder, first)).isDirectory() ? `${first}/` : first, why: "no-record" };
  }
  const folders = new Set<string>();
  for (const f of files.keys()) {
    const parts = f.split("/");
    for (let i = 1; i < parts.length; i++) folders.add(parts.slice(0, i).join("/"));
  }
  const walk = (rel: string, names: string[]): { file: string; why: ForeignReason } | null => {
    for (const name of names) {
      const path = rel === "" ? name : `${rel}/${name}`;
      const full = join(folder, ...path.split("/"));
      const st = lstatSync(full);
      if (st.isDirectory()) {
        if (!folders.has(path)) return { file: `${path}/`, why: "not-listed" };
        const found = walk(path, readdirSync(full).sort());
        if (found !== null) return found;
        continue;
      }
      if (path === "record.json") continue;
      const digest = files.get(path);
      if (digest === undefined || !st.isFile()) return { file: path, why: "not-listed" };
      if (fileSha256(full) !== digest) return { file: path, why: "changed" };
    }
    return null;
  };
  return walk("", top);
}

function isLink(path: string): boolean {
  try {
    return lstatSync(path).isSymbolicLink();
  } catch {
    return false;
  }
}
