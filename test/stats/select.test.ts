import { describe, expect, it } from "vitest";
import { countAtMost, selectInPlace } from "../../src/stats/select.js";
import { mulberry32 } from "./random.js";

describe("selectInPlace (Floyd and Rivest 1975)", () => {
  it("puts at index k the value a sort would put there, with no larger value before and no smaller after", () => {
    const rnd = mulberry32(99);
    for (const n of [1, 2, 7, 601, 5000]) {
      for (let trial = 0; trial < 5; trial++) {
        // few distinct values on some trials: ties are the hard case (common practice)
        const a = Float64Array.from({ length: n }, () => (trial % 2 ? Math.floor(rnd() * 5) : rnd() * 1000 - 500));
        const sorted = Float64Array.from(a).sort();
        const k = Math.floor(rnd() * n);
        const b = Float64Array.from(a);
        selectInPlace(b, k);
        expect(b[k]).toBe(sorted[k]);
        for (let i = 0; i < k; i++) expect(b[i]).toBeLessThanOrEqual(b[k]);
        for (let i = k + 1; i < n; i++) expect(b[i]).toBeGreaterThanOrEqual(b[k]);
        expect(Float64Array.from(b).sort()).toEqual(sorted); // a permutation of the input
      }
    }
  });

  it("countAtMost counts the values ≤ x (computed by hand)", () => {
    expect(countAtMost([3, 1, 2, 2, 5], 2)).toBe(3);
    expect(countAtMost([3, 1, 2, 2, 5], 0)).toBe(0);
  });
});
