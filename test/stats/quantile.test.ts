import { quantileSorted as d3QuantileSorted } from "d3-array";
import { describe, expect, it } from "vitest";
import { quantilePosition, quantileSorted, shareAtMost } from "../../src/stats/quantile.js";
import { nistDatasets } from "./nist.js";
import { mulberry32 } from "./random.js";

const probabilities = [
  ...Array.from({ length: 101 }, (_, i) => i / 100),
  0.001, 0.025, 0.333, 0.975, 0.999, 1 / 3, 2 / 3, Math.PI / 4,
];
const ascending = (values: number[]): number[] => values.slice().sort((a, b) => a - b);

describe("quantileSorted", () => {
  it("quantileSorted equals d3-array quantileSorted (type 7) exactly on the NIST StRD datasets", () => {
    // reference: d3-array quantileSorted, Hyndman & Fan (1996) definition 7; data: NIST StRD
    for (const ds of nistDatasets()) {
      const sorted = ascending(ds.values);
      for (const p of probabilities) expect(quantileSorted(sorted, p), `${ds.dataset} p=${p}`).toBe(d3QuantileSorted(sorted, p));
    }
  });

  it("quantileSorted equals d3-array quantileSorted exactly on seeded random data of many sizes", () => {
    // reference: d3-array quantileSorted (type 7)
    const uniform = mulberry32(314);
    for (let n = 1; n <= 60; n++) {
      const sorted = ascending(Array.from({ length: n }, () => (uniform() - 0.3) * 10 ** Math.floor(uniform() * 8)));
      for (const p of probabilities) expect(quantileSorted(sorted, p)).toBe(d3QuantileSorted(sorted, p));
      for (let k = 0; k < 20; k++) {
        const p = uniform();
        expect(quantileSorted(sorted, p)).toBe(d3QuantileSorted(sorted, p));
      }
    }
  });

  it("quantileSorted interpolates between order statistics", () => {
    // computed by hand: h = (n − 1)p; [1, 2, 3, 4] at 0.5: h 1.5 → 2.5; [10 … 50] at 0.25: h 1 → 20
    expect(quantileSorted([1, 2, 3, 4], 0.5)).toBe(2.5);
    expect(quantileSorted([10, 20, 30, 40, 50], 0.25)).toBe(20);
    expect(quantileSorted([10, 20, 30, 40, 50], 0)).toBe(10);
    expect(quantileSorted([10, 20, 30, 40, 50], 1)).toBe(50);
    expect(quantileSorted([7], 0.9)).toBe(7);
  });

  it("quantileSorted throws on no values or p outside [0, 1]", () => {
    // common practice: programming errors are thrown
    expect(() => quantileSorted([], 0.5)).toThrow(Error);
    expect(() => quantileSorted([1, 2], 1.5)).toThrow(Error);
    expect(() => quantileSorted([1, 2], Number.NaN)).toThrow(Error);
  });
});

describe("quantilePosition", () => {
  it("quantilePosition gives h, the two order statistics and the weight", () => {
    // computed by hand: h = (n − 1)p (Hyndman & Fan 1996, definition 7, 0-based)
    expect(quantilePosition(5, 0.9)).toEqual({ h: 4 * 0.9, lo: 3, hi: 4, fraction: 4 * 0.9 - 3 });
    expect(quantilePosition(5, 0.5)).toEqual({ h: 2, lo: 2, hi: 3, fraction: 0 });
    expect(quantilePosition(5, 1)).toEqual({ h: 4, lo: 4, hi: 4, fraction: 0 });
    expect(quantilePosition(1, 0.3)).toEqual({ h: 0, lo: 0, hi: 0, fraction: 0 });
  });
});

describe("shareAtMost", () => {
  it("shareAtMost counts values ≤ x, ties included", () => {
    // computed by hand
    const sorted = [1, 2, 2, 5];
    expect([0, 1, 1.5, 2, 4.9, 5, 9].map((x) => shareAtMost(sorted, x))).toEqual([0, 0.25, 0.25, 0.75, 0.75, 1, 1]);
  });

  it("shareAtMost equals a brute-force count on seeded random data with ties", () => {
    // reference: direct count (definition of the empirical distribution function)
    const uniform = mulberry32(8);
    for (let n = 1; n <= 40; n++) {
      const sorted = ascending(Array.from({ length: n }, () => Math.floor(uniform() * 10)));
      for (let x = -1; x <= 10; x += 0.5) {
        expect(shareAtMost(sorted, x)).toBe(sorted.filter((v) => v <= x).length / n);
      }
    }
  });

  it("shareAtMost throws on no values", () => {
    // common practice: programming errors are thrown
    expect(() => shareAtMost([], 1)).toThrow(Error);
  });
});
