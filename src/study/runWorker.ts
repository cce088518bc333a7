/**
 * Entry of a worker thread of the run pool (`pool.ts`): analyses one `RunPlan` per message and
 * replies with its `RunAnalysis`. Observation arrays are copied to their exact length and their
 * buffers transferred, not cloned.
 */
import { parentPort } from "node:worker_threads";
import { UserError } from "../messages/error.js";
import { analyzeRun, type RunPlan } from "./analyzeRun.js";
import type { WorkerReply } from "./pool.js";

const port = parentPort;
if (port === null) throw new Error("runWorker.js runs only as a worker thread");

// Runs arrive up to two at a time (pool.ts); they are analysed one after another, in order.
const queue: RunPlan[] = [];
let busy = false;

port.on("message", (plan: RunPlan) => {
  queue.push(plan);
  if (!busy) void next();
});

async function next(): Promise<void> {
  busy = true;
  for (let plan = queue.shift(); plan !== undefined; plan = queue.shift()) port!.postMessage(...(await analyse(plan)));
  busy = false;
}

async function analyse(plan: RunPlan): Promise<[WorkerReply, ArrayBuffer[]]> {
  try {
    const analysis = await analyzeRun(plan);
    const transfer: ArrayBuffer[] = [];
    for (const out of analysis.outputs.values()) {
      if (out.observations !== undefined) {
        out.observations = out.observations.slice();
        transfer.push(out.observations.buffer as ArrayBuffer);
      }
      if (out.observationTimes !== undefined) {
        out.observationTimes = out.observationTimes.slice();
        transfer.push(out.observationTimes.buffer as ArrayBuffer);
      }
    }
    return [{ ok: true, analysis }, transfer];
  } catch (e) {
    const reply: WorkerReply =
      e instanceof UserError
        ? { ok: false, user: true, message: e.message, exitCode: e.exitCode }
        : { ok: false, user: false, message: (e as Error)?.message ?? String(e), exitCode: 1, stack: (e as Error)?.stack };
    return [reply, []];
  }
}
