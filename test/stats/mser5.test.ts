import { describe, expect, it } from "vitest";
import { mser } from "../../src/stats/mser5.js";
import { relativeError } from "./nist.js";
import { mulberry32, normals } from "./random.js";

/** Direct two-pass MSER(d) from the batch means (the definition, White 1997). */
function direct(batchMeans: number[], d: number): number {
  const kept = batchMeans.slice(d);
  const mean = kept.reduce((s, z) => s + z, 0) / kept.length;
  return kept.reduce((s, z) => s + (z - mean) ** 2, 0) / kept.length ** 2;
}

/** Five values with mean `level` exactly: noise inside the batch, none between batches. */
const zeroSumBatch = (level: number, e: number) => [level + e, level - 2 * e, level + 2 * e, level, level - e];

describe("mser", () => {
  it("mser finds a transient of 5·d0 values before a level whose batches all average to it", () => {
    // by construction (White 1997): after d0 batches every batch mean is exactly 4, so MSER(d) = 0
    // for d ≥ d0 and > 0 below; ties go to the smallest d, which is d0
    const uniform = mulberry32(11);
    for (const d0 of [1, 3, 8]) {
      const transient = Array.from({ length: 5 * d0 }, () => 40 + 8 * uniform());
      const steady = Array.from({ length: 60 }, () => zeroSumBatch(4, Math.round(uniform() * 16) / 8)).flat();
      const r = mser([...transient, ...steady], 5);
      expect(r.batches).toBe(d0 + 60);
      expect(r.statistics[d0]).toBe(0);
      expect(r.d).toBe(d0);
      expect(r.truncated).toBe(5 * d0);
      expect(r.atLimit).toBe(false);
    }
  });

  it("mser drops at least the transient batches before a noisy constant level", () => {
    // by construction: a transient 50 standard deviations away dominates MSER(d) for every d < d0;
    // beyond d0 the rule may drop a few batches more by chance (no claim on those)
    for (let seed = 1; seed <= 20; seed++) {
      const z = normals(mulberry32(seed));
      const d0 = 1 + (seed % 7);
      const sequence = [
        ...Array.from({ length: 5 * d0 }, () => 60 + z()),
        ...Array.from({ length: 2000 }, () => 10 + z()),
      ];
      const r = mser(sequence);
      expect(r.d).toBeGreaterThanOrEqual(d0);
      expect(r.atLimit).toBe(false);
    }
  });

  it("mser statistics equal the definition for every d = 0 … ⌊m/2⌋", () => {
    // formula: MSER(d) = Σ_{j>d} (Z_j − Z̄_d)² / (m − d)² (White, Cobb and Spratt 2000), computed directly
    const z = normals(mulberry32(3));
    const sequence = Array.from({ length: 503 }, (_, i) => 5 * Math.exp(-i / 60) + z());
    const r = mser(sequence);
    expect(r.batches).toBe(100);
    expect(r.statistics).toHaveLength(51);
    r.statistics.forEach((s, d) => expect(relativeError(s, direct(r.batchMeans, d))).toBeLessThanOrEqual(1e-12));
    const best = Math.min(...r.statistics);
    expect(r.statistics[r.d]).toBe(best);
    expect(r.statistics.indexOf(best)).toBe(r.d);
  });

  it("mser drops the incomplete last batch and averages batches of batchSize", () => {
    // computed by hand: 23 values → 4 batches of 5 (last 3 values unused): means 9, 1.8, 1.8, 1.8;
    // MSER = [(5.4² + 3·1.8²)/16, 0, 0] = [2.43, 0, 0]; tie between d = 1 and 2 → 1
    const r = mser([9, 9, 9, 9, 9, 1, 2, 3, 2, 1, 2, 1, 2, 3, 1, 1, 2, 1, 2, 3, 2, 1, 2]);
    expect(r.batchMeans).toEqual([9, 1.8, 1.8, 1.8]);
    expect(relativeError(r.statistics[0], 2.43)).toBeLessThanOrEqual(1e-15);
    expect(r.statistics.slice(1)).toEqual([0, 0]);
    expect([r.d, r.truncated, r.atLimit]).toEqual([1, 5, false]);
  });

  it("mser of a constant sequence picks d = 0 (all statistics tie at 0)", () => {
    // computed by hand: every batch mean equal, every MSER(d) = 0, ties to the smallest d
    const r = mser(new Array(100).fill(3.25));
    expect(r.statistics.every((s) => s === 0)).toBe(true);
    expect([r.d, r.atLimit]).toEqual([0, false]);
  });

  it("mser of a steady upward trend ends at the limit ⌊m/2⌋ and flags it", () => {
    // computed by hand: batch means Z_j = 5j − 3 lie on a line, so with k = m − d kept batches
    // the statistic is 25(k² − 1)/(12k), smallest for the fewest batches kept: d = ⌊m/2⌋
    const r = mser(Array.from({ length: 5 * 21 }, (_, i) => i));
    expect(r.batches).toBe(21);
    expect(r.d).toBe(10);
    expect(r.atLimit).toBe(true);
    expect(r.truncated).toBe(50);
  });

  it("mser with fewer than two batches returns d = 0, no statistics, atLimit false", () => {
    // documented convention: nothing to compare with m < 2
    expect(mser([1, 2, 3, 4, 5, 6, 7, 8, 9])).toEqual({ d: 0, batches: 1, batchMeans: [3], statistics: [], atLimit: false, truncated: 0 });
    expect(mser([1, 2])).toEqual({ d: 0, batches: 0, batchMeans: [], statistics: [], atLimit: false, truncated: 0 });
  });

  it("mser with batchSize 1 works on the raw values", () => {
    // computed by hand: values 8, 0, 0, 0 → MSER(0) = 48/16 = 3, MSER(1) = 0, MSER(2) = 0 → d 1
    expect(mser([8, 0, 0, 0], 1)).toMatchObject({ d: 1, batches: 4, statistics: [3, 0, 0], truncated: 1, atLimit: false });
    expect(() => mser([1, 2, 3], 0)).toThrow(Error);
  });
});
