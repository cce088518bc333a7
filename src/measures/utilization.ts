import { Adder } from "../stats/adder.js";
import * as msg from "../messages/study.js";
import { busyAboveCapacity, type OverCapacity } from "../messages/warnings.js";
import type { UtilizationMeasure } from "../manifest/types.js";
import type { UtilizationRunStats } from "../outcome/index.js";
import type { MeasureAccumulator, MeasureOutput, SeriesRead } from "./accumulator.js";
import { EventMerge } from "./events.js";
import { EntityVisits } from "./visits.js";
import { LevelStats } from "./levelStats.js";
import { levelShareTables } from "./levelTables.js";
import type { MeasureSetup } from "./setup.js";
import { SliceAreas, wholeSlices } from "./slices.js";
import { TableBuilder } from "./table.js";
import { TraceBuilder } from "./trace.js";

/**
 * `line`: the run-file line of the row that started the interval (empty at the window's start when
 * no row set the level yet); with a capacity series, `changed` names the series of that row.
 */
export const UTILIZATION_COLUMNS = [
  "index", "value", "capacity", "from", "to", "duration", "area", "capacity_area",
  "running_area", "running_capacity_area", "running_mean", "running_utilization", "line",
];
export const UTILIZATION_SERIES_COLUMNS = [...UTILIZATION_COLUMNS, "changed"];

const BUSY = 0;
const CAPACITY = 1;
/** Busy changes from entity events (`from: {enter, leave}`), by the event that made them. */
const ENTERED = 2;
const LEFT = 3;

/**
 * Utilization = area(busy) / area(capacity) over the window (contract sections 2 and 4).
 *
 * The busy level and the capacity (a constant, or a level of its own series) are followed
 * together: every change of either closes an interval on which both are constant, so the table
 * shows both areas side by side. Example: busy 1 on [0, 4] and 2 on [4, 10] with capacity 2 gives
 * busy area 16, capacity area 20, utilization 0.8.
 *
 * With `from: {enter, leave}` (contract section 9) the busy level is the number of entities that
 * have had the first event and not yet the second, paired per entity as for a level measure
 * (`EntityVisits`): each start adds 1, each end takes 1 away.
 *
 * The rows are followed as they come. With two series (busy and capacity, or entity events and
 * capacity) an `EventMerge` puts their changes in time order; at one time a capacity row comes
 * before the entity events' changes.
 */
export class Utilization implements MeasureAccumulator {
  readonly reads: SeriesRead[];
  /** Merges the changes of two sources (busy or entity events, and a capacity series); null with one. */
  private readonly events: EventMerge | null;
  /** The merge input of the capacity series. */
  private readonly capacityInput: number;
  /** The entity visits behind the busy level, with `from: {enter, leave}`; else null. */
  private readonly visits: EntityVisits | null;
  /** The reads slot of the capacity series (-1: a constant capacity). */
  private readonly capacitySlot: number;
  private busy: number;
  private capacity: number;
  private from: number;
  private readonly c: number;
  private readonly end: number;
  private index = 0;
  /** The line of the latest row of either series, and which one it was (NaN / -1: none yet). */
  private line = NaN;
  private changedKind = -1;
  private readonly busyStats: LevelStats;
  private readonly busyArea = new Adder();
  private readonly capacityArea = new Adder();
  private readonly table: TableBuilder;
  /** Reused for every row; numbers only (NaN for an empty cell) so doubles are stored unboxed. */
  private readonly cells: number[] = new Array<number>(UTILIZATION_COLUMNS.length).fill(0);
  /** With a capacity series: the row with the `changed` cell (text), filled from `cells`. */
  private readonly seriesRow: (number | string | null)[] | null;
  /** The chart's record of the busy level and of the capacity, warm-up included. */
  private readonly busyTrace: TraceBuilder | null;
  private readonly capacityTrace: TraceBuilder | null;
  private readonly batchBusy: SliceAreas | null = null;
  private readonly batchCapacity: SliceAreas | null = null;
  private readonly sliceBusy: SliceAreas | null = null;
  private readonly sliceCapacity: SliceAreas | null = null;
  /** Intervals of positive duration where busy > capacity: the first one and how many, how long. */
  private over: OverCapacity | null = null;
  private readonly overTime = new Adder();

