/**
 * CSV run files (RFC 4180), parsed from bytes.
 *
 * Two paths per row:
 * - the fast path reads a row whose fields do not start with a double quote: it walks the bytes
 *   once, reads numbers in place (`scanDecimal`), matches the series name against known names
 *   without making a string, and makes a string only for an entity cell the caller wants;
 * - the quoted path reads any row into strings (quotes, `""` escapes, commas and line breaks
 *   inside quotes). The fast path hands a row over as soon as it meets a field starting with `"`.
 *
 * A row that runs past the end of the bytes at hand is left for the next chunk (`parse` returns
 * where it starts), so rows may be split anywhere across chunks.
 */
import type { ColumnMap } from "../manifest/types.js";
import * as ingestMessages from "../messages/ingest.js";
import { parseDecimalBytes, parseDecimalText, scanDecimal, scanned } from "./decimal.js";
import type { UserError } from "../messages/error.js";
import { type ChunkParser, DEFAULT_ROW_LIMIT, ROW_LIMIT_MAX } from "./feeder.js";
import type { SeriesEntry, SeriesTable } from "./seriesTable.js";

const COMMA = 44;
const LF = 10;
const CR = 13;
const QUOTE = 34;
const SPACE = 32;
const TAB = 9;

const SKIP = 0;
const TIME = 1;
const SERIES = 2;
const VALUE = 3;
const ENTITY = 4;
/** Past the last column the reader needs: skip to the end of the line. */
const REST = 5;

/** Entity ids up to this many bytes are decoded byte by byte when ASCII. */
const SHORT_ID = 16;

/** `parse` steps: the row needs more bytes / the row has a quoted field. */
const INCOMPLETE = -1;
const QUOTED = -2;

export class CsvParser implements ChunkParser {
  /** Physical line (1-based) where the next record starts. */
  private line = 1;
  private haveHeader = false;
  /** Role of each field up to the last one needed. */
  private roles = new Uint8Array(0);
  /** Fields a row needs: up to the time and the series columns. */
  private required = 0;
  /** Fields the header has: a row may have fewer, never more. */
  private width = 0;
  private timeColumn = -1;
  private seriesColumn = -1;
  private valueColumn = -1;
  private entityColumn = -1;
  /** Fields of the record read last by `readFields`, and the line it started on. */
  private fields: string[] = [];
  private fieldsLine = 0;
  /** Whether the columns start time, series, value (then entity, when wanted): `standardRow` applies. */
  private standard = false;
  /** Where the time cell of the row before lies in the bytes at hand (`standardRow`), and its value. */
  private timeBytesStart = 0;
  private timeBytesEnd = 0;
  private timeBefore = NaN;

  constructor(
    private readonly table: SeriesTable,
    private readonly display: string,
    private readonly columns: ColumnMap,
    /** The longest row, in bytes, its line break not counted (see `ChunkFeeder`). */
    private readonly limit: number = DEFAULT_ROW_LIMIT,
  ) {}

  parse(buf: Buffer, pos: number, final: boolean): number {
    const end = buf.length;
    this.timeBytesEnd = this.timeBytesStart = 0; // positions in the bytes of the last call
    while (pos < end) {
      const c = buf[pos];
      if (c === LF) {
        this.line++;
        pos++;
        continue;
      }
      if (c === CR) {
        if (pos + 1 === end) {
          if (!final) return pos;
          pos++;
          continue;
        }
        if (buf[pos + 1] === LF) {
          this.line++;
          pos += 2;
          continue;
        }
      }
      let next: number;
      const line = this.line;
      if (!this.haveHeader) {
        next = this.readFields(buf, pos, end, final);
        if (next !== INCOMPLETE) this.useHeader();
      } else {
        next = this.standard ? this.standardRow(buf, pos, end, final) : this.fastRow(buf, pos, end, final);
        if (next === QUOTED) {
          next = this.readFields(buf, pos, end, final);
          if (next !== INCOMPLETE) this.fieldsRow();
        }
      }
      if (next === INCOMPLETE) return pos;
      if (next - pos > this.limit && lengthWithoutBreak(buf, pos, next) > this.limit) {
        this.line = line;
        throw this.tooLong(buf, pos, this.limit);
      }
      pos = next;
    }
    return pos;
  }

