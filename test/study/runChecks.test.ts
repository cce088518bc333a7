import { describe, expect, it } from "vitest";
import * as warn from "../../src/messages/warnings.js";
import { DURATION_DIGITS_WARNING, endsEarly, LATE_FRACTION, timeResolution } from "../../src/study/runChecks.js";
import { ulp } from "../../src/stats/ulp.js";
import { csv } from "../helpers/tempStudy.js";
import { studyOf } from "../helpers/runStudyFrom.js";

const manifest = (start: number, end: number, measures: string) => `title: clock
scenarios:
  - {name: a, start: ${start}, end: ${end}, runs: runs/*.csv}
measures:
${measures}
`;
const QUEUE = "  - {name: q, kind: level, series: queue}";

/** Rows written as decimal text, as a model's log would have them. */
const text = (rows: [string, string, string?, string?][]) =>
  "time,series,value,entity\n" + rows.map(([t, s, v, e]) => `${t},${s},${v ?? ""},${e ?? ""}`).join("\n") + "\n";

describe("durations that keep few digits (large clock values)", () => {
  it("a clock near 1e9 with steps of 1e-3 is warned about on the run, with the digits its durations keep", async () => {
    // our own numbers: a level changing every millisecond from t = 1e9
    const rows: [string, string, string][] = [];
    for (let k = 0; k < 50; k++) rows.push([`1000000000.${String(k).padStart(3, "0")}`, "queue", String(k % 3)]);
    const { outcome } = await studyOf(manifest(1e9, 1000000000.05, QUEUE), { "runs/r1.csv": text(rows) });
    const run = outcome.results.scenarios[0].runs[0];
    const res = run.time_resolution as { largest_time: number; ulp: number; smallest_duration: number; digits: number };
    // formula: ulp(1e9) = 2^−23 (1e9 lies in [2^29, 2^30)); the shortest duration is a difference of
    // two parsed times near 1e9, a multiple of 2^−23 near 1e-3; digits = log10(d / ulp) ≈ 3.92
    expect(res.ulp).toBe(2 ** -23);
    expect(res.largest_time).toBe(1000000000.05);
    expect(Math.abs(res.smallest_duration - 1e-3)).toBeLessThanOrEqual(2 ** -23);
    expect(res.digits).toBeCloseTo(Math.log10(1e-3 / 2 ** -23), 3);
    expect(res.digits).toBeLessThan(DURATION_DIGITS_WARNING);
    const message = warn.durationDigits("runs/r1.csv", res.digits, res.largest_time, res.ulp, res.smallest_duration, DURATION_DIGITS_WARNING);
    expect(outcome.warnings).toContainEqual({ scenario: "a", run: "r1", measure: null, message });
  });

  it("the same steps on a small clock are not warned about, and entity durations on a large clock are", async () => {
    // steps of 1e-3 from t = 0 to 0.05: ulp(0.05) = 2^−57, about 13 digits (formula as above)
    const rows: [string, string, string][] = [];
    for (let k = 0; k < 50; k++) rows.push([`0.${String(k).padStart(3, "0")}`, "queue", String(k % 3)]);
    const small = await studyOf(manifest(0, 0.05, QUEUE), { "runs/r1.csv": text(rows) });
    const res = small.outcome.results.scenarios[0].runs[0].time_resolution as { digits: number };
    expect(res.digits).toBeGreaterThan(12);
    expect(small.outcome.warnings.filter((w) => w.message.includes("significant digits"))).toEqual([]);
    // entity visits of 1 time unit on a clock near 4e15: ulp(4e15) = 0.5, log10(1 / 0.5) = 0.3 digits
    const visits = csv([[4e15, "arrive", null, "a"], [4e15 + 1, "depart", null, "a"], [4e15 + 2, "arrive", null, "b"], [4e15 + 6, "depart", null, "b"]]);
    const big = await studyOf(manifest(4e15, 4e15 + 7, "  - {name: stay, kind: observation, from: {start: arrive, end: depart}}"), { "runs/r1.csv": visits });
    const r = big.outcome.results.scenarios[0].runs[0].time_resolution as { digits: number; ulp: number; smallest_duration: number };
    expect(r).toMatchObject({ ulp: ulp(4e15), smallest_duration: 1 });
    expect(r.ulp).toBe(0.5);
    expect(big.outcome.warnings.some((w) => w.run === "r1" && w.message.includes("significant digits"))).toBe(true);
  });

  it("timeResolution takes the largest time and the shortest duration over all measures", () => {
    // computed by hand: largest 1e9, shortest 0.5 → log10(0.5 / 2^−23) = log10(2^22) = 6.62
    const r = timeResolution([
      { stats: { kind: "count", value: 0, n: 0, rate: 0 }, tables: [], warnings: [] },
      { stats: { kind: "count", value: 0, n: 0, rate: 0 }, tables: [], warnings: [], resolution: { largestTime: 1e9, smallestDuration: 2 } },
      { stats: { kind: "count", value: 0, n: 0, rate: 0 }, tables: [], warnings: [], resolution: { largestTime: 10, smallestDuration: 0.5 } },
    ]);
    expect(r).toEqual({ largest_time: 1e9, ulp: 2 ** -23, smallest_duration: 0.5, digits: Math.log10(2 ** 22) });
    expect(timeResolution([])).toBeNull();
  });
});

