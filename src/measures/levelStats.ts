import { Adder } from "../stats/adder.js";
import type { IntervalSink } from "./intervals.js";

/**
 * Time-weighted statistics of a level over the window [c, end] (contract section 4).
 *
 * - area = sum(v_i * d_i), compensated (Neumaier 1974);
 * - mean = area / T, the time average;
 * - sd = sqrt(sum(d_i * (v_i - mean)^2) / T), the time-weighted standard deviation, from
 *   compensated sums of d*(v-K) and d*(v-K)^2 shifted by K, the first value, so that a large
 *   constant offset does not cancel away the digits (Chan, Golub and LeVeque 1983, shifted data);
 * - min and max over intervals of positive duration; final value at end;
 * - the share of time with level >= k for each threshold k (issue 8), prorated like the area;
 * - time at each distinct value while there are at most `maxDistinct` of them.
 *
 * Example: value 2 on [0, 3] and 5 on [3, 4] gives area 21, mean 5.25, sd sqrt(27/16).
 */
export class LevelStats implements IntervalSink {
  readonly area = new Adder();
  private readonly duration = new Adder();
  private readonly shifted = new Adder();
  private readonly shiftedSq = new Adder();
  private shift = NaN;
  min = Infinity;
  max = -Infinity;
  private readonly atLeast: Adder[];
  private readonly atLeastIntervals: number[];
  private timeAtValue: Map<number, Adder> | null = new Map();

  constructor(
    private readonly thresholds: readonly number[] = [],
    private readonly maxDistinct = 100,
  ) {
    this.atLeast = thresholds.map(() => new Adder());
    this.atLeastIntervals = thresholds.map(() => 0);
  }

  interval(from: number, to: number, value: number): void {
    const d = to - from;
    if (Number.isNaN(this.shift)) this.shift = value;
    if (d > 0) {
      if (value < this.min) this.min = value;
      if (value > this.max) this.max = value;
    }
    this.area.add(value * d);
    this.duration.add(d);
    const dv = value - this.shift;
    this.shifted.add(d * dv);
    this.shiftedSq.add(d * dv * dv);
    for (let i = 0; i < this.thresholds.length; i++) {
      if (value >= this.thresholds[i] && d > 0) {
        this.atLeast[i].add(d);
        this.atLeastIntervals[i]++;
      }
    }
    if (this.timeAtValue !== null && d > 0) {
      let a = this.timeAtValue.get(value);
      if (a === undefined) {
        if (this.timeAtValue.size >= this.maxDistinct) {
          this.timeAtValue = null;
          return;
        }
        a = new Adder();
        this.timeAtValue.set(value, a);
      }
      a.add(d);
    }
  }

  /** Statistics over a window of duration T (T > 0). */
  result(T: number): LevelFigures {
    const area = this.area.value();
    const mean = area / T;
    const m1 = this.shifted.value() / T;
    const variance = Math.max(0, this.shiftedSq.value() / T - m1 * m1);
    const timeAtLeast: Record<string, number> = {};
    const atLeastDetail = this.thresholds.map((k, i) => ({ threshold: k, intervals: this.atLeastIntervals[i], time: this.atLeast[i].value() }));
    for (const a of atLeastDetail) timeAtLeast[String(a.threshold)] = a.time / T;
    let timeAtValue: { value: number; time: number; share: number }[] | null = null;
    if (this.timeAtValue !== null) {
      timeAtValue = [...this.timeAtValue.entries()]
        .sort((a, b) => a[0] - b[0])
        .map(([value, t]) => ({ value, time: t.value(), share: t.value() / T }));
    }
    return {
      area,
      mean,
      sd: Math.sqrt(variance),
      min: this.min === Infinity ? null : this.min,
      max: this.max === -Infinity ? null : this.max,
      timeAtLeast,
      atLeastDetail,
      timeAtValue,
    };
  }
}

export interface LevelFigures {
  area: number;
  mean: number;
  sd: number;
  min: number | null;
  max: number | null;
  timeAtLeast: Record<string, number>;
  /** For each threshold: the intervals of positive duration at or above it and their total time. */
  atLeastDetail: { threshold: number; intervals: number; time: number }[];
  timeAtValue: { value: number; time: number; share: number }[] | null;
}
