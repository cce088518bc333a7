import { describe, expect, it } from "vitest";
import { loadStudy } from "../../src/manifest/loadStudy.js";
import { timeAverageAt } from "../../src/study/at.js";
import { csv } from "../helpers/tempStudy.js";
import { figures, studyOf } from "../helpers/runStudyFrom.js";
import * as warn from "../../src/messages/warnings.js";

// A small level trace worked by hand (our own numbers): initial 0, 2 from t=0, 5 from t=3,
// 1 from t=4, window [0, 10], and a row at t=12 after the end.
const trace = csv([[0, "queue", 2], [3, "queue", 5], [4, "queue", 1], [12, "queue", 3]]);
const levelManifest = (extra = "") => `title: hand
${extra}
scenarios:
  - {name: a, end: 10, runs: runs/*.csv}
measures:
  - {name: q, kind: level, series: queue}
`;

describe("level statistics on a hand-worked trace", () => {
  it("runStudy gives area, time average, time-weighted sd, min, max and final as worked by hand", async () => {
    const { outcome } = await studyOf(levelManifest(), { "runs/r1.csv": trace });
    const q = figures(outcome.results, "q");
    // computed by hand: area = 0*0 + 2*3 + 5*1 + 1*6 = 17; T = 10; mean = 1.7
    expect(q.area).toBe(17);
    expect(q.duration).toBe(10);
    expect(q.mean).toBe(1.7);
    // computed by hand: sum d (v - 1.7)^2 = 3*0.09 + 1*10.89 + 6*0.49 = 14.1; sd = sqrt(1.41)
    expect(q.sd as number).toBeCloseTo(Math.sqrt(1.41), 14);
    // computed by hand: min and max over intervals of positive duration (the zero-length [0,0] at 0 is not one)
    expect(q.min).toBe(1);
    expect(q.max).toBe(5);
    expect(q.final).toBe(1);
    // CONTRACT.md section 3: the row after the end is excluded and counted
    expect(outcome.inputs[0].left_out.after_end).toBe(1);
  });

  it("the calculation table lists every interval with duration, area, running area and running average", async () => {
    const { outcome } = await studyOf(levelManifest(), { "runs/r1.csv": trace });
    const t = outcome.tables.find((x) => x.run === "r1" && x.measure === "q")!;
    expect(t.columns).toEqual(["index", "value", "from", "to", "duration", "area", "running_area", "running_mean", "line"]);
    // computed by hand: the initial level holds on [0, 0] (duration 0, no row behind it), then the
    // three rows' levels, each pointing at its line of the file (the header is line 1; CONTRACT.md section 11)
    expect(t.preview).toEqual([
      [1, 0, 0, 0, 0, 0, 0, null, null],
      [2, 2, 0, 3, 3, 6, 6, 2, 2],
      [3, 5, 3, 4, 1, 5, 11, 11 / 4, 3],
      [4, 1, 4, 10, 6, 6, 17, 1.7, 4],
    ]);
  });

  it("a warm-up prorates the interval that straddles it", async () => {
    const { outcome } = await studyOf(levelManifest("warmup: 2"), { "runs/r1.csv": trace });
    const q = figures(outcome.results, "q");
    // computed by hand: c = 2; [2,3] at 2 gives 2, [3,4] at 5 gives 5, [4,10] at 1 gives 6: area 13 over T = 8
    expect(q.area).toBe(13);
    expect(q.duration).toBe(8);
    expect(q.mean).toBe(13 / 8);
  });

  it("rows at the same time each leave a zero-length interval and the last one holds (ties)", async () => {
    const tied = csv([[0, "queue", 2], [3, "queue", 5], [3, "queue", 7], [3, "queue", 4]]);
    const { outcome } = await studyOf(levelManifest(), { "runs/r1.csv": tied });
    const q = figures(outcome.results, "q");
    // computed by hand: 2 on [0,3] (area 6), 5 and 7 on [3,3] (area 0), 4 on [3,10] (area 28)
    expect(q.area).toBe(34);
    expect(q.max).toBe(4); // CONTRACT.md section 4: max over intervals of positive duration only
    expect(q.final).toBe(4);
    const t = outcome.tables.find((x) => x.run === "r1" && x.measure === "q")!;
    expect(t.rows_total).toBe(5);
    expect(t.preview!.map((r) => r[4])).toEqual([0, 3, 0, 0, 7]);
  });

  it("a row exactly at the end is inside the window and sets the final value", async () => {
    const { outcome } = await studyOf(levelManifest(), { "runs/r1.csv": csv([[0, "queue", 2], [10, "queue", 9]]) });
    const q = figures(outcome.results, "q");
    // CONTRACT.md section 3: a row exactly at end is inside
    expect(q.area).toBe(20);
    expect(q.final).toBe(9);
    expect(outcome.inputs[0].left_out.after_end).toBe(0);
  });

  it("timeAverageAt prorates the interval containing t", async () => {
    const { manifestPath } = await studyOf(levelManifest(), { "runs/r1.csv": trace });
    const study = await loadStudy(manifestPath);
    const r = await timeAverageAt(study, { scenario: "a", run: "r1", measure: "q" }, 3.5);
    // computed by hand: 2*3 + 5*0.5 = 8.5 over [0, 3.5]
    expect(r.result).toEqual({ time: 3.5, area: 8.5, duration: 3.5, mean: 8.5 / 3.5 });
  });

  it("timeAverageAt after a warm-up starts at the warm-up", async () => {
    const { manifestPath } = await studyOf(levelManifest("warmup: 2"), { "runs/r1.csv": trace });
    const study = await loadStudy(manifestPath);
    const r = await timeAverageAt(study, { scenario: "a", run: "r1", measure: "q" }, 4);
    // computed by hand: 2*1 + 5*1 over [2, 4]
    expect(r.result).toEqual({ time: 4, area: 7, duration: 2, mean: 3.5 });
  });
});

