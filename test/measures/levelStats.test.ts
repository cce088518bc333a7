import { describe, expect, it } from "vitest";
import { LevelStats } from "../../src/measures/levelStats.js";
import { div, fromDouble, integer, mul, sqrtToNumber, sub, sum } from "../stats/exact.js";
import { mulberry32 } from "../stats/random.js";

/**
 * The exact time-weighted sd of intervals (value, duration) over T = Σ durations, in rational
 * arithmetic (contract section 4: sd = √(Σ dᵢ (vᵢ − mean)² / T) with mean = Σ vᵢ dᵢ / T), rounded
 * once to a double.
 */
function exactSd(intervals: [number, number][]): number {
  const d = intervals.map(([, dur]) => fromDouble(dur));
  const v = intervals.map(([value]) => fromDouble(value));
  const T = sum(d);
  const mean = div(sum(v.map((x, i) => mul(x, d[i]))), T);
  const squares = sum(v.map((x, i) => {
    const dev = sub(x, mean);
    return mul(d[i], mul(dev, dev));
  }));
  return sqrtToNumber(div(squares, T));
}

function statsOf(intervals: [number, number][]) {
  const s = new LevelStats();
  let t = 0;
  for (const [value, d] of intervals) {
    s.interval(t, t + d, value);
    t += d;
  }
  return s.result(t);
}

/** Significant digits two numbers share: −log10 of their relative difference (Infinity when equal). */
const digitsShared = (x: number, ref: number) => -Math.log10(Math.abs(x - ref) / Math.abs(ref));

describe("LevelStats", () => {
  it("LevelStats.result keeps at least 12 significant digits of the sd for levels near 1e9 changing by 1e-3", () => {
    // reference: exact rational arithmetic (BigInt fractions) on the same doubles; the level and the
    // durations are seeded random (mulberry32), our own invented data
    const uniform = mulberry32(1209);
    for (const base of [1e9, -1e9, 123456789.125, 4e12]) {
      const intervals: [number, number][] = [];
      let level = base;
      for (let i = 0; i < 2000; i++) {
        level += (Math.floor(uniform() * 7) - 3) * 1e-3; // steps of −3e-3 … 3e-3
        // durations 0.25 … 4 in quarters, or any double in (0, 3) on every other base
        const d = base < 0 || base > 1e12 ? 3 * uniform() + 1e-9 : 0.25 + Math.floor(uniform() * 16) / 4;
        intervals.push([level, d]);
      }
      const sd = statsOf(intervals).sd;
      const ref = exactSd(intervals);
      expect(ref).toBeGreaterThan(0);
      expect(digitsShared(sd, ref), `base ${base}: sd ${sd}, exact ${ref}`).toBeGreaterThanOrEqual(12);
    }
  });

  it("LevelStats.result keeps the sd's digits when the level is constant but for a far-off first interval", () => {
    // reference: exact rational arithmetic; a short excursion far from the rest (0 for 1e-3, then 1e9 ± 1e-3)
    const intervals: [number, number][] = [[0, 1e-3], [1e9, 100], [1e9 + 1e-3, 50], [1e9 - 2e-3, 25]];
    expect(digitsShared(statsOf(intervals).sd, exactSd(intervals))).toBeGreaterThanOrEqual(12);
    // and a constant level averages to itself with sd exactly 0 (invariance)
    expect(statsOf([[1e9 + 1e-3, 3], [1e9 + 1e-3, 0.5]]).sd).toBe(0);
  });

  it("LevelStats.result on the doc example: 2 on [0, 3] and 5 on [3, 4] gives area 11, mean 2.75, sd √(27/16)", () => {
    // computed by hand: mean 11/4; Σ d (v − mean)² = 3·(3/4)² + 1·(9/4)² = 27/4; / T = 27/16
    const f = statsOf([[2, 3], [5, 1]]);
    expect(f.area).toBe(11);
    expect(f.mean).toBe(2.75);
    expect(f.sd).toBe(sqrtToNumber(div(integer(27), integer(16))));
  });
});
