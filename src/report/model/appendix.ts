/**
 * The audit appendix: the input files, the calculation tables, the arithmetic of every interval,
 * the consistency checks and the batch values.
 */
import { selectionSteps } from "./selections.js";
import { meanCorrectionMatters, PREVIEW_HEAD, PREVIEW_RUNS, PREVIEW_TAIL } from "../../study/tables.js";
import type { Check, IntervalArithmetic, StudyOutcome, TableRecord } from "../../outcome/index.js";
import { MISSING } from "../number.js";
import { anchor, key, type ReportContext, TABLES_ELSEWHERE } from "./anchors.js";
import {
  type ArithmeticStep,
  type CalcTable,
  type Cell,
  type InputLine,
  type IntervalView,
  NUMERIC,
  type ReportModel,
  tableView,
  type TableView,
} from "./view.js";
import { comparisonBlocksView } from "./comparisonSteps.js";
import { batchMeansOf, figureLabel, fmt, intervalText, link, q, relative, roundNumbersIn, text } from "./words.js";

/** Rows of one calculation table shown in the appendix: the first `TABLE_HEAD_ROWS` and the last `TABLE_TAIL_ROWS` (the rows the study keeps as the table's preview). */
export const TABLE_HEAD_ROWS = PREVIEW_HEAD;
export const TABLE_TAIL_ROWS = PREVIEW_TAIL;
/** The most rows the appendix shows per calculation table. */
export const TABLE_ROW_CAP = TABLE_HEAD_ROWS + TABLE_TAIL_ROWS;

/** The audit appendix. */
export function appendixView(ctx: ReportContext): ReportModel["appendix"] {
  const { study, outcome, results, tableAnchors, intervalIds, measureOf, batchIds, tbId } = ctx;
  // Appendix.
  const inputs: InputLine[] = outcome.inputs.map((r) => {
    const left = r.left_out.after_end + r.left_out.unused_series;
    const why: string[] = [];
    if (r.left_out.after_end > 0) why.push(`${fmt(r.left_out.after_end)} after end`);
    if (r.left_out.unused_series > 0) why.push(`${fmt(r.left_out.unused_series)} unread series`);
    return {
      scenario: r.scenario, run: r.run, file: r.file, bytes: fmt(r.bytes), rows: fmt(r.rows), used: fmt(r.rows - left),
      leftOut: why.length === 0 ? "0" : `${fmt(left)} (${why.join(", ")})`,
      beforeWindow: fmt(r.left_out.before_window ?? 0),
      series: Object.entries(r.series_rows).map(([s, n]) => `${s} ${fmt(n)}`).join(", "),
      sha256: r.sha256,
    };
  });
  const tables: CalcTable[] = outcome.tables.flatMap((t, i) => (t.preview === null ? [] : [calcTable(t, t.preview, tableAnchors[i], closingLine(ctx, t))]));
  const tablesElsewhere = elsewhereNote(outcome.tables);
  const intervals: IntervalView[] = outcome.intervals.map((a, i) => {
    const kind = (() => { try { return measureOf(a.scenario, a.measure).kind; } catch { return "level" as const; } })();
    return intervalView(a, intervalIds.get(key(a.scenario, a.measure, a.figure)) ?? anchor("calc", i + 1), figureLabel(kind, a.figure), tbId);
  });
  const checks = checksTable(results.scenarios);
  const batchValues = batchValuesView(study.measureNames, results.scenarios, batchIds);
  const manifestFile = study.manifestPath.split(/[\\/]/).pop() ?? "manifest";
  return {
    manifest: { file: manifestFile, text: study.manifestText },
    inputs,
    inputsIntro: "Rows: rows read from the file. Left out: rows after the window's end, and rows of series that no measure reads. " +
      "Before collection start: rows of used series before the warm-up ends (or the window starts); levels still take their value from them, observations and counts leave them out.",
    tablesIntro: `Each calculation table shows at most ${TABLE_ROW_CAP} rows here (the first ${TABLE_HEAD_ROWS} and the last ${TABLE_TAIL_ROWS}); ` +
      "the full table is the CSV file named under it, whose SHA-256 digest is given.",
    tables,
    tablesElsewhere,
    intervals,
    comparisons: comparisonBlocksView(ctx),
    selections: selectionSteps(ctx, ctx.outcome.tables.filter((t) => t.kind === "selection").map((t) => `${t.file} (SHA-256 ${t.sha256})`)),
    checks,
    batchValues,
  };
}

