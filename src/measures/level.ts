import { Adder } from "../stats/adder.js";
import * as msg from "../messages/study.js";
import type { LevelMeasure } from "../manifest/types.js";
import type { LevelRunStats } from "../outcome/index.js";
import type { MeasureAccumulator, MeasureOutput, SeriesRead } from "./accumulator.js";
import { type IntervalSink, LevelTracker } from "./intervals.js";
import { LevelStats } from "./levelStats.js";
import { levelShareTables } from "./levelTables.js";
import type { MeasureSetup } from "./setup.js";
import { EntityVisits } from "./visits.js";
import { SliceAreas, wholeSlices } from "./slices.js";
import { TableBuilder } from "./table.js";
import { TraceBuilder } from "./trace.js";

/** `line`: the run-file line of the row that set the interval's value (empty for the measure's `initial`; contract section 11). */
export const LEVEL_COLUMNS = ["index", "value", "from", "to", "duration", "area", "running_area", "running_mean", "line"];

/**
 * Everything one level's intervals feed: statistics, the calculation table, the chart trace, and
 * the slice areas for batch means and MSER-5.
 */
export class LevelSinks implements IntervalSink {
  readonly stats: LevelStats;
  readonly table: TableBuilder;
  private readonly running = new Adder();
  /** Reused for every row; numbers only (NaN for an empty cell) so doubles are stored unboxed. */
  private readonly cells: number[] = new Array<number>(LEVEL_COLUMNS.length).fill(0);
  /** The chart's record of the level, fed by the tracker with every change (warm-up included). */
  readonly trace: TraceBuilder | null;
  readonly batches: SliceAreas | null;
  readonly slices: SliceAreas | null;
  private index = 0;

  constructor(
    private readonly setup: MeasureSetup,
    thresholds: readonly number[],
    initial: number,
  ) {
    const { window: w } = setup;
    const end = w.end as number;
    this.stats = new LevelStats(thresholds);
    this.table = new TableBuilder(LEVEL_COLUMNS, setup.table.maxRows, setup.table.edgeRows);
    this.trace = setup.trace ? new TraceBuilder(w.start, w.collectFrom, end, initial) : null;
    const T = end - w.collectFrom;
    this.batches = setup.batches !== null ? new SliceAreas(w.collectFrom, T / setup.batches, setup.batches, end) : null;
    if (setup.slice !== null) {
      const { count, last } = wholeSlices(w.start, end, setup.slice);
      this.slices = new SliceAreas(w.start, setup.slice, count, last);
    } else this.slices = null;
  }

  interval(from: number, to: number, value: number, line: number): void {
    const d = to - from;
    const area = value * d;
    this.stats.interval(from, to, value);
    this.running.add(area);
    const runningArea = this.running.value();
    const elapsed = to - this.setup.window.collectFrom;
    const runningMean = elapsed > 0 ? runningArea / elapsed : NaN;
    const r = this.cells;
    r[0] = ++this.index;
    r[1] = value;
    r[2] = from;
    r[3] = to;
    r[4] = d;
    r[5] = area;
    r[6] = runningArea;
    r[7] = runningMean;
    r[8] = line;
    this.table.addNumbers(r);
    if (this.batches !== null) this.batches.interval(from, to, value);
    if (this.slices !== null) this.slices.interval(from, to, value);
  }

