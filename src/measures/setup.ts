import type { RunWindow } from "./window.js";

/** Everything a measure accumulator needs to know about the run it reads. */
export interface MeasureSetup {
  window: RunWindow;
  /** The run file as shown in messages. */
  file: string;
  table: { maxRows: number; edgeRows: number };
  /** Keep the level trace for the chart. */
  trace: boolean;
  /** Batch means with this many batches (issue 4), or null. */
  batches: number | null;
  /** Slice width for MSER-5 / Welch slice averages over [start, end], or null. */
  slice: number | null;
  /** Keep each observation's time too (MSER-5 on observations needs it; 8 bytes an observation). */
  observationTimes: boolean;
}
