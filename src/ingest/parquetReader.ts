/**
 * Parquet run files (contract section 9) read one row group at a time, in two shapes:
 *
 *   ParquetRunFile ──row group g──┬─► readParquet:     time, series, value, entity ─► SeriesTable ─► onRow
 *                                 └─► readParquetRows: every (wanted) cell of each row ─► onRow(cells, row)
 *
 * `readParquet` is the events layout (section 1), giving the same rows, checks and `ReadReport` as
 * the CSV reader: times and values are numbers (double, float, integer or decimal columns), series
 * and entities are texts (an integer id becomes its decimal text), a null cell is an empty cell. A
 * row's `line` is its 1-based position in the file (section 11).
 *
 * `readParquetRows` is the plain row source a layout step reads (entities, levels): the column
 * names in file order, then per row its cells as `number | string | null`.
 */
import { UserError } from "../messages/error.js";
import * as ingestMessages from "../messages/ingest.js";
import { type ParquetColumn, type ParquetProbe, ParquetRunFile, newProbe } from "./parquetFile.js";
import type { ReadOptions, ReadReport } from "./readTypes.js";
import { type SeriesEntry, SeriesTable } from "./seriesTable.js";
import { mark } from "../timing.js";

/** One cell of the plain row source. */
export type Cell = number | string | null;

const NUMBERS = "numbers (a double, float, integer or decimal column)";
const TEXTS = "texts or integers (a string or integer column)";

/** A sentinel no cell equals, for the series cache. */
const NOTHING: unknown = Symbol("nothing");

/**
 * Reads a Parquet run file in the events layout and gives the rows of the requested series to
 * `onRow` in row order, with the same checks as `readRun` (times finite and not decreasing
 * within a series, values finite or null). `probe` counts what was held at once (tests).
 *
 * @example
 * // bakery.parquet: columns time DOUBLE, series STRING, value DOUBLE; rows (0, queue, 2), (1.5, queue, 3), (2, sold, null)
 * await readParquet({ path, display: "bakery.parquet", columns, series: [{ name: "queue", entity: false }], onRow })
 * // onRow(0, 0, 2, undefined, 1), onRow(0, 1.5, 3, undefined, 2)
 * // -> { bytes: <file size>, rows: 3, seriesRows: { queue: 2, sold: 1 }, sha256: "..." }
 */
export async function readParquet(opts: ReadOptions, probe: ParquetProbe = newProbe()): Promise<ReadReport> {
  const { display, columns } = opts;
  mark(`reading ${display}`);
  const file = await ParquetRunFile.open(opts.path, display, probe).catch((e: unknown) => {
    throw fileProblem(e, display);
  });
  const names = file.columns.map((c) => c.name);
  const timeCol = file.indexOf(columns.time);
  const seriesCol = file.indexOf(columns.series);
  const missing: { role: string; name: string }[] = [];
  if (timeCol < 0) missing.push({ role: "time", name: columns.time });
  if (seriesCol < 0) missing.push({ role: "series", name: columns.series });
  const decreased = (line: number, series: string, previous: number, time: number, previousLine: number) =>
    ingestMessages.parquetTimeDecreased(display, line, columns.time, series, previous, time, previousLine);
  const table = new SeriesTable(opts.series, opts.onRow, display, decreased);
  try {
    if (missing.length > 0) throw ingestMessages.parquetMissingColumns(display, missing, names);
    const valueCol = file.indexOf(columns.value);
    const entityCol = table.wantsEntity ? file.indexOf(columns.entity) : -1;
    if (table.wantsEntity && entityCol < 0) throw ingestMessages.parquetMissingEntity(display, columns.entity, names, table.entitySeries);
    const roles = [timeCol, seriesCol, valueCol, entityCol].filter((i) => i >= 0).map((i) => names[i]);
    refuseNested(file.columns, roles, display);
    const cells = new RoleCells(display, file.columns[timeCol], file.columns[seriesCol], file.columns[valueCol], file.columns[entityCol]);
    const digesting = file.digest(opts.storedBytes);
    digesting.catch(() => {}); // awaited below; a failure of the rows comes first
    for (let g = 0; g < file.groups.length; g++) {
      const data = await file.readGroup(g, roles);
      const at = (i: number) => (i < 0 ? null : data[roles.indexOf(names[i])]);
      const time = at(timeCol)!;
      const series = at(seriesCol)!;
      const value = at(valueCol);
      const entity = at(entityCol);
      const first = file.groups[g].start + 1;
      let lastCell: unknown = NOTHING;
      let entry: SeriesEntry | null = null;
      for (let k = 0, n = file.groups[g].rows; k < n; k++) {
        const row = first + k;
        let t = time[k];
        if (typeof t !== "number") t = cells.number(t, row, "time");
        if (t - t !== 0) throw ingestMessages.parquetNotFinite(display, row, columns.time, "time", t);
        const s = series[k];
        if (s !== lastCell) {
          lastCell = s;
          entry = cells.series(s, table, row);
        }
        if (entry === null) throw ingestMessages.parquetEmptySeries(display, row, columns.series);
        let v: number = NaN;
        if (value !== null) {
          const x = value[k];
          if (typeof x === "number") {
            if (x - x !== 0) throw ingestMessages.parquetNotFinite(display, row, columns.value, "value", x);
            v = x;
          } else if (x !== null && x !== undefined) v = cells.number(x, row, "value");
        }
        const e = entity !== null && entry.entity ? cells.entity(entity[k], row) : undefined;
        table.accept(entry, t, v, e, row);
      }
    }
    const sha256 = await digesting;
    mark(`read ${display}`);
    return { bytes: file.bytes, sha256, rows: table.rows, seriesRows: table.counts() };
  } catch (e) {
    throw fileProblem(e, display);
  } finally {
    await file.close();
  }
}

