import { describe, expect, it } from "vitest";
import { UserError } from "../../src/messages/error.js";
import * as studyMessages from "../../src/messages/study.js";
import { studyOf } from "../helpers/runStudyFrom.js";

// Invented runs: a queue level, waits and departures; computed by hand where figures are read.
const run = (k: number, extra = "") =>
  ["time,series,value,entity", "0,queue,0,", "0.5,arrive,,c1", `1,queue,${k},`, "2,wait,1.5,", "3,depart,,c1", `4,queue,0,`, extra].filter((l) => l !== "").join("\n") + "\n";
const files = { "runs/a-1.csv": run(1), "runs/a-2.csv": run(2), "runs/b-1.csv": run(3, "5,balk,,"), "runs/b-2.csv": run(1) };
const manifest = (measures: string[]) =>
  [
    "scenarios:",
    "  - {name: calm, runs: runs/a-*.csv, end: 10}",
    "  - {name: busy, runs: runs/b-*.csv, end: 10}",
    "measures:",
    ...measures.map((m) => `  - ${m}`),
    "",
  ].join("\n");

async function failure(measures: string[]): Promise<UserError> {
  try {
    await studyOf(manifest(measures), files);
  } catch (e) {
    if (e instanceof UserError) return e;
    throw e;
  }
  throw new Error("the study ran without an error");
}

describe("checkSeriesPresent (through runStudy)", () => {
  it("refuses a misspelt series of each kind with the manifest place and the closest name that appears", async () => {
    const cases: [string, string, string][] = [
      ["{name: q, kind: level, series: queu}", "queu", "queue"],
      ["{name: w, kind: observation, series: wiat}", "wiat", "wait"],
      ["{name: d, kind: count, series: departs}", "departs", "depart"],
      ["{name: u, kind: utilization, series: queue, capacity: cap_open, capacity_initial: 2}", "cap_open", null as unknown as string],
      ["{name: t, kind: observation, from: {start: arrive, end: deprat}}", "deprat", "depart"],
    ];
    for (const [measure, series, suggestion] of cases) {
      const e = await failure(["{name: ok, kind: level, series: queue}", measure]);
      const name = measure.match(/name: (\w+)/)![1];
      const key = measure.includes("from:") ? "from" : "series";
      const expected = studyMessages.seriesInNoRun(
        { file: "study.yaml", line: 6, path: `measures[1].${key}` },
        name,
        series,
        "calm",
        2,
        suggestion,
        ["arrive", "depart", "queue", "wait"],
      );
      // The place's file is the manifest's full path; the rest of the message is the catalogue's.
      expect(e.message.slice(e.message.indexOf(": measure"))).toBe(expected.message.slice(expected.message.indexOf(": measure")));
      expect(e.message).toMatch(new RegExp(`study\\.yaml:6:\\d+ \\(at measures\\[1\\]\\.${key}\\)`));
    }
  });

  it("names a capacity series with no row in a run, instead of a zero capacity area", async () => {
    const e = await failure(["{name: u, kind: utilization, series: queue, capacity: queeu}"]);
    expect(e.message).toBe(studyMessages.capacitySeriesAbsent(e.message.slice(0, e.message.indexOf(": measure")), "u", "queeu", "queue").message);
    expect(e.message).toMatch(/runs\/a-1\.csv: measure/);
  });

  it("accepts a series that appears in only one scenario's runs, and warns on the runs without it", async () => {
    const { outcome } = await studyOf(manifest(["{name: balks, kind: count, series: balk, may_be_absent: true}"]), files);
    const busy = outcome.results.scenarios[1];
    // computed by hand: one balk row in busy/b-1, none in b-2
    expect(busy.runs.map((r) => (r.measures.balks as { n: number }).n)).toEqual([1, 0]);
    expect(outcome.warnings.some((w) => w.scenario === "busy" && w.run === "b-2" && w.measure === "balks")).toBe(true);
    // calm has no balk at all: allowed by may_be_absent, said once for the scenario
    expect(outcome.warnings.filter((w) => w.scenario === "calm" && w.run === null && w.measure === "balks")).toHaveLength(1);
  });

  it("without may_be_absent, a series absent from every run of one scenario is an error for that scenario", async () => {
    const e = await failure(["{name: balks, kind: count, series: balk}"]);
    expect(e.message).toContain('scenario "calm"');
    expect(e.message).toContain("may_be_absent: true");
  });
});
