/**
 * EventMerge (src/measures/events.ts): events of several series, each in time order, come out
 * in the order of a stable sort by time (ties in arrival order, or by input then arrival), the
 * order the measures used when they kept every event and sorted at the end.
 */
import { describe, expect, it } from "vitest";
import { uniform } from "../../src/demo/random.js";
import { EventMerge } from "../../src/measures/events.js";

interface Ev {
  input: number;
  time: number;
  line: number;
}

/** Random events of `inputs` series, each series' times non-decreasing, interleaved at random (invented data). */
function events(seed: number, inputs: number, n: number): Ev[] {
  const u = uniform(seed);
  const t = new Array<number>(inputs).fill(0);
  const out: Ev[] = [];
  for (let line = 1; line <= n; line++) {
    const input = Math.floor(u() * inputs);
    // Whole steps 0..3 so that ties across series are frequent.
    t[input] += Math.floor(u() * 4) * (u() < 0.2 ? 5 : 1);
    out.push({ input, time: t[input], line });
  }
  return out;
}

function merged(evs: Ev[], inputs: number, ties: "arrival" | "input"): { lines: number[]; peak: number } {
  const lines: number[] = [];
  const m = new EventMerge(inputs, ties, (_time, _kind, _value, _entity, line) => lines.push(line));
  for (const e of evs) m.add(e.input, e.time, e.input, 0, undefined, e.line);
  m.finish();
  return { lines, peak: m.peak };
}

describe("EventMerge", () => {
  it("gives the order of a stable sort by time, ties in arrival order (common practice: Array.prototype.sort is stable, ES2019)", () => {
    for (let seed = 1; seed <= 40; seed++) {
      const inputs = 1 + (seed % 3);
      const evs = events(seed, inputs, 300);
      const expected = [...evs].sort((a, b) => a.time - b.time).map((e) => e.line);
      expect(merged(evs, inputs, "arrival").lines).toEqual(expected);
    }
  });

  it("gives the order of a stable sort by time of input 0's events followed by input 1's with ties: input", () => {
    for (let seed = 1; seed <= 40; seed++) {
      const evs = events(seed, 2, 300);
      const expected = [...evs.filter((e) => e.input === 0), ...evs.filter((e) => e.input === 1)].sort((a, b) => a.time - b.time).map((e) => e.line);
      expect(merged(evs, 2, "input").lines).toEqual(expected);
    }
  });

  it("keeps few events waiting when the rows come in time order across series (common practice)", () => {
    // Alternating series at increasing times: each event waits at most until the other series' next one.
    const evs: Ev[] = Array.from({ length: 10_000 }, (_, k) => ({ input: k % 2, time: k, line: k + 1 }));
    const r = merged(evs, 2, "arrival");
    expect(r.lines).toEqual(evs.map((e) => e.line));
    // At most the one waiting for the other series and the one just added, which releases it.
    expect(r.peak).toBeLessThanOrEqual(2);
  });
});
