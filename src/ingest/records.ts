/**
 * Run files read as plain records: the cells of the columns a layout asks for, by name, with
 * the line each record starts on. This is where a file reader meets the layouts
 * (`layouts.ts`):
 *
 *   bytes ─► ChunkFeeder ─► CsvRecords | JsonLinesRecords ─┐
 *   Parquet: readParquetRows (readRun.ts, readParquetLayout) ┴─► RecordSink: header(found) once,
 *                                                               record(cells, line) per row, finish()
 *
 * A reader hands over, for each row, one cell per name of `sink.wanted` (in that order): the
 * cell's text (CSV, trimmed of surrounding spaces), a JSON string, number or boolean as it is,
 * or null when the cell is empty or the column absent. A CSV cell of a column the sink marks
 * `numeric` (a time or a level), unquoted and a plain decimal, comes as its number instead, read
 * from the bytes by the event reader's `scanDecimal` (no string made). It calls `header` first with the names
 * the file has (when the format has a header), then `record` in file order, then `finish`.
 * The event layout of contract section 1 keeps its own faster reader (`csvParser.ts`) when no
 * measure filters rows with `where`; everything else goes through here.
 */
import * as ingestMessages from "../messages/ingest.js";
import type { UserError } from "../messages/error.js";
import { type ChunkParser, DEFAULT_ROW_LIMIT, ROW_LIMIT_MAX } from "./feeder.js";
import { scanDecimal, scanned } from "./decimal.js";
import { describe, JsonLinesReader } from "./jsonLinesParser.js";

/** One cell as a reader gives it: null when empty or absent. */
export type Cell = string | number | boolean | null;

/** What a layout takes from a reader (see the module comment). */
export interface RecordSink {
  /** The column names the layout reads, in the order `record`'s cells come in. */
  readonly wanted: readonly string[];
  /**
   * For each name of `wanted`, whether the layout reads its cells only as numbers: a reader may
   * then give such a cell as the number it reads (the same double `parseDecimalText` gives its
   * text) instead of its text. A cell that is not a plain decimal still comes as text.
   */
  readonly numeric?: readonly boolean[];
  /** The names of the file's columns, before any record; null for a format without a header (JSON Lines). */
  header(found: readonly string[] | null): void;
  /** One row: `cells[k]` is the cell of column `wanted[k]`; `line` is the row's 1-based line (or position). */
  record(cells: readonly Cell[], line: number): void;
  /** The end of the file. */
  finish(): void;
}

const COMMA = 44;
const LF = 10;
const CR = 13;
const QUOTE = 34;
const SPACE = /^[ \t]+|[ \t]+$/g;

/** CSV (RFC 4180) as records of the wanted columns. */
export class CsvRecords implements ChunkParser {
  private line = 1;
  private haveHeader = false;
  private width = 0;
  /** For each field of the header, the index in `wanted` it fills, or -1. */
  private slotOf: Int32Array = new Int32Array(0);
  /** For a field that fills more than one wanted name (a `where` on a column a layout reads too): the further indices. */
  private moreSlots: Map<number, number[]> | null = null;
  /** For each field of the header, whether its unquoted cells are read as numbers in place (`RecordSink.numeric`). */
  private numberAt: Uint8Array = new Uint8Array(0);
  private readonly cells: Cell[];
  private readonly all: string[] = [];

  constructor(
    private readonly sink: RecordSink,
    private readonly display: string,
    private readonly limit: number = DEFAULT_ROW_LIMIT,
  ) {
    this.cells = new Array<Cell>(sink.wanted.length).fill(null);
  }

  parse(buf: Buffer, pos: number, final: boolean): number {
    const end = buf.length;
    while (pos < end) {
      const c = buf[pos];
      if (c === LF) {
        this.line++;
        pos++;
        continue;
      }
      if (c === CR) {
        if (pos + 1 === end && !final) return pos;
        if (pos + 1 === end || buf[pos + 1] === LF) {
          pos = pos + 1 === end ? end : pos + 2;
          this.line++;
          continue;
        }
      }
      const next = this.recordAt(buf, pos, end, final);
      if (next < 0) return pos;
      pos = next;
    }
    return pos;
  }