/**
 * The line that closes a run's main level or utilization table: the run's totals from results.json
 * and their quotient, the run value (contract section 4), linked to the interval arithmetic that
 * lists the run's value. Null for the other tables.
 */
function closingLine(ctx: ReportContext, t: TableRecord): CalcTable["closing"] {
  if (t.run === null || (t.kind !== "level" && t.kind !== "utilization")) return null;
  const st = ctx.results.scenarios.find((s) => s.name === t.scenario)?.runs.find((r) => r.id === t.run)?.measures[t.measure];
  const value = (v: number) => link(fmt(v), ctx.ivId(t.scenario, t.measure, "value"));
  if (st?.kind === "utilization" && t.kind === "utilization") {
    return { text: `busy area ${fmt(st.area)} ÷ capacity area ${fmt(st.capacity_area)}`, value: value(st.value), what: "(the run's utilization)" };
  }
  if (st?.kind === "level" && t.kind === "level") {
    return { text: `area ${fmt(st.area)} ÷ duration ${fmt(st.duration)}`, value: value(st.value), what: "(the run's time average)" };
  }
  return null;
}

/** What the columns of a share or quantile table mean, by table kind (one line each). */
const TABLE_EXPLAIN: Record<string, { label: string; text: string }> = {
  time_at_least: {
    label: "share of time at or above each threshold",
    text: "One row per threshold k: intervals_at_or_above counts the level's intervals with value ≥ k, time is their total duration inside the window, duration is the window's length, and share = time / duration.",
  },
  "response-curve": {
    label: "response curve points",
    text: "One row per point: group gives the values of the other factors, factor_value the scenario's value of this factor; n, mean, ci_low and ci_high are the scenario's summary interval exactly as in results.json, whose arithmetic is in interval_table (across runs; a batch-means point's batch values are in the batch means of this appendix).",
  },
  time_at_value: {
    label: "time at each value",
    text: "One row per distinct value: time is how long the level held that value inside the window, duration is the window's length, and share = time / duration; the shares add up to 1.",
  },
  quantiles: {
    label: "quantiles (type 7)",
    text: "One row per probability p: h = (n − 1)·p; the sorted values at ranks lower_rank = ⌊h⌋ + 1 and upper_rank = ⌊h⌋ + 2 are interpolated with fraction = h − ⌊h⌋; the arithmetic column writes the interpolation out.",
  },
  within: {
    label: "share of values within each threshold",
    text: "One row per threshold x: at_most is the number of observations ≤ x, n the number of observations in the window, and share = at_most / n.",
  },
};

/** The note on the tables the page does not show: how many, of which runs, and where they are. */
function elsewhereNote(tables: TableRecord[]): { id: string; text: string } | null {
  const byScenario = new Map<string, { runs: string[]; tables: number }>();
  for (const t of tables) {
    if (t.preview !== null || t.run === null) continue;
    const s = byScenario.get(t.scenario) ?? { runs: [], tables: 0 };
    if (s.runs.at(-1) !== t.run) s.runs.push(t.run);
    s.tables++;
    byScenario.set(t.scenario, s);
  }
  if (byScenario.size === 0) return null;
  const parts = [...byScenario].map(([scenario, s]) =>
    `${q(scenario)}: ${fmt(s.tables)} tables of ${fmt(s.runs.length)} runs (${s.runs.length === 1 ? `run ${s.runs[0]}` : `runs ${s.runs[0]} to ${s.runs.at(-1)}`})`);
  return {
    id: TABLES_ELSEWHERE,
    text: `This page shows the calculation tables of the first ${PREVIEW_RUNS} runs of each scenario. The tables of the later runs are files only, ` +
      `tables/<scenario>/runs/<run>/<measure>.csv in the report folder, each listed with its SHA-256 digest in record.json: ${parts.join("; ")}. ` +
      "`sojourn table` writes any of them in full.",
  };
}