  finish(): void {
    if (!this.haveHeader) throw ingestMessages.emptyFile(this.display, "csv");
  }

  /**
   * The error for the row from `start`, longer than `limit` bytes: an unterminated quote when a
   * quoted field is open at its `limit`-th byte (named by the line the quote opened on), else a
   * long row (named by the line the row starts on). Decided on the first `limit` bytes only, so the
   * message is the same wherever chunks end and whether or not the row ends later.
   */
  tooLong(buf: Buffer, start: number, limit: number): UserError {
    const stop = start + limit;
    let line = this.line;
    let atFieldStart = true;
    let quoteLine = -1;
    for (let p = start; p < stop; p++) {
      const c = buf[p];
      if (quoteLine >= 0) {
        if (c === LF) line++;
        else if (c === QUOTE) {
          if (p + 1 < stop && buf[p + 1] === QUOTE) p++;
          else quoteLine = -1;
        }
      } else if (atFieldStart && c === QUOTE) {
        quoteLine = line;
        atFieldStart = false;
      } else {
        if (c === LF) line++;
        atFieldStart = c === COMMA || c === LF;
      }
    }
    if (quoteLine >= 0) return ingestMessages.quoteTooLong(this.display, quoteLine, limit, ROW_LIMIT_MAX);
    return ingestMessages.rowTooLong(this.display, this.line, limit, ROW_LIMIT_MAX);
  }

  /**
   * The fast path for the usual column order (time, series, value, then entity when wanted) and the
   * usual row: straight-line code, no per-field dispatch. Anything else in the row (a quote, a name
   * not seen before, spaces, a number `scanDecimal` declines, the end of the bytes at hand) goes to
   * `fastRow` from the row's start, which reads it the general way.
   */
  private standardRow(buf: Buffer, p: number, end: number, final: boolean): number {
    const rowStart = p;
    // Rows often share their time (events at one instant): the same bytes as the time cell of the
    // row before give the same number, compared from the last byte, where times differ first.
    let time: number;
    let q: number;
    const width = this.timeBytesEnd - this.timeBytesStart;
    if (width > 0 && p + width < end && buf[p + width] === COMMA && sameBytesBackwards(buf, p, this.timeBytesStart, width)) {
      time = this.timeBefore;
      q = p + width;
    } else {
      time = scanDecimal(buf, p, end);
      q = scanned.end;
      if (time !== time || q >= end || buf[q] !== COMMA) return this.fastRow(buf, rowStart, end, final);
      this.timeBytesStart = p;
      this.timeBytesEnd = q;
      this.timeBefore = time;
    }
    const entry = this.table.matchKnown(buf, q + 1, end);
    if (entry === null) return this.fastRow(buf, rowStart, end, final);
    p = this.table.matchedEnd + 1;
    if (buf[p - 1] !== COMMA || p >= end) return this.fastRow(buf, rowStart, end, final);
    let value = NaN;
    let c = buf[p];
    if (c === COMMA || c === LF) q = p;
    else {
      value = scanDecimal(buf, p, end);
      q = scanned.end;
      if (value !== value || q >= end || ((c = buf[q]) !== COMMA && c !== LF)) return this.fastRow(buf, rowStart, end, final);
    }
    let entity: string | undefined;
    if (buf[q] === COMMA) {
      // The rest of the row: the entity cell first when this series wants it, then up to the line
      // feed, counting the cells (time, series, value, and one more per comma from here on).
      p = ++q;
      let cells = 4;
      while (q < end && (c = buf[q]) !== LF && c !== QUOTE) {
        if (c === COMMA) cells++;
        q++;
      }
      if (q >= end || c === QUOTE || cells > this.width) return this.fastRow(buf, rowStart, end, final);
      if (entry.entity && this.entityColumn === 3) {
        let e = p;
        while (e < q && buf[e] !== COMMA) e++;
        entity = decodeCell(buf, p, e);
      }
    }
    this.table.accept(entry, time, value, entity, this.line);
    this.line++;
    return q + 1;
  }

