/**
 * The report's view model: everything the HTML shows, already rounded and worded.
 *
 *   Study + StudyOutcome ──buildReportModel──▶ ReportModel ──renderHtml──▶ report.html ──renderPdf──▶ report.pdf
 *
 * Pure: no file system, no template engine, no browser. Every number a reader sees is turned
 * into text here by the one rounding rule of `number.ts`; every sentence is worded here; the
 * templates only place these strings. Chart specs (vega-lite, data inline) are built here too.
 */
import type { Measure, Scenario, Study, Warmup } from "../manifest/types.js";
import type {
  IntervalArithmetic,
  RunResult,
  RunStats,
  StudyOutcome,
  Summary,
  TableRecord,
} from "../study/outcome.js";
import type { TopLevelSpec } from "vega-lite";
import {
  evenSample,
  histogramChart,
  intervalChart,
  runsChart,
  traceChart,
  MAX_HISTOGRAM_VALUES,
  MAX_TRACE_POINTS,
} from "./charts.js";
import { formatNumber, formatPercent, MISSING, SIGNIFICANT_DIGITS } from "./number.js";

/** Rows of one calculation table shown in the appendix: the first `TABLE_HEAD_ROWS` and the last `TABLE_TAIL_ROWS`. */
export const TABLE_HEAD_ROWS = 20;
export const TABLE_TAIL_ROWS = 10;
/** The most rows the appendix shows per calculation table. */
export const TABLE_ROW_CAP = TABLE_HEAD_ROWS + TABLE_TAIL_ROWS;

/** A number as shown, with the anchor of the place that derives it (or null). */
export interface Cell {
  text: string;
  href: string | null;
  /** Set on cells of columns that hold numbers: right-aligned, tabular figures. */
  num?: boolean;
}

export interface Fact {
  label: string;
  value: string;
}

export interface ScenarioLine {
  name: string;
  runs: string;
  window: string;
  warmup: string;
  analysis: string;
}

export interface SummaryRow {
  measure: string;
  measureHref: string;
  /** Rows of the measure's block; set on its first row only (0 elsewhere). */
  measureRows: number;
  scenario: string;
  mean: Cell;
  halfWidth: Cell;
  interval: Cell;
  runs: string;
  relative: Cell;
  note: string | null;
}

export interface Chart {
  id: string;
  caption: string;
  spec: TopLevelSpec;
}

/** A plain table of text cells; a cell with `href` links to where it comes from. */
export interface TableView {
  caption: string;
  columns: string[];
  /** Per column: true when every cell is a number as shown (or missing). */
  numeric: boolean[];
  rows: Cell[][];
}

const NUMERIC = /^(—|-?[0-9][0-9.e-]*( %)?|\[[^\]]*\])$/;

/** A table view with its numeric columns marked. */
function tableView(caption: string, columns: string[], rows: Cell[][]): TableView {
  const numeric = columns.map((_, j) => rows.length > 0 && rows.every((r) => NUMERIC.test(r[j]?.text ?? "")));
  return { caption, columns, numeric, rows: rows.map((r) => r.map((c, j) => (numeric[j] ? { ...c, num: true } : c))) };
}

export interface MeasureSection {
  id: string;
  name: string;
  kind: string;
  statement: string;
  charts: Chart[];
  runs: TableView;
  extras: TableView | null;
  batchMeans: TableView | null;
  runsNeeded: TableView | null;
}

export interface MethodNote {
  id: string;
  term: string;
  formula: string;
  text: string;
  source: string;
}

export interface WarningLine {
  where: string;
  message: string;
}

export interface InputLine {
  scenario: string;
  run: string;
  file: string;
  bytes: string;
  rows: string;
  used: string;
  leftOut: string;
  beforeWindow: string;
  series: string;
  sha256: string;
}

export interface CalcTable {
  id: string;
  heading: string;
  file: string;
  sha256: string;
  columns: string[];
  /** A row of cells, or a gap marker row with its text. */
  rows: { cells: string[] | null; gap: string | null }[];
  note: string;
}

export interface ArithmeticStep {
  label: string;
  formula: string;
  value: string;
}

export interface IntervalView {
  id: string;
  heading: string;
  rows: { run: string; value: Cell; deviation: string; squared: string }[];
  steps: ArithmeticStep[];
  note: string | null;
}

export interface ReportModel {
  title: string;
  generatedAt: string;
  reportDate: string;
  toolVersion: string;
  timeUnit: string;
  rule: string;
  cover: { facts: Fact[]; scenarios: ScenarioLine[] };
  contents: { href: string; label: string }[];
  summary: { intro: string; rows: SummaryRow[] };
  measures: MeasureSection[];
  comparisons: { intro: string; table: TableView } | null;
  methods: MethodNote[];
  limitations: string[];
  warnings: WarningLine[];
  appendix: {
    manifest: { file: string; text: string };
    inputs: InputLine[];
    inputsIntro: string;
    tablesIntro: string;
    tables: CalcTable[];
    intervals: IntervalView[];
  };
}

