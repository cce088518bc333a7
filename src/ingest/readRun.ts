/**
 * Reads one run file (contract section 1) as a stream, in one pass:
 *
 *   file ──read 1 MiB──┬─► SHA-256 and byte count (bytes as stored)
 *                      └─► [gunzip] ─► ChunkFeeder ─► CsvParser | JsonLinesParser ─► SeriesTable ─► onRow
 *
 * A Parquet file (`.parquet`) is read by row group instead, by `readParquet` (`parquetReader.ts`).
 *
 * Another layout (contract section 9), or a measure with `where`, reads records instead (`rowStage`):
 *
 *   CSV | JSON Lines: ChunkFeeder ─► CsvRecords | JsonLinesRecords ─┐
 *   Parquet: readParquetRows ───────────────────────────────────────┴─► layout (layouts.ts) ─► RowRouter ─► onRow
 *
 * A plain file is read into two alternating buffers, the next read running ahead while a chunk is
 * parsed; the feeder copies each chunk into its working buffer.
 *
 * Memory stays bounded whatever the file's length: one chunk, the part of a row left over at its
 * end (at most the row limit, `maxRowBytes`), and one entry per distinct series. A large file read from the main thread is parsed on a
 * second thread while this one feeds the measures (`pipeline.ts`).
 */
import { createHash } from "node:crypto";
import { pipelineWanted, readRunPipelined } from "./pipeline.js";
import { createGunzip } from "node:zlib";
import { UserError } from "../messages/error.js";
import * as ingestMessages from "../messages/ingest.js";
import { CsvParser } from "./csvParser.js";
import { type ChunkParser, ChunkFeeder, DEFAULT_ROW_LIMIT } from "./feeder.js";
import { JsonLinesParser } from "./jsonLinesParser.js";
import { openRunFile } from "./openFile.js";
import { RUN_EXTENSIONS, type RunFormat, runFormat } from "./runFile.js";
import { SeriesTable } from "./seriesTable.js";
import { mark } from "../timing.js";
import type { ReadOptions, ReadReport } from "./readTypes.js";

export type { RowSink } from "./seriesTable.js";

export { refuseIfNotAFile } from "./openFile.js";

export type { ReadOptions, ReadReport, SeriesRequest } from "./readTypes.js";

const DEFAULT_CHUNK = 1 << 20;

// The Parquet reader (hyparquet, about 60 modules) and the record path of other layouts load only
// when a file needs them: the reader thread of a large CSV file starts that much sooner.
const parquetReader = () => import("./parquetReader.js");
const recordPath = () => Promise.all([import("./layouts.js"), import("./records.js"), import("./rowRouter.js")]);

/** An error of the file system while reading, kept apart from the parser's own errors. */
class SourceError extends Error {
  constructor(readonly source: unknown) {
    super("run file read failed");
  }
}

/**
 * Reads a run file and gives the rows of the requested series to `onRow` in file order.
 *
 * Checks, whatever the series requested: every time is a finite number and, within each series,
 * does not decrease; every non-empty value is a finite number. Throws `UserError` (message
 * catalogue `ingestMessages`) on any input error; errors thrown by `onRow` pass through as they are.
 *
 * @example
 * // bakery.csv: "time,series,value\n0,queue,2\n1.5,queue,3\n2,sold,\n"
 * await readRun({ path, display: "bakery.csv", columns, series: [{ name: "queue", entity: false }], onRow })
 * // onRow(0, 0, 2, undefined, 2), onRow(0, 1.5, 3, undefined, 3)
 * // -> { bytes: 48, rows: 3, seriesRows: { queue: 2, sold: 1 }, sha256: "..." }
 */
export async function readRun(opts: ReadOptions): Promise<ReadReport> {
  if (opts.chunkSize === undefined && opts.readerThread !== false && !readsRecords(opts) && pipelineWanted(opts.path)) return readRunPipelined(opts);
  return readRunHere(opts);
}

