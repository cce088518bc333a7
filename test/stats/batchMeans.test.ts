import { describe, expect, it } from "vitest";
import { batchMeansInterval, observationBatches } from "../../src/stats/batchMeans.js";
import { summarize } from "../../src/stats/interval.js";
import { lag1 } from "../../src/stats/moments.js";
import { mulberry32, normals } from "./random.js";

/**
 * A stationary AR(1) sequence x_t = μ + φ(x_{t−1} − μ) + ε_t with standard normal ε_t, started
 * in its stationary distribution (x_0 − μ ~ N(0, 1/(1 − φ²))) so there is no warm-up.
 */
function ar1(length: number, mu: number, phi: number, z: () => number): Float64Array {
  const x = new Float64Array(length);
  let deviation = z() / Math.sqrt(1 - phi * phi);
  for (let t = 0; t < length; t++) {
    x[t] = mu + deviation;
    deviation = phi * deviation + z();
  }
  return x;
}

describe("observationBatches", () => {
  it("observationBatches drops the n mod k oldest values, then averages k batches", () => {
    // computed by hand: 7 values, k 3 → drop 1 (the first), batches [1, 2], [3, 4], [5, 6]
    expect(observationBatches([100, 1, 2, 3, 4, 5, 6], 3)).toEqual([1.5, 3.5, 5.5]);
    // 10 values, k 4 → drop 2, batches of 2
    expect(observationBatches([50, 60, 1, 3, 5, 7, 9, 11, 13, 15], 4)).toEqual([2, 6, 10, 14]);
    // n divisible by k: nothing dropped
    expect(observationBatches([1, 2, 3, 4, 5, 6], 2)).toEqual([2, 5]);
  });

  it("observationBatches gives no batch when n < k and throws on a k that is not a positive integer", () => {
    // documented convention; common practice for programming errors
    expect(observationBatches([1, 2], 3)).toEqual([]);
    for (const k of [0, -1, 2.5, Number.NaN]) expect(() => observationBatches([1, 2, 3], k)).toThrow(Error);
  });
});

describe("batchMeansInterval", () => {
  it("batchMeansInterval gives the t interval of the batch means at k − 1 df and their lag-1 autocorrelation", () => {
    // same arithmetic as summarize (Law 2015, section 9.5.3); lag-1 by the NIST StRD definition
    const means = [4.1, 3.7, 4.6, 4.0, 3.9, 4.4];
    const r = batchMeansInterval(means, 0.9);
    const s = summarize(means, 0.9);
    expect(r).toMatchObject({ batches: 6, mean: s.mean, sd: s.sd, half_width: s.half_width, ci_low: s.ci_low, ci_high: s.ci_high, df: 5 });
    expect(r.half_width).toBe((r.t! * r.sd!) / Math.sqrt(6));
    expect(r.lag1).toBe(lag1(means));
  });

  it("batchMeansInterval with one batch gives null interval fields", () => {
    // documented convention, as intervalArithmetic with one value
    expect(batchMeansInterval([2], 0.95)).toEqual({
      batches: 1, mean: 2, sd: null, df: null, t: null, half_width: null, ci_low: null, ci_high: null, lag1: null,
    });
  });

  it("batchMeansInterval covers the mean of AR(1) φ = 0.5 at the nominal 90 % (400 replications of 10 000 values, 20 batches)", () => {
    // Coverage study (Law 2015, section 9.5.3; Schmeiser 1982). With batches of 500 values the
    // batch means of AR(1) φ = 0.5 are nearly independent normals, so coverage should be 0.90.
    // Band: with true coverage 0.90 the count of covering intervals in 400 is Binomial(400, 0.9),
    // sd √(400·0.9·0.1) = 6, i.e. 0.015 in share; 0.86–0.94 is ±2.67 sd, which a correct
    // interval misses with probability below 1 % (normal approximation). Seeded: reproducible.
    const mu = 7.5;
    const z = normals(mulberry32(2024));
    let covered = 0;
    let coveredTiny = 0;
    const replications = 400;
    for (let r = 0; r < replications; r++) {
      const x = ar1(10_000, mu, 0.5, z);
      const ci = batchMeansInterval(observationBatches(x, 20), 0.9);
      if (ci.ci_low! <= mu && mu <= ci.ci_high!) covered++;
      // Negative control: 10 000 batches of 1 (every value treated as independent).
      const tiny = batchMeansInterval(observationBatches(x, 10_000), 0.9);
      if (tiny.ci_low! <= mu && mu <= tiny.ci_high!) coveredTiny++;
    }
    const coverage = covered / replications;
    expect(coverage).toBeGreaterThanOrEqual(0.86);
    expect(coverage).toBeLessThanOrEqual(0.94);
    // computed by hand: single values have variance 1/(1 − φ²) = 4/3, but the mean needs the
    // long-run variance 1/(1 − φ)² = 4; the standard error is √(1/3) = 0.577 of the right one, so
    // coverage falls to P(|Z| ≤ 1.645·0.577) ≈ 0.66, far below the band
    expect(coveredTiny / replications).toBeLessThan(0.86);
  });
});
