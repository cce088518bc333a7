/**
 * The series of one run file as they are met: row counts, the time-order check, and delivery of
 * the rows of requested series to the sink.
 *
 * Series names are matched without making a string per row: a CSV cell's bytes are compared with
 * the series matched last, then looked up in an open-addressing hash table (h * 31 + byte) of the byte
 * strings seen. A string is made once per distinct series.
 *
 * The usual file has a handful of series: a cell is then compared in place with the few names that
 * start with its first byte (`matchKnown`), which needs no pass to find the cell's end. When more
 * than FEW names share a first byte (a file with thousands of series, `s000001`, `s000002`, ...)
 * the cell is hashed and looked up instead, so that each row costs the same however many distinct
 * names the file holds.
 */
import type { UserError } from "../messages/error.js";
import * as ingestMessages from "../messages/ingest.js";

/** What the reader asks for: see `SeriesRequest` in `readRun.ts`. */
export interface SeriesWanted {
  name: string;
  entity: boolean;
}

export type RowSink = (
  seriesIndex: number,
  time: number,
  value: number,
  entity: string | undefined,
  line: number,
) => void;

/** Builds the error for a time that goes down within a series. */
export type Decreased = (line: number, series: string, previous: number, time: number, previousLine: number) => UserError;

/** One distinct series of the file. */
export interface SeriesEntry {
  readonly name: string;
  rows: number;
  lastTime: number;
  lastLine: number;
  /** Index into the requests, or -1 when the series is not requested. */
  readonly request: number;
  /** Further requests of the same name (rare), or null. */
  readonly moreRequests: readonly number[] | null;
  /** Whether any request of this series wants the entity cell decoded. */
  readonly entity: boolean;
}

const SPACE = 32;
const TAB = 9;
const CR = 13;
const COMMA = 44;
const LF = 10;

/** Names sharing a first byte that are still compared one by one; more are looked up by hash. */
const FEW = 8;

export class SeriesTable {
  /** Data rows read, all series. */
  rows = 0;
  private readonly entries: SeriesEntry[] = [];
  private readonly byName = new Map<string, SeriesEntry>();
  private readonly requests = new Map<string, number[]>();
  /** The byte key matched last, or -1. */
  private lastKey = -1;
  // Byte-string keys: several keys may lead to one entry (invalid UTF-8 decodes to the same name).
  private slots = new Int32Array(64);
  private mask = 63;
  private readonly keyBytes: Buffer[] = [];
  private readonly keyHash: number[] = [];
  private readonly keyEntry: SeriesEntry[] = [];
  /**
   * For each first byte, the keys starting with it (indices), or undefined; a list is not grown past
   * FEW + 1 keys (then the hash table is used, see `matchKnown`). Keys never start with a space or a
   * tab (cells are trimmed before they become keys).
   */
  private readonly byFirstByte: (number[] | undefined)[] = new Array<number[] | undefined>(256).fill(undefined);
  /** Where the cell matched by the last successful `matchKnown` ends (its comma or line feed). */
  matchedEnd = 0;

  constructor(
    private readonly wanted: readonly SeriesWanted[],
    private readonly onRow: RowSink,
    private readonly display: string,
    /** The message for a time that decreases (default: the text formats', which count lines). */
    private readonly decreased: Decreased = (line, series, previous, time, previousLine) =>
      ingestMessages.timeDecreased(display, line, series, previous, time, previousLine),
  ) {
    wanted.forEach((w, i) => {
      const list = this.requests.get(w.name);
      if (list === undefined) this.requests.set(w.name, [i]);
      else list.push(i);
    });
  }

  /**
   * The series of the unquoted cell `buf[a..b)` (surrounding spaces trimmed), or null when blank.
   * `h` is `hashBytes(buf, a, b)`, computed by the caller while it looked for the cell's end.
   */
  lookupBytes(buf: Buffer, a: number, b: number, h: number): SeriesEntry | null {
    let c: number;
    if (a < b && ((c = buf[a]) === SPACE || c === TAB || (c = buf[b - 1]) === SPACE || c === TAB || c === CR)) {
      while (a < b && ((c = buf[a]) === SPACE || c === TAB)) a++;
      while (b > a && ((c = buf[b - 1]) === SPACE || c === TAB || c === CR)) b--;
      h = hashBytes(buf, a, b);
    }
    if (a === b) return null;
    const last = this.lastKey;
    if (last >= 0 && this.keyHash[last] === h && sameBytes(this.keyBytes[last], buf, a, b)) return this.keyEntry[last];
    const s = this.probe(buf, a, b, h);
    const k = this.slots[s];
    if (k !== 0) {
      this.lastKey = k - 1;
      return this.keyEntry[k - 1];
    }
    const bytes = Buffer.from(buf.subarray(a, b));
    const entry = this.entryFor(bytes.toString("utf8"));
    this.addKey(bytes, h, s, entry);
    return entry;
  }