/**
 * Whether the file is read as records and turned into event rows by its layout (`layouts.ts`):
 * any layout but `events`, or `events` with a measure that filters rows by `where`. Else the
 * event table's own reader (`csvParser.ts`, `jsonLinesParser.ts`) does it all.
 */
export function readsRecords(opts: Pick<ReadOptions, "layout" | "series">): boolean {
  return (opts.layout !== undefined && opts.layout.layout !== "events") || opts.series.some((s) => s.where !== undefined && s.where !== null);
}

/** The parser of one read and what it found: the event table's reader, or records and a layout. */
interface RowStage {
  parser: ChunkParser;
  rows(): number;
  counts(): Record<string, number>;
  close(): void;
}

/**
 * Where a reader plugs in: a reader of another format gives records to `layoutSink(...)` (a
 * `RecordSink`, see `records.ts`) as `CsvRecords` and `JsonLinesRecords` do here.
 */
async function rowStage(opts: ReadOptions, format: "csv" | "jsonl", limit: number): Promise<RowStage> {
  const { display } = opts;
  if (!readsRecords(opts)) {
    const table = new SeriesTable(opts.series, opts.onRow, display);
    const parser = format === "csv" ? new CsvParser(table, display, opts.columns, limit) : new JsonLinesParser(table, display, opts.columns, limit);
    return { parser, rows: () => table.rows, counts: () => table.counts(), close: () => {} };
  }
  const [{ layoutSink }, { CsvRecords, JsonLinesRecords }, { RowRouter }] = await recordPath();
  const router = new RowRouter(opts.series, opts.onRow, display);
  const sink = layoutSink(opts.layout ?? { layout: "events", pairs: [] }, router, opts.columns, display);
  const parser = format === "csv" ? new CsvRecords(sink, display, limit) : new JsonLinesRecords(sink, display, limit);
  return { parser, rows: () => router.rows, counts: () => router.counts(), close: () => sink.close() };
}

/**
 * A Parquet file in a layout (or with `where`): the plain row source of `parquetReader.ts` gives
 * each row's cells to the layout, the same `RecordSink` the CSV and JSON Lines record readers feed.
 */
async function readParquetLayout(opts: ReadOptions): Promise<ReadReport> {
  const { display } = opts;
  const [[{ layoutSink }, , { RowRouter }], { readParquetRows }] = await Promise.all([recordPath(), parquetReader()]);
  const router = new RowRouter(opts.series, opts.onRow, display);
  const sink = layoutSink(opts.layout ?? { layout: "events", pairs: [] }, router, opts.columns, display);
  const wanted = sink.wanted;
  const cells: (string | number | null)[] = new Array<string | number | null>(wanted.length).fill(null);
  let at: number[] = [];
  try {
    const report = await readParquetRows({
      path: opts.path,
      display,
      storedBytes: opts.storedBytes,
      onHeader(header) {
        sink.header(header);
        at = wanted.map((name) => header.indexOf(name));
        return wanted.filter((name) => header.includes(name));
      },
      onRow(row, position) {
        for (let k = 0; k < at.length; k++) {
          const c = at[k] < 0 ? null : row[at[k]];
          cells[k] = c === "" ? null : c;
        }
        sink.record(cells, position);
      },
    });
    sink.finish();
    return { bytes: report.bytes, sha256: report.sha256, rows: router.rows, seriesRows: router.counts() };
  } finally {
    sink.close();
  }
}

/** `readRun` in this thread: read, parse and hand every row to `onRow`. */
export async function readRunHere(opts: ReadOptions): Promise<ReadReport> {
  const { display } = opts;
  mark(`reading ${display}`);
  const format = runFormat(opts.path);
  if (format === null) throw ingestMessages.unsupportedExtension(display, RUN_EXTENSIONS);
  if (format.format === "parquet") return readsRecords(opts) ? readParquetLayout(opts) : (await parquetReader()).readParquet(opts);
  const chunkSize = Math.max(1, Math.floor(opts.chunkSize ?? DEFAULT_CHUNK));

  const limit = opts.maxRowBytes ?? DEFAULT_ROW_LIMIT;
  const stage = await rowStage(opts, format.format, limit);
  try {
    return await readThrough(opts, format, chunkSize, limit, stage);
  } finally {
    stage.close();
  }
}

