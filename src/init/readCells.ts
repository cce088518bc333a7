/**
 * A bounded read of every column of a run file, whatever its layout, for `sojourn init`:
 *
 *   CSV:        header ──► CsvRecords (records.ts) asking for every column ─┐
 *   JSON Lines: JsonLinesReader (jsonLinesParser.ts), every key of each object ┼─► onRow(cells, line), at most `limit` rows
 *   Parquet:    readParquetRows (parquetReader.ts), every column ─────────────┘
 *
 * The file readers are the ones `sojourn report` uses, so a file they refuse gets their message
 * (a `UserError`); init only stops them early. Cells come as the record readers give them: a CSV
 * cell's trimmed text, a JSON string, number or boolean, a Parquet number or text, or null when
 * empty. For JSON Lines the columns are the keys in order of first appearance: a key first seen on
 * a later row gets the next column.
 */
import { createReadStream } from "node:fs";
import { createGunzip } from "node:zlib";
import { ChunkFeeder, DEFAULT_ROW_LIMIT } from "../ingest/feeder.js";
import { JsonLinesReader } from "../ingest/jsonLinesParser.js";
import { readParquetRows } from "../ingest/parquetReader.js";
import { refuseIfNotAFile } from "../ingest/openFile.js";
import { type Cell, CsvRecords, type RecordSink } from "../ingest/records.js";
import * as ingestMessages from "../messages/ingest.js";
import { UserError } from "../messages/error.js";
import { RUN_EXTENSIONS, runFormat } from "../ingest/runFile.js";

export type { Cell } from "../ingest/records.js";

export interface CellsRead {
  /** Column names: the header (CSV, Parquet) or the keys seen (JSON Lines). */
  header: string[];
  /** Data rows read. */
  rows: number;
  /** True when the file has more rows than were read. */
  cut: boolean;
}

/** Thrown by the row callback to stop a reader early. */
class Enough extends Error {}

const CHUNK = 1 << 16;

/**
 * Reads at most `limit` data rows of a run file and hands each row's cells to `onRow`, one cell
 * per column of `header` (JSON Lines: of the keys seen so far; the array may grow). `onHeader` is
 * called once, before any row, with the names known then. The cells array is reused.
 */
export async function readCells(
  path: string,
  display: string,
  limit: number,
  onRow: (cells: readonly Cell[], line: number) => void,
  onHeader: (names: readonly string[]) => void = () => {},
): Promise<CellsRead> {
  await refuseIfNotAFile(path, display);
  const format = runFormat(path);
  if (format === null) throw ingestMessages.unsupportedExtension(display, RUN_EXTENSIONS);
  let rows = 0;
  const counted = (cells: readonly Cell[], line: number) => {
    if (rows >= limit) throw new Enough();
    rows++;
    onRow(cells, line);
  };
  if (format.format === "parquet") {
    let header: string[] = [];
    try {
      await readParquetRows({
        path,
        display,
        onHeader: (names) => {
          header = [...names];
          onHeader(header);
          return undefined;
        },
        onRow: (cells, row) => counted(cells.map((c) => (c === "" ? null : c)), row),
      });
      return { header, rows, cut: false };
    } catch (e) {
      if (e instanceof Enough) return { header, rows, cut: true };
      throw e;
    }
  }
  if (format.format === "csv") {
    const header = await csvHeader(path, display, format.gzip);
    onHeader(header);
    const sink: RecordSink = { wanted: header, header: () => {}, record: counted, finish: () => {} };
    const cut = await feed(path, display, format.gzip, new CsvRecords(sink, display));
    return { header, rows, cut };
  }
  const reader = new KeyedLines(display, counted, onHeader);
  const cut = await feed(path, display, format.gzip, reader);
  return { header: reader.keys, rows, cut };
}

/** The header row of a CSV file (the reader's message when there is none). */
async function csvHeader(path: string, display: string, gzip: boolean): Promise<string[]> {
  let names: string[] | null = null;
  const sink: RecordSink = {
    wanted: [],
    header: (found) => {
      names = [...(found ?? [])];
      throw new Enough();
    },
    record: () => {},
    finish: () => {},
  };
  await feed(path, display, gzip, new CsvRecords(sink, display));
  if (names === null) throw ingestMessages.emptyFile(display, "csv");
  return names;
}

/** Streams the file's text through `parser` until it ends or a callback says `Enough`. Returns whether it stopped early. */
async function feed(path: string, display: string, gzip: boolean, parser: CsvRecords | KeyedLines): Promise<boolean> {
  const feeder = new ChunkFeeder(parser, CHUNK, DEFAULT_ROW_LIMIT);
  const raw = createReadStream(path, { highWaterMark: CHUNK });
  const stream = gzip ? raw.pipe(createGunzip()) : raw;
  let bytes = 0;
  try {
    for await (const chunk of stream) {
      bytes += (chunk as Buffer).length;
      feeder.push(chunk as Buffer);
    }
    if (bytes === 0) throw ingestMessages.emptyFile(display, parser instanceof CsvRecords ? "csv" : "jsonl");
    feeder.finish();
    return false;
  } catch (e) {
    if (e instanceof Enough) return true;
    if (e instanceof UserError) throw e;
    const code = (e as { code?: unknown } | null)?.code;
    if (gzip && typeof code === "string" && code.startsWith("Z_")) throw ingestMessages.corruptGzip(display, (e as Error).message);
    throw ingestMessages.unreadableFile(display, typeof code === "string" ? code : undefined);
  } finally {
    raw.destroy();
    stream.destroy();
  }
}

/** JSON Lines objects as cells of every key seen, in order of first appearance. */
class KeyedLines extends JsonLinesReader {
  readonly keys: string[] = [];
  private readonly at = new Map<string, number>();
  private cells: Cell[] = [];

  constructor(
    display: string,
    private readonly onRow: (cells: readonly Cell[], line: number) => void,
    private readonly onHeader: (names: readonly string[]) => void,
  ) {
    super(display);
  }

  protected object(row: Record<string, unknown>, line: number): void {
    for (const key of Object.keys(row)) {
      if (this.at.has(key)) continue;
      this.at.set(key, this.keys.length);
      this.keys.push(key);
    }
    if (!this.sawObject) this.onHeader(this.keys);
    if (this.cells.length !== this.keys.length) this.cells = new Array<Cell>(this.keys.length);
    this.cells.fill(null);
    for (const [key, v] of Object.entries(row)) {
      if (typeof v === "string" || typeof v === "number" || typeof v === "boolean") this.cells[this.at.get(key)!] = v === "" ? null : v;
      // null stays empty; a nested value is no cell init can read (the reader proper says so if a layout reads it)
    }
    this.onRow(this.cells, line);
  }
}
