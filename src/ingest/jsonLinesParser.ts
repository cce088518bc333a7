/**
 * JSON Lines run files: one object per non-blank line, keys named by the column map.
 *
 * Each line is decoded and given to `JSON.parse`; this path is simpler and slower than the CSV
 * one. Types accepted (contract section 1): `time` a number or a numeric string; `value` a number,
 * a numeric string, null or absent; `series` a string or a number; `entity` a string or a number.
 */
import type { ColumnMap } from "../manifest/types.js";
import * as ingestMessages from "../messages/ingest.js";
import { parseDecimalText } from "./decimal.js";
import type { UserError } from "../messages/error.js";
import { type ChunkParser, DEFAULT_ROW_LIMIT, ROW_LIMIT_MAX } from "./feeder.js";
import type { SeriesTable } from "./seriesTable.js";

const LF = 10;
const CR = 13;
const BLANK = /^[ \t\r]*$/;

/** A JSON value described for a message: "a string", "null", "an array"... */
export function describe(x: unknown): string {
  if (x === null) return "null";
  if (Array.isArray(x)) return "an array";
  switch (typeof x) {
    case "string":
      return `the string ${JSON.stringify(x)}`;
    case "number":
      return `the number ${String(x)}`;
    case "boolean":
      return `the value ${String(x)}`;
    case "object":
      return "an object";
    default:
      return typeof x;
  }
}

const QUOTE = 34;
const BACKSLASH = 92;
const COLON = 58;

/**
 * The number of keys of the object a valid JSON text holds, each written key counted (a key
 * written twice counts twice, where `JSON.parse` keeps one): the strings at depth 1 followed by a
 * colon.
 */
export function topLevelKeys(text: string): number {
  // The usual row is flat, without escapes: every double quote then opens or closes a string, at
  // depth 1, and a string followed by a colon is a key. Anything else takes the general walk.
  if (text.indexOf("\\") < 0 && text.indexOf("{", 1) < 0 && text.indexOf("[") < 0) {
    let keys = 0;
    for (let open = text.indexOf('"'); open >= 0; ) {
      const close = text.indexOf('"', open + 1);
      let k = close + 1;
      while (isSpace(text.charCodeAt(k))) k++;
      if (text.charCodeAt(k) === COLON) keys++;
      open = text.indexOf('"', close + 1);
    }
    return keys;
  }
  let keys = 0;
  eachTopLevelKey(text, () => {
    keys++;
    return false;
  });
  return keys;
}

/** The key of a valid JSON object text that is written twice (keys compared as JSON decodes them). */
export function duplicateOf(text: string): string {
  const seen = new Set<string>();
  let twice = "";
  eachTopLevelKey(text, (open, close) => {
    const key = JSON.parse(text.slice(open, close + 1)) as string;
    if (seen.has(key)) twice = key;
    seen.add(key);
    return twice !== "";
  });
  return twice;
}

/**
 * Calls `visit` with the opening and closing quote of each key of the object a valid JSON text
 * holds (the strings at depth 1 followed by a colon), in order, until it returns true.
 */
function eachTopLevelKey(text: string, visit: (open: number, close: number) => boolean): void {
  let depth = 0;
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (c === QUOTE) {
      const close = closingQuote(text, i);
      if (depth === 1) {
        let k = close + 1;
        while (isSpace(text.charCodeAt(k))) k++;
        if (text.charCodeAt(k) === COLON && visit(i, close)) return;
      }
      i = close;
    } else if (c === 123 || c === 91) depth++; // { [
    else if (c === 125 || c === 93) depth--; // } ]
  }
}

/** The closing quote of the JSON string opening at `open` (the text is valid JSON). */
function closingQuote(text: string, open: number): number {
  let j = open;
  for (;;) {
    j = text.indexOf('"', j + 1);
    let escapes = 0;
    while (text.charCodeAt(j - 1 - escapes) === BACKSLASH) escapes++;
    if (escapes % 2 === 0) return j;
  }
}

function isSpace(c: number): boolean {
  return c === 32 || c === 9 || c === 10 || c === 13;
}

/**
 * What every JSON Lines reader shares: the split into lines (a line longer than the row limit is
 * an input error), blank lines skipped, each other line parsed as one JSON object whose keys are
 * each written once, and an empty file refused. A subclass says what an object becomes (`object`).
 */
export abstract class JsonLinesReader implements ChunkParser {
  private line = 1;
  /** Whether an object was read before this one (false while the first is handed over). */
  protected sawObject = false;