describe("a run whose rows stop long before the window's end", () => {
  it("is warned about on the run when its latest row is more than a tenth of the window before end", async () => {
    // our own numbers: window [0, 100]; rows up to 85 (15 before the end > 10) in r1, up to 95 in r2
    const r1 = csv([[0, "queue", 1], [40, "queue", 2], [85, "queue", 0]]);
    const r2 = csv([[0, "queue", 1], [95, "queue", 0]]);
    const { outcome } = await studyOf(manifest(0, 100, QUEUE), { "runs/r1.csv": r1, "runs/r2.csv": r2 });
    const [run1, run2] = outcome.results.scenarios[0].runs;
    expect(run1).toMatchObject({ last_row_time: 85, ends_early: true });
    expect(run2.last_row_time).toBe(95);
    expect(run2.ends_early).toBeUndefined();
    const message = warn.runEndsEarly("runs/r1.csv", 85, 100, 0, LATE_FRACTION);
    expect(outcome.warnings).toContainEqual({ scenario: "a", run: "r1", measure: null, message });
    expect(outcome.warnings.filter((w) => w.run === "r2")).toEqual([]);
  });

  it("counts rows after the end and rows of every series read; a gap of exactly a tenth is not warned about", () => {
    // the rule, by hand: end − last > 0.1 · (end − start)
    expect(endsEarly(90, 0, 100)).toBe(false);
    expect(endsEarly(89.9, 0, 100)).toBe(true);
    expect(endsEarly(130, 0, 100)).toBe(false);
    expect(endsEarly(null, 0, 100)).toBe(false); // no row at all: "series never appears" says it
    expect(endsEarly(545, 50, 600)).toBe(false); // 55 = a tenth of 550
    expect(LATE_FRACTION).toBe(0.1);
  });

  it("a run with a row after the end, or a late row of another series read, is not short", async () => {
    const m = `${QUEUE}\n  - {name: n, kind: count, series: arrive}`;
    const after = csv([[0, "queue", 1], [20, "queue", 2], [120, "queue", 0]]);
    const other = csv([[0, "queue", 1], [20, "queue", 2], [99, "arrive"]]);
    const { outcome } = await studyOf(manifest(0, 100, m), { "runs/after.csv": after, "runs/other.csv": other });
    for (const run of outcome.results.scenarios[0].runs) expect(run.ends_early, run.id).toBeUndefined();
    expect(outcome.results.scenarios[0].runs.map((r) => r.last_row_time)).toEqual([120, 99]);
  });
});
