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
