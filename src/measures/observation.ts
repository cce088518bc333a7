import { Adder } from "../stats/adder.js";
import { describe } from "../stats/moments.js";
import * as msg from "../messages/study.js";
import type { ObservationMeasure } from "../manifest/types.js";
import type { ObservationRunStats } from "../outcome/index.js";
import type { MeasureAccumulator, MeasureOutput, SeriesRead } from "./accumulator.js";
import type { MeasureSetup } from "./setup.js";
import { EntityVisits } from "./visits.js";
import { type Cell, TableBuilder } from "./table.js";
import { observationExtras } from "./quantiles.js";

/**
 * Growable typed arrays of the observation values, in the order recorded, and their times when
 * asked for (`keepTimes`).
 */
class Observations {
  times: Float64Array;
  values = new Float64Array(1024);
  n = 0;
  constructor(private readonly keepTimes: boolean) {
    this.times = new Float64Array(keepTimes ? 1024 : 0);
  }
  push(time: number, value: number): void {
    if (this.n === this.values.length) {
      if (this.keepTimes) {
        const t = new Float64Array(this.n * 2);
        t.set(this.times);
        this.times = t;
      }
      const v = new Float64Array(this.n * 2);
      v.set(this.values);
      this.values = v;
    }
    if (this.keepTimes) this.times[this.n] = time;
    this.values[this.n++] = value;
  }
}

/** `line`: the run-file line of the row that made the observation (for an entity: its end event; `start_line` its start event). */
export const OBSERVATION_COLUMNS = ["index", "time", "value", "running_sum", "running_mean", "line"];
export const ENTITY_OBSERVATION_COLUMNS = ["index", "time", "entity", "start_time", "value", "running_sum", "running_mean", "line", "start_line"];

/** Shared end of both observation kinds: statistics from the recorded values. */
function observationOutput(
  measure: ObservationMeasure,
  setup: MeasureSetup,
  obs: Observations,
  table: TableBuilder,
  extra: Record<string, unknown>,
): MeasureOutput {
  const values = obs.values.subarray(0, obs.n);
  const d = describe(values);
  const stats: ObservationRunStats = { kind: "observation", value: d.mean, n: d.n, mean: d.mean, sd: d.sd, min: d.min, max: d.max, ...extra };
  const tables = [{ suffix: "", table: table.build() }];
  const extras = observationExtras(values, measure.quantiles, measure.within, setup.table);
  if (extras.quantiles !== undefined) stats.quantiles = extras.quantiles;
  if (extras.within !== undefined) stats.within = extras.within;
  tables.push(...extras.tables);
  const out: MeasureOutput = { stats, tables, warnings: [], observations: values };
  if (setup.observationTimes) out.observationTimes = obs.times.subarray(0, obs.n);
  return out;
}

/** Each row of one series is one observation (contract section 2). */
export class SeriesObservation implements MeasureAccumulator {
  readonly reads: SeriesRead[];
  private readonly obs: Observations;
  private readonly running = new Adder();
  private readonly table: TableBuilder;
  /** Reused for every row; numbers only so doubles are stored unboxed. */
  private readonly cells: number[] = new Array<number>(OBSERVATION_COLUMNS.length).fill(0);

  constructor(
    private readonly measure: ObservationMeasure & { source: { type: "series" } },
    private readonly setup: MeasureSetup,
  ) {
    this.reads = [{ series: measure.source.series, entity: false }];
    this.table = new TableBuilder(OBSERVATION_COLUMNS, setup.table.maxRows, setup.table.edgeRows);
    this.obs = new Observations(setup.observationTimes);
  }

  row(_slot: number, time: number, value: number, _entity: string | undefined, line: number): void {
    if (value !== value) throw msg.observationRowWithoutValue(this.setup.file, line, this.measure.source.series, this.measure.name);
    if (time < this.setup.window.collectFrom) return;
    this.obs.push(time, value);
    this.running.add(value);
    const sum = this.running.value();
    const r = this.cells;
    r[0] = this.obs.n;
    r[1] = time;
    r[2] = value;
    r[3] = sum;
    r[4] = sum / this.obs.n;
    r[5] = line;
    this.table.addNumbers(r);
  }

  finish(): MeasureOutput {
    return observationOutput(this.measure, this.setup, this.obs, this.table, {});
  }
}

/**
 * For each entity, time of its `end` event minus time of its `start` event, recorded at the end
 * event's time (contract section 2). Entities still open at the window's end are censored:
 * counted and reported.
 */
export class EntityObservation implements MeasureAccumulator {
  readonly reads: SeriesRead[];
  private readonly visits: EntityVisits;
  private readonly obs: Observations;
  private readonly running = new Adder();
  private readonly table: TableBuilder;
  /** Reused for every table row. */
  private readonly cells: Cell[] = new Array<Cell>(ENTITY_OBSERVATION_COLUMNS.length);
  private readonly resolution = { largestTime: 0, smallestDuration: Infinity };

  constructor(
    private readonly measure: ObservationMeasure & { source: { type: "entities" } },
    private readonly setup: MeasureSetup,
  ) {
    const c = setup.window.collectFrom;
    this.obs = new Observations(setup.observationTimes);
    this.table = new TableBuilder(ENTITY_OBSERVATION_COLUMNS, setup.table.maxRows, setup.table.edgeRows);
    this.visits = new EntityVisits(
      measure.name,
      measure.source.start,
      measure.source.end,
      setup.file,
      () => {},
      (time, entity, began, line, startLine) => {
        if (time < c) return;
        this.ended(time, entity, began, line, startLine);
      },
    );
    this.reads = this.visits.reads;
  }

  row(slot: number, time: number, _value: number, entity: string | undefined, line: number): void {
    this.visits.row(slot, time, entity, line);
  }

  /** An entity's visit ended inside the window: one observation, one table row. */
  private ended(time: number, entity: string, began: number, line: number, startLine: number): void {
    const { obs, resolution } = this;
    const value = time - began;
    if (value > 0 && value < resolution.smallestDuration) resolution.smallestDuration = value;
    const far = Math.max(Math.abs(time), Math.abs(began));
    if (far > resolution.largestTime) resolution.largestTime = far;
    obs.push(time, value);
    this.running.add(value);
    const sum = this.running.value();
    const row = this.cells;
    row[0] = obs.n;
    row[1] = time;
    row[2] = entity;
    row[3] = began;
    row[4] = value;
    row[5] = sum;
    row[6] = sum / obs.n;
    row[7] = line;
    row[8] = startLine;
    this.table.add(row);
  }

  finish(): MeasureOutput {
    const open = this.visits.finish();
    const out = observationOutput(this.measure, this.setup, this.obs, this.table, { censored: open });
    out.resolution = this.resolution;
    return out;
  }
}
