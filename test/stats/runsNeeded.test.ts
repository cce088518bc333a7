import { describe, expect, it } from "vitest";
import { MAX_RUNS, relativeHalfWidth, runsNeeded, type PrecisionTarget } from "../../src/stats/runsNeeded.js";
import { tQuantile } from "../../src/stats/tQuantile.js";
import { mulberry32, normals } from "./random.js";

/** The half-width with n' runs: t(1 − α/2, n' − 1)·sd/√n' (Law 2015, section 9.4.1). */
const halfWidth = (sd: number, runs: number, confidence: number) =>
  (tQuantile(1 - (1 - confidence) / 2, runs - 1) * sd) / Math.sqrt(runs);

describe("runsNeeded", () => {
  it("runsNeeded gives n' with half-width ≤ target and n' − 1 not (brute force over small cases)", () => {
    // formula: Law (2015) section 9.4.1; relative error γ aims at γ/(1 + γ)·|mean| (from memory:
    // Law's adjusted relative error; derived in src/stats/runsNeeded.ts); reference: a plain
    // search n, n + 1, … with the same inequality
    const cases: [number, number, number, number, PrecisionTarget][] = [
      [2, 10, 50, 0.95, { type: "half_width", value: 1 }],
      [3.7, 5, 20, 0.9, { type: "half_width", value: 0.5 }],
      [1, 2, 10, 0.99, { type: "relative", value: 0.05 }],
      [12, 3, 100, 0.95, { type: "relative", value: 0.02 }],
      [0.4, 20, 3, 0.95, { type: "half_width", value: 0.01 }],
      [5, 4, -40, 0.9, { type: "relative", value: 0.1 }],
    ];
    for (const [sd, n, mean, confidence, target] of cases) {
      const h = target.type === "half_width" ? target.value : (target.value / (1 + target.value)) * Math.abs(mean);
      let brute = n;
      while (halfWidth(sd, brute, confidence) > h) brute++;
      const result = runsNeeded(sd, n, mean, confidence, target);
      expect(result).toEqual({ runs: brute, reason: null, halfWidth: h });
      expect(halfWidth(sd, brute, confidence)).toBeLessThanOrEqual(h);
      if (brute > n) expect(halfWidth(sd, brute - 1, confidence)).toBeGreaterThan(h);
    }
  });

  it("runsNeeded(2, 10, 50, 0.95, half-width 1) is 18", () => {
    // computed by hand with t from the reference table: t(0.975, 17)·2/√18 = 0.9946 ≤ 1 and
    // t(0.975, 16)·2/√17 = 2.1199·2/4.1231 = 1.0283 > 1 (printed t table: 2.110 and 2.120)
    expect(runsNeeded(2, 10, 50, 0.95, { type: "half_width", value: 1 }).runs).toBe(18);
  });

  it("runsNeeded with a relative error 0.1 of mean 50 aims at the half-width 50/11, not 5", () => {
    // computed by hand: γ/(1 + γ)·|x̄| = 0.1/1.1·50 = 4.5454…; with sd 10 at 0.95:
    // k = 21: t(0.975, 20) = 2.0860, 2.0860·10/√21 = 4.552 > 4.545; k = 22: t(0.975, 21) = 2.0796,
    // 2.0796·10/√22 = 4.434 ≤ 4.545 (printed t table: 2.086, 2.080). The unadjusted target 5 would
    // stop at k = 18: 2.1098·10/√18 = 4.973 ≤ 5.
    expect(relativeHalfWidth(0.1, 50)).toBe(0.1 / 1.1 * 50);
    expect(runsNeeded(10, 5, 50, 0.95, { type: "relative", value: 0.1 })).toEqual({ runs: 22, reason: null, halfWidth: 0.1 / 1.1 * 50 });
    expect(runsNeeded(10, 5, 50, 0.95, { type: "half_width", value: 5 }).runs).toBe(18);
  });

  it("runsNeeded's relative target holds: the interval's error is within γ of the true mean when the interval covers it", () => {
    // the derivation in relativeHalfWidth, checked on seeded normal samples (mulberry32 + Box–Muller):
    // whenever |x̄ − μ| ≤ h with h = γ/(1 + γ)·|x̄|, then |x̄ − μ| ≤ γ·|μ|
    const z = normals(mulberry32(77));
    for (let i = 0; i < 2000; i++) {
      const mu = 10 * z();
      const gamma = 0.01 + Math.abs(z()) / 4;
      const xbar = mu + Math.abs(mu) * gamma * z() / 2;
      if (Math.abs(xbar - mu) <= relativeHalfWidth(gamma, xbar)) expect(Math.abs(xbar - mu)).toBeLessThanOrEqual(gamma * Math.abs(mu) * (1 + 1e-12));
    }
  });

  it("runsNeeded returns n when the target is already met", () => {
    // formula: the smallest n' ≥ n
    expect(runsNeeded(1, 30, 10, 0.95, { type: "half_width", value: 5 }).runs).toBe(30);
  });

  it("runsNeeded handles a target that needs about a million runs", () => {
    // formula: for large n' the t quantile is close to 1.96, so n' ≈ (1.96·sd/h)²
    const result = runsNeeded(1, 10, 0, 0.95, { type: "half_width", value: 0.002 }).runs!;
    expect(halfWidth(1, result, 0.95)).toBeLessThanOrEqual(0.002);
    expect(halfWidth(1, result - 1, 0.95)).toBeGreaterThan(0.002);
    expect(Math.abs(result - (1.959964 / 0.002) ** 2)).toBeLessThan(10);
  });

  it("runsNeeded says why there is no number: no runs, one run, no spread, mean 0, beyond 10^7 runs", () => {
    // documented conventions (src/stats/runsNeeded.ts, docs/statistics.md)
    const half = { type: "half_width", value: 1 } as const;
    const rel = { type: "relative", value: 0.1 } as const;
    expect(runsNeeded(null, 0, null, 0.95, half)).toEqual({ runs: null, reason: "no-runs", halfWidth: 1 });
    expect(runsNeeded(null, 1, 10, 0.95, half)).toEqual({ runs: null, reason: "one-run", halfWidth: 1 });
    expect(runsNeeded(null, 1, 10, 0.95, rel).reason).toBe("one-run");
    expect(runsNeeded(0, 4, 10, 0.95, rel)).toEqual({ runs: null, reason: "no-spread", halfWidth: 0.1 / 1.1 * 10 });
    expect(runsNeeded(0, 4, 0, 0.95, half).reason).toBe("no-spread");
    expect(runsNeeded(1, 10, 0, 0.95, rel)).toEqual({ runs: null, reason: "mean-zero", halfWidth: 0 });
    expect(runsNeeded(1, 10, 5, 0.95, { type: "half_width", value: 1e-6 })).toEqual({ runs: null, reason: "beyond-limit", halfWidth: 1e-6 });
    expect(MAX_RUNS).toBe(10_000_000);
  });
});
