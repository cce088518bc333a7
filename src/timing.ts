/**
 * Phase times for performance work: with `SOJOURN_TIMING=1` each `mark` writes
 * `timing <label> <ms> cpu <ms>` to standard error: the milliseconds since the process (or thread)
 * started, then the CPU milliseconds (user + system) the whole process has used so far, which a
 * machine shared with other work disturbs much less than the wall clock. Without it `mark` does nothing. docs/performance.md uses these marks to say where time goes.
 */
import { performance } from "node:perf_hooks";
import { isMainThread, threadId } from "node:worker_threads";

const on = process.env.SOJOURN_TIMING === "1";
/** Whether `mark` writes: a caller may skip measuring what only a mark would show. */
export const timing = on;
/** Worker threads count from their own start; this offset puts their marks on the process clock. */
const offset = isMainThread ? 0 : performance.timeOrigin - (Number(process.env.SOJOURN_TIMING_ORIGIN) || performance.timeOrigin);

export function mark(label: string): void {
  if (!on) return;
  const ms = performance.now() + offset;
  const cpu = process.cpuUsage();
  process.stderr.write(`timing ${label}${isMainThread ? "" : ` (thread ${threadId})`} ${ms.toFixed(0)} cpu ${((cpu.user + cpu.system) / 1000).toFixed(0)}\n`);
}

if (on && isMainThread) process.env.SOJOURN_TIMING_ORIGIN = String(performance.timeOrigin);
