/**
 * The two Slurm commands `--on slurm` uses, and the job scripts it submits. Nothing else of
 * Slurm is assumed: no accounting database (sacct), no particular plugin; a job is followed by
 * `squeue` while it is known there and by the exit-status file its script writes (see
 * clusterReport.ts).
 */
import { spawnSync } from "node:child_process";
import * as msg from "../messages/cluster.js";

/** The command line of one job, as sbatch takes it (`--parsable` is added). */
export function sbatch(args: string[], what: string): string {
  const r = spawnSync("sbatch", ["--parsable", ...args], { encoding: "utf8" });
  if (r.error !== undefined) throw msg.noSlurm("sbatch", (r.error as NodeJS.ErrnoException).code === "ENOENT" ? "it is not on PATH" : r.error.message);
  if (r.status !== 0) throw msg.submitFailed(what, (r.stderr || r.stdout).trim() || `exit status ${r.status}`);
  // `--parsable` prints "<id>" or "<id>;<cluster>"
  const id = r.stdout.trim().split(";")[0];
  if (!/^\d+$/.test(id)) throw msg.submitFailed(what, `it printed no job id (${JSON.stringify(r.stdout.trim())})`);
  return id;
}

/** Whether any of these jobs (or a task of these arrays) is still queued or running. */
export function anyAlive(jobs: readonly string[]): boolean {
  if (jobs.length === 0) return false;
  const r = spawnSync("squeue", ["--noheader", "--format=%i %T", `--jobs=${jobs.join(",")}`], { encoding: "utf8" });
  if (r.error !== undefined) throw msg.noSlurm("squeue", (r.error as NodeJS.ErrnoException).code === "ENOENT" ? "it is not on PATH" : r.error.message);
  // A job that ended long ago is no longer known: squeue then says "Invalid job id".
  if (r.status !== 0) {
    if (/invalid job id/i.test(r.stderr)) return false;
    throw msg.noSlurm("squeue", r.stderr.trim() || `exit status ${r.status}`);
  }
  return r.stdout.split("\n").some((line) => line.trim() !== "" && !/\s(COMPLETED|FAILED|CANCELLED|TIMEOUT|OUT_OF_MEMORY|NODE_FAIL|PREEMPTED|BOOT_FAIL|DEADLINE)\s*$/.test(line));
}

/** A word for a POSIX shell: single-quoted, a quote inside written '\''. */
export function shellWord(s: string): string {
  return `'${s.replace(/'/g, `'\\''`)}'`;
}

/**
 * A job script: runs one Sojourn command, then writes its exit status to `statusFile` (under a
 * temporary name, then renamed, so a reader never sees half a number) and exits with it.
 * `command` and `status` are shell text (quote names with `shellWord`). A task
 * killed by Slurm writes no status: the waiter then reads it as "ended without finishing".
 */
export function jobScript(purpose: string, command: string[], status: string): string {
  return [
    "#!/bin/sh",
    `# Written by \`sojourn report --on slurm\`: ${purpose}.`,
    command.join(" "),
    "rc=$?",
    `printf '%s\\n' "$rc" > ${status}.tmp-$$ && mv -f ${status}.tmp-$$ ${status}`,
    'exit "$rc"',
    "",
  ].join("\n");
}