// ---------------------------------------------------------------------------------------------
// Anchors

/** Lower-case letters, digits and single hyphens, at most 40 characters ("" when none remain). */
export function slug(text: string): string {
  return text
    .normalize("NFKD")
    .replace(/[\u0300-\u036f]/g, "")
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, "-")
    .replace(/^-+|-+$/g, "")
    .slice(0, 40)
    .replace(/-+$/, "");
}

/** A unique, HTML-safe anchor: prefix, a running number, and a readable slug of the names. */
function anchor(prefix: string, index: number, ...names: (string | null)[]): string {
  const s = slug(names.filter((n): n is string => n !== null).join(" "));
  return s === "" ? `${prefix}-${index}` : `${prefix}-${index}-${s}`;
}

const key = (...parts: (string | null)[]) => JSON.stringify(parts);

// ---------------------------------------------------------------------------------------------
// Wording

const fmt = formatNumber;
const q = (name: string) => `“${name}”`;

function kindLabel(kind: Measure["kind"]): string {
  return { level: "level (time average)", utilization: "utilization", observation: "observation (mean)", count: "count" }[kind];
}

function primaryName(kind: Measure["kind"]): string {
  return { level: "time average", utilization: "utilization", observation: "mean", count: "count" }[kind];
}

function valueTitle(m: Measure, unit: string): string {
  switch (m.kind) {
    case "level":
      return `time average of ${m.name} per run`;
    case "utilization":
      return `utilization of ${m.name} per run (share of capacity)`;
    case "observation":
      return m.source.type === "entities" ? `mean of ${m.name} per run (${unit})` : `mean of ${m.name} per run`;
    case "count":
      return `${m.name}: count per run`;
  }
}

function capacityText(m: Measure): string {
  if (m.kind !== "utilization") return "";
  return m.capacity.type === "constant" ? `capacity ${fmt(m.capacity.value)}` : `capacity from series ${q(m.capacity.series)}`;
}

function statement(measure: Measure, scenarios: Scenario[], unit: string): string {
  const m = measure;
  let s: string;
  switch (m.kind) {
    case "level":
      s = m.source.type === "series"
        ? `The level of series ${q(m.source.series)} (${fmt(m.initial)} before its first row), averaged over time: area under the level divided by the window's length in ${unit}.`
        : `The number of entities that have had event ${q(m.source.enter)} and not yet event ${q(m.source.leave)}, averaged over time (area divided by the window's length in ${unit}).`;
      break;
    case "utilization": {
      const caps = scenarios.map((sc) => {
        const own = sc.measures.find((x) => x.name === m.name);
        return `${sc.name}: ${own ? capacityText(own) : capacityText(m)}`;
      });
      s = `Busy units (series ${q(m.series)}) over available units, as area(busy) / area(capacity). Capacity by scenario: ${caps.join("; ")}.`;
      break;
    }
    case "observation":
      s = m.source.type === "series"
        ? `The mean of the values of series ${q(m.source.series)} recorded inside the window.`
        : `For each entity, the time (${unit}) from its event ${q(m.source.start)} to its event ${q(m.source.end)}, recorded at the second event; entities without the second event are censored and counted, not averaged.`;
      break;
    case "count":
      s = `The number of rows of series ${q(m.series)} inside the window; the rate is that number per ${unit} of window.`;
      break;
  }
  return `${s} Across runs, each run's ${primaryName(m.kind)} is one value of the interval.`;
}

function warmupText(w: Warmup, unit: string): string {
  switch (w.type) {
    case "none":
      return "none";
    case "fixed":
      return `${fmt(w.time)} ${unit}`;
    case "mser-5":
      return `estimated by MSER-5 from ${w.measure} (slice of ${fmt(w.slice)} ${unit})`;
  }
}

function figureLabel(kind: Measure["kind"], figure: string): string {
  if (figure === "value") return primaryName(kind);
  const dot = figure.indexOf(".");
  const group = dot < 0 ? figure : figure.slice(0, dot);
  const k = dot < 0 ? "" : figure.slice(dot + 1);
  switch (group) {
    case "quantiles":
      return k === "0.5" ? "median (0.5 quantile)" : `${k} quantile`;
    case "within":
      return `share of values ≤ ${k}`;
    case "time_at_least":
      return `share of time at level ≥ ${k}`;
    default:
      return figure;
  }
}

function intervalText(lo: number | null, hi: number | null): string {
  return lo === null || hi === null ? MISSING : `[${fmt(lo)}, ${fmt(hi)}]`;
}

function relative(s: { mean: number | null; half_width: number | null }): string {
  if (s.mean === null || s.half_width === null || s.mean === 0) return MISSING;
  return formatPercent(s.half_width / Math.abs(s.mean));
}

