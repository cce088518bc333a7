import jstat from "jstat";
import { describe, expect, it } from "vitest";
import { bonferroniLevel, differenceNotes, pairedInterval, welchInterval } from "../../src/stats/compare.js";
import { relativeError } from "./nist.js";
import { mulberry32, normals } from "./random.js";

/** jstat's inverse t is good to about 3e-8 (see tQuantile.test.ts). */
const JSTAT = 1e-7;

/** Mean and n − 1 sample variance, by the textbook two-pass formulas. */
function moments(x: number[]): { mean: number; variance: number } {
  const mean = x.reduce((s, v) => s + v, 0) / x.length;
  return { mean, variance: x.reduce((s, v) => s + (v - mean) ** 2, 0) / (x.length - 1) };
}

describe("bonferroniLevel", () => {
  it("bonferroniLevel splits the error rate 1 − confidence evenly over K intervals", () => {
    // formula: Bonferroni inequality (Dunn 1961); computed by hand: 0.90 over 2 → 0.95, 0.95 over 5 → 0.99
    expect(bonferroniLevel(0.9, 2)).toBeCloseTo(0.95, 15);
    expect(bonferroniLevel(0.95, 5)).toBeCloseTo(0.99, 15);
    expect(bonferroniLevel(0.95, 1)).toBe(0.95);
    for (const [c, K] of [[0.9, 3], [0.95, 10], [0.99, 4]]) {
      expect(Math.abs(K * (1 - bonferroniLevel(c, K)) - (1 - c))).toBeLessThanOrEqual(1e-15);
    }
  });

  it("bonferroniLevel throws on K that is not a positive integer or a confidence outside (0, 1)", () => {
    // common practice: programming errors are thrown
    expect(() => bonferroniLevel(0.95, 0)).toThrow(Error);
    expect(() => bonferroniLevel(0.95, 1.5)).toThrow(Error);
    expect(() => bonferroniLevel(1, 2)).toThrow(Error);
  });
});

describe("pairedInterval", () => {
  it("pairedInterval of bike-repair times with and without a second mechanic, computed by hand", () => {
    // computed by hand: d = [2, 3, 1, 3], mean 2.25, Σ(d − d̄)² = 2.75, s_d² = 2.75/3,
    // se = s_d/2; t(0.975, 3) from jstat studentt.inv
    const r = pairedInterval([12, 15, 11, 14], [10, 12, 10, 11], 0.95);
    expect([r.n_a, r.n_b, r.mean_a, r.mean_b, r.diff_mean, r.df]).toEqual([4, 4, 13, 10.75, 2.25, 3]);
    expect(r.sd_diff).toBe(Math.sqrt(2.75 / 3));
    expect(r.standard_error).toBe(Math.sqrt(2.75 / 3) / 2);
    const t = jstat.studentt.inv(0.975, 3);
    expect(relativeError(r.t!, t)).toBeLessThanOrEqual(JSTAT);
    expect(relativeError(r.half_width!, (t * Math.sqrt(2.75 / 3)) / 2)).toBeLessThanOrEqual(JSTAT);
    expect(r.ci_low).toBe(2.25 - r.half_width!);
    expect(r.ci_high).toBe(2.25 + r.half_width!);
    expect(r.note).toBeNull();
  });

  it("pairedInterval equals the hand formula with jstat's t on seeded random pairs", () => {
    // formula: paired-t (Law 2015, section 10.2.1); t from jstat studentt.inv
    const z = normals(mulberry32(41));
    for (const n of [2, 5, 12, 40]) {
      const a = Array.from({ length: n }, () => 30 + 4 * z());
      const b = a.map((x) => x - 1 + 2 * z());
      const d = moments(a.map((x, i) => x - b[i]));
      const t = jstat.studentt.inv(0.9 + 0.1 / 2, n - 1);
      const r = pairedInterval(a, b, 0.9);
      expect(relativeError(r.diff_mean!, d.mean)).toBeLessThanOrEqual(1e-13);
      expect(relativeError(r.standard_error!, Math.sqrt(d.variance / n))).toBeLessThanOrEqual(1e-13);
      expect(relativeError(r.half_width!, t * Math.sqrt(d.variance / n))).toBeLessThanOrEqual(JSTAT);
    }
  });

  it("pairedInterval with fewer than two pairs gives null interval fields and a note", () => {
    // documented convention: no spread estimate from one difference
    const r = pairedInterval([5], [3], 0.95);
    expect(r).toMatchObject({ diff_mean: 2, sd_diff: null, standard_error: null, df: null, t: null, half_width: null, ci_low: null, ci_high: null });
    expect(r.note).toBe(differenceNotes.tooFewPairs);
    expect(pairedInterval([], [], 0.95).diff_mean).toBeNull();
    expect(() => pairedInterval([1, 2], [1], 0.95)).toThrow(Error);
  });
});