  constructor(
    private readonly measure: UtilizationMeasure,
    private readonly setup: MeasureSetup,
  ) {
    const cap = measure.capacity;
    const source = measure.source;
    if (source.type === "series") {
      this.visits = null;
      this.reads = [{ series: source.series, entity: false }];
    } else {
      // The busy level follows the entities: +1 at each start, -1 at each end, in time order.
      let inside = measure.initial;
      const busyInput = 1;
      const changed = (time: number, kind: number, value: number, line: number) => {
        if (this.events === null) this.change(time, kind, value, line);
        else this.events.add(busyInput, time, kind, value, undefined, line);
      };
      this.visits = new EntityVisits(
        measure.name,
        source.enter,
        source.leave,
        setup.file,
        (time, line) => changed(time, ENTERED, ++inside, line),
        (time, _entity, _began, line) => changed(time, LEFT, --inside, line),
      );
      this.reads = [...this.visits.reads];
    }
    this.capacitySlot = cap.type === "series" ? this.reads.length : -1;
    if (cap.type === "series") this.reads.push({ series: cap.series, entity: false, unfiltered: true });
    const change = (time: number, kind: number, value: number, _entity: string | undefined, line: number) => this.change(time, kind, value, line);
    // Busy rows and capacity rows: in file order at one time. Entity events and capacity rows:
    // the capacity first at one time (input 0).
    if (cap.type !== "series") this.events = null;
    else this.events = this.visits === null ? new EventMerge(2, "arrival", change) : new EventMerge(2, "input", change);
    this.capacityInput = this.visits === null ? 1 : 0;
    this.busy = measure.initial;
    this.capacity = cap.type === "constant" ? cap.value : cap.initial;
    this.c = setup.window.collectFrom;
    this.end = setup.window.end as number;
    this.from = this.c;
    this.busyStats = new LevelStats(measure.atLeast);
    this.seriesRow = cap.type === "series" ? new Array<number | string | null>(UTILIZATION_SERIES_COLUMNS.length).fill(null) : null;
    this.table = new TableBuilder(this.seriesRow !== null ? UTILIZATION_SERIES_COLUMNS : UTILIZATION_COLUMNS, setup.table.maxRows, setup.table.edgeRows);
    const { start } = setup.window;
    this.busyTrace = setup.trace ? new TraceBuilder(start, this.c, this.end, this.busy) : null;
    this.capacityTrace = setup.trace ? new TraceBuilder(start, this.c, this.end, this.capacity) : null;
    const T = this.end - this.c;
    if (setup.batches !== null) {
      this.batchBusy = new SliceAreas(this.c, T / setup.batches, setup.batches, this.end);
      this.batchCapacity = new SliceAreas(this.c, T / setup.batches, setup.batches, this.end);
    }
    if (setup.slice !== null) {
      const { count, last } = wholeSlices(setup.window.start, this.end, setup.slice);
      this.sliceBusy = new SliceAreas(setup.window.start, setup.slice, count, last);
      this.sliceCapacity = new SliceAreas(setup.window.start, setup.slice, count, last);
    }
  }

  row(slot: number, time: number, value: number, entity: string | undefined, line: number): void {
    if (this.visits !== null && slot !== this.capacitySlot) {
      this.visits.row(slot, time, entity, line);
      return;
    }
    if (value !== value) throw msg.levelRowWithoutValue(this.setup.file, line, this.reads[slot].series, this.measure.name);
    if (this.events === null) this.change(time, BUSY, value, line);
    else if (slot === this.capacitySlot) this.events.add(this.capacityInput, time, CAPACITY, value, undefined, line);
    else this.events.add(0, time, BUSY, value, undefined, line);
  }

  /** The series of the row behind a change of `kind`. */
  private seriesOfKind(kind: number): string {
    if (kind === CAPACITY) return this.reads[this.capacitySlot].series;
    if (kind === ENTERED || kind === LEFT) return this.reads[kind - ENTERED].series;
    return this.reads[0].series;
  }

  private change(time: number, kind: number, value: number, line: number): void {
    if (time >= this.c) {
      this.close(time);
      this.from = time;
    }
    this.line = line;
    this.changedKind = kind;
    if (kind !== CAPACITY) {
      this.busy = value;
      if (this.busyTrace !== null) this.busyTrace.change(time, value);
    } else {
      this.capacity = value;
      if (this.capacityTrace !== null) this.capacityTrace.change(time, value);
    }
  }