function dateText(iso: string): string {
  const d = new Date(iso);
  if (Number.isNaN(d.getTime())) return iso;
  return `${d.toISOString().slice(0, 10)} ${d.toISOString().slice(11, 16)} UTC`;
}

const text = (t: string): Cell => ({ text: t, href: null });
const link = (t: string, href: string | null): Cell => ({ text: t, href: href === null ? null : `#${href}` });

// ---------------------------------------------------------------------------------------------
// Method notes and limitations (wording of the report's fixed parts)

const METHODS: Omit<MethodNote, "id">[] = [
  {
    term: "Time average of a level",
    formula: "ȳ = A / T,  A = Σ vᵢ·dᵢ,  T = end − c,  c = max(start, warm-up)",
    text: "The level holds value vᵢ for duration dᵢ inside the window; the area A is the sum of value × duration and the time average divides it by the window's length. An interval that straddles the warm-up or the end counts only its part inside the window.",
    source: "Little, J. D. C. (1961). A proof for the queuing formula L = λW. Operations Research 9(3), 383–387 (time-average number in system).",
  },
  {
    term: "Time-weighted standard deviation",
    formula: "s_T = √( Σ dᵢ·(vᵢ − ȳ)² / T )",
    text: "The spread of the level over time: each squared deviation from the time average is weighted by how long it lasted. Minimum and maximum are taken over intervals of positive duration.",
    source: "Definition by the same time weighting as the time average; see Little (1961).",
  },
  {
    term: "Utilization",
    formula: "u = A(busy) / A(capacity)",
    text: "Area under the busy level divided by the area under the capacity (a constant capacity k gives A(capacity) = k·T).",
    source: "Little (1961), applied to the units in service.",
  },
  {
    term: "Mean and sample standard deviation",
    formula: "x̄ = Σ xᵢ / n,  s = √( Σ (xᵢ − x̄)² / (n − 1) )",
    text: "Used for observations within a run and for run values across runs. The divisor n − 1 makes s² unbiased for the variance; it is computed in one pass by Welford's update.",
    source: "Welford, B. P. (1962). Note on a method for calculating corrected sums of squares and products. Technometrics 4(3), 419–420.",
  },
  {
    term: "Count and rate",
    formula: "rate = n / T",
    text: "The number of rows of the series inside the window, and that number per time unit of window.",
    source: "Definition.",
  },
  {
    term: "Confidence interval across runs (Student t)",
    formula: "x̄ ± t(1 − α/2; n − 1) · s / √n,  half-width h = t · s / √n,  relative precision h / |x̄|",
    text: "Each run contributes one value (its time average, utilization, mean or count). The t quantile has n − 1 degrees of freedom at the study's confidence 1 − α.",
    source: "Student (1908). The probable error of a mean. Biometrika 6(1), 1–25.",
  },
  {
    term: "Compensated summation",
    formula: "s ← s + x, with the rounding error of each addition carried in a separate term",
    text: "All long sums (areas, running sums) carry the low-order digits lost in each addition, so the order of millions of terms does not change the reported digits.",
    source: "Kahan, W. (1965). Further remarks on reducing truncation errors. Communications of the ACM 8(1), 40; Neumaier, A. (1974). Rundungsfehleranalyse einiger Verfahren zur Summation endlicher Summen. ZAMM 54(1), 39–51.",
  },
  {
    term: "Warm-up by MSER-5",
    formula: "d* = argmin_d  Σ_{j>d} (Z_j − Z̄_d)² / (k − d)²,  Z_j = means of batches of 5",
    text: "The series is cut into batches of five; the truncation point d* minimizes the marginal standard error of what remains (searched over the first half). The warm-up is the time at the end of batch d*.",
    source: "White, K. P. Jr. (1997). An effective truncation heuristic for bias reduction in simulation output. Simulation 69(6), 323–334.",
  },
  {
    term: "Warm-up plot",
    formula: "Ȳ_j = (1/R) Σ_r Y_rj, smoothed by a moving average of width 2w + 1",
    text: "Averaging the runs time slice by time slice and smoothing the result shows where the level settles; the warm-up chosen should lie past that point.",
    source: "Welch, P. D. (1983). The statistical analysis of simulation results. In S. S. Lavenberg (ed.), Computer Performance Modeling Handbook, Academic Press, 268–328.",
  },
  {
    term: "Batch means within one run",
    formula: "Z_j = batch averages (j = 1..k),  Z̄ ± t(1 − α/2; k − 1) · s_Z / √k,  lag-1 r = Σ (Z_j − Z̄)(Z_{j+1} − Z̄) / Σ (Z_j − Z̄)²",
    text: "One long run is cut into k batches of equal length; their averages are treated as roughly independent. A lag-1 correlation far from 0 says the batches are too short.",
    source: "Schmeiser, B. (1982). Batch size effects in the analysis of simulation output. Operations Research 30(3), 556–568.",
  },
  {
    term: "Comparing two scenarios (unequal variances)",
    formula: "x̄_a − x̄_b ± t(1 − α/2; ν) · √(s_a²/n_a + s_b²/n_b),  ν = (s_a²/n_a + s_b²/n_b)² / ( (s_a²/n_a)²/(n_a − 1) + (s_b²/n_b)²/(n_b − 1) )",
    text: "For independent runs of two scenarios. With paired runs (common random numbers) the interval is the Student t interval of the run-by-run differences.",
    source: "Welch, B. L. (1947). The generalization of “Student's” problem when several different population variances are involved. Biometrika 34(1–2), 28–35.",
  },
  {
    term: "Several comparisons at once (Bonferroni)",
    formula: "each interval at 1 − α/m for m comparisons",
    text: "Makes all m intervals hold together with probability at least 1 − α.",
    source: "Bonferroni, C. E. (1936). Teoria statistica delle classi e calcolo delle probabilità. Pubblicazioni del R. Istituto Superiore di Scienze Economiche e Commerciali di Firenze 8, 3–62; Dunn, O. J. (1961). Multiple comparisons among means. JASA 56, 52–64.",
  },
  {
    term: "Quantiles (type 7)",
    formula: "Q(p) = x₍ⱼ₎ + g·(x₍ⱼ₊₁₎ − x₍ⱼ₎),  h = (n − 1)·p,  j = ⌊h⌋ + 1,  g = h − ⌊h⌋",
    text: "Linear interpolation between the order statistics x₍₁₎ ≤ … ≤ x₍ₙ₎ of a run's observations.",
    source: "Hyndman, R. J., & Fan, Y. (1996). Sample quantiles in statistical packages. The American Statistician 50(4), 361–365.",
  },
  {
    term: "Runs needed for a target precision",
    formula: "n* = smallest k with t(1 − α/2; k − 1) · s / √k ≤ h*  (h* = target half-width, or target relative precision × |x̄|)",
    text: "How many runs would bring the half-width down to the target, treating the current sd s as if it were exact; a planning figure, not a promise.",
    source: "Follows from the Student t half-width above.",
  },
  {
    term: "Little's law (consistency check)",
    formula: "L = λ · W",
    text: "Time-average number in a system equals arrival rate times mean time in the system, over a long window that starts and ends nearly empty.",
    source: "Little, J. D. C. (1961). Operations Research 9(3), 383–387.",
  },
];