  /**
   * The slot of the key with the bytes `buf[a..b)` (hash `h`), or the free slot where it would go:
   * `slots[result]` is then 0.
   */
  private probe(buf: Buffer, a: number, b: number, h: number): number {
    const mask = this.mask;
    const slots = this.slots;
    let s = spread(h) & mask;
    for (;;) {
      const k = slots[s];
      if (k === 0 || (this.keyHash[k - 1] === h && sameBytes(this.keyBytes[k - 1], buf, a, b))) return s;
      s = (s + 1) & mask;
    }
  }

  /** Adds a byte key (never starting or ending with a space, tab or carriage return) at free slot `s`. */
  private addKey(bytes: Buffer, h: number, s: number, entry: SeriesEntry): void {
    this.keyBytes.push(bytes);
    this.keyHash.push(h);
    this.keyEntry.push(entry);
    this.slots[s] = this.keyBytes.length;
    const sharing = (this.byFirstByte[bytes[0]] ??= []);
    if (sharing.length <= FEW) sharing.push(this.keyBytes.length - 1);
    if (this.keyBytes.length * 2 > this.slots.length) this.grow();
    this.lastKey = this.keyBytes.length - 1;
  }

  /**
   * Makes a name read from a quoted cell known by its bytes too, so that the next cells holding it
   * are matched in place. Names with spaces, tabs or carriage returns at either end are left out:
   * unquoted cells are trimmed, so their bytes must not match such a key. So are names holding a
   * comma, a line feed or a double quote, which no unquoted cell can hold (the bytes `a,b` of an
   * unquoted row are two cells, never the name `a,b`).
   */
  learnName(name: string, entry: SeriesEntry): void {
    if (name === "" || name !== name.replace(/^[ \t\r]+|[ \t\r]+$/g, "") || /[,\n"]/.test(name)) return;
    const bytes = Buffer.from(name, "utf8");
    const h = hashBytes(bytes, 0, bytes.length);
    const s = this.probe(bytes, 0, bytes.length, h);
    if (this.slots[s] !== 0) return; // known already
    this.addKey(bytes, h, s, entry);
  }

  /**
   * The series whose name is exactly the bytes from `p` up to the next comma or line feed, when
   * that name was seen before; else null (the caller then finds the cell's end and asks
   * `lookupBytes`, which also trims). Sets `matchedEnd` on a match.
   */
  matchKnown(buf: Buffer, p: number, end: number): SeriesEntry | null {
    if (p >= end) return null;
    const candidates = this.byFirstByte[buf[p]];
    if (candidates === undefined) return null;
    if (candidates.length > FEW) return this.matchHashed(buf, p, end);
    for (let j = 0; j < candidates.length; j++) {
      const k = candidates[j];
      const key = this.keyBytes[k];
      const stop = p + key.length;
      if (stop >= end) continue;
      const c = buf[stop];
      if (c !== COMMA && c !== LF) continue;
      let i = 1;
      while (i < key.length && key[i] === buf[p + i]) i++;
      if (i < key.length) continue;
      this.matchedEnd = stop;
      return this.keyEntry[k];
    }
    return null;
  }

  /** `matchKnown` for many names: finds the cell's end, hashing its bytes, and looks them up. */
  private matchHashed(buf: Buffer, p: number, end: number): SeriesEntry | null {
    let h = 0;
    let q = p;
    while (q < end) {
      const c = buf[q];
      if (c === COMMA || c === LF) break;
      h = (Math.imul(h, 31) + c) | 0;
      q++;
    }
    if (q >= end) return null;
    const k = this.slots[this.probe(buf, p, q, h)];
    if (k === 0) return null;
    this.lastKey = k - 1;
    this.matchedEnd = q;
    return this.keyEntry[k - 1];
  }

  /**
   * The series whose name is exactly the bytes `buf[a..b)` (a quoted cell, untrimmed), when that
   * name was seen before; else null.
   */
  matchExact(buf: Buffer, a: number, b: number): SeriesEntry | null {
    if (a >= b) return null;
    const candidates = this.byFirstByte[buf[a]];
    if (candidates === undefined) return null;
    if (candidates.length > FEW) {
      const k = this.slots[this.probe(buf, a, b, hashBytes(buf, a, b))];
      return k === 0 ? null : this.keyEntry[k - 1];
    }
    for (let j = 0; j < candidates.length; j++) {
      const k = candidates[j];
      if (sameBytes(this.keyBytes[k], buf, a, b)) return this.keyEntry[k];
    }
    return null;
  }

  /** The series of a decoded name (used as is), or null when empty. */
  lookupName(name: string): SeriesEntry | null {
    return name === "" ? null : this.entryFor(name);
  }

  private entryFor(name: string): SeriesEntry {
    let entry = this.byName.get(name);
    if (entry === undefined) {
      const requests = this.requests.get(name);
      entry = {
        name,
        rows: 0,
        lastTime: -Infinity,
        lastLine: 0,
        request: requests === undefined ? -1 : requests[0],
        moreRequests: requests === undefined || requests.length === 1 ? null : requests.slice(1),
        entity: requests !== undefined && requests.some((i) => this.wanted[i].entity),
      };
      this.byName.set(name, entry);
      this.entries.push(entry);
    }
    return entry;
  }

  /**
   * Counts a row, checks that its series' time does not decrease, and gives it to the sink when
   * the series is requested. `entity` is only looked at for series whose `entity` flag is set.
   */
  accept(entry: SeriesEntry, time: number, value: number, entity: string | undefined, line: number): void {
    this.rows++;
    entry.rows++;
    if (time < entry.lastTime) {
      throw this.decreased(line, entry.name, entry.lastTime, time, entry.lastLine);
    }
    entry.lastTime = time;
    entry.lastLine = line;
    if (entry.request < 0) return;
    if (entry.moreRequests === null) {
      this.onRow(entry.request, time, value, entity, line);
      return;
    }
    for (const i of [entry.request, ...entry.moreRequests]) {
      this.onRow(i, time, value, this.wanted[i].entity ? entity : undefined, line);
    }
  }

  /** Rows per series, in order of first appearance. */
  counts(): Record<string, number> {
    // A loop, not Object.fromEntries: several times faster for a file with 100 000s of series.
    const out: Record<string, number> = {};
    for (const e of this.entries) {
      if (e.name === "__proto__") Object.defineProperty(out, e.name, { value: e.rows, enumerable: true, writable: true, configurable: true });
      else out[e.name] = e.rows;
    }
    return out;
  }

  /** Whether any requested series wants its entity cell. */
  get wantsEntity(): boolean {
    return this.wanted.some((w) => w.entity);
  }

  /** Names of the requested series that want their entity cell. */
  get entitySeries(): string[] {
    return [...new Set(this.wanted.filter((w) => w.entity).map((w) => w.name))];
  }

  private grow(): void {
    const slots = new Int32Array(this.slots.length * 2);
    const mask = slots.length - 1;
    for (let k = 0; k < this.keyHash.length; k++) {
      let s = spread(this.keyHash[k]) & mask;
      while (slots[s] !== 0) s = (s + 1) & mask;
      slots[s] = k + 1;
    }
    this.slots = slots;
    this.mask = mask;
  }
}

/** The hash of a series cell: h = h * 31 + byte over its bytes, in 32-bit integers. */
export function hashBytes(buf: Uint8Array, a: number, b: number): number {
  let h = 0;
  for (let i = a; i < b; i++) h = (Math.imul(h, 31) + buf[i]) | 0;
  return h;
}

/** Mixes the high bits of a hash into the low ones, which pick the slot. */
function spread(h: number): number {
  return Math.imul(h ^ (h >>> 16), 0x45d9f3b) ^ (h >>> 15);
}

function sameBytes(key: Buffer, buf: Buffer, a: number, b: number): boolean {
  if (key.length !== b - a) return false;
  for (let i = 0; i < key.length; i++) if (key[i] !== buf[a + i]) return false;
  return true;
}
