import { describe, expect, it } from "vitest";
import { UserError } from "../../src/messages/index.js";
import * as msg from "../../src/messages/study.js";
import { simulateQueue } from "../../src/demo/queue.js";
import { csv } from "../helpers/tempStudy.js";
import { figures, studyOf } from "../helpers/runStudyFrom.js";

const manifest = (end = 10, extra = "") => `title: entities
${extra}
scenarios:
  - {name: a, end: ${end}, runs: runs/*.csv}
measures:
  - {name: inside, kind: level, from: {enter: arrive, leave: depart}}
  - {name: stay, kind: observation, from: {start: arrive, end: depart}}
  - {name: arrivals, kind: count, series: arrive}
`;

describe("entity-derived measures", () => {
  it("level and durations on a hand-worked event log; departures listed before arrivals in the file", async () => {
    // entities a: 1→4, b: 2→3, c: 5→9 (our own numbers); the departures come first in the file,
    // which the contract allows (time is ordered only within a series).
    const file = csv([
      [3, "depart", null, "b"], [4, "depart", null, "a"], [9, "depart", null, "c"],
      [1, "arrive", null, "a"], [2, "arrive", null, "b"], [5, "arrive", null, "c"],
    ]);
    const { outcome } = await studyOf(manifest(), { "runs/r.csv": file });
    const inside = figures(outcome.results, "inside");
    // computed by hand: 1 on [1,2], 2 on [2,3], 1 on [3,4], 1 on [5,9]: area 8 over 10
    expect(inside.area).toBe(8);
    expect(inside.mean).toBe(0.8);
    expect(inside.max).toBe(2);
    const stay = figures(outcome.results, "stay");
    // computed by hand: durations recorded at their end times 3, 4, 9: 1, 3, 4
    expect(stay).toMatchObject({ n: 3, mean: 8 / 3, min: 1, max: 4, censored: 0 });
  });

  it("an entity still inside at the end is censored: counted and reported", async () => {
    const file = csv([[1, "arrive", null, "a"], [4, "depart", null, "a"], [8, "arrive", null, "d"], [12, "depart", null, "d"]]);
    const { outcome } = await studyOf(manifest(), { "runs/r.csv": file });
    // CONTRACT.md section 2: d leaves after the end (t = 12 > 10), so it is censored
    expect(figures(outcome.results, "stay")).toMatchObject({ n: 1, censored: 1 });
    expect(figures(outcome.results, "inside").final).toBe(1);
  });

  it("a leave without an enter is an input error naming the file and the line", async () => {
    const file = csv([[1, "arrive", null, "a"], [2, "depart", null, "zz"]]);
    const err = await studyOf(manifest(), { "runs/r.csv": file }).catch((e) => e);
    expect(err).toBeInstanceOf(UserError);
    // the catalogue function with the same arguments (line 3: header is line 1)
    expect([
      msg.leaveWithoutEnter("runs/r.csv", 3, "zz", "depart", "inside", "arrive").message,
      msg.leaveWithoutEnter("runs/r.csv", 3, "zz", "depart", "stay", "arrive").message,
    ]).toContain(err.message);
  });

  it("a second start of an open entity is an input error", async () => {
    const file = csv([[1, "arrive", null, "a"], [2, "arrive", null, "a"]]);
    const err = await studyOf(manifest(), { "runs/r.csv": file }).catch((e) => e);
    expect(err).toBeInstanceOf(UserError);
    expect(err.message).toContain("runs/r.csv:3");
  });
});

describe("Little's law as a sample-path identity (Little 1961; exact for a run that starts and ends empty)", () => {
  it("time average of the entity level = (arrivals / duration) × mean time in system, to 1e-9 relative", async () => {
    // a seeded M/M/2 run that stops admitting at 400 and drains; the window ends after the last departure
    const rows = [...simulateQueue({ arrivalRate: 0.8, serviceRate: 0.5, servers: 2, horizon: 400, seed: 7, drain: true, decimals: 4 })];
    const last = rows[rows.length - 1].time;
    const end = Math.ceil(last) + 1;
    const file = csv(rows.map((r) => [r.time, r.series, r.value, r.entity]));
    const { outcome } = await studyOf(manifest(end), { "runs/r.csv": file });
    const L = figures(outcome.results, "inside").mean as number;
    const W = figures(outcome.results, "stay").mean as number;
    const n = figures(outcome.results, "arrivals").n as number;
    expect(n).toBeGreaterThan(250);
    const lambdaW = (n / end) * W;
    expect(Math.abs(L - lambdaW) / L).toBeLessThan(1e-9);
    // the study's own consistency check agrees
    const checks = outcome.results.scenarios[0].checks as { check: string; passed: boolean; applies?: boolean }[];
    expect(checks.find((c) => c.check === "littles-law")).toMatchObject({ passed: true, applies: true });
  });

  it("the check uses the number inside, the level less its initial: a level with initial 3 passes a law that holds", async () => {
    // Little (1961): L counts entities in the system; `initial` only shifts the level (contract
    // section 2), so L = mean − initial. Seeded M/M/2 run that drains, as above; initial values
    // chosen by us: a small count, a fraction and one large enough that mean − initial would lose digits.
    const rows = [...simulateQueue({ arrivalRate: 0.8, serviceRate: 0.5, servers: 2, horizon: 200, seed: 11, drain: true, decimals: 4 })];
    const end = Math.ceil(rows[rows.length - 1].time) + 1;
    const file = csv(rows.map((r) => [r.time, r.series, r.value, r.entity]));
    for (const initial of [3, 0.5, 1e6]) {
      const text = manifest(end).replace("from: {enter: arrive, leave: depart}}", `from: {enter: arrive, leave: depart}, initial: ${initial}}`);
      const { outcome } = await studyOf(text, { "runs/r.csv": file });
      const checks = outcome.results.scenarios[0].checks as { check: string; passed: boolean; applies?: boolean; L?: number }[];
      const little = checks.find((c) => c.check === "littles-law")!;
      expect(little, `initial ${initial}`).toMatchObject({ passed: true, applies: true });
      // the same run with initial 0 gives the same L (the number inside does not depend on initial)
      const plain = await studyOf(manifest(end), { "runs/r.csv": file });
      const plainL = (plain.outcome.results.scenarios[0].checks as { check: string; L?: number }[]).find((c) => c.check === "littles-law")!.L;
      expect(little.L).toBe(plainL);
      expect(outcome.warnings.filter((w) => w.message.includes("λ·W"))).toEqual([]);
    }
  });
});
