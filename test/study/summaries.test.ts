import Handlebars from "handlebars";
import { describe, expect, it } from "vitest";
import * as warn from "../../src/messages/warnings.js";
import { buildReportModel } from "../../src/report/model/index.js";
import { renderHtml } from "../../src/report/html.js";
import { LATE_FRACTION } from "../../src/study/runChecks.js";
import { csv } from "../helpers/tempStudy.js";
import { studyOf } from "../helpers/runStudyFrom.js";

const META = { toolVersion: "test", generatedAt: "2026-01-01T00:00:00Z" };

const manifest = (measures: string, extra = "") => `title: rows
${extra}
scenarios:
  - {name: a, end: 10, runs: runs/*.csv}
measures:
${measures}
`;

describe("summarizeMeasure says which runs an interval rests on", () => {
  it("an observation measure that drops a run (no observation in its window) names it on the summary and its row", async () => {
    // our own numbers: waits 2, 4 in r1; 3, 5 in r3; r2's only wait is before the warm-up at 1
    const files = {
      "runs/r1.csv": csv([[2, "wait", 2], [5, "wait", 4], [9, "tick"]]),
      "runs/r2.csv": csv([[0.5, "wait", 7], [9, "tick"]]),
      "runs/r3.csv": csv([[3, "wait", 3], [6, "wait", 5], [9.5, "tick"]]),
    };
    const { study, outcome } = await studyOf(manifest("  - {name: w, kind: observation, series: wait, quantiles: [0.5]}\n  - {name: t, kind: count, series: tick}", "warmup: 1"), files);
    const s = outcome.results.scenarios[0].summary.w;
    // computed by hand: run means 3 and 4 over 2 of 3 runs
    expect(s).toMatchObject({ n: 2, mean: 3.5, runs_without_value: ["r2"] });
    expect(s.quantiles!["0.5"].runs_without_value).toEqual(["r2"]);
    // the count has a value in every run: no list
    expect(outcome.results.scenarios[0].summary.t.runs_without_value).toBeUndefined();
    const message = warn.runsWithoutValue(["r2"], 2, 3);
    expect(outcome.warnings).toContainEqual({ scenario: "a", run: null, measure: "w", message });
    const model = buildReportModel(study, outcome, META);
    const row = model.summary.rows.find((r) => r.key === "w")!;
    expect(row.runs).toBe("2");
    // the row's flags: the run left out (to the measure's run table) and the warning that says so
    const wi = outcome.warnings.findIndex((w) => w.message === message);
    expect(row.flags).toEqual([
      { kind: "left-out", text: warn.rowFlag.leftOut(["r2"]), href: `#${model.measures[0].runs.id}` },
      { kind: "warnings", text: warn.rowFlag.warnings(1), href: `#${model.warnings[wi].id}` },
    ]);
    expect(model.summary.rows.find((r) => r.key === "t")!.flags).toEqual([]);
  });

  it("a run that stops long before the end is named on every summary row of its scenario", async () => {
    // window [0, 10]; r2's last row is at 6, 4 before the end (more than a tenth)
    const files = {
      "runs/r1.csv": csv([[0, "queue", 1], [9.5, "queue", 2]]),
      "runs/r2.csv": csv([[0, "queue", 2], [6, "queue", 0]]),
    };
    const { study, outcome } = await studyOf(manifest("  - {name: q, kind: level, series: queue}\n  - {name: n, kind: count, series: queue}"), files);
    for (const name of ["q", "n"]) expect(outcome.results.scenarios[0].summary[name].runs_ending_early).toEqual(["r2"]);
    const model = buildReportModel(study, outcome, META);
    // the flag links to the run's own warning, which is also counted on the row (one: r2 ends early)
    const wi = outcome.warnings.findIndex((w) => w.run === "r2" && w.message.includes(`more than ${LATE_FRACTION * 100}% of the window`));
    expect(wi).toBeGreaterThanOrEqual(0);
    for (const row of model.summary.rows) {
      expect(row.flags).toEqual([
        { kind: "ends-early", text: warn.rowFlag.endsEarly(["r2"]), href: `#${model.warnings[wi].id}` },
        { kind: "warnings", text: warn.rowFlag.warnings(1), href: `#${model.warnings[wi].id}` },
      ]);
    }
    const html = await renderHtml(model);
    expect(html).toContain(`<li id="${model.warnings[wi].id}">`);
    expect(html).toContain(Handlebars.escapeExpression(warn.rowFlag.endsEarly(["r2"])));
  });

  it("a summary row counts the warnings of its runs about its own measure, not those about another", async () => {
    // our own numbers: busy 3 against capacity 2 on [2, 4] in r1 (a warning about u only; busy
    // area 2 + 6 + 6 = 14 over 20, so the range check passes)
    const files = {
      "runs/r1.csv": csv([[0, "busy", 1], [2, "busy", 3], [4, "busy", 1], [9.5, "busy", 1]]),
      "runs/r2.csv": csv([[0, "busy", 1], [9.5, "busy", 2]]),
    };
    const { study, outcome } = await studyOf(manifest("  - {name: u, kind: utilization, series: busy, capacity: 2}\n  - {name: n, kind: count, series: busy}"), files);
    const model = buildReportModel(study, outcome, META);
    expect(model.summary.rows.find((r) => r.key === "u")!.flags.map((f) => f.text)).toEqual([warn.rowFlag.warnings(1)]);
    expect(model.summary.rows.find((r) => r.key === "n")!.flags).toEqual([]);
  });

  it("a run name with markup is escaped on the summary row", async () => {
    const files = {
      "runs/<b>x</b>.csv": csv([[0, "queue", 1], [9.5, "queue", 2]]),
      "runs/ok.csv": csv([[0, "queue", 2], [2, "queue", 0]]),
      "runs/<i>late.csv": csv([[0, "queue", 2], [1, "queue", 0]]),
    };
    const { study, outcome } = await studyOf(manifest("  - {name: q, kind: level, series: queue}"), files);
    const model = buildReportModel(study, outcome, META);
    // runs ending early: "<i>late" (last row 1) and "ok" (last row 2); runs in file-name order
    const message = warn.rowFlag.endsEarly(["<i>late", "ok"]);
    expect(model.summary.rows[0].flags.map((f) => f.text)).toEqual([message, warn.rowFlag.warnings(2)]);
    const html = await renderHtml(model);
    expect(html).not.toContain("<i>late");
    // HTML escaping as Handlebars does it (common practice: escape & < > " ' ` =)
    expect(html).toContain(`<a class="flag flag-ends-early" href="${model.summary.rows[0].flags[0].href}">${Handlebars.escapeExpression(message)}</a>`);
  });
});