  /** Reads one row on the fast path; returns the position after it, INCOMPLETE or QUOTED. */
  private fastRow(buf: Buffer, p: number, end: number, final: boolean): number {
    const roles = this.roles;
    const known = roles.length;
    const rowStart = p;
    let field = 0;
    let time = NaN;
    let value = NaN;
    let entry: SeriesEntry | null = null;
    let entityStart = -1;
    let entityEnd = -1;
    let entityQuoted = false;
    /** Fields past the first one that the REST step skips. */
    let restFields = 0;
    let q: number;
    for (;;) {
      const role = field < known ? roles[field] : REST;
      if (p < end && buf[p] === QUOTE && role !== REST) {
        // A quoted cell with no line feed and no doubled quote inside is read here; any other
        // row goes to `readFields`. Its text is taken as it is (no trimming), as `readFields` does.
        const close = simpleQuoted(buf, p, end);
        if (close < 0) return close === INCOMPLETE && !final ? INCOMPLETE : QUOTED;
        const a = p + 1;
        q = afterQuoted(buf, close);
        if (role === TIME || role === VALUE) {
          let x = scanDecimal(buf, a, close);
          if (x !== x || scanned.end !== close) {
            const text = buf.toString("utf8", a, close);
            const y = parseDecimalText(text);
            if (y === undefined) return this.notANumber(buf, rowStart, end, final, role, text);
            x = y;
          }
          if (role === TIME) time = x;
          else value = x;
        } else if (role === SERIES) {
          entry = this.table.matchExact(buf, a, close);
          if (entry === null) return QUOTED; // a name not seen before, or an empty one
        } else if (role === ENTITY) {
          entityStart = a;
          entityEnd = close;
          entityQuoted = true;
        }
      } else if (role === TIME || role === VALUE) {
        let x: number;
        if (p < end && (buf[p] === COMMA || buf[p] === LF)) {
          x = NaN; // an empty cell
          q = p;
        } else {
          x = scanDecimal(buf, p, end);
          q = scanned.end;
          if (x !== x || (q < end && buf[q] !== COMMA && buf[q] !== LF)) {
            q = fieldEnd(buf, p, end);
            if (q === end && !final) return INCOMPLETE;
            const y = parseDecimalBytes(buf, p, q);
            if (y === undefined) {
              const text = buf.toString("utf8", p, q).trim();
              return this.notANumber(buf, rowStart, end, final, role, text);
            }
            x = y;
          }
        }
        if (role === TIME) time = x;
        else value = x;
      } else if (role === SERIES) {
        // The usual case: the cell is exactly a name seen before (`matchKnown`); else find the
        // field's end, hashing its bytes in the same pass (see `hashBytes`).
        entry = this.table.matchKnown(buf, p, end);
        if (entry !== null) q = this.table.matchedEnd;
        else {
          let h = 0;
          q = p;
          while (q < end) {
            const c = buf[q];
            if (c === COMMA || c === LF) break;
            h = (Math.imul(h, 31) + c) | 0;
            q++;
          }
          if (q === end && !final) return INCOMPLETE;
          entry = this.table.lookupBytes(buf, p, q, h);
          if (entry === null) {
            if ((q === end || buf[q] === LF) && isBlank(buf, rowStart, q)) return this.blankRow(q, end);
            throw ingestMessages.emptySeries(this.display, this.line);
          }
        }
      } else if (role === REST) {
        // Field by field to the line feed: a quoted field may hold commas.
        q = p;
        for (;;) {
          if (q < end && buf[q] === QUOTE) {
            const close = simpleQuoted(buf, q, end);
            if (close < 0) return close === INCOMPLETE && !final ? INCOMPLETE : QUOTED;
            q = afterQuoted(buf, close);
          } else {
            while (q < end && buf[q] !== COMMA && buf[q] !== LF) q++;
          }
          if (q >= end || buf[q] === LF) break;
          restFields++;
          q++;
        }
      } else {
        q = fieldEnd(buf, p, end);
        if (role === ENTITY) {
          entityStart = p;
          entityEnd = q;
        }
      }
      if (q === end) {
        if (!final) return INCOMPLETE;
        field++;
        break;
      }
      if (buf[q] === COMMA && role !== REST) {
        p = q + 1;
        field++;
        continue;
      }
      field++;
      q++;
      break;
    }
    const line = this.line;
    if (field < this.required) {
      if (isBlank(buf, rowStart, q)) {
        this.line++;
        return q;
      }
      throw ingestMessages.tooFewFields(this.display, line, field, this.required);
    }
    if (field + restFields > this.width) throw this.tooManyFields(splitCells(buf.toString("utf8", rowStart, q)), line);
    if (time !== time) throw ingestMessages.missingTime(this.display, line);
    const e = entry as SeriesEntry;
    let entity: string | undefined;
    if (e.entity && entityStart >= 0) {
      if (!entityQuoted) entity = decodeCell(buf, entityStart, entityEnd);
      else if (entityEnd > entityStart) entity = buf.toString("utf8", entityStart, entityEnd);
    }
    this.table.accept(e, time, value, entity, line);
    this.line++;
    return q;
  }

