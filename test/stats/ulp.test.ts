import { describe, expect, it } from "vitest";
import { ulp } from "../../src/stats/ulp.js";

describe("ulp", () => {
  it("ulp(x) is the gap from |x| to the next larger double", () => {
    // IEEE 754 binary64: 52 fraction bits, so ulp(1) = 2^-52; the gap is checked against the next
    // double found by adding half an ulp (rounds to even, stays) and a whole one (moves)
    for (const x of [1, 1.5, 2, 3, 1e9, -1e9, 123456.789, 4e12, 1e-300, 2 ** 1000, 0.1]) {
      const u = ulp(x);
      const a = Math.abs(x);
      expect(a + u).toBeGreaterThan(a);
      expect(a + u / 2 === a || a + u / 2 === a + u).toBe(true);
      expect(a + u / 4).toBe(a);
    }
    expect(ulp(1)).toBe(2 ** -52);
    expect(ulp(1e9)).toBe(2 ** -23); // 2^29 ≤ 1e9 < 2^30
    expect(ulp(2 ** 30)).toBe(2 ** -22);
    expect(ulp(2 ** 30 - 2 ** -23)).toBe(2 ** -23);
    expect(ulp(0)).toBe(2 ** -1074);
    expect(ulp(5e-324)).toBe(2 ** -1074);
  });
});
