import { Adder } from "../stats/adder.js";
import type { IntervalSink } from "./intervals.js";

/**
 * Areas of a level over consecutive time slices [o + j*w, o + (j+1)*w], j = 0..k-1 (the last
 * one ends exactly at `last`). An interval that crosses a slice edge is prorated: each slice gets
 * the part of its area that lies inside it. Used for batch means over time (equal slices of the
 * window) and for the slice averages of MSER-5 and Welch's plot.
 *
 * Example: value 3 on [0, 5] with slices of width 2 over [0, 6] gives areas 6, 6, 3 (and 0 for
 * the last slice's remaining second until another interval covers it).
 */
export class SliceAreas implements IntervalSink {
  readonly areas: Adder[];
  readonly edges: number[];

  constructor(origin: number, width: number, count: number, last: number) {
    this.areas = Array.from({ length: count }, () => new Adder());
    this.edges = Array.from({ length: count + 1 }, (_, j) => (j === count ? last : origin + j * width));
  }

  interval(from: number, to: number, value: number): void {
    if (!(to > from)) return;
    const { edges, areas } = this;
    const k = areas.length;
    let j = this.slot(from);
    let a = from;
    while (a < to && j < k) {
      const e = edges[j + 1];
      const b = to < e ? to : e;
      if (b > a) areas[j].add(value * (b - a));
      a = b;
      j++;
    }
  }

  private slot(t: number): number {
    const { edges } = this;
    let lo = 0;
    let hi = edges.length - 2;
    if (t < edges[0]) return 0;
    while (lo < hi) {
      const mid = (lo + hi + 1) >> 1;
      if (edges[mid] <= t) lo = mid;
      else hi = mid - 1;
    }
    return lo;
  }

  /** Time average of each slice. */
  means(): number[] {
    return this.areas.map((a, j) => a.value() / (this.edges[j + 1] - this.edges[j]));
  }
}

/** Slice layout for MSER-5 / Welch over [start, end] with width s: only whole slices. */
export function wholeSlices(start: number, end: number, width: number): { count: number; last: number } {
  const count = Math.floor((end - start) / width + 1e-9);
  return { count, last: start + count * width };
}
