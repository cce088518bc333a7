import { existsSync, lstatSync, readdirSync, statSync } from "node:fs";
import { basename, dirname, isAbsolute, join, relative, resolve } from "node:path";
import { sha256 } from "../digest.js";
import { onInterrupt } from "../interrupt.js";
import * as msg from "../messages/output.js";
import { UserError } from "../messages/index.js";
import { errorCode, nodeFs, type OutputFs } from "../fileSystem.js";
import { firstForeign, inputInside, realLocation, type StudyInput } from "./ownership.js";

export interface StagedDirOptions {
  /** Replace a folder that holds files Sojourn did not write (never one that holds an input). */
  force: boolean;
  /** The study's inputs: a folder holding any of them is never replaced. */
  inputs: StudyInput[];
  fs?: OutputFs;
}

/**
 * The rule a report folder is claimed by, checked without writing anything (`StagedDir` applies
 * it first; `report --on slurm` applies it before it submits a job): DIR must not be a file, must
 * not be, hold or be a parent of an input of the study (even with `force`), and an existing DIR
 * must hold only what Sojourn can show it wrote (unless `force`). Throws the catalogue message.
 */
export function checkReportDir(dir: string, options: { force: boolean; inputs: StudyInput[] }): { final: string; exists: boolean; earlier: boolean } {
  const wanted = resolve(dir);
  let exists = false;
  try {
    const st = statSync(wanted);
    if (!st.isDirectory()) throw msg.outIsFile(dir);
    exists = true;
  } catch (e) {
    if (e instanceof UserError) throw e;
    const code = errorCode(e);
    if (code !== "ENOENT") throw folderError(dir, wanted, e);
  }
  const final = realLocation(wanted);
  const held = inputInside(final, options.inputs);
  if (held !== null) throw msg.outHoldsInput(dir, held.relative, held.input.kind);
  try {
    const earlier = exists && readdirSync(final).length > 0;
    const foreign = earlier && !options.force ? firstForeign(final) : null;
    if (foreign !== null) throw msg.outHoldsForeign(dir, foreign.file, foreign.why);
    return { final, exists, earlier };
  } catch (e) {
    const code = errorCode(e);
    if (code === null) throw e;
    throw msg.outUnreadable(dir, code);
  }
}

/**
 * A report folder that is built beside its final place and moved there only when complete:
 *
 *   DIR.sojourn-tmp-<pid>  ──write everything──▶  commit(): DIR → DIR.sojourn-old-<pid>,
 *                                                  tmp → DIR, remove old
 *
 * (the temporary names start with a dot and sit beside DIR). A failure or an interruption before
 * `commit` removes the temporary folder and leaves an earlier DIR exactly as it was.
 *
 * Before anything is written, DIR is checked (src/record/ownership.ts): a DIR that is, holds or
 * is a parent of the manifest or an input of the study is refused, even with `force`; an existing
 * DIR that holds anything Sojourn cannot show it wrote is refused unless `force`. A DIR reached
 * through a link is written where the link points.
 *
 * Errors of the system (a full disk, a read-only place, a name too long) become catalogue
 * messages that say which file and that the earlier report is intact.
 */
export class StagedDir {
  /** The folder as the user named it, for messages. */
  readonly shown: string;
  /** Where the folder really is (links resolved). */
  readonly final: string;
  readonly temp: string;
  private readonly fs: OutputFs;
  /** Whether DIR held something before (an earlier report) that the failure leaves in place. */
  private readonly earlier: boolean;
  private done = false;
  private readonly release: () => void;

  constructor(dir: string, options: StagedDirOptions) {
    this.shown = dir;
    this.fs = options.fs ?? nodeFs;
    const claim = checkReportDir(dir, options);
    this.final = claim.final;
    this.earlier = claim.earlier;
    const exists = claim.exists;
    const parent = dirname(this.final);
    this.temp = join(parent, `${stagePrefix(basename(this.final))}tmp-${process.pid}`);
    try {
      removeStale(this.final, this.fs);
      this.fs.remove(this.temp);
      makeFolders(parent, this.fs);
      // A name the file system refuses shows now, not after the whole study is computed.
      if (!exists) {
        this.fs.mkdir(this.final);
        this.fs.remove(this.final);
      }
      this.fs.mkdir(this.temp);
    } catch (e) {
      throw this.prepareError(e, this.final);
    }
    this.release = onInterrupt(
      () => this.abandon(),
      () => msg.interrupted().message,
    );
  }

  /** Writes a file (relative path, `/` separators) inside the temporary folder. */
  write(rel: string, data: string | Uint8Array): void {
    const p = this.path(rel);
    try {
      makeFolders(dirname(p), this.fs);
      this.fs.writeFile(p, data);
    } catch (e) {
      throw this.writeError(e, rel);
    }
  }

  path(rel: string): string {
    return join(this.temp, ...rel.split("/"));
  }

  /** A scratch file beside DIR for this process (`kind`: a short word), removed with the stale folders. */
  scratch(kind: string): string {
    return join(dirname(this.final), `${stagePrefix(basename(this.final))}${kind}-${process.pid}`);
  }