describe("runs_needed_reason in results.json", () => {
  const target = (t: string) => `  - {name: q, kind: level, series: queue, target: ${t}}`;
  it("gives the reason when there is no number: one run, identical runs, a mean of 0 for a relative target", async () => {
    const one = await studyOf(manifest(target("{half_width: 0.1}")), { "runs/r1.csv": csv([[0, "queue", 1], [9.5, "queue", 2]]) });
    expect(one.outcome.results.scenarios[0].summary.q).toMatchObject({ runs_needed: null, runs_needed_reason: "one-run", target_half_width: 0.1 });
    const same = csv([[0, "queue", 1], [9.5, "queue", 2]]);
    const two = await studyOf(manifest(target("{relative: 0.1}")), { "runs/r1.csv": same, "runs/r2.csv": same });
    // computed by hand: mean (9.5 + 1)/10 = 1.05 in both runs, sd 0
    expect(two.outcome.results.scenarios[0].summary.q).toMatchObject({ runs_needed: null, runs_needed_reason: "no-spread" });
    const zero = await studyOf(manifest(target("{relative: 0.1}")), {
      "runs/r1.csv": csv([[0, "queue", 1], [9.5, "queue", 1]]),
      "runs/r2.csv": csv([[0, "queue", -1], [9.5, "queue", -1]]),
    });
    // computed by hand: run means 1 and −1, mean 0: a relative target asks for half-width 0
    expect(zero.outcome.results.scenarios[0].summary.q).toMatchObject({ mean: 0, runs_needed: null, runs_needed_reason: "mean-zero", target_half_width: 0 });
    const model = buildReportModel(zero.study, zero.outcome, META);
    const cell = model.measures[0].runsNeeded!.rows[0].at(-1)!;
    expect(cell.text).toContain(warn.runsNeededWhy("mean-zero", 2));
  });
});
