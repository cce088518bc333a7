import tQuantile from "@stdlib/stats-base-dists-t-quantile";
import Handlebars from "handlebars";
import { describe, expect, it } from "vitest";
import { uniform } from "../../src/demo/random.js";
import { rowFlag } from "../../src/messages/warnings.js";
import { renderHtml } from "../../src/report/html.js";
import { buildReportModel, type ReportModel } from "../../src/report/model/index.js";
import { formatNumber } from "../../src/report/number.js";
import { csv } from "../helpers/tempStudy.js";
import { studyOf } from "../helpers/runStudyFrom.js";

const META = { toolVersion: "test", generatedAt: "2026-01-01T00:00:00Z" };

type Row = [number, string, (number | null)?, (string | null)?];

/** A seeded run: a level `q` that moves by ±1 in [0, top] (plus `shift`) at random times in [0, end), and a row of `d` at each move. */
function seededRun(seed: number, end: number, top: number, shift = 0): string {
  const rand = uniform(seed);
  const rows: Row[] = [[0, "q", shift]];
  let t = 0;
  let v = 0;
  for (;;) {
    t = Math.round((t + 0.2 + rand() * 1.5) * 1000) / 1000;
    if (t >= end) break;
    v = Math.min(top, Math.max(0, v + (rand() < 0.5 ? -1 : 1)));
    rows.push([t, "q", v + shift], [t, "d"]);
  }
  return csv(rows);
}

/** Every in-page link of the page resolves to exactly one id. */
function expectLinksResolve(html: string, hrefs: string[]) {
  const ids = [...html.matchAll(/\sid="([^"]+)"/g)].map((m) => m[1]);
  expect(hrefs.length).toBeGreaterThan(0);
  for (const h of hrefs) {
    expect(h.startsWith("#"), h).toBe(true);
    expect(ids.filter((id) => id === h.slice(1)), h).toHaveLength(1);
  }
}

/** The summary section of the page. */
const summaryPart = (html: string) => html.slice(html.indexOf('id="summary"'), html.indexOf("</section>", html.indexOf('id="summary"')));

const allFlagHrefs = (model: ReportModel) => model.summary.rows.flatMap((r) => r.flags.map((f) => f.href));