  /**
   * Moves the finished folder into place. It is synchronous, so a signal cannot come between the
   * two renames (src/interrupt.ts); a failed second rename puts the earlier folder back.
   */
  commit(): void {
    const old = this.scratch("old");
    const hadOld = existsSync(this.final);
    try {
      if (hadOld) this.fs.rename(this.final, old);
      try {
        this.fs.rename(this.temp, this.final);
      } catch (e) {
        if (hadOld) this.fs.rename(old, this.final);
        throw e;
      }
      this.done = true;
    } catch (e) {
      throw this.writeError(e, ".");
    }
    this.release();
    if (hadOld) this.fs.remove(old);
  }

  /** Removes the temporary folder (on failure). */
  abandon(): void {
    if (this.done) return;
    this.done = true;
    this.release();
    try {
      this.fs.remove(this.temp);
    } catch {
      // nothing more can be done; the next report for DIR removes it (removeStale)
    }
  }

  /** A system error while preparing the folder, as a catalogue message. */
  private prepareError(e: unknown, at: string): UserError {
    return folderError(this.shown, at, e);
  }

  /** A system error while writing `rel` of the new report, as a catalogue message. */
  private writeError(e: unknown, rel: string): UserError {
    const code = errorCode(e);
    if (code === null) return e as UserError;
    if (rel === ".") return code === "ENAMETOOLONG" ? msg.outNameTooLong(this.shown) : msg.cannotWrite(this.shown, `${msg.writeReason(code)}, ${code}`);
    if (code === "ENAMETOOLONG") return msg.reportFileNameTooLong(this.shown, rel, Buffer.byteLength(join(this.final, ...rel.split("/")), "utf8"));
    if (code === "ENOSPC" || code === "EDQUOT") return msg.reportDiskFull(this.shown, rel, code, this.earlier);
    return msg.reportFileUnwritable(this.shown, rel, code, this.earlier);
  }
}

/**
 * A system error met while creating the folder `shown` (really at `at`), as a catalogue message;
 * anything that is not a system error is returned as it is.
 */
export function folderError(shown: string, at: string, e: unknown): UserError {
  const code = errorCode(e);
  if (code === null) return e as UserError;
  switch (code) {
    case "ENAMETOOLONG":
      return msg.outNameTooLong(shown);
    case "EROFS":
    case "EACCES":
    case "EPERM":
      return msg.outReadOnly(shown, forUser(nearestExisting(at)), code);
    case "ENOTDIR":
    case "EEXIST":
      return msg.outPathBlocked(shown, forUser(nearestExisting(at)));
    case "ENOSPC":
    case "EDQUOT":
      return msg.outDiskFull(shown, code);
    default:
      return msg.cannotWrite(shown, `${msg.writeReason(code)}, ${code}`);
  }
}

/**
 * The start of the names of DIR's temporary folders and files: `.DIR.sojourn-`, or for a name so
 * long that the temporary names would pass the usual limit of 255 bytes, a digest of it instead.
 */
export function stagePrefix(name: string): string {
  const plain = `.${name}.sojourn-`;
  return Buffer.byteLength(plain, "utf8") + "tmp-4294967295.partial".length <= 255 ? plain : `.${sha256(name).slice(0, 16)}.sojourn-`;
}

/** A path as the user would type it: relative to the working folder when inside it. */
function forUser(path: string): string {
  const rel = relative(process.cwd(), path);
  if (rel === "") return "the current folder";
  return rel.startsWith("..") || isAbsolute(rel) ? path : rel;
}

/** The nearest of `path` and its ancestors that exists (a file or a folder). */
function nearestExisting(path: string): string {
  let at = path;
  for (;;) {
    try {
      lstatSync(at);
      return at;
    } catch {
      const up = dirname(at);
      if (up === at) return at;
      at = up;
    }
  }
}

/**
 * Creates `path` and its missing ancestors one level at a time (node's recursive mkdir never
 * returns on some special file systems, such as /proc, where mkdir says ENOENT).
 */
export function makeFolders(path: string, fs: OutputFs): void {
  const missing: string[] = [];
  let at = path;
  for (;;) {
    try {
      if (statSync(at).isDirectory()) break;
      throw Object.assign(new Error(`ENOTDIR: not a folder '${at}'`), { code: "ENOTDIR", path: at });
    } catch (e) {
      if (errorCode(e) !== "ENOENT") throw e;
      const up = dirname(at);
      if (up === at) break;
      missing.push(at);
      at = up;
    }
  }
  for (const p of missing.reverse()) fs.mkdir(p);
}

/** True when a process with this id is running. */
function alive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (e) {
    return (e as NodeJS.ErrnoException).code === "EPERM";
  }
}

/**
 * Removes the temporary folders and files that earlier runs for the same DIR left behind when
 * they were killed outright (SIGKILL, power loss): those whose process no longer runs. DIR itself
 * was never touched by them.
 */
function removeStale(final: string, fs: OutputFs): void {
  const parent = dirname(final);
  const prefix = stagePrefix(basename(final));
  if (!existsSync(parent)) return;
  for (const name of readdirSync(parent)) {
    if (!name.startsWith(prefix)) continue;
    const m = /^(tmp|old|pdf|rec)-(\d+)(\.partial)?$/.exec(name.slice(prefix.length));
    if (m === null || Number(m[2]) === process.pid || alive(Number(m[2]))) continue;
    // An "old" folder whose process died between its two renames holds the earlier report: put it back.
    if (m[1] === "old" && !existsSync(final)) fs.rename(join(parent, name), final);
    else fs.remove(join(parent, name));
  }
}