/** What `readParquetRows` is asked. */
export interface ParquetRowsOptions {
  /** Absolute path to open. */
  path: string;
  /** Path shown in messages (relative to the manifest). */
  display: string;
  /**
   * Called once, before any row, with the file's top-level column names in file order; returns
   * the names whose cells are wanted (the others stay null), or undefined for all.
   */
  onHeader?: (names: readonly string[]) => readonly string[] | undefined;
  /**
   * Called for each row in file order with its cells (in the order of the names given to
   * `onHeader`) and its 1-based position. The array is reused for the next row: copy what you keep.
   */
  onRow: (cells: readonly Cell[], row: number) => void;
  /** Where the file's bytes as stored go, in order (see `ReadOptions.storedBytes`); `sha256` is then empty. */
  storedBytes?: (chunk: Buffer) => void;
}

/** What `readParquetRows` reports: as `ReadReport`, without the series counts (a layout step makes its own). */
export interface ParquetRowsReport {
  bytes: number;
  sha256: string;
  rows: number;
  /** The file's column names in file order (as given to `onHeader`). */
  header: string[];
}

/**
 * The plain row source of a Parquet run file: every row's cells, one row group at a time. A cell
 * is a number (double, float, integer and decimal columns; an integer beyond 2^53 in magnitude is
 * given as its exact decimal text), a string (text columns; a boolean as `true`/`false`, a date or
 * time as its ISO 8601 text), or null. Numbers come as stored, NaN and infinities included: the
 * consumer checks them as it checks a number parsed from a CSV cell. A wanted column of any other
 * type (bytes, nested groups) is an input error naming the row and the column.
 */
export async function readParquetRows(opts: ParquetRowsOptions, probe: ParquetProbe = newProbe()): Promise<ParquetRowsReport> {
  const { display } = opts;
  const file = await ParquetRunFile.open(opts.path, display, probe).catch((e: unknown) => {
    throw fileProblem(e, display);
  });
  try {
    const header = file.columns.map((c) => c.name);
    const asked = opts.onHeader?.(header);
    const wanted = header.map((name) => asked === undefined || asked.includes(name));
    const read = header.filter((_, i) => wanted[i]);
    if (asked !== undefined) refuseNested(file.columns, read, display);
    const digesting = file.digest(opts.storedBytes);
    digesting.catch(() => {});
    const cells: Cell[] = new Array<Cell>(header.length).fill(null);
    for (let g = 0; g < file.groups.length; g++) {
      const data = await file.readGroup(g, read);
      const byColumn = header.map((_, i) => (wanted[i] ? data[read.indexOf(header[i])] : null));
      const first = file.groups[g].start + 1;
      for (let k = 0, n = file.groups[g].rows; k < n; k++) {
        for (let i = 0; i < header.length; i++) {
          const column = byColumn[i];
          if (column !== null) cells[i] = plainCell(column[k], display, first + k, file.columns[i]);
        }
        opts.onRow(cells, first + k);
      }
    }
    return { bytes: file.bytes, sha256: await digesting, rows: file.rows, header };
  } catch (e) {
    throw fileProblem(e, display);
  } finally {
    await file.close();
  }
}

