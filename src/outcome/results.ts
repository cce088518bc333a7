import type { SelectionResult } from "../stats/selection.js";
import type { RunsNeededReason } from "../stats/runsNeeded.js";
import type { IntervalSummary } from "../stats/interval.js";
import type { RunStats } from "./runFigures.js";

/**
 * results.json (CONTRACT.md section 8 and its extensions), as closed types: every key the study
 * writes is declared, required or optional, so that no later phase has to re-check its shape.
 */

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

/** results.json `time_resolution` of a run. */
export interface TimeResolution {
  /** The largest |time| of an interval or entity event, and ulp of it. */
  largest_time: number;
  ulp: number;
  /** The shortest positive duration any measure formed. */
  smallest_duration: number;
  /** log10(smallest_duration / ulp): the significant digits that duration keeps. */
  digits: number;
}

export interface RunResult {
  id: string;
  file: string;
  sha256: string;
  start: number;
  end: number | null;
  /** Rows read and rows left out (CONTRACT.md section 3). */
  rows: number;
  left_out: LeftOut;
  measures: Record<string, RunStats>;
  /** The warm-up in force for this run, when there is one. */
  warmup?: number;
  /** Time of the run file's last row a measure reads; null without one (always written by the study). */
  last_row_time?: number | null;
  /** Set when the run's rows stop well before its window's end. */
  ends_early?: true;
  time_resolution?: TimeResolution;
}

/** A precision target as written: a half-width, or a relative error. */
export type TargetFigures = { half_width: number } | { relative: number };

/** Across-run summary of one figure. Interval fields are null with fewer than two runs. */
export interface Summary extends IntervalSummary {
  /** Runs that gave no value (left out of the interval), in code-unit order. */
  runs_without_value?: string[];
  /** Runs whose rows stop well before the window's end, in code-unit order. */
  runs_ending_early?: string[];
  /** Per-run quantiles, shares within and shares of time at least, summarised by key. */
  quantiles?: Record<string, Summary>;
  within?: Record<string, Summary>;
  time_at_least?: Record<string, Summary>;
  /** The measure's precision target and the runs it needs. */
  target?: TargetFigures;
  runs_needed?: number | null;
  runs_needed_reason?: RunsNeededReason | null;
  target_half_width?: number | null;
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

/** MSER-5 on the slice averages of a level or utilization (averaged over the runs). */
export interface SliceWarmupEstimate {
  method: "mser-5";
  measure: string;
  d: number;
  batches: number;
  time: number;
  slice: number;
  slice_means: number[];
  statistics: number[];
  at_limit: boolean;
}

/** MSER-5 on each run's observations; the scenario's warm-up is the latest first kept observation. */
export interface RunsWarmupEstimate {
  method: "mser-5";
  measure: string;
  d: number;
  batches: number;
  time: number;
  runs: { run: string; d: number; batches: number; time: number | null; at_limit: boolean }[];
}

export type WarmupEstimate = SliceWarmupEstimate | RunsWarmupEstimate;

/** One consistency check of one run (study/consistency.ts). */
export interface Check {
  check: "littles-law" | "conservation" | "utilization-range" | "level-non-negative";
  run: string;
  measure: string;
  passed: boolean;
  message: string;
  /** Little's law: whether it is an exact identity here (empty at both ends), and its two sides. */
  applies?: boolean;
  L?: number;
  lambda_w?: number;
  relative_difference?: number;
}

export interface ScenarioResult {
  name: string;
  runs: RunResult[];
  summary: Record<string, Summary>;
  /** The scenario's warm-up time (null: estimated as none); absent without a warm-up. */
  warmup?: number | null;
  warmup_estimate?: WarmupEstimate;
  analysis?: { method: "batch-means"; batches: number };
  checks?: Check[];
  /** The scenario's value of each factor (the manifest's `factors`), in the study's factor order; absent without factors. */
  factors?: Record<string, number>;
}

/**
 * One point of a response curve: one scenario's interval of the measure (the one its summary row
 * shows: across runs, or from the batch means of its single long run), placed at its factor value.
 */
export interface CurvePoint {
  scenario: string;
  /** The scenario's value of the curve's factor. */
  value: number;
  /** Mean and interval bounds, exactly the scenario's summary (null where the summary has none). */
  mean: number | null;
  ci_low: number | null;
  ci_high: number | null;
  /** The values the interval rests on: runs with a value, or the batches of one long run. */
  n: number;
  /** Only when the interval is from batch means ("batch-means"); absent: across runs. */
  interval_method?: IntervalMethod;
}

/** The points of one curve that share the values of the other factors, in ascending factor value. */
export interface CurveGroup {
  /** The values of the other factors, in the study's factor order (empty with one factor). */
  fixed: Record<string, number>;
  points: CurvePoint[];
}

/** A measure against one factor: one group per combination of the other factors with at least two points. */
export interface ResponseCurve {
  measure: string;
  factor: string;
  groups: CurveGroup[];
  /** Scenarios on no curve of this factor: their combination of the other factors has no second factor value. */
  alone?: string[];
}

/** One comparison of two scenarios in one measure (study/compare.ts). */
export interface Comparison {
  measure: string;
  a: string;
  b: string;
  method: "welch" | "paired";
  diff_mean: number | null;
  half_width: number | null;
  ci_low: number | null;
  ci_high: number | null;
  df: number | null;
  confidence_each: number;
  t: number | null;
  standard_error: number | null;
  n_a: number;
  n_b: number;
  mean_a: number | null;
  mean_b: number | null;
  /** Paired: the number of matched runs. */
  pairs?: number;
  /**
   * Only when a side has `analysis: batch-means`: what was compared ("batch-means": the batch
   * means of two single long runs, Welch on them; "across-runs": the run values), in words
   * (`values`), what that assumes, and the lag-1 checks of the two sets of batch means.
   */
  basis?: IntervalMethod;
  values?: string;
  assumes?: string;
  lag1_a?: number | null;
  lag1_b?: number | null;
  verdict: string;
}

/** The study's warm-up as written: none, a time, or the estimate asked for. */
export type WarmupAsWritten = number | null | { method: "mser-5"; measure: string; slice: number };

export interface Results {
  format: "sojourn-results/1";
  title: string;
  time_unit: string;
  confidence: number;
  warmup: WarmupAsWritten;
  scenarios: ScenarioResult[];
  comparisons?: Comparison[];
  /** Each measure against each factor (docs/manifest.md, "Factors and response curves"); absent without factors. */
  response_curves?: ResponseCurve[];
  /** The manifest's `select:` entries that could be computed, in order (docs/results.md); absent without `select:`. */
  selections?: SelectionEntry[];
}

/** One selection of the best: the measure it is on, then the procedure's result (stats/selection.ts). */
export type SelectionEntry = { measure: string } & SelectionResult;
