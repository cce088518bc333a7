/**
 * Layouts (contract section 9): the ways a run file's rows become the event rows of section 1.
 * Each layout is a `RecordSink`, so any reader that gives records (`records.ts`) feeds it, and
 * each ends in the same `RowRouter`, so the measures see event rows whatever the layout:
 *
 *   reader ─records─► EventsLayout ──────────────────────────────┐
 *                  ─► EntitiesLayout ─► EventSorter (time order) ─┼─► RowRouter ─► measures
 *                  ─► LevelsLayout ───────────────────────────────┘
 *
 * - events: one row is one event (time, series, value, entity), plus attribute columns for `where`.
 * - entities: one row is one entity (or visit): an id column and one time column per event. The
 *   event columns are the series the measures read; every other column is an attribute. Each
 *   non-empty cell of an event column is an event at that time; they are put in time order by an
 *   external sort in bounded memory (`externalSort.ts`). On one row, for each measure's
 *   `from: {start: A, end: B}` or `{enter: A, leave: B}`, B earlier than A is an input error;
 *   other pairs of columns are not compared (the contract gives the columns no order).
 * - levels: one row is one instant: a time column (must not decrease) and one column per level
 *   series, each non-empty cell that level's new value from the row's time on.
 *
 * Every event row carries the line of the file row it came from.
 */
import { tmpdir } from "node:os";
import type { ColumnMap } from "../manifest/types.js";
import * as ingestMessages from "../messages/ingest.js";
import { parseDecimalText } from "./decimal.js";
import { EventSorter } from "./externalSort.js";
import type { LayoutOptions } from "./readTypes.js";
import type { Cell, RecordSink } from "./records.js";
import type { RowRouter, SeriesSlot } from "./rowRouter.js";

/** A layout as its reader drives it, with `close` to free what it holds (after an error too). */
export interface LayoutSink extends RecordSink {
  close(): void;
}

/** The layout of `options` ending in `router`. */
export function layoutSink(options: LayoutOptions, router: RowRouter, columns: ColumnMap, display: string): LayoutSink {
  switch (options.layout) {
    case "events":
      return new EventsLayout(router, columns, display);
    case "entities":
      return new EntitiesLayout(router, columns, display, options);
    case "levels":
      return new LevelsLayout(router, columns, display);
  }
}

/** A cell as a number: NaN when empty, undefined when not a finite decimal number. */
function numberOf(cell: Cell): number | undefined {
  if (cell === null) return NaN;
  if (typeof cell === "number") return Number.isFinite(cell) ? cell : undefined;
  if (typeof cell === "string") return parseDecimalText(cell);
  return undefined;
}

function textOf(cell: Cell): string {
  return typeof cell === "string" ? cell : String(cell);
}

/** Header checks shared by the layouts: the columns each needs, and every `where` column. */
function checkHeader(found: readonly string[] | null, display: string, needed: { role: string; name: string }[], router: RowRouter): void {
  if (found === null) return;
  const missing = needed.filter((c) => !found.includes(c.name));
  if (missing.length > 0) throw ingestMessages.missingColumns(display, missing, found);
  for (const a of router.attributes) if (!found.includes(a)) throw ingestMessages.whereColumnMissing(display, a, found);
}

/** `layout: events` read as records: used when a measure filters rows with `where`. */
class EventsLayout implements LayoutSink {
  readonly wanted: string[];
  readonly numeric: boolean[];

  constructor(
    private readonly router: RowRouter,
    private readonly columns: ColumnMap,
    private readonly display: string,
  ) {
    this.wanted = [columns.time, columns.series, columns.value, columns.entity, ...router.attributes];
    this.numeric = this.wanted.map((_, k) => k === 0 || k === 2);
  }

  header(found: readonly string[] | null): void {
    const c = this.columns;
    checkHeader(found, this.display, [{ role: "time", name: c.time }, { role: "series", name: c.series }], this.router);
  }

  record(cells: readonly Cell[], line: number): void {
    const file = this.display;
    const time = numberOf(cells[0]);
    if (time === undefined) throw ingestMessages.notANumber(file, line, "time", textOf(cells[0]));
    if (time !== time) throw ingestMessages.missingTime(file, line);
    if (cells[1] === null) throw ingestMessages.emptySeries(file, line);
    const value = numberOf(cells[2]);
    if (value === undefined) throw ingestMessages.notANumber(file, line, "value", textOf(cells[2]));
    const entity = cells[3] === null ? undefined : textOf(cells[3]);
    const slot = this.router.slot(textOf(cells[1]));
    this.router.deliver(this.router.route(slot, cells, 4), time, value, entity, line);
  }

  finish(): void {}
  close(): void {}
}

/** `layout: entities`: see the module comment. */
class EntitiesLayout implements LayoutSink {
  readonly wanted: string[];
  readonly numeric: boolean[];
  private readonly events: string[];
  private readonly slots: (SeriesSlot | undefined)[];
  /** The order of the event columns at one time on one row: a pair's first before its second. */
  private readonly rank: Int32Array;
  private readonly pairs: [number, number][];
  private readonly times: Float64Array;
  private readonly sorter: EventSorter;