describe("welchInterval", () => {
  it("welchInterval of bakery queue lengths in two layouts, computed by hand", () => {
    // computed by hand: a = [1, 2, 3], b = [2, 4, 6, 8]: diff −3, s_a² = 1, s_b² = 20/3,
    // se² = 1/3 + 5/3 = 2, ν = 2² / ((1/3)²/2 + (5/3)²/3) = 216/53 (Welch 1947; Satterthwaite 1946)
    const r = welchInterval([1, 2, 3], [2, 4, 6, 8], 0.95);
    expect([r.n_a, r.n_b, r.mean_a, r.mean_b, r.diff_mean, r.sd_a]).toEqual([3, 4, 2, 5, -3, 1]);
    expect(relativeError(r.sd_b!, Math.sqrt(20 / 3))).toBeLessThanOrEqual(1e-15);
    expect(relativeError(r.standard_error!, Math.SQRT2)).toBeLessThanOrEqual(1e-15);
    expect(relativeError(r.df!, 216 / 53)).toBeLessThanOrEqual(1e-14);
    const t = jstat.studentt.inv(0.975, 216 / 53);
    expect(relativeError(r.t!, t)).toBeLessThanOrEqual(JSTAT);
    expect(relativeError(r.half_width!, t * Math.SQRT2)).toBeLessThanOrEqual(JSTAT);
    expect(r.ci_low).toBe(-3 - r.half_width!);
    expect(r.sd_diff).toBeNull();
  });

  it("welchInterval equals the hand formula with jstat's t on seeded random samples of unequal size and spread", () => {
    // formula: Welch (1947), Satterthwaite (1946); t from jstat studentt.inv
    const z = normals(mulberry32(77));
    for (const [na, nb] of [[2, 2], [5, 9], [20, 6], [30, 30]]) {
      const a = Array.from({ length: na }, () => 10 + z());
      const b = Array.from({ length: nb }, () => 12 + 5 * z());
      const ma = moments(a);
      const mb = moments(b);
      const va = ma.variance / na;
      const vb = mb.variance / nb;
      const df = (va + vb) ** 2 / (va ** 2 / (na - 1) + vb ** 2 / (nb - 1));
      const r = welchInterval(a, b, 0.95);
      expect(relativeError(r.diff_mean!, ma.mean - mb.mean)).toBeLessThanOrEqual(1e-13);
      expect(relativeError(r.df!, df)).toBeLessThanOrEqual(1e-12);
      expect(relativeError(r.half_width!, jstat.studentt.inv(0.975, df) * Math.sqrt(va + vb))).toBeLessThanOrEqual(JSTAT);
      expect(r.df!).toBeGreaterThanOrEqual(Math.min(na, nb) - 1);
      expect(r.df!).toBeLessThanOrEqual(na + nb - 2);
    }
  });

  it("welchInterval with one constant side takes the other side's n − 1 degrees of freedom", () => {
    // computed by hand: s_a = 0 → ν = (s_b²/n_b)² / ((s_b²/n_b)²/(n_b − 1)) = n_b − 1
    const r = welchInterval([4, 4, 4], [1, 3, 8, 2, 6], 0.95);
    expect(r.df).toBe(4);
  });

  it("welchInterval with no spread on either side or too few values gives null interval fields and a note", () => {
    // documented convention: ν = 0/0 is undefined; one value gives no variance
    const flat = welchInterval([2, 2], [5, 5, 5], 0.95);
    expect(flat).toMatchObject({ diff_mean: -3, standard_error: 0, df: null, t: null, half_width: null, ci_low: null, ci_high: null });
    expect(flat.note).toBe(differenceNotes.noSpread);
    const short = welchInterval([2], [5, 6, 7], 0.95);
    expect(short).toMatchObject({ diff_mean: -4, standard_error: null, df: null, half_width: null });
    expect(short.note).toBe(differenceNotes.tooFewValues);
  });

  it("welchInterval does not underflow on tiny variances", () => {
    // formula: ν is scale-free, so scaling both samples by 1e-150 leaves it unchanged (the textbook
    // form would square variances of about 1e-300 and underflow to 0/0)
    const a = [1, 2, 4];
    const b = [3, 3.5, 7, 9];
    const scaled = welchInterval(a.map((x) => x * 1e-150), b.map((x) => x * 1e-150), 0.95);
    expect(relativeError(scaled.df!, welchInterval(a, b, 0.95).df!)).toBeLessThanOrEqual(1e-13);
  });
});
