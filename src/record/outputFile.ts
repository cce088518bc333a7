/**
 * The files `sojourn table --out FILE` and `sojourn summarize-run --out FILE` write. Such a file
 * replaces an existing one only when that file is the same command's own earlier output, or with
 * `--force`; it never replaces an input of the study (the manifest, a run file), not even with
 * `--force`. How a file is recognised as Sojourn's own:
 *
 * - a calculation table (`table`): its first line is exactly the header of one of the tables a
 *   measure writes (`index,value,from,to,...`, `p,n,h,...`; the column lists in src/measures/),
 *   and every record after it has as many cells as that header (RFC 4180 quoting understood),
 *   the last one ended by a line feed;
 * - a run summary (`summarize-run`): it is JSON with `"format": "sojourn-run-summary/1"` and its
 *   own digest (the `digest` key) matches the rest of its contents.
 *
 * Every file is written beside its place under a temporary name and renamed into place, so an
 * interruption or a full disk never leaves half a file, and the earlier file stays as it was.
 */
import { lstatSync, readFileSync, statSync } from "node:fs";
import { basename, dirname, join, resolve } from "node:path";
import { sha256 } from "../digest.js";
import { onInterrupt } from "../interrupt.js";
import { COUNT_COLUMNS } from "../measures/count.js";
import { LEVEL_COLUMNS } from "../measures/level.js";
import { TIME_AT_LEAST_COLUMNS, TIME_AT_VALUE_COLUMNS } from "../measures/levelTables.js";
import { ENTITY_OBSERVATION_COLUMNS, OBSERVATION_COLUMNS } from "../measures/observation.js";
import { QUANTILE_COLUMNS, WITHIN_COLUMNS } from "../measures/quantiles.js";
import { UTILIZATION_COLUMNS, UTILIZATION_SERIES_COLUMNS } from "../measures/utilization.js";
import * as msg from "../messages/output.js";
import { SUMMARY_FORMAT } from "../study/runSummary.js";
import { errorCode, outputFs, type OutputFs } from "../fileSystem.js";
import { makeFolders, stagePrefix } from "./outputDir.js";
import { inputAt, realLocation, type StudyInput } from "./ownership.js";

/** The header lines of every calculation table a run's measure writes (what `sojourn table` prints). */
export const TABLE_HEADERS: ReadonlySet<string> = new Set(
  [
    LEVEL_COLUMNS,
    UTILIZATION_COLUMNS,
    UTILIZATION_SERIES_COLUMNS,
    OBSERVATION_COLUMNS,
    ENTITY_OBSERVATION_COLUMNS,
    COUNT_COLUMNS,
    TIME_AT_LEAST_COLUMNS,
    TIME_AT_VALUE_COLUMNS,
    QUANTILE_COLUMNS,
    WITHIN_COLUMNS,
  ].map((columns) => columns.join(",")),
);

/** Files larger than this are not read to be recognised (a table of a million rows is about 100 MB). */
const MAX_OWN_BYTES = 1 << 30;

/** Number of cells in each CSV record of `text` (RFC 4180), or null if a quote is left open. */
function cellsPerRecord(text: string): number[] | null {
  const counts: number[] = [];
  let cells = 1;
  let quoted = false;
  for (let i = 0; i < text.length; i++) {
    const c = text[i];
    if (quoted) {
      if (c === '"') {
        if (text[i + 1] === '"') i++;
        else quoted = false;
      }
    } else if (c === '"') quoted = true;
    else if (c === ",") cells++;
    else if (c === "\n") {
      counts.push(cells);
      cells = 1;
    }
  }
  return quoted ? null : counts;
}