  /** Reads the record at `p`; returns where the next one starts, or -1 when it needs more bytes. */
  private recordAt(buf: Buffer, p: number, end: number, final: boolean): number {
    const start = p;
    const line = this.line;
    let breaks = 0;
    let field = 0;
    const header = !this.haveHeader;
    const cells = this.cells;
    cells.fill(null);
    if (header) this.all.length = 0;
    for (;;) {
      let text: string | number | null = null;
      const slot = header ? -2 : field < this.width ? this.slotOf[field] : -1;
      let q: number;
      if (p < end && buf[p] === QUOTE) {
        // A quoted field: up to the quote not doubled; "" inside is one quote.
        let out = "";
        const from = p + 1;
        q = from;
        for (;;) {
          const close = buf.indexOf(QUOTE, q);
          if (close === -1 || close >= end) {
            if (!final) return -1;
            throw ingestMessages.unterminatedQuote(this.display, line + breaks);
          }
          if (close + 1 < end && buf[close + 1] === QUOTE) {
            q = close + 2;
            continue;
          }
          if (close + 1 === end && !final) return -1;
          for (let i = from; i < close; i++) if (buf[i] === LF) breaks++;
          if (slot !== -1) out = buf.toString("utf8", from, close).replace(/""/g, '"');
          q = close + 1;
          break;
        }
        if (q < end && buf[q] !== COMMA && buf[q] !== LF && !(buf[q] === CR && (q + 1 === end || buf[q + 1] === LF))) {
          throw ingestMessages.textAfterQuote(this.display, line + breaks);
        }
        if (slot !== -1) text = out;
      } else {
        q = p;
        while (q < end && buf[q] !== COMMA && buf[q] !== LF) q++;
        if (q === end && !final) return -1;
        if (slot >= 0 && this.numberAt[field] === 1 && q > p) {
          // A time cell read straight from the bytes; anything `scanDecimal` declines is read as text below.
          const x = scanDecimal(buf, p, q);
          if (x === x && scanned.end === q) text = x;
        }
        if (slot !== -1 && text === null) {
          let b = q;
          if (b > p && buf[b - 1] === CR) b--;
          const t = buf.toString("utf8", p, b).replace(SPACE, "");
          text = t;
        }
      }
      if (header) this.all.push(String(text ?? ""));
      else if (slot >= 0 && text !== "" && text !== null) {
        cells[slot] = text;
        const more = this.moreSlots?.get(field);
        if (more !== undefined) for (const k of more) cells[k] = text;
      }
      field++;
      if (q < end && buf[q] === CR) q++;
      if (q < end && buf[q] === COMMA) {
        p = q + 1;
        if (p === end && !final) return -1;
        continue;
      }
      // The end of the record: a line feed, or the end of the data.
      const next = q < end ? q + 1 : end;
      if (next - start > this.limit + 1) throw ingestMessages.rowTooLong(this.display, line, this.limit, ROW_LIMIT_MAX);
      this.line += breaks + (q < end ? 1 : 0);
      if (header) this.useHeader(line);
      else {
        if (field > this.width) throw ingestMessages.tooManyFields(this.display, line, field, this.width, false);
        this.sink.record(cells, line);
      }
      return next;
    }
  }

  private useHeader(line: number): void {
    this.haveHeader = true;
    const names = this.all.slice();
    this.width = names.length;
    this.slotOf = new Int32Array(names.length).fill(-1);
    this.numberAt = new Uint8Array(names.length);
    const seen = new Map<string, number>();
    names.forEach((name, i) => {
      const first = seen.get(name);
      if (first !== undefined && name !== "" && this.sink.wanted.includes(name)) {
        throw ingestMessages.duplicateColumn(this.display, line, name, first + 1, i + 1);
      }
      seen.set(name, i);
      const slots = this.sink.wanted.flatMap((w, k) => (w === name ? [k] : []));
      this.slotOf[i] = slots.length > 0 ? slots[0] : -1;
      if (slots.length > 1) (this.moreSlots ??= new Map()).set(i, slots.slice(1));
      // A column that also fills a `where` keeps its text: `where` compares texts as written.
      else if (slots.length === 1 && this.sink.numeric?.[slots[0]] === true) this.numberAt[i] = 1;
    });
    this.sink.header(names);
  }

  finish(): void {
    if (!this.haveHeader) throw ingestMessages.emptyFile(this.display, "csv");
    this.sink.finish();
  }

  tooLong(_buf: Buffer, _start: number, limit: number): UserError {
    return ingestMessages.rowTooLong(this.display, this.line, limit, ROW_LIMIT_MAX);
  }
}

/** JSON Lines as records of the wanted keys. */
export class JsonLinesRecords extends JsonLinesReader {
  private readonly cells: Cell[];

  constructor(
    private readonly sink: RecordSink,
    display: string,
    limit: number = DEFAULT_ROW_LIMIT,
  ) {
    super(display, limit);
    this.cells = new Array<Cell>(sink.wanted.length).fill(null);
  }

  protected object(row: Record<string, unknown>, line: number): void {
    const file = this.display;
    if (!this.sawObject) this.sink.header(null);
    const wanted = this.sink.wanted;
    for (let k = 0; k < wanted.length; k++) {
      const v = Object.hasOwn(row, wanted[k]) ? row[wanted[k]] : null;
      if (v === null || v === undefined || v === "") this.cells[k] = null;
      else if (typeof v === "string" || typeof v === "number" || typeof v === "boolean") this.cells[k] = v;
      else throw ingestMessages.wrongType(file, line, wanted[k], "cell", "a number, a string, true, false or null", describe(v));
    }
    this.sink.record(this.cells, line);
  }

  override finish(): void {
    super.finish();
    this.sink.finish();
  }
}