  constructor(
    private readonly router: RowRouter,
    private readonly columns: ColumnMap,
    private readonly display: string,
    options: LayoutOptions,
  ) {
    this.events = router.requestedNames;
    this.wanted = [columns.entity, ...this.events, ...router.attributes];
    this.numeric = this.wanted.map((_, k) => k >= 1 && k <= this.events.length);
    this.slots = new Array<SeriesSlot | undefined>(this.events.length).fill(undefined);
    this.times = new Float64Array(this.events.length);
    this.pairs = options.pairs
      .map(([a, b]): [number, number] => [this.events.indexOf(a), this.events.indexOf(b)])
      .filter(([a, b]) => a >= 0 && b >= 0 && a !== b);
    this.rank = ranks(this.events.length, this.pairs);
    this.sorter = new EventSorter(options.sortEvents);
  }

  header(found: readonly string[] | null): void {
    checkHeader(found, this.display, [{ role: "entity", name: this.columns.entity }], this.router);
  }

  record(cells: readonly Cell[], line: number): void {
    const file = this.display;
    if (cells[0] === null) throw ingestMessages.entityIdEmpty(file, line, this.columns.entity);
    const id = textOf(cells[0]);
    const n = this.events.length;
    const times = this.times;
    for (let k = 0; k < n; k++) {
      const t = numberOf(cells[1 + k]);
      if (t === undefined) throw ingestMessages.eventTimeNotANumber(file, line, this.events[k], textOf(cells[1 + k]));
      times[k] = t;
    }
    for (const [a, b] of this.pairs) {
      if (times[b] < times[a]) throw ingestMessages.eventsBackwards(file, line, this.events[a], times[a], this.events[b], times[b]);
    }
    for (let k = 0; k < n; k++) {
      const t = times[k];
      if (t !== t) continue;
      const slot = (this.slots[k] ??= this.router.slot(this.events[k]));
      const route = this.router.route(slot, cells, 1 + n);
      this.sorted(() => this.sorter.add(t, line, this.rank[k], route, id));
    }
  }

  finish(): void {
    const router = this.router;
    // The rows delivered may fail (an input error of a measure): those errors pass as they are.
    let delivering = false;
    this.sorted(
      () =>
        this.sorter.drain((time, line, route, id) => {
          delivering = true;
          router.deliver(route, time, NaN, id, line);
          delivering = false;
        }),
      () => delivering,
    );
  }

  /** Runs a step of the sort; an error of the file system (its chunk files) becomes the user's message. */
  private sorted(step: () => void, passThrough: () => boolean = () => false): void {
    try {
      step();
    } catch (e) {
      const code = (e as { code?: unknown } | null)?.code;
      const syscall = (e as { syscall?: unknown } | null)?.syscall;
      if (passThrough() || typeof syscall !== "string") throw e;
      throw ingestMessages.sortFilesFailed(this.display, tmpdir(), typeof code === "string" ? code : undefined, this.sorter.limit);
    }
  }

  close(): void {
    this.sorter.close();
  }
}

/**
 * Ranks of `n` columns such that the first of each pair ranks before the second where the pairs
 * allow it (a topological order; a cycle is broken at the column named first), else in order.
 */
function ranks(n: number, pairs: readonly [number, number][]): Int32Array {
  const rank = new Int32Array(n).fill(-1);
  let next = 0;
  const placed = (k: number) => rank[k] >= 0;
  while (next < n) {
    // The first column not placed whose every predecessor is placed; else the first not placed.
    const ready = [...Array(n).keys()].find((c) => !placed(c) && pairs.every(([a, b]) => b !== c || placed(a) || a === c));
    const k = ready ?? [...Array(n).keys()].find((c) => !placed(c))!;
    rank[k] = next++;
  }
  return rank;
}

/** `layout: levels`: see the module comment. */
class LevelsLayout implements LayoutSink {
  readonly wanted: string[];
  readonly numeric: boolean[];
  private readonly levels: string[];
  private readonly slots: (SeriesSlot | undefined)[];
  private lastTime = -Infinity;
  private lastLine = 0;

  constructor(
    private readonly router: RowRouter,
    private readonly columns: ColumnMap,
    private readonly display: string,
  ) {
    this.levels = router.requestedNames;
    this.wanted = [columns.time, ...this.levels, ...router.attributes];
    this.numeric = this.wanted.map((_, k) => k <= this.levels.length);
    this.slots = new Array<SeriesSlot | undefined>(this.levels.length).fill(undefined);
  }

  header(found: readonly string[] | null): void {
    checkHeader(found, this.display, [{ role: "time", name: this.columns.time }], this.router);
  }

  record(cells: readonly Cell[], line: number): void {
    const file = this.display;
    const time = numberOf(cells[0]);
    if (time === undefined) throw ingestMessages.notANumber(file, line, "time", textOf(cells[0]));
    if (time !== time) throw ingestMessages.missingTime(file, line);
    if (time < this.lastTime) throw ingestMessages.levelTimeDecreased(file, line, this.columns.time, this.lastTime, time, this.lastLine);
    this.lastTime = time;
    this.lastLine = line;
    const n = this.levels.length;
    for (let k = 0; k < n; k++) {
      const cell = cells[1 + k];
      if (cell === null) continue;
      const v = numberOf(cell);
      if (v === undefined) throw ingestMessages.levelNotANumber(file, line, this.levels[k], textOf(cell));
      const slot = (this.slots[k] ??= this.router.slot(this.levels[k]));
      this.router.deliver(this.router.route(slot, cells, 1 + n), time, v, undefined, line);
    }
  }

  finish(): void {}
  close(): void {}
}
