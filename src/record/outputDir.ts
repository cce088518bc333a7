import { existsSync, mkdirSync, readdirSync, renameSync, rmSync, statSync, writeFileSync } from "node:fs";
import { basename, dirname, join, resolve } from "node:path";
import * as msg from "../messages/output.js";

/** Files whose presence marks a folder as an earlier Sojourn output. */
const MARKERS = ["record.json", "results.json"];

/**
 * A report folder that is built beside its final place and moved there only when complete:
 *
 *   DIR.sojourn-tmp-<pid>  ──write everything──▶  commit(): DIR → DIR.sojourn-old-<pid>,
 *                                                  tmp → DIR, remove old
 *
 * A failure or an interruption before `commit` removes the temporary folder and leaves an
 * earlier DIR exactly as it was. An existing DIR that is neither empty nor an earlier Sojourn
 * output is refused unless `force`.
 */
export class StagedDir {
  readonly final: string;
  readonly temp: string;
  private done = false;
  private readonly onSignal = () => {
    this.abandon();
    process.stderr.write(msg.interrupted().message + "\n");
    process.exit(130);
  };

  constructor(dir: string, force: boolean) {
    this.final = resolve(dir);
    if (existsSync(this.final)) {
      const st = statSync(this.final);
      if (!st.isDirectory()) throw msg.outIsFile(dir);
      const entries = readdirSync(this.final);
      if (entries.length > 0 && !MARKERS.some((m) => entries.includes(m)) && !force) throw msg.outNotOurs(dir);
    }
    this.temp = join(dirname(this.final), `.${basename(this.final)}.sojourn-tmp-${process.pid}`);
    try {
      removeStale(this.final);
      rmSync(this.temp, { recursive: true, force: true });
      mkdirSync(this.temp, { recursive: true });
    } catch (e) {
      throw msg.cannotWrite(dir, (e as NodeJS.ErrnoException).code ?? String(e));
    }
    process.on("SIGINT", this.onSignal);
    process.on("SIGTERM", this.onSignal);
  }

  /** Writes a file (relative path, `/` separators) inside the temporary folder. */
  write(rel: string, data: string | Uint8Array): void {
    const p = join(this.temp, ...rel.split("/"));
    mkdirSync(dirname(p), { recursive: true });
    writeFileSync(p, data);
  }

  path(rel: string): string {
    return join(this.temp, ...rel.split("/"));
  }

  /** Moves the finished folder into place. */
  commit(): void {
    const old = join(dirname(this.final), `.${basename(this.final)}.sojourn-old-${process.pid}`);
    const hadOld = existsSync(this.final);
    if (hadOld) renameSync(this.final, old);
    try {
      renameSync(this.temp, this.final);
    } catch (e) {
      if (hadOld) renameSync(old, this.final);
      throw e;
    }
    this.done = true;
    this.release();
    if (hadOld) rmSync(old, { recursive: true, force: true });
  }

  /** Removes the temporary folder (on failure). */
  abandon(): void {
    if (this.done) return;
    this.done = true;
    this.release();
    rmSync(this.temp, { recursive: true, force: true });
  }

  private release(): void {
    process.off("SIGINT", this.onSignal);
    process.off("SIGTERM", this.onSignal);
  }
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
 * Removes the temporary folders that earlier runs for the same DIR left behind when they were
 * killed outright (SIGKILL, power loss): those whose process no longer runs. DIR itself was never
 * touched by them.
 */
function removeStale(final: string): void {
  const parent = dirname(final);
  const prefix = `.${basename(final)}.sojourn-`;
  if (!existsSync(parent)) return;
  for (const name of readdirSync(parent)) {
    if (!name.startsWith(prefix)) continue;
    const m = /^(tmp|old)-(\d+)$/.exec(name.slice(prefix.length));
    if (m === null || Number(m[2]) === process.pid || alive(Number(m[2]))) continue;
    // An "old" folder whose process died between its two renames holds the earlier report: put it back.
    if (m[1] === "old" && !existsSync(final)) renameSync(join(parent, name), final);
    else rmSync(join(parent, name), { recursive: true, force: true });
  }
}
