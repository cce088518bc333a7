import { spawn } from "node:child_process";
import { chmodSync, mkdirSync, mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { dirname, join } from "node:path";
import { fileURLToPath } from "node:url";

const MAIN = fileURLToPath(new URL("../../dist/cli/main.js", import.meta.url));

/** The user id commands run as when a test needs file permissions to bite (root reads anything). */
export const NOBODY = 65534;

export interface CliResult {
  status: number;
  stdout: string;
  stderr: string;
}

/**
 * Runs the built command line asynchronously (so many cases can run at once) in `cwd`.
 * `uid`: run as this user (only possible when the tests run as root).
 */
export function runCli(args: string[], options: { cwd: string; env?: Record<string, string>; uid?: number }): Promise<CliResult> {
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, [MAIN, ...args], {
      cwd: options.cwd,
      // one thread per command: many commands run at once here, and the output does not depend on it
      env: { ...process.env, SOURCE_DATE_EPOCH: "1780000000", SOJOURN_WORKERS: "1", ...options.env },
      ...(options.uid !== undefined ? { uid: options.uid, gid: options.uid } : {}),
    });
    let stdout = "";
    let stderr = "";
    child.stdout.setEncoding("utf8").on("data", (s: string) => (stdout += s));
    child.stderr.setEncoding("utf8").on("data", (s: string) => (stderr += s));
    child.on("error", reject);
    child.on("close", (code) => resolve({ status: code ?? -1, stdout, stderr }));
  });
}

/** Writes `files` into a fresh folder (world-readable, so an unprivileged user can enter it). */
export function studyFolder(files: Record<string, string | Buffer>): string {
  const dir = mkdtempSync(join(tmpdir(), "sojourn-bad-"));
  chmodSync(dir, 0o755);
  for (const [rel, content] of Object.entries(files)) {
    const p = join(dir, rel);
    mkdirSync(dirname(p), { recursive: true });
    writeFileSync(p, content);
  }
  return dir;
}

/** Runs `tasks` with at most `limit` of them at a time, results in order. */
export async function pooled<T>(tasks: (() => Promise<T>)[], limit: number): Promise<T[]> {
  const out: T[] = new Array(tasks.length);
  let next = 0;
  const worker = async () => {
    while (next < tasks.length) {
      const i = next++;
      out[i] = await tasks[i]();
    }
  };
  await Promise.all(Array.from({ length: Math.min(limit, tasks.length) }, worker));
  return out;
}
