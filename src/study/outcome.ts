import type { TraceLine } from "../measures/trace.js";
import type { PairedSteps, WelchSteps } from "../stats/differenceSteps.js";
import type { IntervalSteps, IntervalSummary } from "../stats/interval.js";

/**
 * What a study run produces: `results.json` (typed as `Results`) plus everything the report and
 * the study record need beside it (input audit, table index, interval arithmetic, chart data).
 */

/** A run measure as written to results.json. Extra keys beyond the contract are allowed. */
export interface LevelRunStats {
  kind: "level";
  value: number;
  mean: number;
  area: number;
  duration: number;
  sd: number;
  min: number;
  max: number;
  final: number;
  [extra: string]: unknown;
}
export interface UtilizationRunStats {
  kind: "utilization";
  value: number;
  mean: number;
  [extra: string]: unknown;
}
export interface ObservationRunStats {
  kind: "observation";
  /** null when the run has no observation in the window. */
  value: number | null;
  n: number;
  mean: number | null;
  sd: number | null;
  min: number | null;
  max: number | null;
  [extra: string]: unknown;
}
export interface CountRunStats {
  kind: "count";
  value: number;
  n: number;
  /** null when the run has no window end. */
  rate: number | null;
  [extra: string]: unknown;
}
export type RunStats = LevelRunStats | UtilizationRunStats | ObservationRunStats | CountRunStats;

export interface RunResult {
  id: string;
  file: string;
  sha256: string;
  start: number;
  end: number | null;
  measures: Record<string, RunStats>;
  [extra: string]: unknown;
}

/** Across-run summary of one figure. Interval fields are null with fewer than two runs. */
export interface Summary extends IntervalSummary {
  /**
   * Which interval the report shows for this row (only on the primary figure of a scenario with
   * `analysis: batch-means`; absent means "across-runs"): the contract's fields above, or
   * `batch_means` below. See docs/statistics.md, "Batch means inside long runs".
   */
  interval_method?: IntervalMethod;
  /** The batch-means interval of the scenario's single long run, when `interval_method` is "batch-means". */
  batch_means?: BatchMeansSummary;
  /** Why the row's interval is the one `interval_method` names (with batch means only). */
  interval_note?: string;
  [extra: string]: unknown;
}

/** "across-runs": the contract's summary fields (one value per run); "batch-means": one long run's batch means. */
export type IntervalMethod = "across-runs" | "batch-means";

/**
 * The interval of a single long run from its k batch means (t with k − 1 degrees of freedom):
 * the same numbers as the run's `batch_means` figures, under the scenario's summary.
 */
export interface BatchMeansSummary {
  method: "batch-means";
  /** The id of the run the batches come from. */
  run: string;
  /** k, the number of batch means. */
  batches: number;
  /** k − 1. */
  df: number | null;
  /** Grand mean of the batch means. */
  mean: number | null;
  /** Sample standard deviation of the batch means (k − 1 divisor). */
  sd: number | null;
  /** t(1 − α/2, k − 1). */
  t: number | null;
  half_width: number | null;
  ci_low: number | null;
  ci_high: number | null;
  /** Lag-1 autocorrelation of the batch means (the independence check). */
  lag1: number | null;
}

export interface ScenarioResult {
  name: string;
  runs: RunResult[];
  summary: Record<string, Summary>;
  [extra: string]: unknown;
}

export interface Results {
  format: "sojourn-results/1";
  title: string;
  time_unit: string;
  confidence: number;
  warmup: unknown;
  scenarios: ScenarioResult[];
  [extra: string]: unknown;
}

/** Why rows of a run file were not used. */
export interface LeftOut {
  /** Rows of series that measures read, after the window's end. */
  after_end: number;
  /** Rows of series that measures read, before the collection start c (warm-up or start):
   *  levels still take their value from them; observations and counts leave them out. */
  before_window: number;
  /** Rows of series no measure reads. */
  unused_series: number;
}

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
   * scenario's runs after the first `PREVIEW_RUNS`, which are files only, and for comparison
   * tables, whose arithmetic the page takes from `StudyOutcome.comparisons`.
   */
  preview: (number | string | null)[][] | null;
  /**
   * Only on a comparison table (kind "comparison"; `scenario` is then side a and `run` null):
   * which comparison of results.json's `comparisons` it is (0-based) and its two sides.
   */
  comparison?: { index: number; a: string; b: string; method: string };
}

/** Step-by-step arithmetic of one across-run interval, labelled with what it summarises. */
export interface IntervalArithmetic extends IntervalSteps {
  scenario: string;
  measure: string;
  /** What is summarised: "value", or a sub-figure such as "quantiles.0.9". */
  figure: string;
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
}