describe("observation, count and utilization on hand-worked runs", () => {
  const rows = csv([
    [0, "busy", 1], [1, "wait", 4], [2, "wait", 6], [2, "arrive", null, "x"], [4, "busy", 2], [5, "wait", 11], [9, "arrive", null, "y"],
  ]);
  const manifest = `title: obs
warmup: 2
scenarios:
  - {name: a, end: 10, runs: runs/*.csv}
measures:
  - {name: w, kind: observation, series: wait, quantiles: [0.5], within: [6]}
  - {name: n, kind: count, series: arrive}
  - {name: u, kind: utilization, series: busy, capacity: 2}
`;
  it("observations and counts before the warm-up are left out; a row exactly at the warm-up is inside", async () => {
    const { outcome } = await studyOf(manifest, { "runs/r1.csv": rows });
    const w = figures(outcome.results, "w");
    // computed by hand: kept observations 6 (t=2, exactly at the warm-up) and 11
    expect(w.n).toBe(2);
    expect(w.mean).toBe(8.5);
    expect(w.sd).toBeCloseTo(Math.sqrt(12.5), 14);
    expect(w.min).toBe(6);
    expect(w.max).toBe(11);
    // Hyndman and Fan (1996) type 7: median of [6, 11] = 8.5; share <= 6 is 1/2
    expect(w.quantiles).toEqual({ "0.5": 8.5 });
    expect(w.within).toEqual({ "6": 0.5 });
    const n = figures(outcome.results, "n");
    // computed by hand: arrivals at 2 and 9; rate = 2 / (10 - 2)
    expect(n).toMatchObject({ n: 2, value: 2, rate: 0.25 });
  });

  it("utilization = busy area / capacity area over the window, prorated at the warm-up", async () => {
    const { outcome } = await studyOf(manifest, { "runs/r1.csv": rows });
    const u = figures(outcome.results, "u");
    // computed by hand: busy 1 on [2,4] and 2 on [4,10]: area 14; capacity 2 over 8: area 16
    expect(u.value).toBe(14 / 16);
    expect(u.mean).toBe(14 / 16);
  });

  it("utilization against a capacity series merges the two series in time order", async () => {
    // capacity rows come after the busy rows in the file: time is ordered only within a series (CONTRACT.md section 1)
    const file = csv([[0, "busy", 1], [4, "busy", 2], [0, "open", 2], [5, "open", 4]]);
    const { outcome } = await studyOf(
      `title: cap
scenarios:
  - {name: a, end: 10, runs: runs/*.csv}
measures:
  - {name: u, kind: utilization, series: busy, capacity: open}
`,
      { "runs/r1.csv": file },
    );
    // computed by hand: busy area 1*4 + 2*6 = 16; capacity area 2*5 + 4*5 = 30
    expect(figures(outcome.results, "u").value).toBe(16 / 30);
  });
});

