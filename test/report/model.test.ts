import { existsSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { describe, expect, it } from "vitest";
import { buildReportModel, roundNumbersIn, slug, TABLE_ROW_CAP, type ReportModel } from "../../src/report/model/index.js";
import { LAG1_LIMIT } from "../../src/study/readings.js";
import { welchMovingAverage, welchWindow } from "../../src/report/charts.js";
import { formatNumber, MISSING } from "../../src/report/number.js";
import { bakery, HOSTILE } from "./fixtures/bakery.js";
import { runsNeededWhy } from "../../src/messages/warnings.js";

const META = { toolVersion: "0.1.0-test", generatedAt: "2025-03-04T05:06:07.000Z" };
const GOLDEN = new URL("./golden/", import.meta.url);

/** JSON with short values on one line, so the golden file stays small enough to review. */
function compactJson(v: unknown, indent = ""): string {
  const flat = JSON.stringify(v);
  if (flat === undefined) return "null";
  if (flat.length <= 120 || v === null || typeof v !== "object") return flat;
  const inner = indent + "  ";
  if (Array.isArray(v)) return `[\n${v.map((x) => inner + compactJson(x, inner)).join(",\n")}\n${indent}]`;
  const entries = Object.entries(v as Record<string, unknown>).filter(([, x]) => x !== undefined);
  return `{\n${entries.map(([k, x]) => `${inner}${JSON.stringify(k)}: ${compactJson(x, inner)}`).join(",\n")}\n${indent}}`;
}

/** Compares with test/report/golden/<name>.json; a mismatch writes <name>-changed.json for review. */
function expectGolden(name: string, model: ReportModel) {
  const file = fileURLToPath(new URL(`${name}.json`, GOLDEN));
  const changed = fileURLToPath(new URL(`${name}-changed.json`, GOLDEN));
  const actual = compactJson(model) + "\n";
  const expected = existsSync(file) ? readFileSync(file, "utf8") : null;
  if (actual === expected) {
    rmSync(changed, { force: true });
    return;
  }
  writeFileSync(changed, actual);
  expect.fail(`report model differs from golden/${name}.json; review golden/${name}-changed.json and rename it if right`);
}

function ids(model: ReportModel): string[] {
  return [
    "summary", "comparisons", "methods", "limitations", "warnings", "appendix",
    ...model.measures.flatMap((m) => [m.id, ...m.charts.map((c) => c.id)]),
    ...model.methods.map((m) => m.id),
    ...model.appendix.tables.map((t) => t.id),
    ...model.appendix.intervals.map((i) => i.id),
    ...(model.warmup?.scenarios ?? []).flatMap((w) => [w.id, ...(w.chart ? [w.chart.id] : [])]),
    ...(model.appendix.batchValues?.items ?? []).map((b) => b.id),
  ];
}

describe("buildReportModel", () => {
  it("buildReportModel of the bakery fixture matches its golden model", () => {
    const { study, outcome } = bakery();
    expectGolden("bakery", buildReportModel(study, outcome, META));
  });

  it("buildReportModel gives unique, safe anchors even for names with markup and quotes", () => {
    const { study, outcome } = bakery({ hostile: true });
    const all = ids(buildReportModel(study, outcome, META));
    // HTML id rules: unique in the document; we restrict further to [a-z0-9-] so no escaping is ever needed.
    expect(new Set(all).size).toBe(all.length);
    for (const id of all) expect(id).toMatch(/^[a-z][a-z0-9-]*$/);
  });

  it("buildReportModel links every summary number to an interval derivation and every run value to a calculation table", () => {
    const { study, outcome } = bakery({ hostile: true });
    const model = buildReportModel(study, outcome, META);
    const derivations = new Set(model.appendix.intervals.map((i) => `#${i.id}`));
    const tables = new Set(model.appendix.tables.map((t) => `#${t.id}`));
    // Brief: every number in the summary links to its derivation.
    for (const r of model.summary.rows) {
      for (const c of [r.mean, r.halfWidth, r.interval, r.relative]) expect(derivations.has(c.href as string)).toBe(true);
    }
    for (const iv of model.appendix.intervals) for (const r of iv.rows) expect(tables.has(r.value.href as string)).toBe(true);
    for (const m of model.measures) for (const row of m.runs.rows) expect(tables.has(row[2].href as string)).toBe(true);
  });

  it("buildReportModel shows each summary mean and half-width by the rounding rule (contract section 8 fields)", () => {
    const { study, outcome } = bakery();
    const model = buildReportModel(study, outcome, META);
    expect(model.summary.rows).toHaveLength(study.measureNames.length * outcome.results.scenarios.length);
    for (const r of model.summary.rows) {
      const s = outcome.results.scenarios.find((x) => x.name === r.scenario)!.summary[r.key];
      expect(r.mean.text).toBe(formatNumber(s.mean));
      expect(r.halfWidth.text).toBe(formatNumber(s.half_width));
      expect(r.interval.text).toBe(`[${formatNumber(s.ci_low)}, ${formatNumber(s.ci_high)}]`);
      expect(r.runs).toBe(String(s.n));
    }
  });

  it("buildReportModel says why a one-run scenario has no interval (contract section 4)", () => {
    const { study, outcome } = bakery({ singleRunScenario: true });
    const model = buildReportModel(study, outcome, META);
    const single = outcome.results.scenarios[1].name;
    const rows = model.summary.rows.filter((r) => r.scenario === single);
    expect(rows.length).toBe(study.measureNames.length);
    for (const r of rows) {
      expect(r.halfWidth.text).toBe(MISSING);
      expect(r.interval.text).toBe(MISSING);
      expect(r.note?.text).toBe(outcome.intervals.find((a) => a.scenario === single && a.measure === r.key && a.figure === "value")!.note);
      expect(r.noteKind).toBe("missing");
    }
  });

  it("buildReportModel says why a scenario has no number of runs needed instead of leaving it out", () => {
    // the fixture's one-run scenario has a relative target and runs_needed_reason "one-run"
    const { study, outcome } = bakery({ singleRunScenario: true });
    const model = buildReportModel(study, outcome, META);
    const table = model.measures.find((m) => m.key === "shelf_stock")!.runsNeeded!;
    const single = outcome.results.scenarios[1].name;
    const row = table.rows.find((r) => r[0].text === single)!;
    expect(row[row.length - 1]).toMatchObject({ text: `${MISSING} ${runsNeededWhy("one-run", 1)}`, flag: true });
    expect(table.rows).toHaveLength(2);
  });

  it("buildReportModel renders the optional extras when results have them and skips them otherwise", () => {
    const full = bakery();
    const plain = bakery({ plain: true });
    const m1 = buildReportModel(full.study, full.outcome, META);
    const m0 = buildReportModel(plain.study, plain.outcome, META);
    // Fixture: shelf_stock has time_at_least, batch means (second scenario) and runs_needed; queue_wait has quantiles and within.
    const stock = m1.measures.find((m) => m.key === "shelf_stock")!;
    const wait = m1.measures.find((m) => m.key === "queue_wait")!;
    expect(stock.extras?.rows).toHaveLength(2);
    expect(stock.batchMeans?.rows).toHaveLength(full.outcome.results.scenarios[1].runs.length);
    expect(stock.runsNeeded?.rows).toHaveLength(2);
    expect(wait.extras?.rows).toHaveLength(4);
    expect(m1.comparisons?.table.rows).toHaveLength((full.outcome.results.comparisons as unknown[]).length);
    expect(m1.cover.scenarios[1].warmup).toContain("MSER-5");
    for (const m of m0.measures) {
      expect(m.extras).toBeNull();
      expect(m.batchMeans).toBeNull();
      expect(m.runsNeeded).toBeNull();
    }
    expect(m0.comparisons).toBeNull();
  });

  it("buildReportModel shows at most TABLE_ROW_CAP rows per calculation table and points longer ones to their CSV and digest", () => {
    const { study, outcome } = bakery();
    const model = buildReportModel(study, outcome, META);
    let shortened = 0;
    model.appendix.tables.forEach((t, i) => {
      const rec = outcome.tables[i];
      const shown = t.rows.filter((r) => r.cells !== null).length;
      expect(shown).toBeLessThanOrEqual(TABLE_ROW_CAP);
      expect(t.note).toContain(rec.file);
      expect(t.note).toContain(rec.sha256);
      if (shown < rec.rows_total) {
        shortened++;
        expect(t.rows.some((r) => r.gap !== null && r.gap.includes(rec.file))).toBe(true);
      }
    });
    // The fixture's first level run changes often, so at least one table is longer than the cap.
    expect(shortened).toBeGreaterThan(0);
  });

  it("buildReportModel writes every step of the interval arithmetic from the outcome's numbers", () => {
    const { study, outcome } = bakery();
    const model = buildReportModel(study, outcome, META);
    expect(model.appendix.intervals).toHaveLength(outcome.intervals.length);
    model.appendix.intervals.forEach((v, i) => {
      const a = outcome.intervals[i];
      const step = (label: string) => v.steps.find((s) => s.label === label)?.value;
      expect(v.rows.map((r) => r.value.text)).toEqual(a.rows.map((r) => formatNumber(r.value)));
      expect(v.rows.map((r) => r.deviation)).toEqual(a.rows.map((r) => formatNumber(r.deviation)));
      expect(step("Sum of run values")).toBe(formatNumber(a.sum));
      expect(step("Sample variance")).toBe(formatNumber(a.variance));
      expect(step("Standard deviation")).toBe(formatNumber(a.sd));
      expect(step("t quantile")).toBe(formatNumber(a.t));
      expect(step("Degrees of freedom")).toBe(formatNumber(a.df));
      expect(step("Half-width")).toBe(formatNumber(a.half_width));
      expect(step("Interval")).toBe(`[${formatNumber(a.ci_low)}, ${formatNumber(a.ci_high)}]`);
    });
  });

  it("buildReportModel cites every published method the brief names", () => {
    const { study, outcome } = bakery();
    const sources = buildReportModel(study, outcome, META).methods.map((m) => m.source).join("\n");
    for (const ref of ["Student (1908)", "Kahan", "Neumaier", "White, K. P.", "Schmeiser", "Welch, P. D. (1983)", "Welch, B. L. (1947)", "Bonferroni", "Hyndman", "Little, J. D. C. (1961)"]) {
      expect(sources).toContain(ref);
    }
  });
});

describe("slug", () => {
  it("slug keeps only lower-case letters, digits and single hyphens", () => {
    // Computed by hand.
    expect(slug('"><img src=x onerror=alert(1)>')).toBe("img-src-x-onerror-alert-1");
    expect(slug("Café  Crème")).toBe("cafe-creme");
    expect(slug("<>")).toBe("");
  });
});

/** The data rows of a chart spec's layer or facet (the specs carry their data inline). */
function chartData(spec: unknown): Record<string, unknown>[] {
  const sp = spec as { data?: { values: Record<string, unknown>[] }; layer?: { data?: { values: Record<string, unknown>[] } }[] };
  return [...(sp.data?.values ?? []), ...(sp.layer ?? []).flatMap((l) => l.data?.values ?? [])];
}

describe("buildReportModel: steady state and distributions", () => {
  it("buildReportModel shows the MSER-5 figures and a warm-up plot of the slice means, their moving average and the chosen warm-up", () => {
    const { study, outcome } = bakery();
    const model = buildReportModel(study, outcome, META);
    const sr = outcome.results.scenarios[1];
    const est = sr.warmup_estimate as { d: number; batches: number; time: number; slice: number; slice_means: number[]; at_limit: boolean };
    expect(model.warmup?.scenarios).toHaveLength(1);
    const w = model.warmup!.scenarios[0];
    expect(w.scenario).toBe(sr.name);
    const fact = (label: string) => w.facts.find((f) => f.label === label)?.value;
    expect(fact("Batches dropped (d)")).toBe(formatNumber(est.d));
    expect(fact("Batches of 5 slices")).toBe(formatNumber(est.batches));
    expect(fact("Warm-up")).toBe(`${formatNumber(est.time)} min`);
    expect(fact("Slices (m)")).toBe(formatNumber(est.slice_means.length));
    // The fixture's estimate stops at the limit (d = ⌊19/2⌋ = 9), so the warning shows.
    expect(est.at_limit).toBe(true);
    expect(w.warning).toContain("largest truncation");
    const rows = chartData(w.chart!.spec);
    const slices = rows.filter((r) => r.series === "average of the runs per slice");
    const wn = welchWindow(est.slice_means.length);
    const smooth = rows.filter((r) => r.series === `moving average (w = ${wn})`);
    // x = slice midpoint: start 0 + (j + 1/2)·s.
    expect(slices.map((r) => r.time)).toEqual(est.slice_means.map((_, j) => (j + 0.5) * est.slice));
    expect(slices.map((r) => r.mean)).toEqual(est.slice_means);
    expect(smooth.map((r) => r.mean)).toEqual(welchMovingAverage(est.slice_means, wn));
    expect(rows.filter((r) => r.label !== undefined).every((r) => r.time === est.time)).toBe(true);
    expect(w.chart!.caption).toContain(`w = ${wn}`);
    expect(model.contents.some((c) => c.href === "#warmup")).toBe(true);
  });

  it("buildReportModel shows an observation MSER-5 as a per-run table without a plot", () => {
    const { study, outcome } = bakery({ observationWarmup: true });
    const model = buildReportModel(study, outcome, META);
    const w = model.warmup!.scenarios[0];
    const est = outcome.results.scenarios[1].warmup_estimate as { runs: { run: string; d: number; batches: number; time: number }[] };
    expect(w.chart).toBeNull();
    expect(w.runs?.rows.map((r) => r.map((c) => c.text))).toEqual(est.runs.map((r) => [r.run, formatNumber(r.batches), formatNumber(r.d), formatNumber(r.time), "no"]));
    expect(w.warning).toBeNull();
  });

  it("buildReportModel leaves out the warm-up section, batch values, checks and new charts when the data has none", () => {
    const { study, outcome } = bakery({ plain: true });
    const model = buildReportModel(study, outcome, META);
    expect(model.warmup).toBeNull();
    expect(model.appendix.batchValues).toBeNull();
    expect(model.contents.some((c) => c.href === "#warmup")).toBe(false);
    expect(model.measures.flatMap((m) => m.charts).some((c) => c.id.endsWith("-time-at-value"))).toBe(false);
    outcome.samples = [];
    for (const sr of outcome.results.scenarios) delete sr.checks;
    const bare = buildReportModel(study, outcome, META);
    expect(bare.measures.flatMap((m) => m.charts).some((c) => c.id.endsWith("-distribution"))).toBe(false);
    expect(bare.appendix.checks).toBeNull();
  });

  it("buildReportModel lists batch means per run with lag-1 flagged above 0.2 in size and every batch value in the appendix", () => {
    const { study, outcome } = bakery({ hostile: true });
    const model = buildReportModel(study, outcome, META);
    const sr = outcome.results.scenarios[1];
    const name = study.measureNames[0];
    const table = model.measures[0].batchMeans!;
    const anchors = new Set(model.appendix.batchValues!.items.map((b) => `#${b.id}`));
    sr.runs.forEach((r, i) => {
      const st = r.measures[name];
      const b = (st.kind === "level" ? st.batch_means : undefined) as { batches: number; mean: number; half_width: number; ci_low: number; ci_high: number; lag1: number; batch_values: number[] };
      const row = table.rows[i];
      expect(row.map((c) => c.text).slice(0, 7)).toEqual([sr.name, r.id, formatNumber(b.batches), formatNumber(b.mean), formatNumber(b.half_width),
        `[${formatNumber(b.ci_low)}, ${formatNumber(b.ci_high)}]`, formatNumber(b.lag1)]);
      expect(row[7].flag === true).toBe(Math.abs(b.lag1) > LAG1_LIMIT);
      expect(anchors.has(row[1].href as string)).toBe(true);
      const values = model.appendix.batchValues!.items[0].table.rows[i];
      expect(values[3].text).toBe(b.batch_values.map((v) => formatNumber(v)).join(", "));
    });
  });

  it("buildReportModel draws each observation measure's empirical distribution with its within thresholds and says when it is a sample", () => {
    const { study, outcome } = bakery();
    const model = buildReportModel(study, outcome, META);
    const chart = model.measures[2].charts.find((c) => c.id.endsWith("-distribution"))!;
    const rows = chartData(chart.spec);
    for (const s of outcome.samples) {
      const mine = rows.filter((r) => r.scenario === s.scenario);
      expect(mine[mine.length - 1].share).toBe(1);
      expect(mine[mine.length - 1].value).toBe(Math.max(...s.values));
    }
    // The fixture's thresholds: within [5] (one rule layer and one label layer).
    expect(rows.filter((r) => r.label !== undefined)).toEqual([{ value: 5, label: "≤ 5" }, { value: 5, label: "≤ 5" }]);
    const first = outcome.samples[0];
    expect(first.values.length).toBeLessThan(first.total);
    expect(chart.caption).toContain(`strided sample of ${formatNumber(first.values.length)} of the ${formatNumber(first.total)} observations`);
  });

  it("buildReportModel averages each value's share of time over a scenario's runs for the time-at-value chart", () => {
    const { study, outcome } = bakery();
    const model = buildReportModel(study, outcome, META);
    const chart = model.measures[0].charts.find((c) => c.id.endsWith("-time-at-value"))!;
    const rows = chartData(chart.spec);
    for (const sr of outcome.results.scenarios) {
      const lists = sr.runs.map((r) => { const st = r.measures[study.measureNames[0]]; return (st.kind === "level" ? st.time_at_value : undefined) as { value: number; share: number }[]; });
      const mine = rows.filter((r) => r.scenario === sr.name);
      let total = 0;
      for (const row of mine) {
        // A value a run never took counts 0 for that run.
        const expected = lists.reduce((a, l) => a + (l.find((e) => e.value === row.value)?.share ?? 0), 0) / lists.length;
        expect(row.share as number).toBeCloseTo(expected, 12);
        total += row.share as number;
      }
      // The shares of each run add up to 1, so their averages do too (tolerance: a few ulps of the sums).
      expect(total).toBeCloseTo(1, 12);
    }
  });

  it("buildReportModel lists every consistency check and shows a failed one once among the warnings, as the study listed it", () => {
    const { study, outcome } = bakery();
    const sr = outcome.results.scenarios[0];
    const failed = { check: "level-non-negative", run: "rep-02", measure: study.measureNames[1], passed: false, message: "the number inside fell to -1.23456789" };
    (sr.checks as unknown[]).push(failed);
    // As the engine does: the failed check is a warning too; the model must not list it twice.
    outcome.warnings.push({ scenario: sr.name, run: failed.run, measure: failed.measure, message: failed.message });
    const model = buildReportModel(study, outcome, META);
    const total = outcome.results.scenarios.reduce((a, s) => a + ((s.checks as unknown[] | undefined)?.length ?? 0), 0);
    expect(model.appendix.checks!.table.rows).toHaveLength(total);
    const row = model.appendix.checks!.table.rows.find((r) => r[4].text === "FAILED")!;
    expect(row[4].flag).toBe(true);
    expect(row[5].text).toBe("the number inside fell to -1.235");
    expect(model.warnings.filter((w) => w.message === "the number inside fell to -1.235")).toHaveLength(1);
    expect(model.appendix.checks!.intro).toContain(`${total - 1} of ${total} passed`);
    // The study decides what is a warning (it adds each failed check, src/study/runStudy.ts): the model adds none of its own.
    outcome.warnings.pop();
    expect(buildReportModel(study, outcome, META).warnings.filter((w) => w.message === "the number inside fell to -1.235")).toHaveLength(0);
  });

  it("buildReportModel explains each share and quantile table and keeps the written-out arithmetic as wrapping text", () => {
    const { study, outcome } = bakery();
    const model = buildReportModel(study, outcome, META);
    const kinds = ["time_at_least", "time_at_value", "quantiles", "within"];
    model.appendix.tables.forEach((t, i) => {
      const rec = outcome.tables[i];
      if (kinds.includes(rec.kind)) {
        expect(t.explain).not.toBeNull();
        // Next to its measure's main table: the nearest earlier table of another kind is the same run's main table.
        const main = outcome.tables.slice(0, i).reverse().find((x) => !kinds.includes(x.kind))!;
        expect([main.scenario, main.run, main.measure]).toEqual([rec.scenario, rec.run, rec.measure]);
      } else expect(t.explain).toBeNull();
      if (rec.kind === "quantiles") {
        expect(t.numeric[t.columns.indexOf("arithmetic")]).toBe(false);
        expect(t.numeric[t.columns.indexOf("quantile")]).toBe(true);
        expect(t.explain).toContain("arithmetic column");
      }
    });
    expect(outcome.tables.filter((t) => kinds.includes(t.kind)).length).toBeGreaterThan(0);
  });

  it("buildReportModel explains what an interval for a per-run quantile or share means", () => {
    const { study, outcome } = bakery();
    const note = buildReportModel(study, outcome, META).methods.find((m) => m.term.startsWith("Intervals for per-run"))!;
    expect(note.text).toContain("not for the quantile or share of all observations pooled");
  });

  it("roundNumbersIn rounds each decimal number of a message by the report's rule and leaves whole numbers and names", () => {
    // Computed by hand with the 4-significant-digit rule.
    expect(roundNumbersIn("L = 14.793044444444446, λ·W = 14.656493333333334")).toBe("L = 14.79, λ·W = 14.66");
    expect(roundNumbersIn("401 entered − 392 left in rep-01.csv v0.1.0")).toBe("401 entered − 392 left in rep-01.csv v0.1.0");
  });

  it("buildReportModel keeps markup in names as plain strings in the new sections (escaped later by the templates)", () => {
    const { study, outcome } = bakery({ hostile: true });
    const model = buildReportModel(study, outcome, META);
    expect(model.warmup!.scenarios[0].scenario).toBe(HOSTILE[0]);
    expect(model.appendix.checks!.table.rows.some((r) => r[0].text === HOSTILE[1])).toBe(true);
  });
});
