/**
 * The figures of one run and measure as written to results.json (`runs[].measures`): closed
 * types, one per measure kind; every key the measures and the study write is declared here.
 */

/** Share of the window spent at each value of a level (few distinct values only). */
export interface TimeAtValue {
  value: number;
  /** Time at the value inside the window. */
  time: number;
  /** time / window length. */
  share: number;
}

/** Batch means inside one run (written by the study when the scenario asks for them). */
export interface BatchMeansFigures {
  batches: number;
  mean: number | null;
  half_width: number | null;
  ci_low: number | null;
  ci_high: number | null;
  /** Lag-1 correlation of the batch means; null with too few batches. */
  lag1: number | null;
  sd: number | null;
  df: number | null;
  t: number | null;
  /** The batch means Z₁, Z₂, … in time order. */
  batch_values: number[];
}

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
  /** Entity levels (`from: {enter, leave}`): entities that entered and left in the window, and inside at its end. */
  entered?: number;
  left?: number;
  inside_at_end?: number;
  /** Share of the window's time at or above each threshold (`at_least`), by threshold. */
  time_at_least?: Record<string, number>;
  time_at_value?: TimeAtValue[];
  batch_means?: BatchMeansFigures;
}

export interface UtilizationRunStats {
  kind: "utilization";
  value: number;
  mean: number;
  /** Area under the busy level and under the capacity. */
  area: number;
  capacity_area: number;
  duration: number;
  busy_mean: number;
  capacity_mean: number;
  /** The busy level at the window's end. */
  final: number;
  time_at_least?: Record<string, number>;
  time_at_value?: TimeAtValue[];
  /** Set when the busy level rose above the capacity for a positive time. */
  over_capacity?: OverCapacityFigures;
  batch_means?: BatchMeansFigures;
}

/** results.json `over_capacity`: how often and how long busy > capacity, and where it first happened. */
export interface OverCapacityFigures {
  intervals: number;
  time: number;
  /** The first such interval, and the run-file line of the row that started it (null: the window start). */
  first: { from: number; to: number; busy: number; capacity: number; line: number | null };
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
  /** Entity durations (`from: {start, end}`): entities with the start event but no end event. */
  censored?: number;
  /** Type-7 quantiles of the run's observations, by probability. */
  quantiles?: Record<string, number | null>;
  /** Share of the observations at or below each threshold, by threshold. */
  within?: Record<string, number | null>;
  batch_means?: BatchMeansFigures;
}

export interface CountRunStats {
  kind: "count";
  value: number;
  n: number;
  /** null when the run has no window end. */
  rate: number | null;
}

export type RunStats = LevelRunStats | UtilizationRunStats | ObservationRunStats | CountRunStats;
