import type { PairedSteps, WelchSteps } from "../stats/differenceSteps.js";
import type { IntervalSteps } from "../stats/interval.js";
import type { IntervalMethod, LeftOut, Results } from "./results.js";
import type { TraceLine } from "./trace.js";

/**
 * What a study run produces: `results.json` (typed as `Results`) plus everything the report and
 * the study record need beside it (input audit, table index, interval arithmetic, chart data).
 */

/** Audit of one input file. */
export interface InputRecord {
  scenario: string;
  run: string;
  /** Relative to the manifest's folder, `/` separators. */
  file: string;
  bytes: number;
  sha256: string;
  rows: number;
  left_out: LeftOut;
  /** Rows per series name, every series seen in the file. */
  series_rows: Record<string, number>;
}

/** One calculation table written under DIR/tables. */
export interface TableRecord {
  /** The scenario; the empty text for a response curve's table, which spans scenarios. */
  scenario: string;
  /** null for a scenario-level table (interval arithmetic). */
  run: string | null;
  measure: string;
  kind: string;
  /** Path relative to the report folder, `/` separators. */
  file: string;
  columns: string[];
  rows_total: number;
  rows_written: number;
  /** True when the table was shortened (head, checkpoints, tail). */
  shortened: boolean;
  sha256: string;
  /**
   * The rows the report page shows (all written rows when there are at most `PREVIEW_HEAD +
   * PREVIEW_TAIL`, else the first and the last, see `study/tables.ts`); null for the tables of a
   * scenario's runs after the first `PREVIEW_RUNS`, which are files only.
   */
  preview: (number | string | null)[][] | null;
  /**
   * Only on a comparison table (kind "comparison"; `scenario` is then side a and `run` null):
   * which comparison of results.json's `comparisons` it is (0-based) and its two sides.
   */
  comparison?: { index: number; a: string; b: string; method: string };
  /** Only on a response curve's table (kind "response-curve"): the factor the measure is drawn against. */
  curve?: { factor: string };
  /** Only on a selection's table (kind "selection"): which `select:` entry of the manifest it is (0-based). */
  selection?: { index: number };
}

/** Step-by-step arithmetic of one across-run interval, labelled with what it summarises. */
export interface IntervalArithmetic extends IntervalSteps {
  scenario: string;
  measure: string;
  /** What is summarised: "value", or a sub-figure such as "quantiles.0.9". */
  figure: string;
}

/**
 * One run's level over its whole window for the charts: the warm-up part too, every change point
 * while there are few, and equal slices with their lowest and highest level always (see
 * `measures/trace.ts`). For a utilization, `level` is the busy level and `capacity` the capacity.
 */
export interface LevelTrace {
  scenario: string;
  run: string;
  measure: string;
  /** The window's start, its collection start c (after warm-up) and its end. */
  start: number;
  from: number;
  to: number;
  warmup: number | null;
  level: TraceLine;
  capacity: TraceLine | null;
}

/** Observation values of one scenario and measure for the histogram (possibly a sample). */
export interface ObservationSample {
  scenario: string;
  measure: string;
  values: number[];
  total: number;
}

export interface Warning {
  scenario: string | null;
  run: string | null;
  measure: string | null;
  message: string;
}

/**
 * Step-by-step arithmetic of one comparison between scenarios, parallel to results.json's
 * `comparisons` (`index` is its position there), with the calculation table that holds it.
 */
export interface ComparisonArithmetic {
  index: number;
  measure: string;
  a: string;
  b: string;
  method: "paired" | "welch";
  /** The study's confidence, the number K of comparisons, and the level of each one, 1 − (1 − confidence)/K (Bonferroni). */
  confidence: number;
  comparisons: number;
  confidence_each: number;
  /** The calculation table (relative to the report folder), also listed in `StudyOutcome.tables`. */
  file: string;
  /** Runs of one side that have no run of the same id with a value on the other (paired only; empty for Welch). */
  unpaired: { scenario: string; run: string; value: number }[];
  steps: PairedSteps | WelchSteps;
}

export interface StudyOutcome {
  results: Results;
  inputs: InputRecord[];
  tables: TableRecord[];
  intervals: IntervalArithmetic[];
  /** The arithmetic of each comparison, in the order of results.json's `comparisons`. */
  comparisons: ComparisonArithmetic[];
  traces: LevelTrace[];
  samples: ObservationSample[];
  warnings: Warning[];
  readings: Readings;
}

/** What the interval of a comparison's difference a − b says. */
export type ComparisonReading = "higher" | "lower" | "no-difference" | "no-interval";

/** The lag-1 check of one run's batch means: within the limit, above it, or no lag-1 (too few batches). */
export interface BatchMeansReading {
  scenario: string;
  run: string;
  measure: string;
  lag1: "ok" | "too-large" | "none";
}

/** The share of the window's time at each value of a level, averaged over a scenario's runs. */
export interface TimeAtValueMean {
  scenario: string;
  measure: string;
  /** Runs with a time-at-value table (averaged), of the scenario's runs. */
  runs: number;
  of: number;
  shares: { value: number; share: number }[];
}

/**
 * The decisions the study made about its numbers (src/study/readings.ts), beside results.json
 * and not written to it: the report only puts them into words and pictures.
 */
export interface Readings {
  /** The lag-1 limit the batch-means check used. */
  lag1Limit: number;
  /** One per comparison, in the order of `results.comparisons`. */
  comparisons: ComparisonReading[];
  batchMeans: BatchMeansReading[];
  timeAtValue: TimeAtValueMean[];
  /** One per scenario and measure (the primary figure), scenario by scenario in results order. */
  summaries: SummaryReading[];
  /** What the report's opening sentences say. */
  brief: BriefReading;
}

/**
 * How a summary row's precision target stands: no target; met; missed (across runs: more runs
 * needed than made; batch means: the half-width is above the one aimed at); or not judged (no
 * number of runs or no half-width to judge by, `runs_needed_reason` says why).
 */
export type TargetReading = "none" | "met" | "missed" | "not-judged";

/** The study's reading of one summary row (scenario × measure, primary figure). */
export interface SummaryReading {
  scenario: string;
  measure: string;
  /** Which interval the row shows (results.json `interval_method`, absent read as "across-runs"). */
  method: IntervalMethod;
  /** The values the interval rests on: run values (runs with a value) or the k batch means of one run. */
  values: number;
  df: number | null;
  /** With batch means: the run they come from; null across runs. */
  run: string | null;
  mean: number | null;
  half_width: number | null;
  ci_low: number | null;
  ci_high: number | null;
  target: TargetReading;
  /** Across runs, when the target is missed: the runs it needs; null otherwise. */
  runsNeeded: number | null;
  /** Runs that gave a value, of the scenario's runs. */
  runs: number;
  of: number;
  runsWithoutValue: string[];
  runsEndingEarly: string[];
  /** Positions in `StudyOutcome.warnings` of the warnings about this scenario in this measure or in no one measure. */
  warnings: number[];
}

/** The facts of the report's opening sentences, as positions into the lists they come from. */
export interface BriefReading {
  scenarios: string[];
  measures: string[];
  /** Runs per scenario, in scenario order. */
  runs: number[];
  /** Positions in `results.comparisons` whose interval excludes 0, contains 0, or is missing. */
  significant: number[];
  notSignificant: number[];
  noInterval: number[];
  /** Positions in `summaries` whose precision target is missed, cannot be judged, or that have no interval. */
  targetsMissed: number[];
  targetsNotJudged: number[];
  withoutInterval: number[];
  /** Positions in `summaries` whose interval is from batch means. */
  fromBatchMeans: number[];
  warnings: number;
}
