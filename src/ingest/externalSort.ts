/**
 * Events put into time order in bounded memory: an external merge sort.
 *
 *   add ─► buffer of at most `limit` events ─full─► sort ─► spill file (binary) ─┐
 *                                                                                ├─► k-way merge (heap) ─► drain
 *   finish: the buffer left, sorted in memory ───────────────────────────────────┘
 *
 * The order is (time, line, rank): time first; events at one time in the order of their rows in
 * the file; events of one row at one time by the rank of their column (`layouts.ts` ranks an
 * event column before the columns that pair with it as the second event). The key is unique,
 * so the order does not depend on how the events were cut into chunks.
 *
 * Memory bound: at most `limit` events in memory (three numbers and the entity id each, plus a
 * 4-byte index for the sort), and while merging one read buffer of `BLOCK` bytes per spill file,
 * at most `FAN` files at a time (more are first merged `FAN` at a time into larger files). With
 * the default limit, 1 048 576 events, that is about 60 MB for ids of about 10 characters.
 * Spill files go to a fresh folder under the system's temporary folder and are removed by
 * `close`, also after an error.
 */
import { closeSync, mkdtempSync, openSync, readSync, rmSync, writeSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";

/** Events held in memory by default. */
export const SORT_EVENTS = 1 << 20;

/** The events held in memory: `SOJOURN_SORT_EVENTS` when set (read at each sort, for tests and the bench), else `SORT_EVENTS`. */
export function sortEventsLimit(): number {
  const n = Math.floor(Number(process.env.SOJOURN_SORT_EVENTS));
  return n >= 1 ? n : SORT_EVENTS;
}
/** Spill files merged at a time. */
export const FAN = 64;
/** Read buffer per spill file while merging. */
const BLOCK = 1 << 16;
/** Bytes of one spilled event before its id: time, line (float64), route, rank, id length (int32). */
const HEAD = 28;

/** Receives events in order. */
export type EventSink = (time: number, line: number, route: number, id: string) => void;

export class EventSorter {
  // Grown by doubling up to `limit`, so that a small file costs little.
  private times: Float64Array;
  private lines: Float64Array;
  private routes: Int32Array;
  private ranks: Int32Array;
  private readonly ids: string[] = [];
  private n = 0;
  private folder: string | null = null;
  private spills: string[] = [];
  private spillCount = 0;
  /** The most events in memory at once, for tests of the bound. */
  peak = 0;

  constructor(readonly limit: number = sortEventsLimit()) {
    if (!(limit >= 1)) throw new Error(`EventSorter: limit ${limit} must be at least 1`);
    const size = Math.min(limit, 4096);
    this.times = new Float64Array(size);
    this.lines = new Float64Array(size);
    this.routes = new Int32Array(size);
    this.ranks = new Int32Array(size);
  }

  private grow(): void {
    const size = Math.min(this.limit, this.times.length * 2);
    const t = new Float64Array(size);
    t.set(this.times);
    this.times = t;
    const l = new Float64Array(size);
    l.set(this.lines);
    this.lines = l;
    const r = new Int32Array(size);
    r.set(this.routes);
    this.routes = r;
    const k = new Int32Array(size);
    k.set(this.ranks);
    this.ranks = k;
  }

  /** Spill files written (0 when everything fitted in memory). */
  get spilled(): number {
    return this.spillCount;
  }

  add(time: number, line: number, rank: number, route: number, id: string): void {
    if (this.n === this.limit) this.spill();
    else if (this.n === this.times.length) this.grow();
    const i = this.n++;
    this.times[i] = time;
    this.lines[i] = line;
    this.ranks[i] = rank;
    this.routes[i] = route;
    this.ids[i] = id;
    if (this.n > this.peak) this.peak = this.n;
  }

  /** The buffer's indices in (time, line, rank) order. */
  private sorted(): Uint32Array {
    const { times, lines, ranks } = this;
    const order = new Uint32Array(this.n);
    for (let i = 0; i < this.n; i++) order[i] = i;
    order.sort((a, b) => times[a] - times[b] || lines[a] - lines[b] || ranks[a] - ranks[b]);
    return order;
  }

  private spill(): void {
    this.folder ??= mkdtempSync(join(tmpdir(), "sojourn-sort-"));
    const path = join(this.folder, `chunk-${this.spillCount++}.bin`);
    const out = new SpillWriter(path);
    const order = this.sorted();
    for (let k = 0; k < order.length; k++) {
      const i = order[k];
      out.write(this.times[i], this.lines[i], this.routes[i], this.ranks[i], this.ids[i]);
    }
    out.close();
    this.ids.fill("", 0, this.n);
    this.n = 0;
    this.spills.push(path);
    if (this.spills.length >= FAN) {
      // Too many files to merge at once: merge these into one larger file.
      const merged = join(this.folder, `chunk-${this.spillCount++}.bin`);
      const w = new SpillWriter(merged);
      merge(this.spills.map((p) => new SpillReader(p)), (t, l, r, k, id) => w.write(t, l, r, k, id));
      w.close();
      for (const p of this.spills) rmSync(p, { force: true });
      this.spills = [merged];
    }
  }

  /** Gives every event to `sink` in order, then frees the spill files. */
  drain(sink: EventSink): void {
    try {
      if (this.spills.length === 0) {
        const order = this.sorted();
        for (let k = 0; k < order.length; k++) {
          const i = order[k];
          sink(this.times[i], this.lines[i], this.routes[i], this.ids[i]);
        }
        return;
      }
      if (this.n > 0) this.spill();
      merge(
        this.spills.map((p) => new SpillReader(p)),
        (t, l, r, _k, id) => sink(t, l, r, id),
      );
    } finally {
      this.close();
    }
  }

  /** Removes the spill files (safe to call more than once). */
  close(): void {
    this.n = 0;
    if (this.folder !== null) rmSync(this.folder, { recursive: true, force: true });
    this.folder = null;
    this.spills = [];
  }
}

type Spilled = (time: number, line: number, route: number, rank: number, id: string) => void;

/** K-way merge of sorted spill files with a binary heap on (time, line, rank). */
function merge(readers: SpillReader[], out: Spilled): void {
  const heap = readers.filter((r) => r.next());
  const less = (a: SpillReader, b: SpillReader) =>
    a.time < b.time || (a.time === b.time && (a.line < b.line || (a.line === b.line && a.rank < b.rank)));
  const down = (i: number) => {
    for (;;) {
      const l = 2 * i + 1;
      if (l >= heap.length) return;
      const r = l + 1;
      const m = r < heap.length && less(heap[r], heap[l]) ? r : l;
      if (!less(heap[m], heap[i])) return;
      [heap[m], heap[i]] = [heap[i], heap[m]];
      i = m;
    }
  };
  for (let i = (heap.length >> 1) - 1; i >= 0; i--) down(i);
  try {
    while (heap.length > 0) {
      const top = heap[0];
      out(top.time, top.line, top.route, top.rank, top.id);
      if (!top.next()) {
        top.close();
        const last = heap.pop()!;
        if (heap.length === 0) break;
        heap[0] = last;
      }
      down(0);
    }
  } finally {
    for (const r of readers) r.close();
  }
}

class SpillWriter {
  private readonly fd: number;
  private buf = Buffer.allocUnsafe(BLOCK);
  private at = 0;

  constructor(path: string) {
    this.fd = openSync(path, "wx", 0o600);
  }

  write(time: number, line: number, route: number, rank: number, id: string): void {
    const bytes = Buffer.byteLength(id, "utf8");
    if (this.at + HEAD + bytes > this.buf.length) {
      this.flush();
      if (HEAD + bytes > this.buf.length) this.buf = Buffer.allocUnsafe(HEAD + bytes);
    }
    const b = this.buf;
    b.writeDoubleLE(time, this.at);
    b.writeDoubleLE(line, this.at + 8);
    b.writeInt32LE(route, this.at + 16);
    b.writeInt32LE(rank, this.at + 20);
    b.writeInt32LE(bytes, this.at + 24);
    b.write(id, this.at + HEAD, bytes, "utf8");
    this.at += HEAD + bytes;
  }

  private flush(): void {
    let done = 0;
    while (done < this.at) done += writeSync(this.fd, this.buf, done, this.at - done);
    this.at = 0;
  }

  close(): void {
    this.flush();
    closeSync(this.fd);
  }
}

class SpillReader {
  private fd: number;
  private buf = Buffer.allocUnsafe(BLOCK);
  private at = 0;
  private len = 0;
  time = 0;
  line = 0;
  route = 0;
  rank = 0;
  id = "";

  constructor(path: string) {
    this.fd = openSync(path, "r");
  }

  /** Reads the next event into the fields; false at the end. */
  next(): boolean {
    if (!this.have(HEAD)) return false;
    const b = this.buf;
    const at = this.at;
    const bytes = b.readInt32LE(at + 24);
    if (!this.have(HEAD + bytes)) throw new Error("EventSorter: a spill file ends inside an event");
    const p = this.at;
    this.time = this.buf.readDoubleLE(p);
    this.line = this.buf.readDoubleLE(p + 8);
    this.route = this.buf.readInt32LE(p + 16);
    this.rank = this.buf.readInt32LE(p + 20);
    this.id = this.buf.toString("utf8", p + HEAD, p + HEAD + bytes);
    this.at = p + HEAD + bytes;
    return true;
  }

  /** Makes `n` bytes available from `at`; false when the file ends first. */
  private have(n: number): boolean {
    if (this.len - this.at >= n) return true;
    if (this.fd < 0) return false;
    const left = this.len - this.at;
    if (n > this.buf.length) {
      const bigger = Buffer.allocUnsafe(n);
      this.buf.copy(bigger, 0, this.at, this.len);
      this.buf = bigger;
    } else this.buf.copy(this.buf, 0, this.at, this.len);
    this.at = 0;
    this.len = left;
    while (this.len < n) {
      const got = readSync(this.fd, this.buf, this.len, this.buf.length - this.len, null);
      if (got === 0) return this.len - this.at >= n;
      this.len += got;
    }
    return true;
  }

  close(): void {
    if (this.fd >= 0) closeSync(this.fd);
    this.fd = -1;
  }
}
