/** The level of one run over its window, as the charts draw it (built by measures/trace.ts). */

/** A change point: the level `value` holds on [time, next time). */
export interface TraceStep {
  time: number;
  value: number;
  /** Area under the level from the collection start c up to `time` (0 up to c). */
  area: number;
}

/** One slice [from, to] of the window: the lowest and highest level held there for a positive time, and its time average. */
export interface TraceSlice {
  from: number;
  to: number;
  low: number;
  high: number;
  mean: number;
  /** Area under the level from c up to `to` (0 when `to` <= c): the running time average at `to` is area_to / (to - c). */
  area_to: number;
}

/** A level over the whole window [start, end], warm-up included, for the charts. */
export interface TraceLine {
  /** Every change point from the window start on, or null when there were more than TRACE_STEP_LIMIT. */
  steps: TraceStep[] | null;
  slices: TraceSlice[];
  /** Lowest and highest level held for a positive time in [start, end]. */
  min: number;
  max: number;
}