const LIMITATIONS = [
  "The report summarises what the simulation model produced. Whether the model represents the real system (its logic, its input distributions, its data) is outside this tool and has to be established separately.",
  "Each interval assumes that the run values of a scenario are independent and identically distributed (separate random-number streams, same settings) and roughly normal; with few runs or skewed values the stated confidence is approximate.",
  "The warm-up choice changes every figure. Check it against the level traces: the shaded warm-up should cover the start-up period, and a different reasonable choice should not change the conclusions.",
  "A half-width describes only the sampling error of the runs. It does not include errors of the model, its data, or the window chosen.",
  "Several intervals read side by side are not jointly at the stated confidence unless adjusted (see Bonferroni in the method notes).",
  "Decisions that affect people's safety or health must go to qualified review under the rules that apply locally; this report is one input to such a review, not a substitute for it.",
];

// ---------------------------------------------------------------------------------------------
// Builder

/**
 * Builds the report's view model from the study and its outcome. Deterministic: the same
 * arguments give the same model (`meta.generatedAt` is the only clock).
 */
export function buildReportModel(
  study: Study,
  outcome: StudyOutcome,
  meta: { toolVersion: string; generatedAt: string },
): ReportModel {
  const results = outcome.results;
  const unit = study.timeUnit;
  const scenarioNames = results.scenarios.map((s) => s.name);
  const measureOf = (scenario: string, name: string): Measure => {
    const sc = study.scenarios.find((s) => s.name === scenario) ?? study.scenarios[0];
    const m = sc?.measures.find((x) => x.name === name) ?? study.scenarios.flatMap((s) => s.measures).find((x) => x.name === name);
    if (!m) throw new Error(`measure ${name} is in the outcome but not in the study`);
    return m;
  };

  // Anchors of calculation tables and interval derivations, assigned once.
  const tableIds = new Map<string, string>();
  outcome.tables.forEach((t, i) => {
    const k = key(t.scenario, t.run, t.measure);
    if (!tableIds.has(k)) tableIds.set(k, anchor("table", i + 1, t.measure, t.scenario, t.run));
  });
  const intervalIds = new Map<string, string>();
  outcome.intervals.forEach((a, i) => {
    const k = key(a.scenario, a.measure, a.figure);
    if (!intervalIds.has(k)) intervalIds.set(k, anchor("calc", i + 1, a.measure, a.scenario, a.figure === "value" ? null : a.figure));
  });
  const measureIds = study.measureNames.map((m, i) => anchor("measure", i + 1, m));
  const ivId = (scenario: string, measure: string, figure: string) => intervalIds.get(key(scenario, measure, figure)) ?? null;
  const tbId = (scenario: string, run: string | null, measure: string) => tableIds.get(key(scenario, run, measure)) ?? null;

  // Cover.
  const totalRuns = results.scenarios.reduce((a, s) => a + s.runs.length, 0);
  const facts: Fact[] = [
    { label: "Time unit", value: unit },
    { label: "Confidence", value: formatPercent(study.confidence) },
    { label: "Warm-up", value: warmupText(study.warmup, unit) },
    { label: "Scenarios", value: String(results.scenarios.length) },
    { label: "Runs", value: `${totalRuns} (${results.scenarios.map((s) => `${s.runs.length}`).join(" + ")})` },
    { label: "Measures", value: String(study.measureNames.length) },
    { label: "Tool", value: `Sojourn ${meta.toolVersion}` },
    { label: "Report date", value: dateText(meta.generatedAt) },
  ];
  const coverScenarios: ScenarioLine[] = results.scenarios.map((sr) => {
    const sc = study.scenarios.find((s) => s.name === sr.name);
    const windows = [...new Set(sr.runs.map((r) => `${fmt(r.start)} to ${r.end === null ? "last row" : fmt(r.end)} ${unit}`))];
    let warm = sc ? warmupText(sc.warmup, unit) : MISSING;
    const est = sr.warmup_estimate as { method?: string; measure?: string; d?: number; batches?: number; time?: number } | undefined;
    if (est && typeof est.time === "number") {
      warm = `${fmt(est.time)} ${unit}, by ${String(est.method ?? "estimate").toUpperCase()} on ${String(est.measure ?? "")}: ` +
        `first ${fmt(est.d ?? null)} of ${fmt(est.batches ?? null)} batches dropped`;
    }
    const analysis = sc?.analysis.type === "batch-means"
      ? `independent runs; batch means within each run (${sc.analysis.batches} batches)`
      : "independent runs";
    return { name: sr.name, runs: String(sr.runs.length), window: windows.join("; "), warmup: warm, analysis };
  });

  // Summary.
  const summaryRows: SummaryRow[] = [];
  study.measureNames.forEach((name, mi) => {
    results.scenarios.forEach((sr, si) => {
      const s: Summary | undefined = sr.summary[name];
      const href = ivId(sr.name, name, "value");
      const iv = outcome.intervals.find((a) => a.scenario === sr.name && a.measure === name && a.figure === "value");
      summaryRows.push({
        measure: name,
        measureHref: `#${measureIds[mi]}`,
        measureRows: si === 0 ? results.scenarios.length : 0,
        scenario: sr.name,
        mean: link(fmt(s?.mean ?? null), href),
        halfWidth: link(fmt(s?.half_width ?? null), href),
        interval: link(intervalText(s?.ci_low ?? null, s?.ci_high ?? null), href),
        runs: String(s?.n ?? 0),
        relative: link(relative({ mean: s?.mean ?? null, half_width: s?.half_width ?? null }), href),
        note: s && s.half_width === null ? (iv?.note ?? "No interval: fewer than two run values.") : null,
      });
    });
  });

  // Measure sections.
  const measures: MeasureSection[] = study.measureNames.map((name, mi) => {
    const id = measureIds[mi];
    const m = measureOf(scenarioNames[0], name);
    const vTitle = valueTitle(m, unit);
    const charts: Chart[] = [];
    let chartNo = 0;
    const chartId = (what: string) => `${id}-chart-${++chartNo}-${what}`;

    charts.push({
      id: chartId("interval"),
      caption: `${name}: mean of the run values and its ${formatPercent(study.confidence)} confidence interval, by scenario (time unit ${unit}).`,
      spec: intervalChart(results.scenarios.map((sr) => {
        const s = sr.summary[name];
        return { scenario: sr.name, mean: s?.mean ?? null, low: s?.ci_low ?? null, high: s?.ci_high ?? null, label: fmt(s?.mean ?? null) };
      }), vTitle),
    });
    charts.push({
      id: chartId("runs"),
      caption: `${name}: each run's ${primaryName(m.kind)} (dots) and the scenario mean (bar) (time unit ${unit}).`,
      spec: runsChart(results.scenarios.flatMap((sr) => sr.runs.flatMap((r) => {
        const v = r.measures[name]?.value;
        return typeof v === "number" ? [{ scenario: sr.name, run: r.id, value: v }] : [];
      })), scenarioNames, vTitle),
    });
    for (const sr of results.scenarios) {
      const tr = outcome.traces.find((t) => t.scenario === sr.name && t.measure === name);
      if (!tr || tr.points.length === 0) continue;
      const thinned = tr.thinned || tr.points.length > MAX_TRACE_POINTS;
      charts.push({
        id: chartId("trace"),
        caption: `${name} over time in run ${tr.run} of ${sr.name}: the level (area under it shaded), the running time average from ${fmt(tr.from)} ${unit}` +
          (tr.warmup !== null ? `, and the warm-up up to ${fmt(tr.warmup)} ${unit} (grey band)` : "") + "." +
          (thinned ? ` The line is thinned for drawing (at most ${MAX_TRACE_POINTS} change points, keeping each stretch's first, lowest, highest and last); the numbers use every row.` : ""),
        spec: traceChart({
          points: tr.points, from: tr.from, to: tr.to, warmup: tr.warmup,
          timeTitle: `time (${unit})`,
          valueTitle: m.kind === "utilization" ? `${name}: busy units` : `${name}: level`,
          levelLabel: "level", averageLabel: "running time average", warmupLabel: "warm-up",
        }),
      });
    }
    if (m.kind === "observation") {
      const rows = outcome.samples.filter((s) => s.measure === name)
        .flatMap((s) => evenSample(s.values, Math.floor(MAX_HISTOGRAM_VALUES / Math.max(1, results.scenarios.length))).map((value) => ({ scenario: s.scenario, value })));
      if (rows.length > 0) {
        const sampled = outcome.samples.filter((s) => s.measure === name).some((s) => s.values.length < s.total);
        charts.push({
          id: chartId("histogram"),
          caption: `${name}: histogram of the observations inside the window, all runs of each scenario together` +
            (m.kind === "observation" && m.source.type === "entities" ? ` (values in ${unit})` : "") + "." +
            (sampled ? " Drawn from an even sample of the observations; the statistics use all of them." : ""),
          spec: histogramChart(rows, scenarioNames, m.source.type === "entities" ? `${name} (${unit})` : name, "observations"),
        });
      }
    }

    return {
      id,
      name,
      kind: kindLabel(m.kind),
      statement: statement(m, study.scenarios, unit),
      charts,
      runs: runTable(name, m.kind, results.scenarios, unit, tbId),
      extras: extrasTable(name, m.kind, results.scenarios, ivId),
      batchMeans: batchMeansTable(name, results.scenarios),
      runsNeeded: runsNeededTable(name, results.scenarios),
    };
  });

  // Comparisons.
  const comps = Array.isArray(results.comparisons) ? (results.comparisons as Record<string, unknown>[]) : [];
  const num = (v: unknown) => (typeof v === "number" ? v : null);
  const comparisons = comps.length === 0 ? null : {
    intro: `Each row is the difference a − b of the scenario means of one measure with its confidence interval. ` +
      (comps.length > 1
        ? `There are ${comps.length} comparisons; each interval is at the confidence shown (Bonferroni), so that all of them hold together at ${formatPercent(study.confidence)} or more.`
        : "") + " An interval that excludes 0 says the scenarios differ in that measure at the stated confidence.",
    table: tableView(
      "Scenario comparisons",
      ["Measure", "a", "b", "Method", "Mean of a − b", "Standard error", "t", "Degrees of freedom", "Half-width", "Interval", "Confidence of each", "Reading"],
      comps.map((c) => [
        text(String(c.measure)), text(String(c.a)), text(String(c.b)),
        text(c.method === "welch" ? "unequal variances (Welch)" : c.method === "paired" ? "paired runs" : String(c.method)),
        text(fmt(num(c.diff_mean))), text(fmt(num(c.standard_error))), text(fmt(num(c.t))), text(fmt(num(c.df))),
        text(fmt(num(c.half_width))), text(intervalText(num(c.ci_low), num(c.ci_high))),
        text(formatPercent(num(c.confidence_each))), text(verdict(c)),
      ]),
    ),
  };

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
  const tables: CalcTable[] = outcome.tables.map((t, i) => calcTable(t, tableIds.get(key(t.scenario, t.run, t.measure)) ?? anchor("table", i + 1)));
  const intervals: IntervalView[] = outcome.intervals.map((a, i) => {
    const kind = (() => { try { return measureOf(a.scenario, a.measure).kind; } catch { return "level" as const; } })();
    return intervalView(a, intervalIds.get(key(a.scenario, a.measure, a.figure)) ?? anchor("calc", i + 1), figureLabel(kind, a.figure), tbId);
  });

  const warnings: WarningLine[] = outcome.warnings.map((w) => ({
    where: [w.scenario, w.run, w.measure].filter((x): x is string => x !== null).join(" › ") || "study",
    message: w.message,
  }));

  const contents = [
    { href: "#summary", label: "Summary" },
    ...measures.map((m) => ({ href: `#${m.id}`, label: m.name })),
    ...(comparisons ? [{ href: "#comparisons", label: "Scenario comparisons" }] : []),
    { href: "#methods", label: "Method notes" },
    { href: "#limitations", label: "Limitations and cautions" },
    { href: "#warnings", label: `Warnings (${warnings.length})` },
    { href: "#appendix", label: "Audit appendix" },
  ];

  const manifestFile = study.manifestPath.split(/[\\/]/).pop() ?? "manifest";
  return {
    title: study.title,
    generatedAt: meta.generatedAt,
    reportDate: dateText(meta.generatedAt),
    toolVersion: meta.toolVersion,
    timeUnit: unit,
    rule: `Numbers are rounded to ${SIGNIFICANT_DIGITS} significant digits, keeping every whole-number digit, without trailing zeros; results.json keeps full precision.`,
    cover: { facts, scenarios: coverScenarios },
    contents,
    summary: {
      intro: `Mean of the run values of each measure by scenario, with its ${formatPercent(study.confidence)} confidence interval (Student t, one value per run). ` +
        "Relative precision is half-width / |mean|. Every number links to its step-by-step derivation in the appendix.",
      rows: summaryRows,
    },
    measures,
    comparisons,
    methods: METHODS.map((n, i) => ({ id: anchor("method", i + 1, n.term), ...n })),
    limitations: LIMITATIONS,
    warnings,
    appendix: {
      manifest: { file: manifestFile, text: study.manifestText },
      inputs,
      inputsIntro: "Rows: rows read from the file. Left out: rows after the window's end, and rows of series that no measure reads. " +
        "Before collection start: rows of used series before the warm-up ends (or the window starts); levels still take their value from them, observations and counts leave them out.",
      tablesIntro: `Each calculation table shows at most ${TABLE_ROW_CAP} rows here (the first ${TABLE_HEAD_ROWS} and the last ${TABLE_TAIL_ROWS}); ` +
        "the full table is the CSV file named under it, whose SHA-256 digest is given.",
      tables,
      intervals,
    },
  };
}