  /** Builds the output once the tracker has closed the last interval. */
  output(final: number, extra: Record<string, unknown> = {}): MeasureOutput {
    const w = this.setup.window;
    const end = w.end as number;
    const T = end - w.collectFrom;
    const f = this.stats.result(T);
    const stats: LevelRunStats = {
      kind: "level",
      value: f.mean,
      mean: f.mean,
      area: f.area,
      duration: T,
      sd: f.sd,
      min: f.min as number,
      max: f.max as number,
      final,
      ...extra,
    };
    if (Object.keys(f.timeAtLeast).length > 0) stats.time_at_least = f.timeAtLeast;
    if (f.timeAtValue !== null) stats.time_at_value = f.timeAtValue;
    const out: MeasureOutput = { stats, tables: [{ suffix: "", table: this.table.build() }, ...levelShareTables(f, T)], warnings: [] };
    out.resolution = { largestTime: this.stats.largestTime, smallestDuration: this.stats.smallestDuration };
    if (this.trace !== null) out.trace = { level: this.trace.finish(), capacity: null };
    if (this.batches !== null) out.batchMeans = this.batches.means();
    if (this.slices !== null) out.slices = this.slices.means();
    return out;
  }
}

/** A level read from one series: each row's value is the new level (contract section 2). */
export class SeriesLevel implements MeasureAccumulator {
  readonly reads: SeriesRead[];
  private readonly sinks: LevelSinks;
  private readonly tracker: LevelTracker;

  constructor(
    private readonly measure: LevelMeasure & { source: { type: "series" } },
    private readonly setup: MeasureSetup,
  ) {
    this.reads = [{ series: measure.source.series, entity: false }];
    this.sinks = new LevelSinks(setup, measure.atLeast, measure.initial);
    this.tracker = new LevelTracker(measure.initial, setup.window.collectFrom, setup.window.end as number, this.sinks, this.sinks.trace);
  }

  row(_slot: number, time: number, value: number, _entity: string | undefined, line: number): void {
    if (value !== value) throw msg.levelRowWithoutValue(this.setup.file, line, this.measure.source.series, this.measure.name);
    this.tracker.change(time, value, line);
  }

  finish(): MeasureOutput {
    return this.sinks.output(this.tracker.finish());
  }
}

/**
 * The number of entities that have had event `enter` and not yet event `leave` (contract
 * section 2), plus `initial`. Events are merged across the two series in time order.
 */
export class EntityLevel implements MeasureAccumulator {
  readonly reads: SeriesRead[];
  private readonly visits: EntityVisits;
  private readonly sinks: LevelSinks;
  private readonly tracker: LevelTracker;
  /** The area of the number inside alone (the level less `initial`), exact for whole numbers. */
  private readonly insideArea = new Adder();
  private readonly insideTracker: LevelTracker;
  private inside = 0;
  private entered = 0;
  private left = 0;

  constructor(
    private readonly measure: LevelMeasure & { source: { type: "entities" } },
    setup: MeasureSetup,
  ) {
    const c = setup.window.collectFrom;
    const end = setup.window.end as number;
    this.sinks = new LevelSinks(setup, measure.atLeast, measure.initial);
    this.tracker = new LevelTracker(measure.initial, c, end, this.sinks, this.sinks.trace);
    this.insideTracker = new LevelTracker(0, c, end, { interval: (from, to, value) => this.insideArea.add(value * (to - from)) });
    this.visits = new EntityVisits(
      measure.name,
      measure.source.enter,
      measure.source.leave,
      setup.file,
      (time, line) => {
        this.inside++;
        if (time >= c) this.entered++;
        this.tracker.change(time, measure.initial + this.inside, line);
        this.insideTracker.change(time, this.inside, line);
      },
      (time, _entity, _began, line) => {
        this.inside--;
        if (time >= c) this.left++;
        this.tracker.change(time, measure.initial + this.inside, line);
        this.insideTracker.change(time, this.inside, line);
      },
    );
    this.reads = this.visits.reads;
  }

  row(slot: number, time: number, _value: number, entity: string | undefined, line: number): void {
    this.visits.row(slot, time, entity, line);
  }

  finish(): MeasureOutput {
    this.visits.finish();
    this.insideTracker.finish();
    const out = this.sinks.output(this.tracker.finish(), { entered: this.entered, left: this.left, inside_at_end: this.inside });
    out.insideArea = this.insideArea.value();
    return out;
  }
}