async function readThrough(opts: ReadOptions, format: RunFormat, chunkSize: number, limit: number, stage: RowStage): Promise<ReadReport> {
  const { display } = opts;
  const parser = stage.parser;
  const feeder = new ChunkFeeder(parser, chunkSize, limit);
  const hash = opts.storedBytes === undefined ? createHash("sha256") : null;
  const stored = opts.storedBytes ?? ((chunk: Buffer) => hash!.update(chunk));
  let bytes = 0;

  // Errors of the parser (input errors) and of `onRow` pass through; the rest are the file's.
  let failure: unknown = null;
  const parsed = (fill: () => void): void => {
    try {
      fill();
    } catch (e) {
      failure = e;
      throw e;
    }
  };
  try {
    const file = await openRunFile(opts.path, display);
    try {
      if (!format.gzip) {
        // Two read buffers: the next read runs on libuv's thread while this chunk is parsed.
        let here = Buffer.allocUnsafe(chunkSize);
        let there = Buffer.allocUnsafe(chunkSize);
        let next = file.read(here, 0, chunkSize, null);
        try {
          for (;;) {
            const { bytesRead: n } = await next;
            if (n === 0) break;
            const chunk = here.subarray(0, n);
            [here, there] = [there, here];
            next = file.read(here, 0, chunkSize, null);
            stored(chunk);
            bytes += n;
            parsed(() => feeder.push(chunk));
          }
        } finally {
          await next.catch(() => {}); // the read ahead, also when parsing stopped at an error
        }
      } else {
        const raw = file.createReadStream({ highWaterMark: chunkSize, autoClose: false });
        try {
          const gunzip = createGunzip({ chunkSize: Math.max(chunkSize, 64) });
          raw.on("data", (chunk: Buffer | string) => {
            stored(chunk as Buffer);
            bytes += chunk.length;
          });
          raw.on("error", (e) => gunzip.destroy(new SourceError(e)));
          raw.pipe(gunzip);
          for await (const chunk of gunzip) parsed(() => feeder.push(chunk as Buffer));
        } finally {
          raw.destroy();
          if (!raw.closed) await new Promise<void>((done) => raw.once("close", () => done()));
        }
      }
    } finally {
      await file.close();
    }
  } catch (e) {
    if (e === failure || e instanceof UserError) throw e;
    throw sourceProblem(e, display, format.format as "csv" | "jsonl", format.gzip, bytes);
  }
  if (bytes === 0) throw ingestMessages.emptyFile(display, format.format as "csv" | "jsonl");
  feeder.finish();
  mark(`read ${display}`);
  return { bytes, sha256: hash === null ? "" : hash.digest("hex"), rows: stage.rows(), seriesRows: stage.counts() };
}

/** The user's message for an error of the file system or of gunzip. */
function sourceProblem(e: unknown, display: string, kind: "csv" | "jsonl", gzip: boolean, bytes: number): unknown {
  const cause = e instanceof SourceError ? e.source : e;
  const code = (cause as { code?: unknown } | null)?.code;
  const syscall = (cause as { syscall?: unknown } | null)?.syscall;
  if (typeof syscall === "string" || e instanceof SourceError) {
    return ingestMessages.unreadableFile(display, typeof code === "string" ? code : undefined);
  }
  if (gzip && typeof code === "string" && code.startsWith("Z_")) {
    if (bytes === 0) return ingestMessages.emptyFile(display, kind);
    return ingestMessages.corruptGzip(display, (cause as Error).message);
  }
  return e;
}
