import { Adder } from "../stats/adder.js";
import type { IntervalSink } from "./intervals.js";

/**
 * Time-weighted statistics of a level over the window [c, end] (contract section 4).
 *
 * - area = sum(v_i * d_i), compensated (Neumaier 1974);
 * - mean = area / T, the time average;
 * - sd = sqrt(sum(d_i * (v_i - mean)^2) / T), the time-weighted standard deviation, by West's
 *   weighted update of the mean and the sum of squared deviations (West 1979, "Updating mean and
 *   variance estimates: an improved method", Communications of the ACM 22(9)), each step adding
 *   d * delta^2 * W / (W + d) for the weight W before it and delta = v - running mean: every term
 *   is >= 0 and no two nearly equal numbers are subtracted, so nothing cancels. (Sums of d*(v-K)
 *   and d*(v-K)^2 shifted by the first value K cancelled when K was far from the rest: a level 0
 *   on [c, c] and 7 from then on got sd 1.2e-7 instead of 0.) The running mean is kept as an
 *   unevaluated sum of two doubles (hi + lo, each update added by Knuth's two-sum): a level near
 *   1e9 that changes by 1e-3 has deviations about 1e-12 of the mean, and a mean rounded to one
 *   double (ulp 1.2e-7) put an error of about 1e-4 into every deviation, which left the sd about
 *   5 significant digits; with the second double the deviations keep about 15;
 * - min and max over intervals of positive duration; final value at end;
 * - the share of time with level >= k for each threshold k (issue 8), prorated like the area;
 * - time at each distinct value while there are at most `maxDistinct` of them.
 *
 * Example: value 2 on [0, 3] and 5 on [3, 4] gives area 11, mean 2.75, sd sqrt(27/16).
 */
export class LevelStats implements IntervalSink {
  readonly area = new Adder();
  private readonly duration = new Adder();
  /** West's running weight (time), weighted mean (meanHigh + meanLow) and sum of d * squared deviations. */
  private weight = 0;
  private meanHigh = 0;
  private meanLow = 0;
  private readonly squares = new Adder();
  min = Infinity;
  max = -Infinity;
  private readonly atLeast: Adder[];
  private readonly atLeastIntervals: number[];
  private timeAtValue: Map<number, Adder> | null = new Map();
  /** The largest |time| of an interval of positive duration and the shortest such duration. */
  largestTime = 0;
  smallestDuration = Infinity;

  constructor(
    private readonly thresholds: readonly number[] = [],
    private readonly maxDistinct = 100,
  ) {
    this.atLeast = thresholds.map(() => new Adder());
    this.atLeastIntervals = thresholds.map(() => 0);
  }

  interval(from: number, to: number, value: number): void {
    const d = to - from;
    if (d > 0) {
      if (d < this.smallestDuration) this.smallestDuration = d;
      const far = Math.max(Math.abs(from), Math.abs(to));
      if (far > this.largestTime) this.largestTime = far;
      if (value < this.min) this.min = value;
      if (value > this.max) this.max = value;
      const before = this.weight;
      this.weight += d;
      // value − hi is one rounding of the exact difference, so delta keeps its relative accuracy.
      const delta = value - this.meanHigh - this.meanLow;
      this.addToMean(delta * (d / this.weight)); // exactly `value` on the first interval
      this.squares.add(d * delta * delta * (before / this.weight));
    }
    this.area.add(value * d);
    this.duration.add(d);
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

  /**
   * meanHigh + meanLow += x, the rounding error of the high part carried in the low part (two-sum:
   * D. E. Knuth, The Art of Computer Programming vol. 2, section 4.2.2, cited from memory), then renormalised so that
   * |meanLow| stays within half an ulp of meanHigh.
   */
  private addToMean(x: number): void {
    const hi = this.meanHigh;
    const s = hi + x;
    const back = s - hi;
    const error = hi - (s - back) + (x - back);
    const low = this.meanLow + error;
    const high = s + low;
    this.meanLow = low - (high - s);
    this.meanHigh = high;
  }

  /** Statistics over a window of duration T (T > 0). */
  result(T: number): LevelFigures {
    const area = this.area.value();
    const mean = area / T;
    const variance = Math.max(0, this.squares.value() / T);
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
