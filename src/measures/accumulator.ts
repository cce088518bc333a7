import type { BuiltTable } from "./table.js";
import type { RunStats } from "../outcome/index.js";
import type { TraceLine } from "./trace.js";

/**
 * One series a measure reads; `entity` asks the reader to decode the entity cell. The measure's
 * `where` filters the rows of every series it reads except those marked `unfiltered` (a capacity
 * series: the capacity is not a property of the entities the filter picks).
 */
export interface SeriesRead {
  series: string;
  entity: boolean;
  unfiltered?: boolean;
}

/** Where rows come from, for messages. */
export interface RowOrigin {
  file: string;
}

/**
 * The times and durations a measure worked with: the largest |time| of an interval or an entity
 * event, and the shortest positive duration (an interval's, or an entity's end − start). Their
 * ratio to ulp(largest time) says how many digits the durations keep (src/study/analyzeRun.ts).
 */
export interface Resolution {
  largestTime: number;
  /** Infinity when the measure formed no positive duration. */
  smallestDuration: number;
}

/** What a measure yields for one run. */
export interface MeasureOutput {
  stats: RunStats;
  /** The calculation tables of this run and measure: the main one first, extras after. */
  tables: { suffix: string; table: BuiltTable }[];
  /** The level over the window for the chart (for a utilization: the busy level and the capacity). */
  trace?: { level: TraceLine; capacity: TraceLine | null };
  /** Observation values in time order (for samples, batch means and MSER-5). */
  observations?: Float64Array;
  /** Observation times, aligned with `observations`. */
  observationTimes?: Float64Array;
  /** Batch means of this run when batch means were asked for. */
  batchMeans?: number[];
  /** Time averages of fixed-width slices from the window start (for MSER-5 and Welch's plot). */
  slices?: number[];
  /**
   * An entity level's area of the number inside alone, Σ insideᵢ·dᵢ (the level less its `initial`):
   * the L of Little's law (src/study/consistency.ts).
   */
  insideArea?: number;
  /** Absent for measures that form no durations (counts, observations of a series). */
  resolution?: Resolution;
  warnings: string[];
}

/**
 * A measure's accumulator for one run. The run reader calls `row` for every row of a series in
 * `reads` (slot = index in `reads`) whose time is not after the window's end, in file order;
 * then `finish` once.
 */
export interface MeasureAccumulator {
  readonly reads: SeriesRead[];
  row(slot: number, time: number, value: number, entity: string | undefined, line: number): void;
  finish(): MeasureOutput;
}