  /** A line of spaces only is blank: skip it. `q` is at or after its line feed, or at the end. */
  private blankRow(q: number, end: number): number {
    this.line++;
    return q < end ? q + 1 : end;
  }

  /**
   * Reads one record, quoted fields and all, into `this.fields` (unquoted fields trimmed of
   * spaces); returns the position after it, or INCOMPLETE.
   */
  private readFields(buf: Buffer, p: number, end: number, final: boolean): number {
    const fields: string[] = [];
    let breaks = 0;
    for (;;) {
      let text: string;
      let q: number;
      if (p < end && buf[p] === QUOTE) {
        const quoteLine = this.line + breaks;
        const start = p + 1;
        let close = start;
        for (;;) {
          const k = buf.indexOf(QUOTE, close);
          if (k === -1) {
            if (!final) return INCOMPLETE;
            throw ingestMessages.unterminatedQuote(this.display, quoteLine);
          }
          if (k + 1 === end && !final) return INCOMPLETE;
          if (k + 1 < end && buf[k + 1] === QUOTE) {
            close = k + 2;
            continue;
          }
          close = k;
          break;
        }
        for (let i = start; i < close; i++) if (buf[i] === LF) breaks++;
        text = buf.toString("utf8", start, close);
        if (text.includes('"')) text = text.replaceAll('""', '"');
        q = close + 1;
        while (q < end && (buf[q] === SPACE || buf[q] === TAB)) q++;
        if (q < end && buf[q] === CR) {
          if (q + 1 === end && !final) return INCOMPLETE;
          if (q + 1 === end || buf[q + 1] === LF) q++;
        }
        if (q < end && buf[q] !== COMMA && buf[q] !== LF) {
          throw ingestMessages.textAfterQuote(this.display, this.line + breaks);
        }
      } else {
        q = fieldEnd(buf, p, end);
        if (q === end && !final) return INCOMPLETE;
        text = buf.toString("utf8", p, q).replace(/^[ \t]+|[ \t\r]+$/g, "");
      }
      fields.push(text);
      if (q < end && buf[q] === COMMA) {
        p = q + 1;
        continue;
      }
      this.fields = fields;
      this.fieldsLine = this.line;
      this.line += breaks + 1;
      return q < end ? q + 1 : end;
    }
  }

