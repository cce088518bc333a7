import { describe, expect, it } from "vitest";
import { TraceBuilder } from "../../src/measures/trace.js";

/**
 * The slices of a trace against a direct sum: a piecewise-constant level's area over a slice is
 * the sum of value × overlap (the definition of a time average, contract section 4). Times are
 * multiples of 1/8 and slices 1 wide, so every area is exact and the check is exact.
 */
function direct(changes: [number, number][], start: number, c: number, end: number, initial: number, slices: number) {
  const width = (end - start) / slices;
  const pieces: [number, number, number][] = [];
  let t = start;
  let v = initial;
  for (const [time, value] of changes) {
    if (time > t) pieces.push([t, time, v]);
    if (time >= start) t = time;
    v = value;
  }
  pieces.push([t, end, v]);
  let since = 0;
  return Array.from({ length: slices }, (_, j) => {
    const a = start + width * j;
    const b = a + width;
    let low = Infinity;
    let high = -Infinity;
    let area = 0;
    for (const [p, q, x] of pieces) {
      const lo = Math.max(p, a);
      const hi = Math.min(q, b);
      if (hi > lo) {
        low = Math.min(low, x);
        high = Math.max(high, x);
        area += x * (hi - lo);
        const from = Math.max(lo, c);
        if (hi > from) since += x * (hi - from);
      }
    }
    return { from: a, to: b, low, high, mean: area / width, area_to: since };
  });
}

describe("TraceBuilder slices", () => {
  it("TraceBuilder.finish gives each slice's low, high, mean and area since c as a direct sum does, for pieces within one slice and across several", () => {
    let seed = 3;
    const next = () => (seed = (seed * 1103515245 + 12345) % 2147483648) / 2147483648;
    const changes: [number, number][] = [];
    let t = 0;
    while (t < 20) {
      // Mostly short steps (several in one slice), now and then a long one crossing slices, some ties.
      const r = next();
      t += r < 0.1 ? 0 : r < 0.85 ? 0.125 * Math.ceil(next() * 4) : 0.125 * Math.ceil(next() * 40);
      if (t > 20) break;
      changes.push([t, Math.floor(next() * 7)]);
    }
    const trace = new TraceBuilder(0, 2.5, 20, 1, 20, 5);
    for (const [time, value] of changes) trace.change(time, value);
    const got = trace.finish();
    expect(changes.length).toBeGreaterThan(40);
    expect(got.slices).toEqual(direct(changes, 0, 2.5, 20, 1, 20));
  });
});