/**
 * Refuses, before any row is read, a column of `names` that is nested (a list, a struct, a map, a
 * repeated field): its cells are not one value per row. Nested columns no one reads are left alone.
 */
function refuseNested(columns: readonly ParquetColumn[], names: readonly string[], display: string): void {
  const c = columns.find((col) => col.nested && names.includes(col.name));
  if (c !== undefined) throw ingestMessages.parquetNestedColumn(display, c.name, c.type);
}

/** One decoded cell as the plain row source gives it. */
function plainCell(x: unknown, display: string, row: number, column: ParquetColumn): Cell {
  if (typeof x === "number" || typeof x === "string") return x;
  if (x === null || x === undefined) return null;
  if (typeof x === "bigint") return x >= -MAX_SAFE && x <= MAX_SAFE ? Number(x) : x.toString();
  if (typeof x === "boolean") return x ? "true" : "false";
  if (x instanceof Date) return x.toISOString();
  throw ingestMessages.parquetUnusableType(display, row, column.name, "", column.type, `${NUMBERS} or ${TEXTS}`);
}

const MAX_SAFE = BigInt(Number.MAX_SAFE_INTEGER);

/** The slow paths of the role cells: everything that is not a plain number where one is read. */
class RoleCells {
  constructor(
    private readonly display: string,
    private readonly time: ParquetColumn,
    private readonly seriesColumn: ParquetColumn,
    private readonly value: ParquetColumn | undefined,
    private readonly entityColumn: ParquetColumn | undefined,
  ) {}

  /** A time or value cell that is not a JavaScript number (null: NaN for a value, an error for a time). */
  number(x: unknown, row: number, role: "time" | "value"): number {
    const column = role === "time" ? this.time : this.value!;
    if (typeof x === "bigint") return Number(x);
    if (x === null || x === undefined) {
      if (role === "time") throw ingestMessages.parquetNullTime(this.display, row, column.name);
      return NaN;
    }
    if (typeof x === "number") {
      if (x - x !== 0) throw ingestMessages.parquetNotFinite(this.display, row, column.name, role, x);
      return x;
    }
    if (typeof x === "string") throw ingestMessages.parquetTextNotNumber(this.display, row, column.name, role, x);
    throw ingestMessages.parquetUnusableType(this.display, row, column.name, role, column.type, NUMBERS);
  }

  /** The series of a series cell, or null when it is null or empty. */
  series(x: unknown, table: SeriesTable, row: number): SeriesEntry | null {
    if (typeof x === "string") return table.lookupName(x);
    if (x === null || x === undefined) return null;
    if (typeof x === "number" || typeof x === "bigint") return table.lookupName(String(x));
    throw ingestMessages.parquetUnusableType(this.display, row, this.seriesColumn.name, "series", this.seriesColumn.type, TEXTS);
  }

  /** The entity of an entity cell (undefined when null or empty). */
  entity(x: unknown, row: number): string | undefined {
    if (typeof x === "string") return x === "" ? undefined : x;
    if (x === null || x === undefined) return undefined;
    if (typeof x === "number" || typeof x === "bigint") return String(x);
    const c = this.entityColumn!;
    throw ingestMessages.parquetUnusableType(this.display, row, c.name, "entity", c.type, TEXTS);
  }
}

/** The user's message for an error of the file system; input errors and errors of `onRow` pass as they are. */
function fileProblem(e: unknown, display: string): unknown {
  if (e instanceof UserError) return e;
  const { code, syscall } = (e ?? {}) as { code?: unknown; syscall?: unknown };
  if (typeof syscall === "string") return ingestMessages.unreadableFile(display, typeof code === "string" ? code : undefined);
  return e;
}
