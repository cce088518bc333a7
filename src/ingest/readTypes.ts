/**
 * What a run-file read is asked and what it reports: the contract shared by the reader
 * (`readRun.ts`) and its second-thread pipeline (`pipeline.ts`, `readWorker.ts`), kept apart so
 * that neither imports the other for its types.
 */
import type { ColumnMap, Layout, WhereFilter } from "../manifest/types.js";
import type { RowSink } from "./seriesTable.js";

/**
 * A series the caller wants rows of. `entity`: decode the entity cell for this series. `where`:
 * only rows whose attribute columns match (`where.ts`); absent or null: every row.
 */
export interface SeriesRequest {
  name: string;
  entity: boolean;
  where?: WhereFilter | null;
}

/** How the file's rows become event rows (contract section 9); absent: `events`. */
export interface LayoutOptions {
  layout: Layout;
  /**
   * Event column pairs (first, second) whose times on one row must not go backwards (`entities`):
   * the `from` of the measures, {start, end} and {enter, leave}.
   */
  pairs: readonly (readonly [string, string])[];
  /** Events the `entities` sort holds in memory at once (default `SORT_EVENTS`, or `SOJOURN_SORT_EVENTS`). */
  sortEvents?: number;
}

export interface ReadReport {
  /** Size of the file on disk (the compressed size for `.gz`). */
  bytes: number;
  /** Hex SHA-256 of the file's bytes as stored on disk. */
  sha256: string;
  /** Data rows read, all series. */
  rows: number;
  /**
   * Rows per series name for every series seen, inserted in order of first appearance. (A
   * JavaScript object lists integer-like keys such as `"7"` first, in ascending order.)
   */
  seriesRows: Record<string, number>;
}

export interface ReadOptions {
  /** Absolute path to open. */
  path: string;
  /** Path shown in messages (relative to the manifest). */
  display: string;
  /** Names of the time, series, value and entity columns (or JSON keys). */
  columns: ColumnMap;
  series: SeriesRequest[];
  /** Called in file order for each row of a requested series; `seriesIndex` indexes `series`. */
  onRow: RowSink;
  /** Read buffer size in bytes (default 1 MiB). */
  chunkSize?: number;
  /**
   * The longest row in bytes, its line break not counted (default `DEFAULT_ROW_LIMIT`, 1 MiB): a
   * longer row is an input error, found once that many bytes of it are held (`ChunkFeeder`).
   */
  maxRowBytes?: number;
  /**
   * Where the file's bytes as stored go, in order, for the SHA-256 to be computed elsewhere (the
   * reader thread hands them to the main thread, which has time to spare); the report's `sha256`
   * is then empty. Default: hashed here.
   */
  storedBytes?: (chunk: Buffer) => void;
  /** The file's layout; absent: `events`. */
  layout?: LayoutOptions;
  /** Whether a large file may be parsed on a second thread (default true; see `pipeline.ts`). */
  readerThread?: boolean;
}
