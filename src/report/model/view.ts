/**
 * The view types of the report model: what the templates place, every number already text.
 */
import type { TopLevelSpec } from "vega-lite";
import type { SelectionSteps, SelectionView } from "./selections.js";

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

/**
 * A short flag on a summary row, linking to its detail: the precision target missed or not
 * judged, runs left out, runs ending early, warnings. `kind` is the class the page styles it by.
 */
export interface Flag {
  kind: "target-missed" | "target-unknown" | "left-out" | "ends-early" | "warnings";
  text: string;
  href: string;
}

/** One sentence of the opening "In brief" block, with an optional link after it to where it is shown. */
export interface BriefSentence {
  text: string;
  href: string | null;
  linkText: string | null;
}

export interface SummaryRow {
  /** The measure's label (what the client reads), and its unit in words or null. */
  measure: string;
  unit: string | null;
  /** The measure's name in the manifest and results.json. */
  key: string;
  measureHref: string;
  /** Rows of the measure's block; set on its first row only (0 elsewhere). */
  measureRows: number;
  scenario: string;
  mean: Cell;
  halfWidth: Cell;
  interval: Cell;
  runs: string;
  relative: Cell;
  /** What the interval is made from (batch means) or why there is none; links to its values when it has them. */
  note: Cell | null;
  /** "method": the note says what the interval is made from; "missing": why there is no interval. */
  noteKind: "method" | "missing" | null;
  /** What the row rests on that a reader should know, each linking to its detail. */
  flags: Flag[];
}

export interface Chart {
  id: string;
  caption: string;
  spec: TopLevelSpec;
}

/** A plain table of text cells; a cell with `href` links to where it comes from. */
export interface TableView {
  /** The anchor of the table, when something links to it. */
  id?: string;
  caption: string;
  columns: string[];
  /** Per column: true when every cell is a number as shown (or missing). */
  numeric: boolean[];
  rows: Cell[][];
  /** Anchors of the rows, one per row (a link elsewhere on the page leads back to the row); absent when no row has one. */
  rowIds?: string[];
}

export const NUMERIC = /^(—|-?[0-9][0-9.e-]*( %)?|\[[^\]]*\])$/;

/** A table view with its numeric columns marked. */
export function tableView(caption: string, columns: string[], rows: Cell[][]): TableView {
  const numeric = columns.map((_, j) => rows.length > 0 && rows.every((r) => NUMERIC.test(r[j]?.text ?? "")));
  const short = columns.map((_, j) => !numeric[j] && rows.length > 0 && rows.every((r) => (r[j]?.text ?? "").length <= SHORT_LABEL));
  return {
    caption, columns, numeric,
    rows: rows.map((r) => r.map((c, j) => (numeric[j] ? { ...c, num: true } : short[j] ? { ...c, nowrap: true } : c))),
  };
}

/** Longest label kept on one line in a table column. */
export const SHORT_LABEL = 16;

export interface MeasureSection {
  id: string;
  /** The measure's label; `key` is its name in the manifest and in results.json (for the reviewer). */
  name: string;
  key: string;
  unit: string | null;
  kind: string;
  statement: string;
  charts: Chart[];
  runs: TableView;
  extras: TableView | null;
  batchMeans: TableView | null;
  runsNeeded: TableView | null;
  /** The points of the measure's response curves (results.json `response_curves`); absent without them. */
  curves?: TableView;
}

export interface MethodNote {
  id: string;
  term: string;
  formula: string;
  text: string;
  source: string;
}

export interface WarningLine {
  id: string;
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
  /**
   * The line that closes a run's level or utilization table: the division that gives the run's
   * value ("busy area 1302 ÷ capacity area 1561"), the value linked to where the run value is used,
   * and what it is; null for the other tables.
   */
  closing: { text: string; value: Cell; what: string } | null;
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

/** A table of values behind a comparison: a row of cells, or a gap marker for rows not shown. */
export interface ValuesTable {
  caption: string;
  columns: string[];
  rows: { cells: Cell[] | null; gap: string | null }[];
}

/** The arithmetic of one comparison a − b in the appendix, step by step. */
export interface ComparisonBlock {
  id: string;
  /** The comparison's row in the comparisons section. */
  back: string;
  heading: string;
  /** What was compared: a, b, the measure, the method and the values. */
  compared: string;
  /** What the comparison assumes, when results.json says (comparisons of batch means). */
  assumes: string | null;
  values: ValuesTable[];
  /** Runs of one side without a run of the same id on the other (paired), left out; null when none. */
  unpaired: string | null;
  steps: ArithmeticStep[];
  /** Why the interval is missing, when it is. */
  note: string | null;
  /** The comparison's calculation table and its digest, in one sentence. */
  file: string;
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
  summary: { brief: BriefSentence[]; intro: string; rows: SummaryRow[] };
  /** The warm-up estimates (MSER-5) with the warm-up plot; null when no scenario estimated one. */
  warmup: { intro: string; scenarios: WarmupView[] } | null;
  measures: MeasureSection[];
  /** The selections of the best (select:), one item per computed entry; null without select:. */
  selections: { intro: string; items: SelectionView[] } | null;
  /** The comparisons table; `notes` under it say what a comparison was made on, what it assumes, and why one has no arithmetic. */
  comparisons: { intro: string; table: TableView; notes: string[] } | null;
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
    /** The arithmetic of each comparison that has one; null when the study compares no scenarios. */
    comparisons: { intro: string; blocks: ComparisonBlock[] } | null;
    /** The arithmetic of each selection of the best; null when there is none. */
    selections: { intro: string; blocks: SelectionSteps[] } | null;
    /** Consistency checks of the run data, one row per check and run; null when there are none. */
    checks: { intro: string; table: TableView } | null;
    /** The batch means of every run, per measure; null without batch means. */
    batchValues: { intro: string; items: { id: string; table: TableView }[] } | null;
  };
}
