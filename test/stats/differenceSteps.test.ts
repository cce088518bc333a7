import { describe, expect, it } from "vitest";
import { differenceNotes, pairedInterval, welchInterval } from "../../src/stats/compare.js";
import { pairedSteps, welchSteps } from "../../src/stats/differenceSteps.js";
import { mulberry32, normals } from "./random.js";

const labelled = (values: number[]) => values.map((value, i) => ({ run: `r${i + 1}`, value }));

describe("pairedSteps", () => {
  it("pairedSteps lists each pair's difference, deviation and square, computed by hand", () => {
    // computed by hand: d = [2, 3, 1, 3], d̄ = 2.25, deviations −0.25, 0.75, −1.25, 0.75 (exact in binary)
    const s = pairedSteps([{ run: "x", a: 12, b: 10 }, { run: "y", a: 15, b: 12 }, { run: "z", a: 11, b: 10 }, { run: "w", a: 14, b: 11 }], 0.95);
    expect(s.rows).toEqual([
      { run: "x", a: 12, b: 10, difference: 2, deviation: -0.25, squared: 0.0625 },
      { run: "y", a: 15, b: 12, difference: 3, deviation: 0.75, squared: 0.5625 },
      { run: "z", a: 11, b: 10, difference: 1, deviation: -1.25, squared: 1.5625 },
      { run: "w", a: 14, b: 11, difference: 3, deviation: 0.75, squared: 0.5625 },
    ]);
    expect([s.n, s.sum, s.mean, s.sum_squared, s.mean_correction, s.mean_a, s.mean_b, s.df]).toEqual([4, 9, 2.25, 2.75, 0, 13, 10.75, 3]);
    expect(s.variance).toBe(2.75 / 3);
    expect(s.standard_error).toBe(Math.sqrt(2.75 / 3) / 2);
  });

  it("pairedSteps ends with pairedInterval's numbers to the last bit on seeded random pairs", () => {
    // common practice: the audit must show the very numbers results.json holds
    const z = normals(mulberry32(7));
    for (const n of [1, 2, 3, 10, 33]) {
      const a = Array.from({ length: n }, () => 1e6 + 50 * z());
      const b = a.map((x) => x - 3 + z());
      const s = pairedSteps(a.map((x, i) => ({ run: String(i), a: x, b: b[i] })), 0.9);
      const iv = pairedInterval(a, b, 0.9);
      expect([s.mean, s.sd, s.standard_error, s.df, s.p, s.t, s.half_width, s.ci_low, s.ci_high, s.note]).toEqual([
        iv.diff_mean, iv.sd_diff, iv.standard_error, iv.df, iv.p, iv.t, iv.half_width, iv.ci_low, iv.ci_high, iv.note,
      ]);
    }
  });

  it("pairedSteps with one pair has no interval and says why", () => {
    const s = pairedSteps([{ run: "only", a: 3, b: 1 }], 0.95);
    expect([s.n, s.mean, s.sd, s.half_width, s.note]).toEqual([1, 2, null, null, differenceNotes.tooFewPairs]);
  });
});

describe("welchSteps", () => {
  it("welchSteps shows se², the shares and the df terms of the Welch–Satterthwaite formula, computed by hand", () => {
    // computed by hand: s_a² = 1, s_b² = 20/3; s²/n = 1/3 and 5/3; se² = 2; shares 1/6 and 5/6;
    // df terms (1/6)²/2 = 1/72 and (5/6)²/3 = 25/108; ν = 1/(1/72 + 25/108) = 216/53 (Welch 1947, Satterthwaite 1946)
    const s = welchSteps(labelled([1, 2, 3]), labelled([2, 4, 6, 8]), 0.95);
    expect(s.a.rows.map((r) => [r.run, r.value, r.deviation, r.squared])).toEqual([["r1", 1, -1, 1], ["r2", 2, 0, 0], ["r3", 3, 1, 1]]);
    expect([s.a.n, s.a.mean, s.a.variance, s.b.n, s.b.mean, s.b.sum_squared, s.difference]).toEqual([3, 2, 1, 4, 5, 20, -3]);
    expect(s.a.variance_over_n).toBe(1 / 3);
    expect(s.b.variance_over_n).toBe(20 / 3 / 4);
    expect(s.standard_error_squared).toBeCloseTo(2, 15);
    expect(s.share_a).toBeCloseTo(1 / 6, 15);
    expect(s.share_b).toBeCloseTo(5 / 6, 15);
    expect(s.df_term_a).toBeCloseTo(1 / 72, 15);
    expect(s.df_term_b).toBeCloseTo(25 / 108, 15);
    expect(s.df).toBeCloseTo(216 / 53, 13);
  });

  it("welchSteps ends with welchInterval's numbers to the last bit, and its steps give them again", () => {
    // common practice: every step shown must lead exactly to the number reported
    const z = normals(mulberry32(11));
    for (const [na, nb] of [[2, 2], [3, 9], [12, 5], [40, 40]]) {
      const a = Array.from({ length: na }, () => 20 + 3 * z());
      const b = Array.from({ length: nb }, () => 18 + 0.5 * z());
      const s = welchSteps(labelled(a), labelled(b), 0.95);
      const iv = welchInterval(a, b, 0.95);
      expect([s.difference, s.a.sd, s.b.sd, s.standard_error, s.df, s.t, s.half_width, s.ci_low, s.ci_high]).toEqual([
        iv.diff_mean, iv.sd_a, iv.sd_b, iv.standard_error, iv.df, iv.t, iv.half_width, iv.ci_low, iv.ci_high,
      ]);
      expect(Math.sqrt(s.standard_error_squared!)).toBe(s.standard_error);
      expect(1 / (s.df_term_a! + s.df_term_b!)).toBe(s.df);
      expect(s.t! * s.standard_error!).toBe(s.half_width);
    }
  });

  it("welchSteps with no spread on either side keeps se² = 0 and has no shares", () => {
    const s = welchSteps(labelled([4, 4]), labelled([2, 2, 2]), 0.95);
    expect([s.standard_error_squared, s.standard_error, s.share_a, s.df_term_a, s.df, s.note]).toEqual([0, 0, null, null, null, differenceNotes.noSpread]);
  });
});
