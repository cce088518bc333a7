/**
 * Regressions for the defects the property-based tests found (valid.test.ts, broken.test.ts),
 * each reduced to the smallest study that shows it.
 */
import { describe, expect, it } from "vitest";
import { UserError } from "../../src/messages/index.js";
import * as studyMessages from "../../src/messages/study.js";
import { csv } from "../helpers/tempStudy.js";
import { figures, studyOf } from "../helpers/runStudyFrom.js";

const levelStudy = (end: number | string, measures = "  - {name: queue, kind: level, series: queue}\n") =>
  `title: regression\nscenarios:\n  - {name: a, end: ${end}, runs: runs/*.csv}\nmeasures:\n${measures}`;

describe("regressions found by fuzzing", () => {
  it("a level that is constant over the whole window has sd exactly 0, also after a zero-length interval at c", async () => {
    // Found by valid.test.ts: a row at the window start leaves the interval [0, 0] with the
    // initial level 0, then the level is 7 up to the end. The time-weighted sd was computed from
    // sums shifted by that first value (0) and cancelled: sqrt(49 - 7²) with rounding gave
    // 1.19e-7. Computed by hand: a constant level has sd 0 (CONTRACT.md section 4 formula).
    const end = 5.503877535115802; // the counterexample's end, where the rounding showed
    const { outcome } = await studyOf(levelStudy(end), { "runs/r.csv": csv([[0, "queue", 7]]) });
    const q = figures(outcome.results, "queue");
    expect(Math.abs((q.mean as number) - 7)).toBeLessThan(1e-14); // area / T, one rounding each
    expect(q.sd).toBe(0);
    expect(q.min).toBe(7);
  });

  it("a level with a short stretch far from the rest keeps its sd digits", async () => {
    // 0 on [0, a], V = 1e6 on [a, 10] with a = 1e-9. Computed by hand: with two values the
    // time-weighted variance is V² · a · b / T² (b = T - a), so sd = V · sqrt(a · b) / T ≈ 10.
    // Sums shifted by the first value (0) subtract 1e12 from 1e12 here and kept about 6 digits.
    const { outcome } = await studyOf(levelStudy(10), { "runs/r.csv": csv([[1e-9, "queue", 1e6]]) });
    const q = figures(outcome.results, "queue");
    const sd = (1e6 * Math.sqrt(1e-9 * (10 - 1e-9))) / 10;
    expect(Math.abs((q.sd as number) - sd) / sd).toBeLessThan(1e-12);
  });

  it("a level whose area overflows is an input error naming the file and the figure, not Infinity in results", async () => {
    // Found by broken.test.ts: finite values (1e308) held for 10 time units have an area beyond
    // the largest double; results.json held Infinity, which JSON writes as null.
    const err = await studyOf(levelStudy(10), { "runs/r.csv": csv([[0, "queue", 1e308]]) }).catch((e) => e);
    expect(err).toBeInstanceOf(UserError);
    expect(err.message).toBe(studyMessages.runFigureOverflow("runs/r.csv", "queue", "value").message);
  });

  it("a window end that makes a capacity area overflow is an input error", async () => {
    // Found by broken.test.ts: end 1e308 with capacity 3 gives a capacity area of 3e308.
    const err = await studyOf(levelStudy("1e308", "  - {name: oven, kind: utilization, series: busy, capacity: 3}\n"), {
      "runs/r.csv": csv([[0, "busy", 1]]),
    }).catch((e) => e);
    expect(err).toBeInstanceOf(UserError);
    expect(err.message).toContain(studyMessages.runFigureOverflow("runs/r.csv", "oven", "").message.split(": its")[0]);
  });

  it("an across-run sd that overflows is an input error naming the scenario and the measure", async () => {
    // computed by hand: run values 1.5e308 and -1.5e308 have mean 0 and squared deviations
    // 2.25e616, beyond the largest double.
    const err = await studyOf(levelStudy(10, "  - {name: wait, kind: observation, series: wait}\n"), {
      "runs/r1.csv": csv([[1, "wait", 1.5e308]]),
      "runs/r2.csv": csv([[1, "wait", -1.5e308]]),
    }).catch((e) => e);
    expect(err).toBeInstanceOf(UserError);
    expect(err.message).toBe(studyMessages.summaryFigureOverflow("a", "wait", "sd").message);
  });
});
