/**
 * Piecewise-constant levels as a stream of intervals.
 *
 * A level is given by change points (time, new value). `LevelTracker` turns them into the
 * intervals of the calculation table, clipped to the window [c, end]:
 *
 *   initial ──┬── changes before c only move the level in effect at c
 *             ├── each change at t >= c closes [from, t] with the old value (duration may be 0)
 *             └── finish() closes [from, end] with the final value
 *
 * A change exactly at c closes a zero-length interval [c, c]; ties at one time each leave a
 * zero-length interval, and the last one's value holds on (contract section 3).
 */

/** Receives every change of the level, before the window's collection start too (the chart's trace). */
export interface ChangeSink {
  change(time: number, value: number): void;
}

/**
 * Receives each closed interval in time order. `line` is the run-file line of the row that set the
 * interval's value (NaN when the value is the measure's `initial`).
 */
export interface IntervalSink {
  interval(from: number, to: number, value: number, line: number): void;
}

export class LevelTracker {
  private current: number;
  private from: number;
  /** The line of the row that set `current` (NaN: the initial value). */
  private line = NaN;

  constructor(
    initial: number,
    private readonly collectFrom: number,
    private readonly end: number,
    private readonly sink: IntervalSink,
    private readonly changes: ChangeSink | null = null,
  ) {
    this.current = initial;
    this.from = collectFrom;
  }

  /** The level becomes `value` at `time` by the row on `line` (time <= end; later rows never reach here). */
  change(time: number, value: number, line: number): void {
    if (time >= this.collectFrom) {
      this.sink.interval(this.from, time, this.current, this.line);
      this.from = time;
    }
    this.current = value;
    this.line = line;
    if (this.changes !== null) this.changes.change(time, value);
  }

  /** Closes the last interval at the window's end. Returns the final level. */
  finish(): number {
    this.sink.interval(this.from, this.end, this.current, this.line);
    return this.current;
  }

  get value(): number {
    return this.current;
  }
}

/** Sends every interval to several sinks. */
export class FanOut implements IntervalSink {
  constructor(private readonly sinks: IntervalSink[]) {}
  interval(from: number, to: number, value: number, line: number): void {
    for (const s of this.sinks) s.interval(from, to, value, line);
  }
}