/** A calculation table as the appendix shows it, from its preview rows (head and tail of the written rows). */
function calcTable(t: TableRecord, preview: NonNullable<TableRecord["preview"]>, id: string, closing: CalcTable["closing"]): CalcTable {
  const written = t.rows_written;
  const show = preview.length <= TABLE_ROW_CAP ? preview : [...preview.slice(0, TABLE_HEAD_ROWS), ...preview.slice(-TABLE_TAIL_ROWS)];
  const cell = (v: number | string | null) => (typeof v === "number" ? fmt(v) : v === null ? MISSING : roundNumbersIn(v));
  const rows: CalcTable["rows"] = show.map((r) => ({ cells: r.map(cell), gap: null }));
  const numeric = t.columns.map((_, j) => show.every((r) => typeof r[j] !== "string" || NUMERIC.test(r[j] as string)));
  const hiddenHere = written - show.length;
  const hiddenTotal = t.rows_total - show.length;
  if (hiddenTotal > 0) {
    const at = written <= TABLE_ROW_CAP ? Math.min(rows.length, Math.ceil(rows.length / 2)) : TABLE_HEAD_ROWS;
    rows.splice(at, 0, { cells: null, gap: `… ${fmt(hiddenTotal)} rows not shown: see ${t.file} …` });
  }
  const parts = [`${fmt(t.rows_total)} rows in full; ${fmt(show.length)} shown here.`];
  if (t.shortened) parts.push(`The CSV file ${t.file} holds ${fmt(t.rows_written)} of them (the table was shortened when written: first rows, checkpoints and last rows).`);
  else parts.push(`The CSV file ${t.file} holds all of them.`);
  if (hiddenHere > 0 || hiddenTotal > 0) parts.push("Rows not shown here are in that file.");
  parts.push(`SHA-256 ${t.sha256}.`);
  const extra = TABLE_EXPLAIN[t.kind];
  const base = t.curve !== undefined ? `${t.measure} — against ${t.curve.factor}`
    : t.run === null ? `${t.measure} — ${t.scenario}` : `${t.measure} — ${t.scenario} — run ${t.run}`;
  const heading = extra ? `${base} — ${extra.label}` : base;
  return { id, heading, explain: extra?.text ?? null, file: t.file, sha256: t.sha256, columns: t.columns, numeric, rows, closing, note: parts.join(" ") };
}

function intervalView(
  a: IntervalArithmetic,
  id: string,
  label: string,
  tbId: (s: string, r: string | null, m: string) => string | null,
): IntervalView {
  const steps: ArithmeticStep[] = [
    { label: "Number of runs", formula: "n", value: fmt(a.n) },
    { label: "Sum of run values", formula: "Σ xᵢ", value: fmt(a.sum) },
    { label: "Mean", formula: `x̄ = Σ xᵢ / n = ${fmt(a.sum)} / ${fmt(a.n)}`, value: fmt(a.mean) },
  ];
  if (a.sum_squared !== null) steps.push({ label: "Sum of squared deviations", formula: "Σ (xᵢ − x̄)²", value: fmt(a.sum_squared) });
  if (meanCorrectionMatters(a)) {
    steps.push({ label: "Correction for the rounding of the mean", formula: "c = (Σ (xᵢ − x̄))² / n", value: fmt(a.mean_correction) });
    if (a.variance !== null) steps.push({ label: "Sample variance", formula: `s² = (Σ (xᵢ − x̄)² − c) / (n − 1) = (${fmt(a.sum_squared)} − ${fmt(a.mean_correction)}) / ${fmt(a.df)}`, value: fmt(a.variance) });
  } else if (a.variance !== null) steps.push({ label: "Sample variance", formula: `s² = Σ (xᵢ − x̄)² / (n − 1) = ${fmt(a.sum_squared)} / ${fmt(a.df)}`, value: fmt(a.variance) });
  if (a.sd !== null) steps.push({ label: "Standard deviation", formula: `s = √s² = √${fmt(a.variance)}`, value: fmt(a.sd) });
  if (a.standard_error !== null) steps.push({ label: "Standard error", formula: `s / √n = ${fmt(a.sd)} / √${fmt(a.n)}`, value: fmt(a.standard_error) });
  if (a.df !== null) steps.push({ label: "Degrees of freedom", formula: "df = n − 1", value: fmt(a.df) });
  if (a.t !== null) steps.push({ label: "t quantile", formula: `t(p = ${fmt(a.p)}; df = ${fmt(a.df)})`, value: fmt(a.t) });
  if (a.half_width !== null) steps.push({ label: "Half-width", formula: `h = t · s / √n = ${fmt(a.t)} × ${fmt(a.standard_error)}`, value: fmt(a.half_width) });
  if (a.ci_low !== null && a.ci_high !== null) {
    steps.push({ label: "Interval", formula: `x̄ ± h = ${fmt(a.mean)} ± ${fmt(a.half_width)}`, value: intervalText(a.ci_low, a.ci_high) });
    steps.push({ label: "Relative precision", formula: "h / |x̄|", value: relative(a) });
  }
  return {
    id,
    heading: `${a.measure} — ${label} — ${a.scenario}`,
    rows: a.rows.map((r) => ({
      run: r.run,
      value: link(fmt(r.value), tbId(a.scenario, r.run, a.measure)),
      deviation: fmt(r.deviation),
      squared: fmt(r.squared),
    })),
    steps,
    note: a.note,
  };
}

