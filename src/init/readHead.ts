/**
 * A bounded read of one run file for `sojourn init`: what its first rows look like.
 *
 *   file ──[gunzip]──► first rows ──► series names, entity column?      (discover, lenient)
 *        ──readRun (all series found, stops after `limit` rows)──► SeriesHead per series
 *        ──(when cut short and not gzip) last 64 KiB──► time of the last row
 *
 * The rows themselves go through `readRun`, so a file init accepts is one `sojourn check`
 * accepts as far as init read it, and a file it refuses gets the reader's own message.
 */
import { createReadStream } from "node:fs";
import { open } from "node:fs/promises";
import { createGunzip } from "node:zlib";
import { StringDecoder } from "node:string_decoder";
import type { ColumnMap } from "../manifest/types.js";
import { DEFAULT_ROW_LIMIT } from "../ingest/feeder.js";
import { ParquetRunFile } from "../ingest/parquetFile.js";
import { readParquetRows } from "../ingest/parquetReader.js";
import { readRun, refuseIfNotAFile } from "../ingest/readRun.js";
import { runFormat } from "../ingest/runFile.js";

/** What the first rows of one series in one file look like. */
export interface SeriesHead {
  name: string;
  rows: number;
  /** Rows with a value / with an entity. */
  valued: number;
  withEntity: number;
  firstTime: number;
  lastTime: number;
  min: number;
  max: number;
  /** Every value is a whole number. */
  integers: boolean;
  /** Distinct values, up to `DISTINCT_CAP` (then `manyValues`). */
  distinct: Set<number>;
  manyValues: boolean;
  /** Consecutive valued rows: how many pairs, how many changed by exactly 1 up or down, how many stayed equal. */
  steps: number;
  unitSteps: number;
  sameSteps: number;
  /** For rows without a value but with an entity: each entity's first time in this series. */
  entityTimes: Map<string, number> | null;
}

/** How a valued series compares with another at the other's rows: is `x <= y` where both are known? */
export interface PairHead {
  compared: number;
  above: number;
  equal: number;
}

export interface FileHead {
  /** Rows read, all series. */
  rows: number;
  /** True when the file has more rows than were read. */
  cut: boolean;
  /** Time of the last row of the file (read from its tail when cut), or null when unknown. */
  lastTime: number | null;
  series: SeriesHead[];
  /** `pairs.get(x + "\u0000" + y)`: series x compared with the level of series y. */
  pairs: Map<string, PairHead>;
}

export const DISTINCT_CAP = 64;
/** Valued series beyond this many are not compared pairwise (cost grows with the square). */
const PAIR_CAP = 24;

class HeadFull extends Error {}

/**
 * Reads at most `limit` rows of a run file (contract section 1) and describes its series.
 * Throws the reader's `UserError` when the file cannot be read as a run file.
 */
export async function readHead(path: string, display: string, columns: ColumnMap, limit: number): Promise<FileHead> {
  await refuseIfNotAFile(path, display); // a pipe would block `discover`, a device never end
  const found = await discover(path, columns, limit);
  const names = found.series;
  const tally = new HeadTally(names);
  let delivered = 0;
  let cut = false;
  let lastTime = -Infinity;
  let total: number;
  try {
    const report = await readRun({
      path,
      display,
      columns,
      series: names.map((name) => ({ name, entity: found.entity })),
      onRow: (i, time, value, entity) => {
        if (delivered >= limit) throw new HeadFull();
        delivered++;
        if (time > lastTime) lastTime = time;
        tally.row(i, time, value, entity);
      },
    });
    total = report.rows;
  } catch (e) {
    if (!(e instanceof HeadFull)) throw e;
    cut = true;
    total = delivered;
  }
  let last: number | null = Number.isFinite(lastTime) ? lastTime : null;
  if (cut) {
    const format = runFormat(path);
    if (format?.format === "parquet") last = await parquetTailTime(path, columns);
    else last = format !== null && !format.gzip ? await tailTime(path, format.format, columns, found.header) : null;
  }
  return { rows: total, cut, lastTime: last, series: tally.heads.filter((h) => h.rows > 0), pairs: tally.pairs };
}

/**
 * The per-series facts of rows given one at a time: `row(i, time, value, entity)` with `i` the
 * series' index in `names`, `value` NaN when the row has none. Each valued row is compared with
 * the level every other series holds at that moment (`pairs`).
 */
export class HeadTally {
  readonly heads: SeriesHead[];
  readonly pairs = new Map<string, PairHead>();
  private readonly lastValue: Float64Array;
  private readonly compare: boolean;