describe("summary rows of a single long run with batch means", () => {
  const manifest = `title: one long run
time_unit: min
analysis: {method: batch-means, batches: 5}
scenarios:
  - {name: long, end: 500, runs: [long.csv]}
measures:
  - {name: q, kind: level, series: q, label: Vehicles waiting, unit: vehicles}
  - {name: d, kind: count, series: d, label: Departures, unit: vehicles}
`;

  it("buildReportModel shows the batch-means interval (Student t, k − 1 degrees of freedom) on the row, names the method and links to the batch values", async () => {
    const { study, outcome } = await studyOf(manifest, { "long.csv": seededRun(7, 500, 6) });
    const s = outcome.results.scenarios[0].summary.q;
    expect(s.interval_method).toBe("batch-means");
    const bm = s.batch_means!;
    const values = (outcome.results.scenarios[0].runs[0].measures.q as { batch_means: { batch_values: number[] } }).batch_means.batch_values;
    // Published formula (Student 1908; batch means as in Schmeiser 1982): Z̄ ± t(0.975; k − 1) · s_Z / √k over the k = 5 batch means.
    const k = values.length;
    const mean = values.reduce((a, b) => a + b, 0) / k;
    const sd = Math.sqrt(values.reduce((a, b) => a + (b - mean) ** 2, 0) / (k - 1));
    const h = tQuantile(0.975, k - 1) * sd / Math.sqrt(k);
    expect(k).toBe(5);
    expect(bm.half_width!).toBeCloseTo(h, 12);
    expect(bm.mean!).toBeCloseTo(mean, 12);

    const model = buildReportModel(study, outcome, META);
    const row = model.summary.rows.find((r) => r.key === "q")!;
    expect(row.measure).toBe("Vehicles waiting");
    expect(row.unit).toBe("vehicles");
    expect(row.mean.text).toBe(formatNumber(bm.mean));
    expect(row.halfWidth.text).toBe(formatNumber(bm.half_width));
    expect(row.interval.text).toBe(`[${formatNumber(bm.ci_low)}, ${formatNumber(bm.ci_high)}]`);
    expect(row.relative.text).not.toBe("—");
    expect(row.noteKind).toBe("method");
    expect(row.note!.text).toBe(`From 5 batch means of run “long”, k − 1 = 4 degrees of freedom (Student t).`);
    const batchIds = model.appendix.batchValues!.items.map((i) => `#${i.id}`);
    for (const c of [row.mean, row.halfWidth, row.interval, row.relative, row.note!]) expect(batchIds).toContain(c.href);
    // Not the old "only one run … add runs" note.
    expect(row.note!.text).not.toMatch(/Add runs/);
    // The count has no batch means: no interval, and the study's note says why.
    const count = model.summary.rows.find((r) => r.key === "d")!;
    expect(count.halfWidth.text).toBe("—");
    expect(count.noteKind).toBe("missing");
    expect(count.note!.text).toBe(outcome.results.scenarios[0].summary.d.interval_note);

    // The interval chart of the measure shows the same interval and says it is from batch means.
    const chart = model.measures.find((m) => m.key === "q")!.charts.find((c) => c.id.endsWith("-interval"))!;
    expect(chart.caption).toContain("batch means of the scenario's single long run");
    expect(JSON.stringify(chart.spec)).toContain(`"low":${bm.ci_low}`);
    expect(model.measures.find((m) => m.key === "q")!.charts.some((c) => c.id.endsWith("-runs"))).toBe(false);

    // The page's summary row shows the interval and the note.
    const html = await renderHtml(model);
    const part = summaryPart(html);
    expect(part).toContain(`>${row.interval.text}</a>`);
    expect(part).toContain(Handlebars.escapeExpression(row.note!.text));
    expect(model.summary.brief.map((b) => b.text)).toContain("1 of the 2 figures take their interval from the batch means of a single long run (the rows' notes say which).");
    expectLinksResolve(html, [...[...html.matchAll(/href="(#[^"]+)"/g)].map((m) => m[1])]);
  });
});

describe("summary flags", () => {
  const manifest = (target: string) => `title: flags
time_unit: min
scenarios:
  - {name: s, end: 100, runs: [r1.csv, r2.csv, r3.csv]}
measures:
  - {name: q, kind: level, series: q, target: ${target}, label: Queue, unit: vehicles}
`;
  const files = { "r1.csv": seededRun(1, 100, 8), "r2.csv": seededRun(2, 100, 8), "r3.csv": seededRun(3, 100, 8) };

  it("a missed precision target is flagged on its row, links to the measure's runs-needed table, and is named in the brief", async () => {
    const { study, outcome } = await studyOf(manifest("{half_width: 0.001}"), files);
    const s = outcome.results.scenarios[0].summary.q;
    expect(s.runs_needed!).toBeGreaterThan(3);
    const model = buildReportModel(study, outcome, META);
    const row = model.summary.rows[0];
    const needed = model.measures[0].runsNeeded!;
    expect(row.flags).toEqual([{ kind: "target-missed", text: rowFlag.targetMissed(formatNumber(s.runs_needed!), "3"), href: `#${needed.id}` }]);
    expect(outcome.readings.brief.targetsMissed).toEqual([0]);
    expect(model.summary.brief.some((b) => b.text.startsWith("One figure misses its precision target: Queue in “s”"))).toBe(true);
    const html = await renderHtml(model);
    expect(html).toContain(`<div class="table-wrap" id="${needed.id}">`);
    expectLinksResolve(html, [...allFlagHrefs(model), ...model.summary.brief.flatMap((b) => (b.href === null ? [] : [b.href]))]);
  });

  it("a target the runs meet gives no flag and the brief says it is met", async () => {
    const { study, outcome } = await studyOf(manifest("{half_width: 1000}"), files);
    expect(outcome.results.scenarios[0].summary.q.runs_needed).toBe(3);
    const model = buildReportModel(study, outcome, META);
    expect(model.summary.rows[0].flags).toEqual([]);
    expect(model.summary.brief.map((b) => b.text)).toContain("The figure with a precision target meets it.");
  });

  it("every flag of rows with runs left out, runs ending early and warnings links to an id on the page", async () => {
    // r2 has no wait inside the window (left out) and its rows stop at 40 of 100 (ends early).
    const m = `title: flags
time_unit: min
scenarios:
  - {name: s, end: 100, runs: [r1.csv, r2.csv, r3.csv]}
measures:
  - {name: w, kind: observation, series: w, label: Wait, unit: min}
  - {name: q, kind: level, series: q}
`;
    const { study, outcome } = await studyOf(m, {
      "r1.csv": csv([[0, "q", 1], [10, "w", 2], [95, "w", 3], [99, "q", 0]]),
      "r2.csv": csv([[0, "q", 1], [40, "q", 2]]),
      "r3.csv": csv([[0, "q", 1], [20, "w", 4], [98, "q", 0]]),
    });
    const model = buildReportModel(study, outcome, META);
    const kinds = model.summary.rows.map((r) => r.flags.map((f) => f.kind));
    expect(kinds).toEqual([["left-out", "ends-early", "warnings"], ["ends-early", "warnings"]]);
    const html = await renderHtml(model);
    expectLinksResolve(html, allFlagHrefs(model));
    // Each flag is a link with its class, in the summary.
    for (const f of model.summary.rows.flatMap((r) => r.flags)) expect(summaryPart(html)).toContain(`<a class="flag flag-${f.kind}" href="${f.href}">`);
  });
});

describe("the opening sentences", () => {
  /** Two scenarios of 4 seeded runs each, compared by Welch; `shift` is added to every level of b. */
  function twoScenarios(shift: number) {
    const manifest = `title: brief
time_unit: min
scenarios:
  - {name: a, end: 200, runs: [a1.csv, a2.csv, a3.csv, a4.csv]}
  - {name: b, end: 200, runs: [b1.csv, b2.csv, b3.csv, b4.csv]}
measures:
  - {name: q, kind: level, series: q, label: Lane queue, unit: vehicles}
compare:
  - {measure: q, scenarios: [a, b], method: welch}
`;
    const files: Record<string, string> = {};
    for (let i = 1; i <= 4; i++) {
      files[`a${i}.csv`] = seededRun(10 + i, 200, 4);
      files[`b${i}.csv`] = seededRun(20 + i, 200, 4, shift);
    }
    return studyOf(manifest, files);
  }

  it("name a comparison as significant when its interval excludes 0", async () => {
    const { study, outcome } = await twoScenarios(10);
    const c = outcome.results.comparisons![0];
    // b is 10 higher at every instant: a − b lies well below 0.
    expect(c.ci_high!).toBeLessThan(0);
    expect(outcome.readings.brief.significant).toEqual([0]);
    const brief = buildReportModel(study, outcome, META).summary.brief.map((b) => b.text);
    expect(brief.some((t) => t.startsWith("At 95 % confidence, the difference is significant: Lane queue is lower in “a” than in “b” by "))).toBe(true);
    expect(brief[0]).toBe("This study compares 2 scenarios, “a” and “b”, in 1 measure (Lane queue), from 8 runs (4 + 4).");
  });

  it("do not call a comparison significant when its interval contains 0", async () => {
    const { study, outcome } = await twoScenarios(0);
    const c = outcome.results.comparisons![0];
    expect(c.ci_low!).toBeLessThan(0);
    expect(c.ci_high!).toBeGreaterThan(0);
    expect(outcome.readings.brief.significant).toEqual([]);
    const brief = buildReportModel(study, outcome, META).summary.brief.map((b) => b.text);
    expect(brief.join(" ")).not.toMatch(/is (higher|lower) in/);
    expect(brief).toContain("At 95 % confidence, the difference between the scenarios is not significant: its interval contains 0.");
  });

  it("say nothing about comparisons when there are none", async () => {
    const { study, outcome } = await studyOf("title: t\nscenarios:\n  - {name: s, end: 10, runs: [a.csv, b.csv]}\nmeasures:\n  - {name: q, kind: level, series: q}\n", {
      "a.csv": csv([[0, "q", 1], [9.5, "q", 2]]), "b.csv": csv([[0, "q", 2], [9.5, "q", 1]]),
    });
    const brief = buildReportModel(study, outcome, META).summary.brief.map((b) => b.text);
    expect(brief).toEqual(["This study reports 1 measure (q) of scenario “s”, from 2 runs.", "The study produced no warnings."]);
  });
});

describe("labels and units", () => {
  it("a label and a unit with HTML special characters are escaped in the summary, the measure section and the charts", async () => {
    const label = `<b>Queue</b> & "lane" <img src=x onerror=alert(1)>`;
    const unit = "<i>cars</i>";
    const manifest = `title: t
scenarios:
  - {name: s, end: 10, runs: [a.csv, b.csv]}
measures:
  - {name: q, kind: level, series: q, label: ${JSON.stringify(label)}, unit: ${JSON.stringify(unit)}}
`;
    const { study, outcome } = await studyOf(manifest, { "a.csv": csv([[0, "q", 1], [4, "q", 3]]), "b.csv": csv([[0, "q", 2], [6, "q", 0]]) });
    const model = buildReportModel(study, outcome, META);
    expect(model.summary.rows[0].measure).toBe(label);
    expect(model.measures[0].name).toBe(label);
    const html = await renderHtml(model);
    for (const raw of [label, unit, "<b>Queue", "<img", "<i>cars"]) expect(html).not.toContain(raw);
    expect(summaryPart(html)).toContain(Handlebars.escapeExpression(label));
    expect(summaryPart(html)).toContain(`unit: ${Handlebars.escapeExpression(unit)}`);
    // Inside the chart SVG (axis titles), escaped by vega.
    const svgs = (html.match(/<svg[\s\S]*?<\/svg>/g) ?? []).join("");
    expect(svgs).toContain("&lt;b&gt;Queue&lt;/b&gt;");
  });

  it("a count's captions, axis titles and summary row never say the study's time unit; its rate column does", async () => {
    const manifest = (unit: string) => `title: t
time_unit: hours
scenarios:
  - {name: s, end: 10, runs: [a.csv, b.csv]}
measures:
  - {name: n, kind: count, series: e, label: Arrivals${unit}}
`;
    for (const unit of ["", ", unit: customers"]) {
      const { study, outcome } = await studyOf(manifest(unit), { "a.csv": csv([[1, "e"], [2, "e"]]), "b.csv": csv([[3, "e"]]) });
      const model = buildReportModel(study, outcome, META);
      const m = model.measures[0];
      expect(m.charts.length).toBeGreaterThan(0);
      const titles = (spec: unknown) => [...JSON.stringify(spec).matchAll(/"title":"([^"]*)"/g)].map((x) => x[1]);
      for (const c of m.charts) {
        expect(c.caption).not.toMatch(/hours/);
        for (const t of titles(c.spec)) expect(t).not.toMatch(/hours/);
      }
      expect(m.runs.caption).not.toMatch(/hours/);
      expect(model.summary.rows[0].unit ?? "").not.toMatch(/hours/);
      // The rate is per time unit, and says so.
      expect(m.runs.columns).toContain("rate (per hours)");
      if (unit !== "") {
        expect(m.charts[0].caption).toContain("unit: customers");
        expect(m.runs.caption).toContain("counts in customers");
      }
    }
  });
});