describe("a busy level above its capacity is warned about, whatever the ratio of areas", () => {
  const capManifest = (capacity: string, extra = "") => `title: cap
${extra}
scenarios:
  - {name: a, end: 10, runs: runs/*.csv}
measures:
  - {name: u, kind: utilization, series: busy, capacity: ${capacity}}
`;

  it("a capacity series that drops below the busy level is named with where and when, though the utilization is below 1", async () => {
    // our own numbers: capacity 4 on [0,6], 1 on [6,8], 4 on [8,10]; busy 2 throughout.
    // computed by hand: busy area 20, capacity area 34, utilization 20/34 < 1; busy 2 > capacity 1 on [6,8]
    const file = csv([[0, "busy", 2], [0, "open", 4], [6, "open", 1], [8, "open", 4]]);
    const { outcome } = await studyOf(capManifest("open"), { "runs/r1.csv": file });
    const u = figures(outcome.results, "u");
    expect(u.value).toBe(20 / 34);
    expect(u.over_capacity).toEqual({ intervals: 1, time: 2, first: { from: 6, to: 8, busy: 2, capacity: 1, line: 4 } });
    const expected = warn.busyAboveCapacity("u", "runs/r1.csv", { intervals: 1, time: 2, from: 6, to: 8, busy: 2, capacity: 1, line: 4, series: "open" }, 20 / 34);
    expect(outcome.warnings).toContainEqual({ scenario: "a", run: "r1", measure: "u", message: expected });
  });

  it("a busy level above a constant capacity counts every interval and its total time; one at capacity is not warned about", async () => {
    // computed by hand: capacity 2; busy 3 on [1,2] and [5,7.5], 2 elsewhere after t = 0
    const over = csv([[0, "busy", 2], [1, "busy", 3], [2, "busy", 1], [5, "busy", 3], [7.5, "busy", 2]]);
    const { outcome } = await studyOf(capManifest("2"), { "runs/r1.csv": over });
    expect(figures(outcome.results, "u").over_capacity).toEqual({ intervals: 2, time: 3.5, first: { from: 1, to: 2, busy: 3, capacity: 2, line: 3 } });
    // computed by hand: busy area 2 + 3 + 3 + 7.5 + 5 = 20.5 against 20, so the warning says "above 1"
    const message = warn.busyAboveCapacity("u", "runs/r1.csv", { intervals: 2, time: 3.5, from: 1, to: 2, busy: 3, capacity: 2, line: 3, series: null }, 20.5 / 20);
    expect(outcome.warnings.filter((w) => w.message === message)).toHaveLength(1);
    // busy exactly at capacity, and a tie where busy rises before the capacity in file order (duration 0)
    const atCapacity = csv([[0, "busy", 2], [0, "open", 2], [4, "busy", 3], [4, "open", 3]]);
    const ok = await studyOf(capManifest("open"), { "runs/r1.csv": atCapacity });
    expect(figures(ok.outcome.results, "u").over_capacity).toBeUndefined();
    expect(ok.outcome.warnings.filter((w) => w.measure === "u")).toEqual([]);
  });

  it("only the window counts: busy above capacity during the warm-up only is not warned about", async () => {
    // computed by hand: busy 3 > 2 on [0,1], before the warm-up at 2
    const file = csv([[0, "busy", 3], [1, "busy", 1]]);
    const { outcome } = await studyOf(capManifest("2", "warmup: 2"), { "runs/r1.csv": file });
    expect(figures(outcome.results, "u").over_capacity).toBeUndefined();
  });
});

describe("rows left out are reported in results.json", () => {
  it("each run carries its rows read and rows left out (CONTRACT.md section 3)", async () => {
    const file = csv([[0, "queue", 2], [1, "other", 1], [3, "queue", 5], [12, "queue", 3]]);
    const { outcome } = await studyOf(levelManifest("warmup: 2"), { "runs/r1.csv": file });
    const run = outcome.results.scenarios[0].runs[0];
    // computed by hand: 4 rows; t = 12 is after the end; t = 0 is before the warm-up; "other" is read by no measure
    expect(run.rows).toBe(4);
    expect(run.left_out).toEqual({ after_end: 1, before_window: 1, unused_series: 1 });
  });
});

describe("series named like object properties", () => {
  it("a series called toString or constructor is counted like any other (regression found by fuzzing)", async () => {
    const file = csv([[0, "toString", 1], [1, "constructor", 2], [2, "q", 3]]);
    const m = `title: t\nscenarios:\n  - {name: a, end: 10, runs: [r.csv]}\nmeasures:\n  - {name: t, kind: level, series: toString}\n  - {name: p, kind: level, series: __proto__, may_be_absent: true}\n`;
    const { outcome } = await studyOf(m, { "r.csv": file });
    const run = outcome.results.scenarios[0].runs[0];
    // computed by hand: "constructor" and "q" are read by no measure; "__proto__" never appears
    expect(run.left_out).toEqual({ after_end: 0, before_window: 0, unused_series: 2 });
    expect(outcome.warnings.some((w) => w.message.includes('"__proto__" never appears'))).toBe(true);
    expect(figures(outcome.results, "t").mean).toBe(1);
  });
});

describe("measures named like object properties", () => {
  it("a measure called __proto__ or constructor appears in results like any other (common practice: user names are data)", async () => {
    const file = csv([[0, "q", 1], [5, "q", 3]]);
    const m = `title: t\nscenarios:\n  - {name: a, end: 10, runs: [r.csv]}\nmeasures:\n  - {name: __proto__, kind: level, series: q}\n  - {name: constructor, kind: count, series: q}\n`;
    const { outcome } = await studyOf(m, { "r.csv": file });
    const json = JSON.parse(JSON.stringify(outcome.results));
    // computed by hand: 1 on [0,5], 3 on [5,10]: time average 2; two rows
    expect(Object.keys(json.scenarios[0].runs[0].measures)).toEqual(["__proto__", "constructor"]);
    expect(json.scenarios[0].runs[0].measures["__proto__"].mean).toBe(2);
    expect(json.scenarios[0].summary["constructor"].mean).toBe(2);
  });
});