  /** The header: finds the columns (after renaming) and sets the role of each field. */
  private useHeader(): void {
    const names = this.fields.map((name) => name.trim());
    const seen = new Map<string, number>();
    names.forEach((name, i) => {
      const first = seen.get(name);
      if (first !== undefined) throw ingestMessages.duplicateColumn(this.display, this.fieldsLine, name, first + 1, i + 1);
      if (name !== "") seen.set(name, i);
    });
    const columns = this.columns;
    this.haveHeader = true;
    this.timeColumn = names.indexOf(columns.time);
    this.seriesColumn = names.indexOf(columns.series);
    this.valueColumn = names.indexOf(columns.value);
    this.entityColumn = this.table.wantsEntity ? names.indexOf(columns.entity) : -1;
    const missing: { role: string; name: string }[] = [];
    if (this.timeColumn < 0) missing.push({ role: "time", name: columns.time });
    if (this.seriesColumn < 0) missing.push({ role: "series", name: columns.series });
    if (missing.length > 0) throw ingestMessages.missingColumns(this.display, missing, names);
    if (this.table.wantsEntity && this.entityColumn < 0) {
      throw ingestMessages.missingEntityColumn(this.display, columns.entity, names, this.table.entitySeries);
    }
    const roles = new Uint8Array(Math.max(this.timeColumn, this.seriesColumn, this.valueColumn, this.entityColumn) + 1);
    roles.fill(SKIP);
    // Set in reverse order of priority, so that a column mapped twice reads as time, then series.
    if (this.entityColumn >= 0) roles[this.entityColumn] = ENTITY;
    if (this.valueColumn >= 0) roles[this.valueColumn] = VALUE;
    roles[this.seriesColumn] = SERIES;
    roles[this.timeColumn] = TIME;
    this.roles = roles;
    this.width = names.length;
    this.required = Math.max(this.timeColumn, this.seriesColumn) + 1;
    this.standard = this.timeColumn === 0 && this.seriesColumn === 1 && this.valueColumn === 2 && (this.entityColumn === 3 || this.entityColumn === -1);
  }

  /**
   * A time or value cell of the row from `rowStart` is not a number: when the row has more cells
   * than the header, that is the error to show (a decimal comma shifts the cells: `1,5,queue`
   * puts `queue` under the value); else the number's. INCOMPLETE while the row's end is not at hand.
   */
  private notANumber(buf: Buffer, rowStart: number, end: number, final: boolean, role: number, text: string): number {
    let lf = buf.indexOf(LF, rowStart);
    if (lf === -1 || lf >= end) {
      if (!final) return INCOMPLETE;
      lf = end;
    }
    const cells = splitCells(buf.toString("utf8", rowStart, lf));
    if (cells.length > this.width) throw this.tooManyFields(cells, this.line);
    throw ingestMessages.notANumber(this.display, this.line, role === TIME ? "time" : "value", text);
  }

  /**
   * The error for a row with more cells than the header; when the cells split a number in two
   * where the time or the value belongs (`1,5` for 1.5), the message says so.
   */
  private tooManyFields(cells: string[], line: number): UserError {
    const extra = cells.length - this.width;
    let splits = 0;
    for (let i = 0; i + 1 < cells.length; i++) {
      if (INTEGER.test(cells[i]) && DIGITS.test(cells[i + 1])) {
        splits++;
        i++;
      }
    }
    return ingestMessages.tooManyFields(this.display, line, cells.length, this.width, splits >= extra);
  }

  /** A row read by `readFields`. */
  private fieldsRow(): void {
    const fields = this.fields;
    const line = this.fieldsLine;
    if (fields.length < this.required) {
      throw ingestMessages.tooFewFields(this.display, line, fields.length, this.required);
    }
    if (fields.length > this.width) throw this.tooManyFields(fields, line);
    const time = parseDecimalText(fields[this.timeColumn]);
    if (time === undefined) throw ingestMessages.notANumber(this.display, line, "time", fields[this.timeColumn]);
    const entry = this.table.lookupName(fields[this.seriesColumn]);
    if (entry === null) throw ingestMessages.emptySeries(this.display, line);
    this.table.learnName(fields[this.seriesColumn], entry);
    let value = NaN;
    if (this.valueColumn >= 0 && this.valueColumn < fields.length) {
      const v = parseDecimalText(fields[this.valueColumn]);
      if (v === undefined) throw ingestMessages.notANumber(this.display, line, "value", fields[this.valueColumn]);
      value = v;
    }
    if (time !== time) throw ingestMessages.missingTime(this.display, line);
    let entity: string | undefined;
    if (entry.entity && this.entityColumn >= 0 && this.entityColumn < fields.length) {
      const text = fields[this.entityColumn];
      if (text !== "") entity = text;
    }
    this.table.accept(entry, time, value, entity, line);
  }
}

