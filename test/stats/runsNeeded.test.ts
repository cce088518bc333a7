import { describe, expect, it } from "vitest";
import { MAX_RUNS, runsNeeded, type PrecisionTarget } from "../../src/stats/runsNeeded.js";
import { tQuantile } from "../../src/stats/tQuantile.js";

/** The half-width with n' runs: t(1 − α/2, n' − 1)·sd/√n' (Law 2015, section 9.4.1). */
const halfWidth = (sd: number, runs: number, confidence: number) =>
  (tQuantile(1 - (1 - confidence) / 2, runs - 1) * sd) / Math.sqrt(runs);

describe("runsNeeded", () => {
  it("runsNeeded gives n' with half-width ≤ target and n' − 1 not (brute force over small cases)", () => {
    // formula: Law (2015) section 9.4.1; reference: a plain search n, n + 1, … with the same inequality
    const cases: [number, number, number, number, PrecisionTarget][] = [
      [2, 10, 50, 0.95, { type: "half_width", value: 1 }],
      [3.7, 5, 20, 0.9, { type: "half_width", value: 0.5 }],
      [1, 2, 10, 0.99, { type: "relative", value: 0.05 }],
      [12, 3, 100, 0.95, { type: "relative", value: 0.02 }],
      [0.4, 20, 3, 0.95, { type: "half_width", value: 0.01 }],
      [5, 4, -40, 0.9, { type: "relative", value: 0.1 }],
    ];
    for (const [sd, n, mean, confidence, target] of cases) {
      const h = target.type === "half_width" ? target.value : target.value * Math.abs(mean);
      let brute = n;
      while (halfWidth(sd, brute, confidence) > h) brute++;
      const result = runsNeeded(sd, n, mean, confidence, target);
      expect(result).toBe(brute);
      expect(halfWidth(sd, result!, confidence)).toBeLessThanOrEqual(h);
      if (result! > n) expect(halfWidth(sd, result! - 1, confidence)).toBeGreaterThan(h);
    }
  });

  it("runsNeeded(2, 10, 50, 0.95, half-width 1) is 18", () => {
    // computed by hand with t from the reference table: t(0.975, 17)·2/√18 = 0.9946 ≤ 1 and
    // t(0.975, 16)·2/√17 = 2.1199·2/4.1231 = 1.0283 > 1 (printed t table: 2.110 and 2.120)
    expect(runsNeeded(2, 10, 50, 0.95, { type: "half_width", value: 1 })).toBe(18);
  });

  it("runsNeeded returns n when the target is already met or sd is 0", () => {
    // formula: the smallest n' ≥ n
    expect(runsNeeded(1, 30, 10, 0.95, { type: "half_width", value: 5 })).toBe(30);
    expect(runsNeeded(0, 4, 10, 0.95, { type: "relative", value: 0.01 })).toBe(4);
  });

  it("runsNeeded handles a target that needs about a million runs", () => {
    // formula: for large n' the t quantile is close to 1.96, so n' ≈ (1.96·sd/h)²
    const result = runsNeeded(1, 10, 0, 0.95, { type: "half_width", value: 0.002 })!;
    expect(halfWidth(1, result, 0.95)).toBeLessThanOrEqual(0.002);
    expect(halfWidth(1, result - 1, 0.95)).toBeGreaterThan(0.002);
    expect(Math.abs(result - (1.959964 / 0.002) ** 2)).toBeLessThan(10);
  });

  it("runsNeeded is null with fewer than two runs or a target out of reach by 10^7 runs", () => {
    // documented convention: no variance estimate; a relative target with mean 0 is a half-width 0
    expect(runsNeeded(1, 1, 10, 0.95, { type: "half_width", value: 1 })).toBeNull();
    expect(runsNeeded(1, 10, 0, 0.95, { type: "relative", value: 0.1 })).toBeNull();
    expect(runsNeeded(1, 10, 5, 0.95, { type: "half_width", value: 1e-6 })).toBeNull();
    expect(runsNeeded(1, 10, 5, 0.95, { type: "half_width", value: -1 })).toBeNull();
    expect(MAX_RUNS).toBe(10_000_000);
  });
});