  constructor(private readonly names: readonly string[]) {
    this.heads = names.map((name) => ({
      name,
      rows: 0,
      valued: 0,
      withEntity: 0,
      firstTime: Infinity,
      lastTime: -Infinity,
      min: Infinity,
      max: -Infinity,
      integers: true,
      distinct: new Set<number>(),
      manyValues: false,
      steps: 0,
      unitSteps: 0,
      sameSteps: 0,
      entityTimes: null,
    }));
    this.lastValue = new Float64Array(names.length).fill(NaN);
    this.compare = names.length <= PAIR_CAP;
  }

  row(i: number, time: number, value: number, entity: string | undefined): void {
    const h = this.heads[i];
    const names = this.names;
    const lastValue = this.lastValue;
    h.rows++;
    if (time < h.firstTime) h.firstTime = time;
    if (time > h.lastTime) h.lastTime = time;
    if (entity !== undefined) h.withEntity++;
    if (value === value) {
      h.valued++;
      if (value < h.min) h.min = value;
      if (value > h.max) h.max = value;
      if (!Number.isInteger(value)) h.integers = false;
      if (!h.manyValues) {
        h.distinct.add(value);
        if (h.distinct.size > DISTINCT_CAP) h.manyValues = true;
      }
      const before = lastValue[i];
      if (before === before) {
        h.steps++;
        if (Math.abs(value - before) === 1) h.unitSteps++;
        else if (value === before) h.sameSteps++;
      }
      lastValue[i] = value;
      if (this.compare) {
        for (let j = 0; j < names.length; j++) {
          const other = lastValue[j];
          if (j === i || other !== other) continue;
          const key = names[i] + "\u0000" + names[j];
          let p = this.pairs.get(key);
          if (p === undefined) this.pairs.set(key, (p = { compared: 0, above: 0, equal: 0 }));
          p.compared++;
          if (value > other) p.above++;
          else if (value === other) p.equal++;
        }
      }
    } else if (entity !== undefined) {
      h.entityTimes ??= new Map();
      if (!h.entityTimes.has(entity)) h.entityTimes.set(entity, time);
    }
  }
}

/** Series names of the first rows, and whether rows can carry an entity. Never throws on bad data. */
async function discover(path: string, columns: ColumnMap, limit: number): Promise<{ series: string[]; entity: boolean; header: string[] | null }> {
  const format = runFormat(path);
  const names = new Set<string>();
  if (format === null) return { series: [], entity: false, header: null };
  if (format.format === "parquet") return discoverParquet(path, columns, limit);
  const raw = createReadStream(path, { highWaterMark: 1 << 16 });
  const stream = format.gzip ? raw.pipe(createGunzip()) : raw;
  const decoder = new StringDecoder("utf8");
  let header: string[] | null = null;
  let seriesAt = -1;
  let rows = 0;
  const csv = new CsvRecords((fields) => {
    if (header === null) {
      header = fields.map((f, i) => (i === 0 ? f.replace(/^\ufeff/, "") : f).trim());
      seriesAt = header.indexOf(columns.series);
      return seriesAt >= 0;
    }
    if (fields.length === 1 && fields[0].trim() === "") return true;
    const s = (fields[seriesAt] ?? "").trim();
    if (s !== "") names.add(s);
    return ++rows < limit;
  });
  let pending = "";
  const jsonLine = (line: string): boolean => {
    if (line.trim() === "") return true;
    const o = JSON.parse(line) as Record<string, unknown>;
    const s = o[columns.series];
    if (typeof s === "string" || typeof s === "number") {
      const name = String(s);
      if (name !== "") names.add(name);
    }
    return ++rows < limit;
  };
  try {
    outer: for await (const chunk of stream) {
      const text = decoder.write(chunk as Buffer);
      if (format.format === "csv") {
        if (!csv.push(text)) break;
      } else {
        pending += text;
        if (pending.length > DEFAULT_ROW_LIMIT && pending.indexOf("\n") < 0) break; // the reader says the line is too long
        let nl: number;
        while ((nl = pending.indexOf("\n")) >= 0) {
          const line = pending.slice(0, nl);
          pending = pending.slice(nl + 1);
          if (!jsonLine(line)) break outer;
        }
      }
    }
    if (format.format === "jsonl" && rows < limit) jsonLine(pending);
    if (format.format === "csv") csv.finish();
  } catch {
    // The reader proper says what is wrong with the file.
  } finally {
    raw.destroy();
    stream.destroy();
  }
  const h = header as string[] | null;
  return { series: [...names], entity: format.format === "jsonl" || (h !== null && h.includes(columns.entity)), header: h };
}