/**
 * The closing quote of the quoted cell opening at `p`, when the cell is simple: no line feed and
 * no doubled quote inside, and the closing quote followed by a comma, a line feed, or a carriage
 * return and a line feed. INCOMPLETE when the bytes at hand end first; QUOTED for any other cell.
 */
function simpleQuoted(buf: Buffer, p: number, end: number): number {
  let k = p + 1;
  while (k < end) {
    const c = buf[k];
    if (c === QUOTE) break;
    if (c === LF) return QUOTED;
    k++;
  }
  if (k + 2 >= end) return INCOMPLETE;
  const c = buf[k + 1];
  if (c === COMMA || c === LF || (c === CR && buf[k + 2] === LF)) return k;
  return QUOTED;
}

/** A cell that may be the whole part of a number written with a decimal comma, and its fraction part. */
const INTEGER = /^\s*[-+]?\d+\s*$/;
const DIGITS = /^\d+\s*$/;

/**
 * The cells of one line of CSV text (for a message), its line break left out: split at commas
 * outside quotes, quoted cells without their quotes.
 */
function splitCells(text: string): string[] {
  const line = text.replace(/\r?\n$/, "");
  const cells: string[] = [];
  let cell = "";
  let quoted = false;
  let atStart = true;
  for (let i = 0; i < line.length; i++) {
    const c = line[i];
    if (quoted) {
      if (c !== '"') cell += c;
      else if (line[i + 1] === '"') cell += line[++i];
      else quoted = false;
    } else if (c === ",") {
      cells.push(cell);
      cell = "";
      atStart = true;
      continue;
    } else if (c === '"' && atStart) quoted = true;
    else cell += c;
    atStart = false;
  }
  cells.push(cell);
  return cells;
}

/** The length of the row `buf[a..b)` without its line feed or carriage return and line feed. */
function lengthWithoutBreak(buf: Buffer, a: number, b: number): number {
  if (b > a && buf[b - 1] === LF) b--;
  if (b > a && buf[b - 1] === CR) b--;
  return b - a;
}

/** Whether `buf[a..a+n)` equals `buf[b..b+n)`, compared from the last byte. */
function sameBytesBackwards(buf: Buffer, a: number, b: number, n: number): boolean {
  for (let i = n - 1; i >= 0; i--) if (buf[a + i] !== buf[b + i]) return false;
  return true;
}

/** The comma or line feed after a simple quoted cell's closing quote at `close` (see `simpleQuoted`). */
function afterQuoted(buf: Buffer, close: number): number {
  return buf[close + 1] === CR ? close + 2 : close + 1;
}

/** The position of the comma or line feed that ends the unquoted field starting at `p`, or `end`. */
function fieldEnd(buf: Buffer, p: number, end: number): number {
  while (p < end) {
    const c = buf[p];
    if (c === COMMA || c === LF) return p;
    p++;
  }
  return end;
}

/** Whether `buf[a..b)` holds only spaces, tabs and line ends. */
function isBlank(buf: Buffer, a: number, b: number): boolean {
  for (let i = a; i < b; i++) {
    const c = buf[i];
    if (c !== SPACE && c !== TAB && c !== CR && c !== LF) return false;
  }
  return true;
}

/** An unquoted entity cell as a string (UTF-8), trimmed; undefined when blank. */
function decodeCell(buf: Buffer, a: number, b: number): string | undefined {
  let c: number;
  while (a < b && ((c = buf[a]) === SPACE || c === TAB)) a++;
  while (b > a && ((c = buf[b - 1]) === SPACE || c === TAB || c === CR)) b--;
  if (a === b) return undefined;
  if (b - a > SHORT_ID) return buf.toString("utf8", a, b);
  // Short ASCII ids (the usual case) are built directly: cheaper than a decoder call.
  let text = "";
  for (let i = a; i < b; i++) {
    c = buf[i];
    if (c >= 0x80) return buf.toString("utf8", a, b);
    text += String.fromCharCode(c);
  }
  return text;
}
