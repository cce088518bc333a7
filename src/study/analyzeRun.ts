import { readRun, type SeriesRequest } from "../ingest/readRun.js";
import type { MeasureAccumulator, MeasureOutput } from "../measures/accumulator.js";
import { createAccumulator } from "../measures/create.js";
import type { MeasureSetup } from "../measures/setup.js";
import { makeWindow, type RunWindow } from "../measures/window.js";
import type { Measure, RunRef, Scenario, TableOptions } from "../manifest/types.js";
import type { InputRecord, RunResult } from "../outcome/index.js";
import { nonFinitePath } from "./finite.js";
import { closest } from "../manifest/didYouMean.js";
import * as studyMessages from "../messages/study.js";
import * as warn from "../messages/warnings.js";
import { DURATION_DIGITS_WARNING, endsEarly, LATE_FRACTION, timeResolution } from "./runChecks.js";
import { runTablePath, type TableFile, tableFile } from "./tables.js";

/** What to compute for one run. */
export interface RunPlan {
  scenario: Scenario;
  run: RunRef;
  /** The warm-up time in force for this run (fixed or estimated), or null. */
  warmup: number | null;
  measures: Measure[];
  tables: TableOptions;
  /** Keep level traces for the charts (the first run of each scenario). */
  trace: boolean;
  /** Batch means per run with this many batches, or null. */
  batches: number | null;
  /** Slice width for MSER-5 / Welch slice averages, or null. */
  slice: number | null;
  /** Keep observation times (the MSER-5 pass on an observation measure); default false. */
  observationTimes?: boolean;
}

export interface RunAnalysis {
  result: RunResult;
  input: InputRecord;
  window: RunWindow;
  outputs: Map<string, MeasureOutput>;
  warnings: { measure: string | null; message: string }[];
  /**
   * The run's calculation tables as files (CSV text and digest), made where the run was analysed
   * so that a worker thread formats them; absent when the analysis came from a run summary.
   */
  tableFiles?: TableFile[];
}

/**
 * The event pairs whose times on one row of an `entities` file must not go backwards: each
 * measure's `from` (first event, second event).
 */
export function pairsOf(measures: readonly Measure[]): [string, string][] {
  const pairs: [string, string][] = [];
  for (const m of measures) {
    if (m.kind === "count" || m.source.type !== "entities") continue;
    const s = m.source;
    pairs.push("start" in s ? [s.start, s.end] : [s.enter, s.leave]);
  }
  return pairs;
}

/** The calculation tables of one analysed run as files, in measure order. */
export function runTableFiles(scenario: string, a: Pick<RunAnalysis, "result" | "outputs">, measures: Measure[]): TableFile[] {
  const files: TableFile[] = [];
  for (const m of measures) {
    for (const t of a.outputs.get(m.name)!.tables) {
      const where = { scenario, run: a.result.id, measure: m.name, kind: t.suffix || m.kind };
      files.push(tableFile(where, runTablePath(scenario, a.result.id, m.name, t.suffix), t.table));
    }
  }
  return files;
}

/**
 * Reads one run file once and feeds every measure's accumulator:
 *
 *   file ──readRun──▶ router (series → accumulators) ──▶ accumulators ──finish──▶ outputs
 *
 * Rows after the window's end are counted and never reach a measure (contract section 3).
 * `readerThread: false` keeps a large file's parsing in this thread (see `readRun`).
 */
