/** Worker thread of `pipeline.ts`: reads and checks one run file and sends its rows in batches. */
import { parentPort, workerData } from "node:worker_threads";
import { UserError } from "../messages/error.js";
import { mark } from "../timing.js";
import { BATCH_ROWS, MAX_IN_FLIGHT, type RowBatch, type SpareBuffers, type WorkerMessage } from "./pipeline.js";
import { type ReadOptions, readRunHere } from "./readRun.js";

mark("reader thread running");
const port = parentPort!;
const { opts, control } = workerData as { opts: Omit<ReadOptions, "onRow">; control: SharedArrayBuffer };
const inFlight = new Int32Array(control);
const wantsEntity = opts.series.some((s) => s.entity);

/** Buffers the main thread has finished with and sent back, to be filled again. */
const spareBatches: SpareBuffers["rows"][] = [];
const spareBytes: Uint8Array[] = [];
port.on("message", (m: SpareBuffers) => {
  if (m.rows !== undefined) spareBatches.push(m.rows);
  if (m.bytes !== undefined) spareBytes.push(m.bytes);
});

function fresh(): RowBatch {
  const spare = spareBatches.pop();
  return {
    type: "rows",
    n: 0,
    series: spare?.series ?? new Int32Array(BATCH_ROWS),
    time: spare?.time ?? new Float64Array(BATCH_ROWS),
    value: spare?.value ?? new Float64Array(BATCH_ROWS),
    line: spare?.line ?? new Float64Array(BATCH_ROWS),
    entities: wantsEntity ? new Array<string | undefined>(BATCH_ROWS) : null,
  };
}

let batch = fresh();

/** Waits until fewer than MAX_IN_FLIGHT messages are unread by the main thread, then counts one more. */
function reserve(): void {
  let waiting: number;
  while ((waiting = Atomics.load(inFlight, 0)) >= MAX_IN_FLIGHT) Atomics.wait(inFlight, 0, waiting);
  Atomics.add(inFlight, 0, 1);
}

function flush(): void {
  if (batch.n === 0) return;
  reserve();
  if (batch.entities !== null) batch.entities.length = batch.n;
  port.postMessage(batch, [batch.series.buffer, batch.time.buffer, batch.value.buffer, batch.line.buffer] as ArrayBuffer[]);
  batch = fresh();
}

const send = (m: WorkerMessage) => port.postMessage(m);

try {
  const report = await readRunHere({
    ...opts,
    // The main thread hashes a copy of each chunk: it waits for rows anyway.
    storedBytes(chunk) {
      reserve();
      let copy = spareBytes.pop();
      if (copy === undefined || copy.length < chunk.length) copy = new Uint8Array(Math.max(chunk.length, 1 << 20));
      copy.set(chunk);
      port.postMessage({ type: "bytes", data: copy.subarray(0, chunk.length) }, [copy.buffer as ArrayBuffer]);
    },
    onRow(seriesIndex, time, value, entity, line) {
      const b = batch;
      const k = b.n++;
      b.series[k] = seriesIndex;
      b.time[k] = time;
      b.value[k] = value;
      b.line[k] = line;
      if (b.entities !== null) b.entities[k] = entity;
      if (b.n === BATCH_ROWS) flush();
    },
  });
  flush();
  send({ type: "done", report });
} catch (e) {
  flush();
  send(
    e instanceof UserError
      ? { type: "error", user: true, message: e.message, exitCode: e.exitCode }
      : { type: "error", user: false, message: (e as Error)?.message ?? String(e), exitCode: 1, stack: (e as Error)?.stack },
  );
}
