/**
 * Runs of a study analysed on worker threads, results in a fixed order.
 *
 *   plans[0..n) ──▶ queue ──▶ this thread ─┐
 *                        └──▶ worker 2 ────┴─▶ results[i] = analysis of plans[i]
 *
 * With N workers this thread is one of them and N - 1 worker threads are started: a thread would
 * otherwise sit idle here waiting for replies, and each worker thread costs its start-up and its
 * own compiler warm-up. Each run is one job (`analyzeRun`, in `runWorker.js` on a worker thread);
 * results are stored at their plan's index,
 * so whatever the number of workers or the order in which they finish, the caller sees the same
 * array and the study's bytes do not change. With one worker, or when the worker entry is not a
 * built `.js` file next to this module (under a TypeScript test runner), runs are analysed in
 * this thread, one after another.
 *
 * An input error in a worker comes back as the same `UserError` (message and exit status); the
 * pool then stops handing out runs and rejects with the error of the earliest failed run, so the
 * message is the one the in-process path would give.
 */
import { availableParallelism } from "node:os";
import { existsSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { Worker } from "node:worker_threads";
import { UserError } from "../messages/error.js";
import { analyzeRun, type RunAnalysis, type RunPlan } from "./analyzeRun.js";

/**
 * Analyses plans and gives their results in plan order; `onDone` hears of each run as it ends (in
 * any order) and may release the analysis' large parts, which the returned array shares.
 */
export type AnalyzeRuns = (plans: RunPlan[], onDone?: (index: number, a: RunAnalysis) => void) => Promise<RunAnalysis[]>;

/** What a worker sends back for one job. */
export type WorkerReply =
  | { ok: true; analysis: RunAnalysis }
  | { ok: false; user: boolean; message: string; exitCode: 1 | 2; stack?: string };

const WORKER_FILE = new URL("./runWorker.js", import.meta.url);

/** Whether worker threads can be used: the built worker entry exists next to this module. */
export function workersAvailable(): boolean {
  return import.meta.url.endsWith(".js") && existsSync(fileURLToPath(WORKER_FILE));
}

/**
 * The number of workers to use: `requested` (the `--workers` flag), else `SOJOURN_WORKERS`, else
 * the machine's available cores; never more than the runs to analyse, never less than 1.
 */
export function workerCount(runs: number, requested?: number): number {
  let n = requested;
  if (n === undefined) {
    const env = process.env.SOJOURN_WORKERS;
    if (env !== undefined && /^\d+$/.test(env.trim())) n = Number(env);
  }
  if (n === undefined || !(n >= 1)) n = availableParallelism();
  return Math.max(1, Math.min(Math.floor(n), runs));
}

/** Analyses the plans one after another in this thread. */
export const inProcess: AnalyzeRuns = async (plans, onDone) => {
  const out: RunAnalysis[] = [];
  for (const [i, plan] of plans.entries()) {
    const a = await analyzeRun(plan);
    out.push(a);
    onDone?.(i, a);
  }
  return out;
};

/** The analysis function for up to `workers` threads (in process when 1 or when unavailable). */
export function runAnalyzer(workers: number): AnalyzeRuns {
  if (workers <= 1 || !workersAvailable()) return inProcess;
  return (plans, onDone) => (plans.length <= 1 ? inProcess(plans, onDone) : onWorkers(plans, Math.min(workers, plans.length), onDone));
}

async function onWorkers(plans: RunPlan[], workers: number, onDone?: (index: number, a: RunAnalysis) => void): Promise<RunAnalysis[]> {
  const results: RunAnalysis[] = new Array(plans.length);
  const failures: { index: number; error: Error }[] = [];
  let next = 0;
  const threads: Worker[] = [];
  /** The next plan to analyse, or -1 when there is none or a run failed. */
  const take = () => (failures.length > 0 || next >= plans.length ? -1 : next++);

  // Each worker thread holds up to two runs: the one it analyses and the next, so that it starts
  // the next run at once instead of waiting for this thread to answer its reply.
  const serve = (worker: Worker): Promise<void> =>
    new Promise((resolve, reject) => {
      const given: number[] = [];
      const give = () => {
        while (given.length < 2) {
          const i = take();
          if (i < 0) break;
          given.push(i);
          worker.postMessage(plans[i]);
        }
        if (given.length === 0) resolve();
      };
      worker.on("message", (reply: WorkerReply) => {
        const current = given.shift()!;
        if (reply.ok) {
          results[current] = reply.analysis;
          // A failure of the caller's handler (a table that cannot be written) fails this run.
          try {
            onDone?.(current, reply.analysis);
          } catch (e) {
            failures.push({ index: current, error: e instanceof Error ? e : new Error(String(e)) });
          }
        } else {
          const e = reply.user ? new UserError(reply.message, reply.exitCode) : new Error(reply.message);
          if (!reply.user && reply.stack !== undefined) e.stack = reply.stack;
          failures.push({ index: current, error: e });
        }
        give();
      });
      worker.on("error", reject);
      worker.on("exit", (code) => {
        const current = given[0];
        if (current !== undefined && results[current] === undefined && failures.every((f) => f.index !== current)) {
          reject(new Error(`a worker thread stopped (exit code ${code}) while analysing run ${plans[current].run.file}`));
        }
      });
      give();
    });

  // This thread is one of the workers: it takes runs from the same queue (without a reader thread
  // of its own for large files, so that no more threads are busy than asked for).
  const serveHere = async (): Promise<void> => {
    for (let i = take(); i >= 0; i = take()) {
      try {
        results[i] = await analyzeRun(plans[i], { readerThread: false });
        onDone?.(i, results[i]);
      } catch (e) {
        if (!(e instanceof Error)) throw e;
        failures.push({ index: i, error: e });
      }
    }
  };

  try {
    for (let w = 1; w < workers; w++) threads.push(new Worker(WORKER_FILE));
    await Promise.all([serveHere(), ...threads.map(serve)]);
  } finally {
    await Promise.all(threads.map((t) => t.terminate()));
  }
  if (failures.length > 0) {
    failures.sort((a, b) => a.index - b.index);
    throw failures[0].error;
  }
  return results;
}