/** The comparison's reading in words, from its interval. */
function verdict(c: Record<string, unknown>): string {
  const lo = typeof c.ci_low === "number" ? c.ci_low : null;
  const hi = typeof c.ci_high === "number" ? c.ci_high : null;
  const a = q(String(c.a));
  const b = q(String(c.b));
  if (lo === null || hi === null) return "no interval (too few runs)";
  if (lo > 0) return `${a} is higher than ${b} (interval above 0)`;
  if (hi < 0) return `${a} is lower than ${b} (interval below 0)`;
  return "no difference shown (interval contains 0)";
}

function runTable(
  name: string,
  kind: Measure["kind"],
  scenarios: StudyOutcome["results"]["scenarios"],
  unit: string,
  tbId: (s: string, r: string | null, m: string) => string | null,
): TableView {
  const cols: Record<Measure["kind"], string[]> = {
    level: ["time average", "time-weighted sd", "min", "max", "final", "area", `duration (${unit})`],
    utilization: ["utilization"],
    observation: ["mean", "sd", "n", "min", "max"],
    count: ["count", `rate (per ${unit})`],
  };
  const fields: Record<Measure["kind"], string[]> = {
    level: ["value", "sd", "min", "max", "final", "area", "duration"],
    utilization: ["value"],
    observation: ["value", "sd", "n", "min", "max"],
    count: ["value", "rate"],
  };
  const extraKeys: { group: string; key: string }[] = [];
  for (const sr of scenarios) for (const r of sr.runs) {
    const st = r.measures[name];
    if (!st) continue;
    for (const group of ["quantiles", "within", "time_at_least"]) {
      const g = st[group];
      if (g && typeof g === "object") for (const k of Object.keys(g)) {
        if (!extraKeys.some((e) => e.group === group && e.key === k)) extraKeys.push({ group, key: k });
      }
    }
  }
  const rows: Cell[][] = [];
  for (const sr of scenarios) for (const r of sr.runs) {
    const st: RunStats | undefined = r.measures[name];
    const href = tbId(sr.name, r.id, name);
    const cells = fields[kind].map((f, i) => {
      const v = st?.[f as keyof RunStats];
      const t = fmt(typeof v === "number" ? v : null);
      return i === 0 ? link(t, href) : text(t);
    });
    const extras = extraKeys.map((e) => {
      const g = st?.[e.group] as Record<string, number> | undefined;
      return text(fmt(g?.[e.key] ?? null));
    });
    rows.push([text(sr.name), text(r.id), ...cells, ...extras]);
  }
  return tableView(
    `${name}: each run's figures (the first number links to the run's calculation table)`,
    ["Scenario", "Run", ...cols[kind], ...extraKeys.map((e) => figureLabel(kind, `${e.group}.${e.key}`))],
    rows,
  );
}