export async function analyzeRun(plan: RunPlan, options: { readerThread?: boolean } = {}): Promise<RunAnalysis> {
  const { run, scenario } = plan;
  const window = makeWindow(run.start, run.end, plan.warmup);
  const setup: MeasureSetup = {
    window,
    file: run.file,
    table: plan.tables,
    trace: plan.trace,
    batches: plan.batches,
    slice: plan.slice,
    observationTimes: plan.observationTimes ?? false,
  };
  const accumulators: [Measure, MeasureAccumulator][] = plan.measures.map((m) => [m, createAccumulator(m, setup)]);

  // One entry per distinct series name and `where`: the accumulators (and their slots) that read it.
  const requests: SeriesRequest[] = [];
  const targets: { acc: MeasureAccumulator; slot: number }[][] = [];
  const bySeries = new Map<string, number>();
  for (const [m, acc] of accumulators) {
    acc.reads.forEach((read, slot) => {
      const where = read.unfiltered === true ? null : m.where;
      const key = where === null ? read.series : `${read.series}\u0000${JSON.stringify(where)}`;
      let i = bySeries.get(key);
      if (i === undefined) {
        i = requests.length;
        bySeries.set(key, i);
        requests.push(where === null ? { name: read.series, entity: false } : { name: read.series, entity: false, where });
        targets.push([]);
      }
      if (read.entity) requests[i].entity = true;
      targets[i].push({ acc, slot });
    });
  }

  const end = window.end ?? Infinity;
  const c = window.collectFrom;
  let afterEnd = 0;
  let beforeWindow = 0;
  /** The latest time of any row the measures read, after the end too (-Infinity: none). */
  let lastRow = -Infinity;
  const report = await readRun({
    readerThread: options.readerThread,
    path: run.path,
    display: run.file,
    columns: scenario.columns,
    maxRowBytes: scenario.maxRowBytes,
    layout: { layout: scenario.layout, pairs: pairsOf(plan.measures) },
    series: requests,
    onRow(seriesIndex, time, value, entity, line) {
      if (time > lastRow) lastRow = time;
      if (time > end) {
        afterEnd++;
        return;
      }
      if (time < c) beforeWindow++;
      const list = targets[seriesIndex];
      for (let k = 0; k < list.length; k++) list[k].acc.row(list[k].slot, time, value, entity, line);
    },
  });

  const outputs = new Map<string, MeasureOutput>();
  const warnings: RunAnalysis["warnings"] = [];
  // Keyed by user-given names: no prototype, so a measure may even be called "__proto__".
  const measures: RunResult["measures"] = Object.create(null);
  for (const [m, acc] of accumulators) {
    const missing = acc.reads.filter((r) => !Object.hasOwn(report.seriesRows, r.series)).map((r) => r.series);
    if (missing.length > 0) {
      warnings.push({
        measure: m.name,
        message: `series ${missing.map((s) => `"${s}"`).join(", ")} never appears in ${run.file}; measure "${m.name}" sees no rows of it in this run`,
      });
    }
    // A capacity series absent from the run with no capacity before its first row would end in
    // "zero capacity area": say that the name is probably wrong instead.
    if (m.kind === "utilization" && m.capacity.type === "series" && m.capacity.initial === 0 && missing.includes(m.capacity.series)) {
      const names = Object.keys(report.seriesRows);
      throw studyMessages.capacitySeriesAbsent(run.file, m.name, m.capacity.series, closest(m.capacity.series, names));
    }
    const out = acc.finish();
    const overflow = nonFinitePath(out.stats);
    if (overflow !== null) throw studyMessages.runFigureOverflow(run.file, m.name, overflow);
    for (const w of out.warnings) warnings.push({ measure: m.name, message: w });
    outputs.set(m.name, out);
    measures[m.name] = out.stats;
  }

  let requested = 0;
  // Own keys only: a series may be called "toString" or "constructor". Each name once (a series
  // may be requested with several `where`s).
  for (const name of new Set(requests.map((r) => r.name))) if (Object.hasOwn(report.seriesRows, name)) requested += report.seriesRows[name];
  const input: InputRecord = {
    scenario: scenario.name,
    run: run.id,
    file: run.file,
    bytes: report.bytes,
    sha256: report.sha256,
    rows: report.rows,
    left_out: { after_end: afterEnd, before_window: beforeWindow, unused_series: report.rows - requested },
    series_rows: report.seriesRows,
  };
  const result: RunResult = {
    id: run.id,
    file: run.file,
    sha256: report.sha256,
    start: run.start,
    end: run.end,
    // Rows read and rows left out (CONTRACT.md section 3: rows after the end are reported).
    rows: input.rows,
    left_out: input.left_out,
    measures,
  };
  if (window.warmup !== null) result.warmup = window.warmup;
  const last = lastRow === -Infinity ? null : lastRow;
  result.last_row_time = last;
  if (window.end !== null && last !== null && endsEarly(last, run.start, window.end)) {
    result.ends_early = true;
    warnings.push({ measure: null, message: warn.runEndsEarly(run.file, last, window.end, run.start, LATE_FRACTION) });
  }
  const resolution = timeResolution(outputs.values());
  if (resolution !== null) {
    result.time_resolution = resolution;
    if (resolution.digits < DURATION_DIGITS_WARNING) {
      warnings.push({
        measure: null,
        message: warn.durationDigits(run.file, resolution.digits, resolution.largest_time, resolution.ulp, resolution.smallest_duration, DURATION_DIGITS_WARNING),
      });
    }
  }
  return { result, input, window, outputs, warnings, tableFiles: runTableFiles(scenario.name, { result, outputs }, plan.measures) };
}