  private close(to: number): void {
    const from = this.from;
    const d = to - from;
    const busy = this.busy;
    const cap = this.capacity;
    const area = busy * d;
    const capArea = cap * d;
    this.busyStats.interval(from, to, busy);
    if (d > 0 && busy > cap) this.noteOverCapacity(from, to, d, busy, cap);
    this.busyArea.add(area);
    this.capacityArea.add(capArea);
    const runningArea = this.busyArea.value();
    const runningCap = this.capacityArea.value();
    const elapsed = to - this.c;
    const r = this.cells;
    r[0] = ++this.index;
    r[1] = busy;
    r[2] = cap;
    r[3] = from;
    r[4] = to;
    r[5] = d;
    r[6] = area;
    r[7] = capArea;
    r[8] = runningArea;
    r[9] = runningCap;
    r[10] = elapsed > 0 ? runningArea / elapsed : NaN;
    r[11] = runningCap !== 0 ? runningArea / runningCap : NaN;
    r[12] = this.line;
    const s = this.seriesRow;
    if (s === null) this.table.addNumbers(r);
    else {
      for (let j = 0; j < r.length; j++) s[j] = r[j] === r[j] ? r[j] : null;
      s[r.length] = this.changedKind === -1 ? null : this.seriesOfKind(this.changedKind);
      this.table.add(s);
    }
    if (this.batchBusy !== null) {
      this.batchBusy.interval(from, to, busy);
      this.batchCapacity!.interval(from, to, cap);
    }
    if (this.sliceBusy !== null) {
      this.sliceBusy.interval(from, to, busy);
      this.sliceCapacity!.interval(from, to, cap);
    }
  }

  /**
   * A busy level above the capacity is a warning however the areas come out: the ratio of areas
   * can hide it (busy 3 against capacity 2 for a while, busy 0 against 2 otherwise, utilization
   * below 1). Intervals of duration 0 are left out: at a tie of a busy and a capacity row the
   * order in the file decides which changes first, not the model.
   */
  private noteOverCapacity(from: number, to: number, d: number, busy: number, cap: number): void {
    if (this.over === null) {
      const line = this.line === this.line ? this.line : null;
      const series = this.changedKind === -1 || this.reads.length === 1 ? null : this.seriesOfKind(this.changedKind);
      this.over = { intervals: 0, time: 0, from, to, busy, capacity: cap, line, series };
    }
    this.over.intervals++;
    this.overTime.add(d);
  }

  finish(): MeasureOutput {
    this.visits?.finish();
    this.events?.finish();
    this.close(this.end);
    const T = this.end - this.c;
    const busyArea = this.busyArea.value();
    const capacityArea = this.capacityArea.value();
    if (!(capacityArea > 0)) throw msg.capacityNotPositive(this.setup.file, this.measure.name);
    const f = this.busyStats.result(T);
    const u = busyArea / capacityArea;
    const stats: UtilizationRunStats = {
      kind: "utilization",
      value: u,
      mean: u,
      area: busyArea,
      capacity_area: capacityArea,
      duration: T,
      busy_mean: busyArea / T,
      capacity_mean: capacityArea / T,
      final: this.busy,
    };
    if (Object.keys(f.timeAtLeast).length > 0) stats.time_at_least = f.timeAtLeast;
    if (f.timeAtValue !== null) stats.time_at_value = f.timeAtValue;
    const out: MeasureOutput = { stats, tables: [{ suffix: "", table: this.table.build() }, ...levelShareTables(f, T)], warnings: [] };
    out.resolution = { largestTime: this.busyStats.largestTime, smallestDuration: this.busyStats.smallestDuration };
    if (this.over !== null) {
      const o = { ...this.over, time: this.overTime.value() };
      stats.over_capacity = { intervals: o.intervals, time: o.time, first: { from: o.from, to: o.to, busy: o.busy, capacity: o.capacity, line: o.line } };
      out.warnings.push(busyAboveCapacity(this.measure.name, this.setup.file, o, u));
    }
    if (this.busyTrace !== null) out.trace = { level: this.busyTrace.finish(), capacity: this.capacityTrace!.finish() };
    if (this.batchBusy !== null) out.batchMeans = ratio(this.batchBusy, this.batchCapacity!);
    if (this.sliceBusy !== null) out.slices = ratio(this.sliceBusy, this.sliceCapacity!);
    return out;
  }
}

function ratio(busy: SliceAreas, capacity: SliceAreas): number[] {
  return busy.areas.map((a, j) => a.value() / capacity.areas[j].value());
}
