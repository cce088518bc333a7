import type { TraceLine, TraceSlice, TraceStep } from "../outcome/trace.js";
import { Adder } from "../stats/adder.js";

export type { TraceLine, TraceSlice, TraceStep };

/** Most change points a trace keeps one by one; a longer run is drawn as a band of slices. */
export const TRACE_STEP_LIMIT = 2000;
/** Equal slices of the window a trace summarises (about one per horizontal pixel of the chart). */
export const TRACE_SLICES = 600;

/**
 * Keeps what a chart needs to draw one run's level exactly, in bounded memory: every change point
 * while there are at most `limit`, and always, for each of `slices` equal slices of [start, end],
 * the lowest and highest level held there, its area, and the area since c. A spike of one instant
 * in a run of a year thus keeps its height in its slice, whatever the run's length.
 *
 * It is fed the level's changes in time order (`change`), the warm-up included: the chart shows
 * the warm-up as a band. Areas after c are the same products, added in the same order, as the
 * calculation table's running area.
 */
export class TraceBuilder {
  private steps: TraceStep[] | null;
  private readonly low: Float64Array;
  private readonly high: Float64Array;
  private readonly area: Adder[];
  private readonly after: Adder[];
  private readonly running = new Adder();
  private time: number;
  private value: number;
  private min = Infinity;
  private max = -Infinity;
  private readonly span: number;
  /** The slice the last piece ended in, and its edges: most pieces lie within one slice. */
  private sliceAt = 0;
  private sliceFrom = Infinity;
  private sliceTo = -Infinity;

  constructor(
    private readonly start: number,
    private readonly c: number,
    private readonly end: number,
    initial: number,
    private readonly slices = TRACE_SLICES,
    private readonly limit = TRACE_STEP_LIMIT,
  ) {
    this.span = end - start;
    if (!(this.span > 0)) this.slices = 0;
    this.low = new Float64Array(this.slices).fill(Infinity);
    this.high = new Float64Array(this.slices).fill(-Infinity);
    this.area = Array.from({ length: this.slices }, () => new Adder());
    this.after = Array.from({ length: this.slices }, () => new Adder());
    this.time = start;
    this.value = initial;
    this.steps = [{ time: start, value: initial, area: 0 }];
  }

  /** The level becomes `value` at `time` (times in order, at most `end`). */
  change(time: number, value: number): void {
    if (time < this.start) {
      // Before the window opens a change only sets the level in effect at its start.
      this.value = value;
      if (this.steps !== null) this.steps[0].value = value;
      return;
    }
    this.piece(this.time, time, this.value);
    this.time = time;
    this.value = value;
    if (this.steps === null) return;
    this.steps.push({ time, value, area: this.running.value() });
    if (this.steps.length > this.limit) this.steps = null;
  }

  /** Closes the last interval at the window's end. */
  finish(): TraceLine {
    this.piece(this.time, this.end, this.value);
    this.time = this.end;
    const slices: TraceSlice[] = [];
    const since = new Adder();
    for (let j = 0; j < this.slices; j++) {
      const from = this.edge(j);
      const to = this.edge(j + 1);
      since.add(this.after[j].value());
      slices.push({ from, to, low: this.low[j], high: this.high[j], mean: this.area[j].value() / (to - from), area_to: since.value() });
    }
    const min = this.min === Infinity ? this.value : this.min;
    const max = this.max === -Infinity ? this.value : this.max;
    return { steps: this.steps, slices, min, max };
  }

  private edge(j: number): number {
    return j >= this.slices ? this.end : this.start + (this.span * j) / this.slices;
  }

  /** The level `v` held on [from, to]: its area after c, and its part in each slice it crosses. */
  private piece(from: number, to: number, v: number): void {
    if (!(to > from)) return;
    const lo = from > this.c ? from : this.c;
    if (to > lo) this.running.add(v * (to - lo));
    if (v < this.min) this.min = v;
    if (v > this.max) this.max = v;
    if (this.slices === 0) return;
    if (from >= this.sliceFrom && to <= this.sliceTo) {
      // Within the slice of the last piece: the loop below would find that slice and stop after it.
      this.slicePart(this.sliceAt, from, to, v, this.sliceFrom, this.sliceTo);
      return;
    }
    let j = Math.min(this.slices - 1, Math.max(0, Math.floor(((from - this.start) / this.span) * this.slices)));
    while (j > 0 && this.edge(j) > from) j--;
    while (j + 1 < this.slices && this.edge(j + 1) <= from) j++;
    for (; j < this.slices; j++) {
      const a = this.edge(j);
      if (a >= to) break;
      const b = this.edge(j + 1);
      this.slicePart(j, from, to, v, a, b);
      this.sliceAt = j;
      this.sliceFrom = a;
      this.sliceTo = b;
    }
  }

  /** The part of the level `v` on [from, to] that lies in slice `j`, [a, b]. */
  private slicePart(j: number, from: number, to: number, v: number, a: number, b: number): void {
    const p = from > a ? from : a;
    const q = to < b ? to : b;
    if (!(q > p)) return;
    if (v < this.low[j]) this.low[j] = v;
    if (v > this.high[j]) this.high[j] = v;
    this.area[j].add(v * (q - p));
    const pc = p > this.c ? p : this.c;
    if (q > pc) this.after[j].add(v * (q - pc));
  }
}
