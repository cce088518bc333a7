/**
 * The normalized study: what the rest of Sojourn trusts.
 *
 * The manifest reader (`src/manifest/`) turns what the user wrote (`unknown` fields) into these
 * strict types once, at the edge, with every default filled in. Nothing after the edge re-checks.
 */
import type { Place } from "../messages/error.js";

/** Names of the four contract columns in the run files. */
export interface ColumnMap {
  time: string;
  series: string;
  value: string;
  entity: string;
}

/**
 * How a run file's rows are laid out (contract section 9): one event per row, one entity (or one
 * visit) per row with a time column per event, or one instant per row with a column per level.
 */
export type Layout = "events" | "entities" | "levels";

/**
 * A measure's `where`: only rows whose attribute column holds one of the values count. Each value
 * is kept as written: a number (matches a cell that reads as the same number) or a text (matches
 * a cell with the same text, surrounding spaces ignored). Several columns: all must match.
 */
export type WhereFilter = { column: string; values: (number | string)[] }[];

/** One run file of one scenario. */
export interface RunRef {
  /** File name without its extensions (`rep-07.csv.gz` -> `rep-07`). */
  id: string;
  /** Absolute path, used to open the file. Never written to results. */
  path: string;
  /** Path relative to the manifest's folder with `/` separators; this is what results show. */
  file: string;
  /** Start of the collection window (default 0). */
  start: number;
  /** End of the collection window; null when neither the scenario nor the run gives one. */
  end: number | null;
}

/** Where a level's value comes from. */
export type LevelSource =
  | { type: "series"; series: string }
  | { type: "entities"; enter: string; leave: string };

/** Where an observation's values come from. */
export type ObservationSource =
  | { type: "series"; series: string }
  | { type: "entities"; start: string; end: string };

export type Capacity = { type: "constant"; value: number } | { type: "series"; series: string; initial: number };

/** Extra per-run figures of issue 8 (quantiles, shares). Empty arrays mean "none asked". */
export interface LevelExtras {
  /** Thresholds k for the share of time with level >= k. */
  atLeast: number[];
}
export interface ObservationExtras {
  /** Probabilities p for type-7 quantiles. */
  quantiles: number[];
  /** Thresholds x for the fraction of observations <= x. */
  within: number[];
}

/** Target precision for the runs-needed figure (issue 4). */
export type Target = { type: "half_width"; value: number } | { type: "relative"; value: number };

interface MeasureBase {
  name: string;
  target: Target | null;
  /** What the report shows instead of `name`: the manifest's `label`, else the name itself. */
  label: string;
  /**
   * The unit of the measure's primary value and its spread (free text), the same in every
   * scenario: the manifest's `unit`, else the default of docs/manifest.md (an observation
   * `from: {start, end}` is a duration in the study's time unit; a utilization is a "fraction";
   * any other measure has none, null). A count's rate is this unit per time unit.
   */
  unit: string | null;
  /** The measure's `where`, or null: it filters the rows of the measure's own series (not a capacity series). */
  where: WhereFilter | null;
}

export interface LevelMeasure extends MeasureBase, LevelExtras {
  kind: "level";
  source: LevelSource;
  /** Level before the first row (default 0). */
  initial: number;
}

export interface UtilizationMeasure extends MeasureBase, LevelExtras {
  kind: "utilization";
  /** The busy level: a series' values, or the number of entities between two events. */
  source: LevelSource;
  initial: number;
  capacity: Capacity;
}

export interface ObservationMeasure extends MeasureBase, ObservationExtras {
  kind: "observation";
  source: ObservationSource;
}

export interface CountMeasure extends MeasureBase {
  kind: "count";
  series: string;
}

export type Measure = LevelMeasure | UtilizationMeasure | ObservationMeasure | CountMeasure;
export type MeasureKind = Measure["kind"];

/** How the warm-up is set for a scenario. */
export type Warmup =
  | { type: "none" }
  | { type: "fixed"; time: number }
  | { type: "mser-5"; measure: string; slice: number };

/** Steady-state analysis inside each run (issue 4). */
export type Analysis = { type: "replications" } | { type: "batch-means"; batches: number };

export interface Scenario {
  name: string;
  runs: RunRef[];
  /** The study's measures with this scenario's overrides applied, in manifest order. */
  measures: Measure[];
  warmup: Warmup;
  analysis: Analysis;
  columns: ColumnMap;
  /** How the run files are laid out (the scenario's `layout`, else the study's, else `events`). */
  layout: Layout;
  /** The longest row of a run file, in bytes (`max_row_bytes`; the scenario's, else the study's, else 1 MiB). */
  maxRowBytes: number;
  /**
   * The scenario's value of each of the study's factors, in the order of `Study.factors` (every
   * scenario has all of them, or the study has none).
   */
  factors: FactorValue[];
}

/** One factor's value in one scenario: a finite number. */
export interface FactorValue {
  name: string;
  value: number;
}

export interface Comparison {
  measure: string;
  a: string;
  b: string;
  method: "paired" | "welch";
}

/**
 * A selection of the best scenario (issue 17), every default filled in: the scenarios in the
 * order written (all the study's, in manifest order, when none are named); n0 ≤ the runs of each.
 */
export interface Selection {
  measure: string;
  better: "larger" | "smaller";
  /** The indifference amount δ > 0, in the measure's unit. */
  delta: number;
  /** The probability of correct selection P*, 1/k < P* < 1. */
  pcs: number;
  method: "independent" | "paired";
  /** n0 ≥ 2: the first n0 runs of each scenario, in manifest order, are the first stage. */
  firstStage: number;
  scenarios: string[];
}

/** Options for the calculation tables written under DIR/tables. */
export interface TableOptions {
  /** Tables with at most this many rows are written in full. */
  maxRows: number;
  /** Rows kept at the head and at the tail of a shortened table. */
  edgeRows: number;
}

/** Where a measure's series are named in the manifest, and whether they may be absent. */
export interface MeasureSource {
  /** The `series` or `from` key of the measure's definition (its mapping when neither). */
  place: Place;
  /** `may_be_absent: true`: a series that appears in none of a scenario's runs is not an error. */
  mayBeAbsent: boolean;
}

export interface Study {
  /** Absolute path of the manifest file. */
  manifestPath: string;
  /** The manifest's text exactly as read. */
  manifestText: string;
  title: string;
  timeUnit: string;
  confidence: number;
  /** The study-wide warm-up as written (scenarios may override it). */
  warmup: Warmup;
  scenarios: Scenario[];
  /** Measure names in manifest order (every scenario has all of them). */
  measureNames: string[];
  /** Per measure name: where its series are named (for messages about the run files). */
  measureSources: ReadonlyMap<string, MeasureSource>;
  comparisons: Comparison[];
  /** The manifest's `select:` entries, in order; empty without them. */
  selections: Selection[];
  tables: TableOptions;
  /** The factor names of the scenarios' `factors`, in the order the first scenario writes them; empty without factors. */
  factors: string[];
}
