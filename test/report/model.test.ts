import { existsSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { describe, expect, it } from "vitest";
import { buildReportModel, slug, TABLE_ROW_CAP, type ReportModel } from "../../src/report/model.js";
import { formatNumber, MISSING } from "../../src/report/number.js";
import { bakery } from "./fixtures/bakery.js";

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
      const s = outcome.results.scenarios.find((x) => x.name === r.scenario)!.summary[r.measure];
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
      expect(r.note).toBe(outcome.intervals.find((a) => a.scenario === single && a.measure === r.measure && a.figure === "value")!.note);
    }
  });

  it("buildReportModel renders the optional extras when results have them and skips them otherwise", () => {
    const full = bakery();
    const plain = bakery({ plain: true });
    const m1 = buildReportModel(full.study, full.outcome, META);
    const m0 = buildReportModel(plain.study, plain.outcome, META);
    // Fixture: shelf_stock has time_at_least, batch means (second scenario) and runs_needed; queue_wait has quantiles and within.
    const stock = m1.measures.find((m) => m.name === "shelf_stock")!;
    const wait = m1.measures.find((m) => m.name === "queue_wait")!;
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
