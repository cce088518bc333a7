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
  LevelTrace,
  RunResult,
  RunStats,
  StudyOutcome,
  Summary,
  TableRecord,
} from "../study/outcome.js";
import type { TopLevelSpec } from "vega-lite";
import {
  ecdfChart,
  ecdfSteps,
  evenSample,
  histogramChart,
  intervalChart,
  runsChart,
  traceChart,
  MAX_HISTOGRAM_VALUES,
  tracedAsBand,
  MAX_ECDF_POINTS,
  MAX_WELCH_POINTS,
  timeAtValueChart,
  welchChart,
  welchMovingAverage,
  welchWindow,
} from "./charts.js";
import { fsum } from "../stats/fsum.js";
import { formatNumber, formatPercent, MISSING, SIGNIFICANT_DIGITS } from "./number.js";
import { runsEndEarlyOnRow, runsNeededWhy, runsWithoutValue, runWarningsOnRow } from "../messages/warnings.js";
import { LATE_FRACTION } from "../study/runChecks.js";
import { meanCorrectionMatters, PREVIEW_HEAD, PREVIEW_RUNS, PREVIEW_TAIL } from "../study/tables.js";

/** Rows of one calculation table shown in the appendix: the first `TABLE_HEAD_ROWS` and the last `TABLE_TAIL_ROWS` (the rows the study keeps as the table's preview). */
export const TABLE_HEAD_ROWS = PREVIEW_HEAD;
export const TABLE_TAIL_ROWS = PREVIEW_TAIL;
/** The most rows the appendix shows per calculation table. */
export const TABLE_ROW_CAP = TABLE_HEAD_ROWS + TABLE_TAIL_ROWS;

/** A number as shown, with the anchor of the place that derives it (or null). */
export interface Cell {
  text: string;
  href: string | null;
  /** Set on cells of columns that hold numbers: right-aligned, tabular figures. */
  num?: boolean;
  /** Set on cells of columns of short labels (run ids, scenario names), kept on one line. */
  nowrap?: boolean;
  /** Set on a cell that flags a problem (shown in the warning colour). */
  flag?: boolean;
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
  /** What the row's interval rests on that a reader should know: runs left out, runs that stopped early. */
  warnings: string[];
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
  const short = columns.map((_, j) => !numeric[j] && rows.length > 0 && rows.every((r) => (r[j]?.text ?? "").length <= SHORT_LABEL));
  return {
    caption, columns, numeric,
    rows: rows.map((r) => r.map((c, j) => (numeric[j] ? { ...c, num: true } : short[j] ? { ...c, nowrap: true } : c))),
  };
}

/** Longest label kept on one line in a table column. */
const SHORT_LABEL = 16;

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
  /** One line on what the columns mean (share and quantile tables), or null. */
  explain: string | null;
  file: string;
  sha256: string;
  columns: string[];
  /** Per column: false for a column of text (such as written-out arithmetic), which wraps. */
  numeric: boolean[];
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