export const CHECK_LABELS: Record<Check["check"], string> = {
  "littles-law": "Little's law (L = λ·W)",
  conservation: "conservation (at start + entered − left = at end)",
  "utilization-range": "utilization within [0, 1]",
  "level-non-negative": "number inside never negative",
};

export function checksTable(scenarios: StudyOutcome["results"]["scenarios"]): { intro: string; table: TableView } | null {
  const rows: Cell[][] = [];
  let failed = 0;
  let total = 0;
  for (const sr of scenarios) for (const c of sr.checks ?? []) {
    total++;
    if (!c.passed) failed++;
    const result: Cell = c.passed ? text(c.applies === false ? "passed (not an identity here)" : "passed") : { ...text("FAILED"), flag: true };
    rows.push([text(sr.name), text(c.run), text(c.measure), text(CHECK_LABELS[c.check]), result, text(roundNumbersIn(c.message))]);
  }
  if (rows.length === 0) return null;
  return {
    intro: `Identities the run data must satisfy, checked run by run: ${fmt(total - failed)} of ${fmt(total)} passed` +
      (failed > 0 ? `, ${fmt(failed)} failed (each failed check is also listed among the warnings).` : ".") +
      " Little's law is an exact identity only when the system is empty at both ends of the window; otherwise its two sides are shown for comparison.",
    table: tableView("Consistency checks by scenario and run", ["Scenario", "Run", "Measure", "Check", "Result", "Details"], rows),
  };
}

export function batchValuesView(
  measureNames: string[],
  scenarios: StudyOutcome["results"]["scenarios"],
  batchIds: Map<string, string>,
): { intro: string; items: { id: string; table: TableView }[] } | null {
  const items: { id: string; table: TableView }[] = [];
  for (const name of measureNames) for (const sr of scenarios) {
    const id = batchIds.get(key(sr.name, name));
    if (id === undefined) continue;
    const rows: Cell[][] = [];
    for (const r of sr.runs) {
      const b = batchMeansOf(r.measures[name]);
      if (b === undefined) continue;
      const values = b.batch_values;
      rows.push([text(r.id), text(fmt(b.batches)), text(fmt(b.lag1)), text(values.length > 0 ? values.map((v) => fmt(v)).join(", ") : MISSING)]);
    }
    items.push({ id, table: tableView(`${name} — ${sr.name}: each run's batch means in time order`, ["Run", "Batches", "Lag-1 correlation", "Batch means Z₁, Z₂, …"], rows) });
  }
  if (items.length === 0) return null;
  return {
    intro: "The batch means behind each batch-means interval, in time order. A trend or long runs of values above or below the mean are what a large lag-1 correlation measures.",
    items,
  };
}