/** The largest time in the last row group of a Parquet file (the rows a cut-short read did not reach), or null. */
async function parquetTailTime(path: string, columns: ColumnMap): Promise<number | null> {
  try {
    const file = await ParquetRunFile.open(path, path);
    try {
      if (file.indexOf(columns.time) < 0 || file.groups.length === 0) return null;
      const [times] = await file.readGroup(file.groups.length - 1, [columns.time]);
      let best = -Infinity;
      for (let i = 0; i < times.length; i++) {
        const t = Number(times[i]);
        if (times[i] !== null && Number.isFinite(t) && t > best) best = t;
      }
      return Number.isFinite(best) ? best : null;
    } finally {
      await file.close();
    }
  } catch {
    return null; // the reader proper says what is wrong with the file
  }
}

/** `discover` for a Parquet file: the series of its first `limit` rows, read by row group. */
async function discoverParquet(path: string, columns: ColumnMap, limit: number): Promise<{ series: string[]; entity: boolean; header: string[] | null }> {
  const names = new Set<string>();
  let header: string[] | null = null;
  let at = -1;
  let rows = 0;
  try {
    await readParquetRows({
      path,
      display: path,
      onHeader: (h) => {
        header = [...h];
        at = h.indexOf(columns.series);
        return at < 0 ? [] : [columns.series];
      },
      onRow: (cells) => {
        if (at < 0 || rows >= limit) throw new HeadFull();
        rows++;
        const s = cells[at];
        if (s !== null && s !== "") names.add(String(s));
      },
    });
  } catch {
    // Cut short (HeadFull), or the reader proper says what is wrong with the file.
  }
  const h = header as string[] | null;
  return { series: [...names], entity: h !== null && h.includes(columns.entity), header: h };
}

/**
 * CSV records from text pieces (RFC 4180: quotes, doubled quotes, line breaks inside quotes).
 * `onRecord` returns false to stop.
 */
class CsvRecords {
  private field = "";
  private fields: string[] = [];
  private quoted = false;
  private afterQuote = false;
  private stopped = false;
  /** Characters of the record read so far: past the row limit the reader proper refuses the file. */
  private size = 0;
  constructor(private readonly onRecord: (fields: string[]) => boolean) {}

  push(text: string): boolean {
    for (let i = 0; i < text.length && !this.stopped; i++) {
      const c = text[i];
      if (++this.size > DEFAULT_ROW_LIMIT) {
        this.stopped = true;
        break;
      }
      if (this.quoted) {
        if (c === '"') {
          this.quoted = false;
          this.afterQuote = true;
        } else this.field += c;
      } else if (c === '"') {
        if (this.afterQuote) this.field += '"';
        this.quoted = true;
        this.afterQuote = false;
      } else if (c === ",") {
        this.fields.push(this.field);
        this.field = "";
        this.afterQuote = false;
      } else if (c === "\n") {
        this.end();
      } else if (c !== "\r") {
        this.field += c;
        this.afterQuote = false;
      }
    }
    return !this.stopped;
  }

  finish(): void {
    if (!this.stopped && (this.field !== "" || this.fields.length > 0)) this.end();
  }

  private end(): void {
    this.size = 0;
    this.fields.push(this.field);
    const fields = this.fields;
    this.field = "";
    this.fields = [];
    this.afterQuote = false;
    if (!this.onRecord(fields)) this.stopped = true;
  }
}

/** The largest time among the complete rows in the last 64 KiB of an uncompressed file, or null. */
async function tailTime(path: string, format: "csv" | "jsonl", columns: ColumnMap, header: string[] | null): Promise<number | null> {
  const handle = await open(path, "r");
  try {
    const size = (await handle.stat()).size;
    const length = Math.min(size, 1 << 16);
    const buf = Buffer.alloc(length);
    await handle.read(buf, 0, length, size - length);
    const lines = buf.toString("utf8").split("\n").slice(1);
    const timeAt = header?.indexOf(columns.time) ?? -1;
    let best = -Infinity;
    for (const line of lines) {
      let t = NaN;
      if (format === "csv") {
        if (timeAt < 0 || line.includes('"')) continue;
        t = Number(line.replace(/\r$/, "").split(",")[timeAt]);
      } else {
        try {
          t = Number((JSON.parse(line) as Record<string, unknown>)[columns.time]);
        } catch {
          continue;
        }
      }
      if (Number.isFinite(t) && t > best) best = t;
    }
    return Number.isFinite(best) ? best : null;
  } finally {
    await handle.close();
  }
}
