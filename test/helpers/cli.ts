import { spawnSync } from "node:child_process";
import { fileURLToPath } from "node:url";

const MAIN = fileURLToPath(new URL("../../dist/cli/main.js", import.meta.url));

/** Runs the built command line (npm test builds first) and returns status, stdout and stderr. */
export function sojourn(args: string[], cwd?: string): { status: number; stdout: string; stderr: string } {
  const r = spawnSync(process.execPath, [MAIN, ...args], { cwd, encoding: "utf8", env: { ...process.env, SOURCE_DATE_EPOCH: "1780000000" } });
  return { status: r.status ?? -1, stdout: r.stdout, stderr: r.stderr };
}