function extrasTable(
  name: string,
  kind: Measure["kind"],
  scenarios: StudyOutcome["results"]["scenarios"],
  ivId: (s: string, m: string, f: string) => string | null,
): TableView | null {
  const rows: Cell[][] = [];
  for (const group of ["quantiles", "within", "time_at_least"]) {
    for (const sr of scenarios) {
      const g = sr.summary[name]?.[group] as Record<string, Summary> | undefined;
      if (!g || typeof g !== "object") continue;
      for (const [k, s] of Object.entries(g)) {
        const href = ivId(sr.name, name, `${group}.${k}`);
        rows.push([
          text(figureLabel(kind, `${group}.${k}`)), text(sr.name),
          link(fmt(s.mean), href), link(fmt(s.half_width), href), link(intervalText(s.ci_low, s.ci_high), href), text(String(s.n)),
        ]);
      }
    }
  }
  if (rows.length === 0) return null;
  return tableView(
    `${name}: further figures across runs (each run's figure is one value of the interval; shares run from 0 to 1)`,
    ["Figure", "Scenario", "Mean", "Half-width", "Interval", "Runs"],
    rows,
  );
}

function batchMeansTable(name: string, scenarios: StudyOutcome["results"]["scenarios"]): TableView | null {
  const rows: Cell[][] = [];
  for (const sr of scenarios) for (const r of sr.runs as RunResult[]) {
    const b = r.measures[name]?.batch_means as Record<string, number | null> | undefined;
    if (!b || typeof b !== "object") continue;
    rows.push([
      text(sr.name), text(r.id), text(fmt(b.batches ?? null)), text(fmt(b.mean ?? null)), text(fmt(b.half_width ?? null)),
      text(intervalText(b.ci_low ?? null, b.ci_high ?? null)), text(fmt(b.lag1 ?? null)),
    ]);
  }
  if (rows.length === 0) return null;
  return tableView(
    `${name}: batch means within each run (a lag-1 correlation far from 0 says the batches are too short)`,
    ["Scenario", "Run", "Batches", "Mean", "Half-width", "Interval", "Lag-1 correlation"],
    rows,
  );
}