/** The warm-up estimate of one scenario: its figures, the warm-up plot, or the per-run table. */
export interface WarmupView {
  id: string;
  scenario: string;
  /** One sentence: what was estimated and the result. */
  lead: string;
  facts: Fact[];
  chart: Chart | null;
  runs: TableView | null;
  /** Shown when MSER-5 stopped at its limit (half the batches). */
  warning: string | null;
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
  /** The warm-up estimates (MSER-5) with the warm-up plot; null when no scenario estimated one. */
  warmup: { intro: string; scenarios: WarmupView[] } | null;
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
    /** Where the tables not shown are (runs after the first `PREVIEW_RUNS` of a scenario); null when every table is shown. */
    tablesElsewhere: { id: string; text: string } | null;
    intervals: IntervalView[];
    /** Consistency checks of the run data, one row per check and run; null when there are none. */
    checks: { intro: string; table: TableView } | null;
    /** The batch means of every run, per measure; null without batch means. */
    batchValues: { intro: string; items: { id: string; table: TableView }[] } | null;
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
  // With one run per scenario there is no interval across runs to speak of.
  return scenarios.some((sc) => sc.runs.length >= 2) ? `${s} Across runs, each run's ${primaryName(m.kind)} is one value of the interval.` : s;
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
    source: "The same time weighting as the time average; accumulated by West's weighted update: West, D. H. D. (1979). Updating mean and variance estimates: an improved method. Communications of the ACM 22(9), 532–535.",
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
    text: "Used for observations within a run and for run values across runs. The divisor n − 1 makes s² unbiased for the variance. Within a run it is computed in two passes over the stored observations with the correction term of Chan, Golub and LeVeque; across runs the sums are exactly rounded, so the order of the runs changes nothing.",
    source: "Chan, T. F., Golub, G. H., LeVeque, R. J. (1983). Algorithms for computing the sample variance: analysis and recommendations. The American Statistician 37(3), 242–247.",
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
    formula: "Ȳ_j = (1/R) Σ_r Y_rj;  Ȳ_j(w) = mean of Ȳ_{j−w} … Ȳ_{j+w} (of Ȳ_1 … Ȳ_{2j−1} for j ≤ w);  w = m/20 rounded, 1 ≤ w ≤ m/4",
    text: "Each run's time average over slices of equal width, averaged over the R runs slice by slice (Ȳ_j for slices j = 1 … m), then smoothed by a centred moving average of 2w + 1 slices. The plot shows both lines and the warm-up MSER-5 chose as a vertical rule; the smoothed line should be flat to the right of the rule. If it still drifts, the runs are too short or the system has no steady state.",
    source: "Welch, P. D. (1983). The statistical analysis of simulation results. In S. S. Lavenberg (ed.), Computer Performance Modeling Handbook, Academic Press, 268–328.",
  },
  {
    term: "Batch means within one run",
    formula: "Z_j = batch averages (j = 1..k),  Z̄ ± t(1 − α/2; k − 1) · s_Z / √k,  lag-1 r = Σ (Z_j − Z̄)(Z_{j+1} − Z̄) / Σ (Z_j − Z̄)²",
    text: "One long run is cut into k batches (a level: k stretches of equal time, prorated at the edges; observations: k groups of ⌊n/k⌋ consecutive values after dropping the n mod k oldest); their averages are treated as roughly independent and give an interval for the run's long-run mean. A lag-1 correlation above 0.2 in size says the batches are probably too short: the report flags it and warns.",
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
    term: "Intervals for per-run quantiles and shares",
    formula: "q_r = quantile (or share) of run r;  q̄ ± t(1 − α/2; n − 1) · s_q / √n",
    text: "Each run gives its own quantile, share of values within a threshold, or share of time at or above a level; the interval treats these n per-run figures like any run value. It is an interval for the expected per-run quantile or share (what one run of this length gives on average), not for the quantile or share of all observations pooled, which can differ, most of all for short runs and extreme quantiles. The distribution chart, by contrast, pools the observations.",
    source: "Follows from the Student t interval above; the quantile definition is Hyndman and Fan (1996), type 7.",
  },
  {
    term: "Runs needed for a target precision",
    formula: "n* = smallest k with t(1 − α/2; k − 1) · s / √k ≤ h*  (h* = target half-width, or γ/(1 + γ) × |x̄| for a relative error γ)",
    text: "How many runs would bring the half-width down to the target, treating the current sd s as if it were exact; a planning figure, not a promise. A relative error γ means the estimate within γ of the true mean: since the interval is centred on x̄, not on the unknown mean, that needs a half-width of γ/(1 + γ) × |x̄|. With one run, identical runs or a mean of 0 for a relative target there is no number, and the table says why.",
    source: "Follows from the Student t half-width above; the adjusted relative error γ/(1 + γ) is that of the sequential procedure for a relative precision in Law (2015), Simulation Modeling and Analysis, 5th ed., §9.4.1 (cited from memory; the derivation is in docs/statistics.md).",
  },
  {
    term: "Little's law (consistency check)",
    formula: "L = λ · W",
    text: "Time-average number in a system equals arrival rate times mean time in the system, over a long window that starts and ends nearly empty. L counts the entities inside: an entity level with an initial value is taken less that value.",
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
  // Every table has its own anchor; a run value links to its measure's first (main) table.
  // A table the page does not show (no preview rows) links to the note that says where its file is.
  const tableAnchors = outcome.tables.map((t, i) => (t.preview === null ? TABLES_ELSEWHERE : anchor("table", i + 1, t.measure, t.scenario, t.run)));
  const tableIds = new Map<string, string>();
  outcome.tables.forEach((t, i) => {
    const k = key(t.scenario, t.run, t.measure);
    if (!tableIds.has(k)) tableIds.set(k, tableAnchors[i]);
  });
  const intervalIds = new Map<string, string>();
  outcome.intervals.forEach((a, i) => {
    const k = key(a.scenario, a.measure, a.figure);
    if (!intervalIds.has(k)) intervalIds.set(k, anchor("calc", i + 1, a.measure, a.scenario, a.figure === "value" ? null : a.figure));
  });
  const measureIds = study.measureNames.map((m, i) => anchor("measure", i + 1, m));
  const batchIds = new Map<string, string>();
  let batchNo = 0;
  for (const name of study.measureNames) for (const sr of results.scenarios) {
    if (sr.runs.some((r) => isRecord(r.measures[name]?.batch_means))) batchIds.set(key(sr.name, name), anchor("batches", ++batchNo, name, sr.name));
  }
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
        warnings: summaryWarnings(s, sr.runs.length, outcome.warnings.filter((w) => w.scenario === sr.name && w.run !== null && (w.measure === name || w.measure === null)).length),
      });
    });
  });

  // Warm-up estimates.
  const warmupViews = results.scenarios.flatMap((sr, i) => {
    const v = warmupView(sr, i + 1, unit, measureOf);
    return v === null ? [] : [v];
  });
  const warmup = warmupViews.length === 0 ? null : {
    intro: "MSER-5 chooses the warm-up from the data: it drops the first d batches of five values that make the standard error of what remains smallest. " +
      "For a level or utilization the values are the runs' time averages over equal time slices, averaged over the runs slice by slice; the warm-up plot shows them with their moving average, so the choice can be judged by eye. " +
      "For an observation measure MSER-5 runs on each run's observations, and the scenario's warm-up is the latest of the runs' choices.",
    scenarios: warmupViews,
  };

  // Measure sections.
  const measures: MeasureSection[] = study.measureNames.map((name, mi) => {
    const id = measureIds[mi];
    const m = measureOf(scenarioNames[0], name);
    const vTitle = valueTitle(m, unit);
    const charts: Chart[] = [];
    let chartNo = 0;
    const chartId = (what: string) => `${id}-chart-${++chartNo}-${what}`;

    // Charts across runs say nothing when no scenario has two runs (one dot, no interval).
    if (results.scenarios.some((sr) => sr.runs.length >= 2)) charts.push({
      id: chartId("interval"),
      caption: `${name}: mean of the run values and its ${formatPercent(study.confidence)} confidence interval, by scenario (time unit ${unit}).`,
      spec: intervalChart(results.scenarios.map((sr) => {
        const s = sr.summary[name];
        return { scenario: sr.name, mean: s?.mean ?? null, low: s?.ci_low ?? null, high: s?.ci_high ?? null, label: fmt(s?.mean ?? null) };
      }), vTitle),
    }, {
      id: chartId("runs"),
      caption: `${name}: each run's ${primaryName(m.kind)} (dots) and the scenario mean (bar) (time unit ${unit}).`,
      spec: runsChart(results.scenarios.flatMap((sr) => sr.runs.flatMap((r) => {
        const v = r.measures[name]?.value;
        return typeof v === "number" ? [{ scenario: sr.name, run: r.id, value: v }] : [];
      })), scenarioNames, vTitle),
    });
    for (const sr of results.scenarios) {
      const tr = outcome.traces.find((t) => t.scenario === sr.name && t.measure === name);
      if (!tr) continue;
      charts.push({ id: chartId("trace"), ...traceView(name, m.kind, sr.name, tr, unit) });
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
          spec: histogramChart(rows, scenarioNames, m.source.type === "entities" ? `${name} (${unit})` : `${name} (observed value)`, "observations"),
        });
      }
      const ecdf = ecdfView(name, m, outcome.samples.filter((s) => s.measure === name), scenarioNames, study, unit);
      if (ecdf !== null) charts.push({ id: chartId("distribution"), ...ecdf });
    }
    if (m.kind === "level" || m.kind === "utilization") {
      const tav = timeAtValueView(name, m.kind, results.scenarios, unit);
      if (tav !== null) charts.push({ id: chartId("time-at-value"), ...tav });
    }

    return {
      id,
      name,
      kind: kindLabel(m.kind),
      statement: statement(m, study.scenarios, unit),
      charts,
      runs: runTable(name, m.kind, results.scenarios, unit, tbId),
      extras: extrasTable(name, m.kind, results.scenarios, ivId),
      batchMeans: batchMeansTable(name, results.scenarios, batchIds),
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
  const tables: CalcTable[] = outcome.tables.flatMap((t, i) => (t.preview === null ? [] : [calcTable(t, t.preview, tableAnchors[i])]));
  const tablesElsewhere = elsewhereNote(outcome.tables);
  const intervals: IntervalView[] = outcome.intervals.map((a, i) => {
    const kind = (() => { try { return measureOf(a.scenario, a.measure).kind; } catch { return "level" as const; } })();
    return intervalView(a, intervalIds.get(key(a.scenario, a.measure, a.figure)) ?? anchor("calc", i + 1), figureLabel(kind, a.figure), tbId);
  });

  const warningsIn = [...outcome.warnings];
  const seen = new Set(warningsIn.map((w) => key(w.scenario, w.run, w.measure, w.message)));
  for (const sr of results.scenarios) for (const c of checksOf(sr)) {
    if (c.passed) continue;
    const k = key(sr.name, c.run, c.measure, c.message);
    if (seen.has(k)) continue;
    seen.add(k);
    warningsIn.push({ scenario: sr.name, run: c.run, measure: c.measure, message: c.message });
  }
  const warnings: WarningLine[] = warningsIn.map((w) => ({
    where: [w.scenario, w.run, w.measure].filter((x): x is string => x !== null).join(" › ") || "study",
    message: roundNumbersIn(w.message),
  }));
  const checks = checksTable(results.scenarios);
  const batchValues = batchValuesView(study.measureNames, results.scenarios, batchIds);

  const contents = [
    { href: "#summary", label: "Summary" },
    ...(warmup ? [{ href: "#warmup", label: "Warm-up" }] : []),
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
    warmup,
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
      tablesElsewhere,
      intervals,
      checks,
      batchValues,
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
  // Entity-derived measures: what the engine counted about the entities themselves.
  const entityFields: [string, string][] = [
    ["censored", "censored (still open at the end)"],
    ["entered", "entered"],
    ["left", "left"],
    ["inside_at_end", "inside at the end"],
  ];
  const present = entityFields.filter(([f]) => scenarios.some((sr) => sr.runs.some((r) => typeof r.measures[name]?.[f] === "number")));
  cols[kind] = [...cols[kind], ...present.map(([, label]) => label)];
  fields[kind] = [...fields[kind], ...present.map(([f]) => f)];
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

/** Size of the lag-1 correlation of batch means above which the batches are flagged as too short. */
export const LAG1_FLAG = 0.2;

function batchMeansTable(name: string, scenarios: StudyOutcome["results"]["scenarios"], batchIds: Map<string, string>): TableView | null {
  const rows: Cell[][] = [];
  for (const sr of scenarios) for (const r of sr.runs as RunResult[]) {
    const b = r.measures[name]?.batch_means;
    if (!isRecord(b)) continue;
    const lag1 = numOrNull(b.lag1);
    const flagged = lag1 !== null && Math.abs(lag1) > LAG1_FLAG;
    const flag: Cell = { ...text(lag1 === null ? "no lag-1 (too few batches)" : flagged ? `|lag-1| > ${LAG1_FLAG}: batches too short` : "ok"), ...(flagged ? { flag: true } : {}) };
    rows.push([
      text(sr.name), link(r.id, batchIds.get(key(sr.name, name)) ?? null), text(fmt(numOrNull(b.batches))), text(fmt(numOrNull(b.mean))),
      text(fmt(numOrNull(b.half_width))), text(intervalText(numOrNull(b.ci_low), numOrNull(b.ci_high))), text(fmt(lag1)), flag,
    ]);
  }
  if (rows.length === 0) return null;
  return tableView(
    `${name}: batch means within each run (interval for the run's long-run mean; each run links to its batch values in the appendix)`,
    ["Scenario", "Run", "Batches", "Mean", "Half-width", "Interval", "Lag-1 correlation", "Check"],
    rows,
  );
}

/**
 * The warnings shown on a summary row: from the summary's lists of runs (src/study/summaries.ts),
 * and how many warnings the runs behind the row have (about this measure or the whole run).
 */
function summaryWarnings(s: Summary | undefined, runs: number, runWarnings: number): string[] {
  const out: string[] = [];
  const list = (v: unknown) => (Array.isArray(v) && v.length > 0 ? v.map(String) : null);
  const without = list(s?.runs_without_value);
  if (s && without !== null) out.push(runsWithoutValue(without, s.n, runs));
  const early = list(s?.runs_ending_early);
  if (early !== null) out.push(runsEndEarlyOnRow(early, LATE_FRACTION));
  if (runWarnings > 0) out.push(runWarningsOnRow(runWarnings));
  return out;
}

function runsNeededTable(name: string, scenarios: StudyOutcome["results"]["scenarios"]): TableView | null {
  const rows: Cell[][] = [];
  for (const sr of scenarios) {
    const s = sr.summary[name];
    if (s?.target === undefined) continue;
    const need = typeof s.runs_needed === "number" ? s.runs_needed : null;
    const t = s.target as { half_width?: number; relative?: number } | undefined;
    let target = MISSING;
    if (t && typeof t.relative === "number") target = `relative error ${formatPercent(t.relative)}`;
    else if (t && typeof t.half_width === "number") target = `half-width ${fmt(t.half_width)}`;
    const aim = typeof s.target_half_width === "number" ? s.target_half_width : null;
    const why = need === null && typeof s.runs_needed_reason === "string" ? runsNeededWhy(s.runs_needed_reason, s.n) : null;
    rows.push([
      text(sr.name), text(target), text(fmt(aim)), text(String(s.n)), text(fmt(s.half_width)),
      why === null ? text(fmt(need)) : { ...text(`${MISSING} ${why}`), flag: true },
    ]);
  }
  if (rows.length === 0) return null;
  return tableView(
    `${name}: runs needed for the target precision (smallest k with t · s / √k ≤ the half-width aimed at; a relative error γ aims at γ/(1 + γ) · |mean|)`,
    ["Scenario", "Target", "Half-width aimed at", "Runs now", "Half-width now", "Runs needed"],
    rows,
  );
}

/** What the columns of a share or quantile table mean, by table kind (one line each). */
const TABLE_EXPLAIN: Record<string, { label: string; text: string }> = {
  time_at_least: {
    label: "share of time at or above each threshold",
    text: "One row per threshold k: intervals_at_or_above counts the level's intervals with value ≥ k, time is their total duration inside the window, duration is the window's length, and share = time / duration.",
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

/** The anchor of the note on the calculation tables that are files only. */
const TABLES_ELSEWHERE = "tables-elsewhere";

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
function calcTable(t: TableRecord, preview: NonNullable<TableRecord["preview"]>, id: string): CalcTable {
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
  const base = t.run === null ? `${t.measure} — ${t.scenario}` : `${t.measure} — ${t.scenario} — run ${t.run}`;
  const heading = extra ? `${base} — ${extra.label}` : base;
  return { id, heading, explain: extra?.text ?? null, file: t.file, sha256: t.sha256, columns: t.columns, numeric, rows, note: parts.join(" ") };
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

// ---------------------------------------------------------------------------------------------
// Steady state, distributions, checks

function isRecord(v: unknown): v is Record<string, unknown> {
  return typeof v === "object" && v !== null && !Array.isArray(v);
}

function numOrNull(v: unknown): number | null {
  return typeof v === "number" && Number.isFinite(v) ? v : null;
}

/**
 * A message from the engine with each decimal number in it rounded by the report's rule
 * ("L = 14.793044444444446" → "L = 14.79"); whole numbers and names are left as they are.
 */
export function roundNumbersIn(message: string): string {
  return message.replace(/(?<![\w.])-?\d+\.\d+(?:e[-+]?\d+)?(?![\w.])/gi, (m) => fmt(Number(m)));
}

const LIMIT_WARNING = "MSER-5 chose the largest truncation it allows (half of the batches): the warm-up may not be over within the runs. Make the runs longer before trusting these figures.";

/** The warm-up estimate of one scenario as shown, or null when the scenario has none. */
function warmupView(
  sr: StudyOutcome["results"]["scenarios"][number],
  index: number,
  unit: string,
  measureOf: (scenario: string, name: string) => Measure,
): WarmupView | null {
  const est = sr.warmup_estimate;
  if (!isRecord(est)) return null;
  const measure = String(est.measure ?? "");
  const time = numOrNull(est.time);
  const d = numOrNull(est.d);
  const batches = numOrNull(est.batches);
  const method = String(est.method ?? "mser-5").toUpperCase();
  const id = anchor("warmup", index, sr.name);
  const facts: Fact[] = [
    { label: "Method", value: method },
    { label: "Measure", value: measure },
  ];

  if (Array.isArray(est.slice_means)) {
    const means = (est.slice_means as unknown[]).map(numOrNull);
    const slice = numOrNull(est.slice);
    const start = sr.runs.length > 0 ? Math.min(...sr.runs.map((r) => r.start)) : 0;
    const m = means.length;
    const w = welchWindow(m);
    const ok = slice !== null && means.every((x): x is number => x !== null);
    facts.push(
      { label: "Slice width", value: `${fmt(slice)} ${unit}` },
      { label: "Slices (m)", value: fmt(m) },
      { label: "Batches of 5 slices", value: fmt(batches) },
      { label: "Batches dropped (d)", value: fmt(d) },
      { label: "Warm-up", value: `${fmt(time)} ${unit}` },
      { label: "Moving average", value: w > 0 ? `w = ${w} (${2 * w + 1} slices)` : "none (fewer than 4 slices)" },
    );
    let chart: Chart | null = null;
    if (ok && m > 0) {
      const ys = means as number[];
      const mid = (j: number) => start + (j + 0.5) * (slice as number);
      const smoothed = welchMovingAverage(ys, w).map((mean, j) => ({ time: mid(j), mean }));
      let kind: Measure["kind"] = "level";
      try { kind = measureOf(sr.name, measure).kind; } catch { /* the estimate names a measure the study lacks: keep the level wording */ }
      chart = {
        id: `${id}-chart`,
        caption: `Warm-up plot of ${measure} in ${sr.name}: the average over the ${sr.runs.length} runs of each ${fmt(slice)}-${unit} slice, drawn at the slice's midpoint (thin line)` +
          (w > 0 ? `, its moving average over ${2 * w + 1} slices (w = ${w}, thick line)` : "") +
          `, and the warm-up MSER-5 chose, ${fmt(time)} ${unit} (dashed rule).` +
          (m > MAX_WELCH_POINTS ? ` The lines are drawn from an even sample of ${MAX_WELCH_POINTS} of the ${fmt(m)} slices.` : ""),
        spec: welchChart({
          slices: ys.map((mean, j) => ({ time: mid(j), mean })),
          smoothed,
          warmup: time,
          timeTitle: `time (${unit})`,
          valueTitle: kind === "utilization" ? `${measure}: slice utilization` : `${measure}: slice average`,
          sliceLabel: "average of the runs per slice",
          smoothLabel: w > 0 ? `moving average (w = ${w})` : "moving average",
          warmupLabel: `warm-up ${fmt(time)} ${unit}`,
        }),
      };
    }
    return {
      id,
      scenario: sr.name,
      lead: `Warm-up ${fmt(time)} ${unit}, chosen by ${method} on ${q(measure)}: the first ${fmt(d)} of ${fmt(batches)} batches of five ${fmt(slice)}-${unit} slices are dropped.`,
      facts,
      chart,
      runs: null,
      warning: est.at_limit === true ? LIMIT_WARNING : null,
    };
  }

  if (Array.isArray(est.runs)) {
    const runs = (est.runs as unknown[]).filter(isRecord);
    facts.push({ label: "Warm-up", value: `${fmt(time)} ${unit}` });
    const table = tableView(
      `${measure} in ${sr.name}: MSER-5 on each run's observations in time order (the scenario's warm-up is the latest first kept observation)`,
      ["Run", "Batches of 5", "Batches dropped d", `First kept observation (${unit})`, "At the limit"],
      runs.map((r) => [
        text(String(r.run ?? "")), text(fmt(numOrNull(r.batches))), text(fmt(numOrNull(r.d))), text(fmt(numOrNull(r.time))),
        text(r.at_limit === true ? "yes" : "no"),
      ]),
    );
    return {
      id,
      scenario: sr.name,
      lead: `Warm-up ${fmt(time)} ${unit}, chosen by ${method} on the observations of ${q(measure)}, run by run: the latest time at which a run's kept observations begin.`,
      facts,
      chart: null,
      runs: table,
      warning: runs.some((r) => r.at_limit === true) ? LIMIT_WARNING : null,
    };
  }

  facts.push({ label: "Batches dropped (d)", value: `${fmt(d)} of ${fmt(batches)}` }, { label: "Warm-up", value: `${fmt(time)} ${unit}` });
  return {
    id,
    scenario: sr.name,
    lead: `Warm-up ${fmt(time)} ${unit}, chosen by ${method} on ${q(measure)}.`,
    facts,
    chart: null,
    runs: null,
    warning: est.at_limit === true ? LIMIT_WARNING : null,
  };
}

/** The empirical distribution chart of an observation measure, or null without samples. */
function ecdfView(
  name: string,
  m: Measure,
  samples: StudyOutcome["samples"],
  scenarios: string[],
  study: Study,
  unit: string,
): Omit<Chart, "id"> | null {
  const rows = samples.flatMap((s) => ecdfSteps(s.values).map((p) => ({ scenario: s.scenario, value: p.value, share: p.share })));
  if (rows.length === 0) return null;
  const within = [...new Set(study.scenarios.flatMap((sc) => sc.measures)
    .filter((x): x is Extract<Measure, { kind: "observation" }> => x.name === name && x.kind === "observation")
    .flatMap((x) => x.within))].sort((a, b) => a - b);
  const entities = m.kind === "observation" && m.source.type === "entities";
  const sampled = samples.filter((s) => s.values.length < s.total);
  const thinned = samples.some((s) => s.values.length > MAX_ECDF_POINTS);
  const caption = [
    `${name}: share of the observations at or below each value (empirical distribution), all runs of each scenario pooled` +
      (entities ? `, values in ${unit}` : "") + ".",
    within.length > 0
      ? `Dashed rules mark the ${within.length === 1 ? "threshold" : "thresholds"} ${within.map((x) => fmt(x)).join(", ")}; the table of further figures gives the mean of the per-run shares within ${within.length === 1 ? "it" : "them"}, which can differ from the pooled share read here.`
      : "",
    ...sampled.map((s) => `${s.scenario}: drawn from a strided sample of ${fmt(s.values.length)} of the ${fmt(s.total)} observations.`),
    thinned ? `Each line has at most ${MAX_ECDF_POINTS} steps, at evenly spaced ranks.` : "",
    "The statistics use every observation.",
  ].filter((x) => x !== "").join(" ");
  return {
    caption,
    spec: ecdfChart({
      rows,
      scenarios: scenarios.filter((sc) => samples.some((s) => s.scenario === sc && s.values.length > 0)),
      thresholds: within.map((x) => ({ value: x, label: `≤ ${fmt(x)}` })),
      valueTitle: entities ? `${name} (${unit})` : `${name} (observed value)`,
      shareTitle: "share of observations ≤ value",
    }),
  };
}

/** The time-at-value bar chart of a level or utilization, or null when no run has the figures. */
function timeAtValueView(
  name: string,
  kind: "level" | "utilization",
  scenarios: StudyOutcome["results"]["scenarios"],
  unit: string,
): Omit<Chart, "id"> | null {
  const rows: { scenario: string; value: number; share: number }[] = [];
  const partial: string[] = [];
  const used: string[] = [];
  for (const sr of scenarios) {
    const lists = sr.runs.map((r) => r.measures[name]?.time_at_value).filter((x): x is unknown[] => Array.isArray(x));
    if (lists.length === 0) continue;
    used.push(sr.name);
    if (lists.length < sr.runs.length) partial.push(`${sr.name}: ${lists.length} of ${sr.runs.length} runs`);
    const byValue = new Map<number, number[]>();
    for (const list of lists) for (const e of list) {
      if (!isRecord(e)) continue;
      const v = numOrNull(e.value);
      const share = numOrNull(e.share);
      if (v === null || share === null) continue;
      byValue.set(v, [...(byValue.get(v) ?? []), share]);
    }
    for (const v of [...byValue.keys()].sort((a, b) => a - b)) {
      rows.push({ scenario: sr.name, value: v, share: fsum(byValue.get(v) as number[]) / lists.length });
    }
  }
  if (rows.length === 0) return null;
  return {
    caption: `${name}: share of the window's time spent at each ${kind === "utilization" ? "number of busy units" : "value"} (time at the value ÷ window length, both in ${unit}), ` +
      "averaged over the runs of each scenario; a run that never took a value counts as 0 for it." +
      (partial.length > 0 ? ` Only the runs with a time-at-value table are averaged (${partial.join("; ")}).` : "") +
      " Each run's own shares are in its time-at-value table in the appendix.",
    spec: timeAtValueChart(rows, used, kind === "utilization" ? `${name}: busy units` : `${name}: level`, "share of time"),
  };
}

interface CheckRecord {
  check: string;
  run: string;
  measure: string;
  passed: boolean;
  message: string;
  applies?: unknown;
}

function checksOf(sr: StudyOutcome["results"]["scenarios"][number]): CheckRecord[] {
  if (!Array.isArray(sr.checks)) return [];
  return (sr.checks as unknown[]).filter((c): c is CheckRecord =>
    isRecord(c) && typeof c.check === "string" && typeof c.passed === "boolean" && typeof c.message === "string");
}

const CHECK_LABELS: Record<string, string> = {
  "littles-law": "Little's law (L = λ·W)",
  conservation: "conservation (at start + entered − left = at end)",
  "utilization-range": "utilization within [0, 1]",
  "level-non-negative": "number inside never negative",
};

function checksTable(scenarios: StudyOutcome["results"]["scenarios"]): { intro: string; table: TableView } | null {
  const rows: Cell[][] = [];
  let failed = 0;
  let total = 0;
  for (const sr of scenarios) for (const c of checksOf(sr)) {
    total++;
    if (!c.passed) failed++;
    const result: Cell = c.passed ? text(c.applies === false ? "passed (not an identity here)" : "passed") : { ...text("FAILED"), flag: true };
    rows.push([text(sr.name), text(String(c.run ?? "")), text(String(c.measure ?? "")), text(CHECK_LABELS[c.check] ?? c.check), result, text(roundNumbersIn(c.message))]);
  }
  if (rows.length === 0) return null;
  return {
    intro: `Identities the run data must satisfy, checked run by run: ${fmt(total - failed)} of ${fmt(total)} passed` +
      (failed > 0 ? `, ${fmt(failed)} failed (each failed check is also listed among the warnings).` : ".") +
      " Little's law is an exact identity only when the system is empty at both ends of the window; otherwise its two sides are shown for comparison.",
    table: tableView("Consistency checks by scenario and run", ["Scenario", "Run", "Measure", "Check", "Result", "Details"], rows),
  };
}

function batchValuesView(
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
      const b = r.measures[name]?.batch_means;
      if (!isRecord(b)) continue;
      const values = Array.isArray(b.batch_values) ? (b.batch_values as unknown[]).map(numOrNull) : [];
      rows.push([text(r.id), text(fmt(numOrNull(b.batches))), text(fmt(numOrNull(b.lag1))), text(values.length > 0 ? values.map((v) => fmt(v)).join(", ") : MISSING)]);
    }
    items.push({ id, table: tableView(`${name} — ${sr.name}: each run's batch means in time order`, ["Run", "Batches", "Lag-1 correlation", "Batch means Z₁, Z₂, …"], rows) });
  }
  if (items.length === 0) return null;
  return {
    intro: "The batch means behind each batch-means interval, in time order. A trend or long runs of values above or below the mean are what a large lag-1 correlation measures.",
    items,
  };
}

/** A run's level over time: caption and chart (the level, or busy against capacity for a utilization). */
function traceView(name: string, kind: Measure["kind"], scenario: string, tr: LevelTrace, unit: string): { caption: string; spec: TopLevelSpec } {
  const band = tracedAsBand(tr);
  const util = kind === "utilization";
  const shape = band
    ? `the ${util ? "busy level and the capacity" : "level"} as a band from the lowest to the highest value in each of ${tr.level.slices.length} equal slices of the window, with each slice's time average as a line (the run has too many changes to draw one by one; every row counts in the numbers)`
    : util ? "the busy level (area under it shaded) and the capacity" : "the level (area under it shaded)";
  const average = util
    ? `the running utilization from ${fmt(tr.from)} ${unit} (busy area over capacity area so far, right axis)`
    : `the running time average from ${fmt(tr.from)} ${unit} (area so far over elapsed time)`;
  const caption = `${name} over time in run ${tr.run} of ${scenario}: ${shape}, and ${average}` +
    (tr.from > tr.start ? `; the warm-up up to ${fmt(tr.from)} ${unit} is the grey band` : "") + ".";
  const spec = traceChart({
    start: tr.start, from: tr.from, to: tr.to, warmup: tr.warmup, level: tr.level, capacity: tr.capacity,
    timeTitle: `time (${unit})`,
    valueTitle: util ? `${name}: units busy and available` : `${name}: level`,
    levelLabel: util ? "busy" : "level",
    capacityLabel: "capacity",
    averageLabel: util ? "running utilization" : "running time average",
    averageTitle: util ? `${name}: running utilization` : null,
    warmupLabel: "warm-up",
  });
  return { caption, spec };
}