  constructor(
    protected readonly display: string,
    /** The longest line, in bytes, its line break not counted (see `ChunkFeeder`). */
    private readonly limit: number = DEFAULT_ROW_LIMIT,
  ) {}

  parse(buf: Buffer, pos: number, final: boolean): number {
    const end = buf.length;
    while (pos < end) {
      let lf = buf.indexOf(LF, pos);
      if (lf === -1) {
        if (!final) return pos;
        lf = end;
      }
      if (lf - pos > this.limit && lf - pos - (buf[lf - 1] === CR ? 1 : 0) > this.limit) {
        throw ingestMessages.rowTooLong(this.display, this.line, this.limit, ROW_LIMIT_MAX);
      }
      const text = buf.toString("utf8", pos, lf);
      if (!BLANK.test(text)) {
        this.object(parseObject(this.display, text, this.line), this.line);
        this.sawObject = true;
      }
      this.line++;
      pos = lf < end ? lf + 1 : end;
    }
    return pos;
  }

  finish(): void {
    if (!this.sawObject) throw ingestMessages.emptyFile(this.display, "jsonl");
  }

  /** The line from `start` runs past the row limit with no line feed. */
  tooLong(_buf: Buffer, _start: number, limit: number): UserError {
    return ingestMessages.rowTooLong(this.display, this.line, limit, ROW_LIMIT_MAX);
  }

  /** One object of the file, read from its 1-based `line`. */
  protected abstract object(row: Record<string, unknown>, line: number): void;
}

/** The JSON object on one line (an input error when the line is not valid JSON, not an object, or names a key twice). */
function parseObject(file: string, text: string, line: number): Record<string, unknown> {
  let parsed: unknown;
  try {
    parsed = JSON.parse(text);
  } catch (e) {
    throw ingestMessages.badJson(file, line, e instanceof Error ? e.message : String(e));
  }
  if (typeof parsed !== "object" || parsed === null || Array.isArray(parsed)) {
    throw ingestMessages.notAnObject(file, line, describe(parsed));
  }
  const row = parsed as Record<string, unknown>;
  if (topLevelKeys(text) !== Object.keys(row).length) throw ingestMessages.duplicateKey(file, line, duplicateOf(text));
  return row;
}

/** JSON Lines in the events layout: each object's time, series, value and entity keys, into the series table. */
export class JsonLinesParser extends JsonLinesReader {
  constructor(
    private readonly table: SeriesTable,
    display: string,
    private readonly columns: ColumnMap,
    limit: number = DEFAULT_ROW_LIMIT,
  ) {
    super(display, limit);
  }

  protected object(row: Record<string, unknown>, line: number): void {
    const file = this.display;
    const { time: timeKey, series: seriesKey, value: valueKey, entity: entityKey } = this.columns;
    const get = (key: string): unknown => (Object.hasOwn(row, key) ? row[key] : undefined);

    const t = get(timeKey);
    if (t === undefined) throw ingestMessages.missingKey(file, line, timeKey, "time");
    let time: number | undefined;
    if (typeof t === "number") time = Number.isFinite(t) ? t : undefined;
    else if (typeof t === "string") time = parseDecimalText(t);
    else throw ingestMessages.wrongType(file, line, timeKey, "time", "a number", describe(t));
    if (time === undefined) throw ingestMessages.notANumber(file, line, "time", String(t));
    if (time !== time) throw ingestMessages.missingTime(file, line);

    const s = get(seriesKey);
    if (s === undefined) throw ingestMessages.missingKey(file, line, seriesKey, "series");
    if (typeof s !== "string" && typeof s !== "number") {
      throw ingestMessages.wrongType(file, line, seriesKey, "series", "a string", describe(s));
    }
    const entry = this.table.lookupName(String(s));
    if (entry === null) throw ingestMessages.emptySeries(file, line);

    const v = get(valueKey);
    let value: number | undefined = NaN;
    if (typeof v === "number") value = Number.isFinite(v) ? v : undefined;
    else if (typeof v === "string") value = parseDecimalText(v);
    else if (v !== undefined && v !== null) {
      throw ingestMessages.wrongType(file, line, valueKey, "value", "a number or null", describe(v));
    }
    if (value === undefined) throw ingestMessages.notANumber(file, line, "value", String(v));

    let entity: string | undefined;
    if (entry.entity) {
      const e = get(entityKey);
      if (typeof e === "string") entity = e === "" ? undefined : e;
      else if (typeof e === "number") entity = String(e);
      else if (e !== undefined && e !== null) {
        throw ingestMessages.wrongType(file, line, entityKey, "entity", "a string", describe(e));
      }
    }
    this.table.accept(entry, time, value, entity, line);
  }
}
