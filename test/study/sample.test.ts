/**
 * The run-ordered observation sample behind the histogram (src/study/sample.ts): bounded, even,
 * and a function of the values in run order only. Expected values are computed by hand from the
 * rule "keep the positions that are multiples of the smallest power of two leaving at most the
 * limit".
 */
import { describe, expect, it } from "vitest";
import { EvenSample, thinned } from "../../src/study/sample.js";

const range = (n: number, from = 0) => Array.from({ length: n }, (_, i) => from + i);

describe("EvenSample", () => {
  it("keeps every value, in order, while there are at most `limit`", () => {
    const s = new EvenSample(10);
    s.add(range(4));
    s.add(range(6, 4));
    expect(s.values()).toEqual(range(10));
  });

  it("past the limit keeps the positions that are multiples of a power of two, at most `limit` of them", () => {
    // 11 values, limit 10: stride 2 keeps positions 0, 2, ..., 10 (computed by hand)
    const s = new EvenSample(10);
    s.add(range(11));
    expect(s.values()).toEqual([0, 2, 4, 6, 8, 10]);
    // 45 values in all: stride 8 would leave 6, stride 4 leaves 12 > 10, so 8: positions 0, 8, ..., 40
    s.add(range(34, 11));
    expect(s.values()).toEqual([0, 8, 16, 24, 32, 40]);
  });

  it("gives the same sample however the runs' values are cut into pieces", () => {
    const values = range(100_003).map((i) => Math.sin(i));
    const whole = new EvenSample(20_000);
    whole.add(values);
    const pieces = new EvenSample(20_000);
    for (let i = 0; i < values.length; i += 977) pieces.add(values.slice(i, i + 977));
    expect(pieces.values()).toEqual(whole.values());
    // 100 003 values, limit 20 000: stride 8 leaves ceil(100003 / 8) = 12 501 (stride 4 would leave 25 001)
    expect(whole.values().length).toBe(12_501);
    expect(whole.values()[1]).toBe(values[8]);
  });
});

describe("thinned", () => {
  it("copies a short run's values and keeps every k-th of a long run's, k = ceil(n / limit)", () => {
    const short = new Float64Array([1, 2, 3]);
    const copy = thinned(short, 3);
    expect([...copy]).toEqual([1, 2, 3]);
    expect(copy.buffer).not.toBe(short.buffer);
    // n = 10, limit 3: k = 4, positions 0, 4, 8 (computed by hand)
    expect([...thinned(new Float64Array(range(10)), 3)]).toEqual([0, 4, 8]);
  });
});
