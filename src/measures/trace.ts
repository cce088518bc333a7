import type { TracePoint } from "./accumulator.js";

/**
 * Change points of one run's level for the step chart, at most `limit` of them: past the limit
 * every other point is dropped and the stride doubles (the chart says it is thinned).
 */
export class TraceBuilder {
  private points: TracePoint[] = [];
  private stride = 1;
  private seen = 0;
  thinned = false;

  constructor(private readonly limit = 4000) {}

  add(time: number, value: number, runningMean: number): void {
    const i = this.seen++;
    if (i % this.stride !== 0) return;
    this.points.push({ time, value, running_mean: runningMean });
    if (this.points.length > this.limit) {
      this.points = this.points.filter((_, j) => j % 2 === 0);
      this.stride *= 2;
      this.thinned = true;
    }
  }

  /** Adds the closing point (always kept). */
  close(time: number, value: number, runningMean: number): TracePoint[] {
    const last = this.points[this.points.length - 1];
    if (last === undefined || last.time !== time || last.value !== value) this.points.push({ time, value, running_mean: runningMean });
    return this.points;
  }
}
