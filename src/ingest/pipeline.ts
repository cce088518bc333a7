/**
 * Reading one large run file on two threads:
 *
 *   worker thread: read ─┬─► [gunzip] ─► parse ─► checks ─► batches of rows (typed arrays) ─┐
 *                        └─► copy of the bytes as stored ──────────────────────────────────┐  │
 *   main thread:                              SHA-256 ◄── each chunk, in order ◄──────────┘  │
 *                                             onRow ◄──── each batch, in order ◄─────────────┘
 *
 * The worker does everything `readRunHere` does (row counts, every input check) and sends the
 * rows of requested series in batches, and a copy of each chunk of the file's bytes, which the main
 * thread hashes (SHA-256) while it waits for rows; the main thread feeds the rows to the measures
 * while the worker parses on. At most MAX_IN_FLIGHT messages wait at a time (the worker sleeps on a
 * shared counter), so memory stays bounded whatever the file's length; their buffers go back to the
 * worker to be filled again. Rows reach `onRow` in file
 * order and an input error arrives after the rows before it, exactly as when reading in one thread.
 */
import { createHash } from "node:crypto";
import { existsSync, statSync } from "node:fs";
import { availableParallelism } from "node:os";
import { fileURLToPath } from "node:url";
import { Worker, isMainThread } from "node:worker_threads";
import { UserError } from "../messages/error.js";
import type { ReadOptions, ReadReport } from "./readTypes.js";
import { performance } from "node:perf_hooks";
import { mark, timing } from "../timing.js";

/**
 * Files at least this large are parsed on a second thread; `SOJOURN_PARALLEL_BYTES` overrides it
 * (the tests use it to exercise the worker on small files).
 */
export const PARALLEL_BYTES = Number(process.env.SOJOURN_PARALLEL_BYTES) || 32 * 1024 * 1024;

export const BATCH_ROWS = 1 << 16;
/** Messages (row batches and chunks of bytes to hash) the reader may have sent and not seen read. */
export const MAX_IN_FLIGHT = 16;

const WORKER_FILE = new URL("./readWorker.js", import.meta.url);

/** One batch of rows as the worker sends it. */
export interface RowBatch {
  type: "rows";
  n: number;
  series: Int32Array;
  time: Float64Array;
  value: Float64Array;
  line: Float64Array;
  entities: (string | undefined)[] | null;
}

/** Buffers the main thread sends back to the reader once read, so that they are filled again. */
export interface SpareBuffers {
  rows?: Pick<RowBatch, "series" | "time" | "value" | "line">;
  bytes?: Uint8Array;
}

export type WorkerMessage =
  | RowBatch
  | { type: "bytes"; data: Uint8Array }
  | { type: "done"; report: ReadReport }
  | { type: "error"; user: boolean; message: string; exitCode: 1 | 2; stack?: string };

/**
 * Whether this file is worth a second thread: large, read from the main thread, worker built, and
 * a second core to run it on.
 */
export function pipelineWanted(path: string): boolean {
  if (!isMainThread || availableParallelism() < 2 || !import.meta.url.endsWith(".js") || !existsSync(fileURLToPath(WORKER_FILE))) return false;
  try {
    // Parquet holds a row in about a third of the bytes CSV takes (bench/run.js): a quarter of the size.
    const size = statSync(path).size;
    return path.toLowerCase().endsWith(".parquet") ? size * 4 >= PARALLEL_BYTES : size >= PARALLEL_BYTES;
  } catch {
    return false; // the reader reports the problem with the file
  }
}

export function readRunPipelined(opts: ReadOptions): Promise<ReadReport> {
  const control = new SharedArrayBuffer(4);
  const inFlight = new Int32Array(control);
  const { path, display, columns, series, maxRowBytes } = opts;
  mark(`reader thread for ${display}`);
  const busyBefore = timing ? performance.eventLoopUtilization() : null;
  const worker = new Worker(WORKER_FILE, { workerData: { opts: { path, display, columns, series, maxRowBytes }, control } });
  const hash = createHash("sha256");
  const giveBack = (spare: SpareBuffers, buffers: ArrayBufferLike[]) => worker.postMessage(spare, buffers as ArrayBuffer[]);
  return new Promise<ReadReport>((resolve, reject) => {
    let settled = false;
    const finish = (error: unknown, report?: ReadReport) => {
      if (settled) return;
      settled = true;
      void worker.terminate();
      if (error !== null) reject(error);
      else resolve(report!);
    };
    worker.on("message", (m: WorkerMessage) => {
      if (settled) return;
      if (m.type === "rows") {
        const { onRow } = opts;
        const { series: s, time, value, line, entities } = m;
        try {
          if (entities === null) for (let k = 0; k < m.n; k++) onRow(s[k], time[k], value[k], undefined, line[k]);
          else for (let k = 0; k < m.n; k++) onRow(s[k], time[k], value[k], entities[k], line[k]);
        } catch (e) {
          finish(e);
          return;
        }
        Atomics.sub(inFlight, 0, 1);
        Atomics.notify(inFlight, 0);
        giveBack({ rows: { series: s, time, value, line } }, [s.buffer, time.buffer, value.buffer, line.buffer]);
      } else if (m.type === "bytes") {
        hash.update(m.data);
        Atomics.sub(inFlight, 0, 1);
        Atomics.notify(inFlight, 0);
        giveBack({ bytes: new Uint8Array(m.data.buffer) }, [m.data.buffer]);
      } else if (m.type === "done") {
        const report = { ...m.report, sha256: hash.digest("hex") };
        // How busy this thread was while the reader parsed: near 100 % says the measures wait on nothing.
        if (busyBefore !== null) mark(`rows of ${display} taken, this thread busy ${(100 * performance.eventLoopUtilization(busyBefore).utilization).toFixed(0)} %`);
        finish(null, report);
      } else {
        const e = m.user ? new UserError(m.message, m.exitCode) : new Error(m.message);
        if (!m.user && m.stack !== undefined) e.stack = m.stack;
        finish(e);
      }
    });
    worker.on("error", (e) => finish(e));
    worker.on("exit", (code) => finish(new Error(`the run file reader thread stopped (exit code ${code}) while reading ${display}`)));
  });
}