function runsNeededTable(name: string, scenarios: StudyOutcome["results"]["scenarios"]): TableView | null {
  const rows: Cell[][] = [];
  for (const sr of scenarios) {
    const s = sr.summary[name];
    const need = s?.runs_needed;
    if (need === undefined || need === null) continue;
    const runs = typeof need === "number" ? need : null;
    const t = s.target as { half_width?: number; relative?: number } | undefined;
    let target = MISSING;
    if (t && typeof t.relative === "number") target = `relative precision ${formatPercent(t.relative)}`;
    else if (t && typeof t.half_width === "number") target = `half-width ${fmt(t.half_width)}`;
    rows.push([text(sr.name), text(target), text(String(s.n)), text(fmt(s.half_width)), text(fmt(runs))]);
  }
  if (rows.length === 0) return null;
  return tableView(
    `${name}: runs needed for the target precision (smallest k with t · s / √k ≤ target half-width)`,
    ["Scenario", "Target", "Runs now", "Half-width now", "Runs needed"],
    rows,
  );
}

function calcTable(t: TableRecord, id: string): CalcTable {
  const preview = t.preview;
  const show = preview.length <= TABLE_ROW_CAP ? preview : [...preview.slice(0, TABLE_HEAD_ROWS), ...preview.slice(-TABLE_TAIL_ROWS)];
  const cell = (v: number | string | null) => (typeof v === "number" ? fmt(v) : v === null ? MISSING : v);
  const rows: CalcTable["rows"] = show.map((r) => ({ cells: r.map(cell), gap: null }));
  const hiddenHere = preview.length - show.length;
  const hiddenTotal = t.rows_total - show.length;
  if (hiddenTotal > 0) {
    const at = preview.length <= TABLE_ROW_CAP ? Math.min(rows.length, Math.ceil(rows.length / 2)) : TABLE_HEAD_ROWS;
    rows.splice(at, 0, { cells: null, gap: `… ${fmt(hiddenTotal)} rows not shown: see ${t.file} …` });
  }
  const parts = [`${fmt(t.rows_total)} rows in full; ${fmt(show.length)} shown here.`];
  if (t.shortened) parts.push(`The CSV file ${t.file} holds ${fmt(t.rows_written)} of them (the table was shortened when written: first rows, checkpoints and last rows).`);
  else parts.push(`The CSV file ${t.file} holds all of them.`);
  if (hiddenHere > 0 || hiddenTotal > 0) parts.push("Rows not shown here are in that file.");
  parts.push(`SHA-256 ${t.sha256}.`);
  const heading = t.run === null ? `${t.measure} — ${t.scenario}` : `${t.measure} — ${t.scenario} — run ${t.run}`;
  return { id, heading, file: t.file, sha256: t.sha256, columns: t.columns, rows, note: parts.join(" ") };
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
  if (a.variance !== null) steps.push({ label: "Sample variance", formula: `s² = Σ (xᵢ − x̄)² / (n − 1) = ${fmt(a.sum_squared)} / ${fmt(a.df)}`, value: fmt(a.variance) });
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