/** Why `text` is not a calculation table Sojourn wrote, or null when it is one. */
export function notOwnTable(text: string): string | null {
  const header = text.slice(0, text.indexOf("\n") < 0 ? text.length : text.indexOf("\n"));
  if (!TABLE_HEADERS.has(header)) return "its first line is not the header of a calculation table";
  if (!text.endsWith("\n")) return "its last line is not ended";
  const counts = cellsPerRecord(text);
  if (counts === null) return "a quoted cell is not closed";
  const width = header.split(",").length;
  const bad = counts.findIndex((n) => n !== width);
  if (bad >= 0) return `line ${bad + 1} has ${counts[bad]} cells, the header ${width}`;
  return null;
}

/** Why `text` is not a run summary Sojourn wrote, or null when it is one. */
export function notOwnSummary(text: string): string | null {
  let parsed: unknown;
  try {
    parsed = JSON.parse(text);
  } catch {
    return "it is not JSON";
  }
  const o = parsed as { format?: unknown; digest?: unknown } | null;
  if (o === null || typeof o !== "object" || Array.isArray(o) || o.format !== SUMMARY_FORMAT) return `its "format" is not "${SUMMARY_FORMAT}"`;
  const { digest, ...rest } = o;
  // The digest is of the summary's JSON without it (src/study/runSummary.ts, encodeSummary).
  if (typeof digest !== "string" || sha256(JSON.stringify(rest)) !== digest) return "its contents do not match the digest written inside it";
  return null;
}

export interface OwnFile {
  /** The path as the user gave it (relative to the working folder). */
  path: string;
  text: string;
}

export interface WriteOwnFilesOptions {
  kind: msg.OwnFileKind;
  /** Write over a file that is not this command's own earlier output (never over an input). */
  force: boolean;
  inputs: StudyInput[];
  fs?: OutputFs;
}

/**
 * Writes `files` after checking all of them (a refusal writes none): not a folder, not an input
 * of the study, and either new or this command's own earlier output (or `force`).
 */
export function writeOwnFiles(files: OwnFile[], options: WriteOwnFilesOptions): void {
  const fs = options.fs ?? outputFs();
  const notOurs = options.kind === "calculation table" ? notOwnTable : notOwnSummary;
  const existed = new Set<string>();
  for (const f of files) {
    const target = resolve(f.path);
    const input = inputAt(realLocation(target), options.inputs);
    if (input !== null) throw msg.outFileIsInput(f.path, input.kind);
    let why: string | null;
    try {
      const st = statSync(target);
      if (st.isDirectory()) throw msg.outFileIsFolder(f.path);
      existed.add(f.path);
      why = st.size > MAX_OWN_BYTES ? `it is larger than ${MAX_OWN_BYTES} bytes` : notOurs(readFileSync(target, "utf8"));
    } catch (e) {
      const code = errorCode(e);
      if (code === null) throw e;
      if (code === "ENOENT" && !isLink(target)) continue;
      if (code === "ENAMETOOLONG" || code === "ENOTDIR") throw msg.outFileUnwritable(f.path, code, false);
      why = code === "ENOENT" ? "it is a link to a file that does not exist" : `it cannot be read: ${msg.writeReason(code)}`;
    }
    if (why !== null && !options.force) throw msg.outFileNotOurs(f.path, options.kind, why);
  }
  for (const f of files) {
    const target = resolve(f.path);
    const temp = join(dirname(target), `${stagePrefix(basename(target))}tmp-${process.pid}`);
    const release = onInterrupt(() => fs.remove(temp));
    try {
      makeFolders(dirname(target), fs);
      fs.writeFile(temp, f.text);
      fs.rename(temp, target);
    } catch (e) {
      try {
        fs.remove(temp);
      } catch {
        // the temporary file is named after this process; nothing else depends on it
      }
      const code = errorCode(e);
      if (code === null) throw e;
      throw msg.outFileUnwritable(f.path, code, existed.has(f.path));
    } finally {
      release();
    }
  }
}

function isLink(path: string): boolean {
  try {
    return lstatSync(path).isSymbolicLink();
  } catch {
    return false;
  }
}
