import { sha256 } from "../digest.js";
import type { Comparison, Study } from "../manifest/types.js";
import { type BuiltTable, type Cell, tableToCsv } from "../measures/table.js";
import { bonferroniLevel } from "../stats/compare.js";
import { pairedSteps, type PairedSteps, type SpreadSteps, welchSteps, type WelchSide, type WelchSteps } from "../stats/differenceSteps.js";
import { longRunValues, valuesOf } from "./compare.js";
import type { ComparisonArithmetic, Results } from "../outcome/index.js";
import { meanCorrectionMatters, safeName, type TableFile } from "./tables.js";

/**
 * The arithmetic of every comparison between scenarios, and its calculation table under
 * `tables/<a>/comparisons/`. The values are the ones `compareScenarios` compares (each run's primary
 * value; paired: runs matched by run id), so the tables end with results.json's numbers.
 */

/**
 * `tables/<a>/comparisons/<n>-<measure>-vs-<b>.csv`, under the folder of the comparison's first
 * scenario beside its `runs/` and `intervals/`, n the comparison's 1-based position in
 * results.json's `comparisons`. The position alone makes the name injective; the names (written
 * as `safeName` writes them) are there for the reader. A top-level `tables/comparisons/` could be
 * a scenario's folder (a scenario named "comparisons"); a folder inside a scenario's cannot.
 * Each part stays below 255 bytes (a safe name has at most 100 characters).
 */
export function comparisonTablePath(index: number, measure: string, a: string, b: string): string {
  return `tables/${safeName(a)}/comparisons/${index + 1}-${safeName(measure)}-vs-${safeName(b)}.csv`;
}

export const PAIRED_COLUMNS = ["item", "run", "value_a", "value_b", "difference", "deviation", "squared_deviation"];
export const WELCH_COLUMNS = ["item", "scenario", "run", "value", "deviation", "squared_deviation"];

/** The arithmetic of each comparison the study lists, in order; a method this file does not know gives none. */
export function comparisonArithmetic(study: Study, results: Results): ComparisonArithmetic[] {
  const K = study.comparisons.length;
  if (K === 0) return [];
  const each = bonferroniLevel(study.confidence, K);
  const out: ComparisonArithmetic[] = [];
  study.comparisons.forEach((c, index) => {
    const a = valuesOf(results.scenarios.find((s) => s.name === c.a)!.runs, c.measure);
    const b = valuesOf(results.scenarios.find((s) => s.name === c.b)!.runs, c.measure);
    const base = { index, measure: c.measure, a: c.a, b: c.b, confidence: study.confidence, comparisons: K, confidence_each: each, file: comparisonTablePath(index, c.measure, c.a, c.b) };
    // Two single long runs with batch means are compared on their batch means (Welch), as in
    // compareScenarios; a paired comparison of them has no interval, so no arithmetic either.
    const long = longRunValues(study, results, c);
    const steps = long === null ? stepsOf(c, a, b, each) : c.method === "welch" ? { steps: welchSteps(long.a, long.b, each), unpaired: [] } : null;
    if (steps !== null) out.push({ ...base, method: steps.steps.method, unpaired: steps.unpaired, steps: steps.steps });
  });
  return out;
}

function stepsOf(c: Comparison, a: Map<string, number>, b: Map<string, number>, each: number): Pick<ComparisonArithmetic, "steps" | "unpaired"> | null {
  const list = (m: Map<string, number>) => [...m].map(([run, value]) => ({ run, value }));
  switch (c.method) {
    case "paired": {
      const pairs = [...a].filter(([id]) => b.has(id)).map(([run, va]) => ({ run, a: va, b: b.get(run)! }));
      const unpaired = [
        ...list(a).filter((v) => !b.has(v.run)).map((v) => ({ scenario: c.a, ...v })),
        ...list(b).filter((v) => !a.has(v.run)).map((v) => ({ scenario: c.b, ...v })),
      ];
      return { steps: pairedSteps(pairs, each), unpaired };
    }
    case "welch":
      return { steps: welchSteps(list(a), list(b), each), unpaired: [] };
    default:
      return null;
  }
}

/** The comparison's calculation table: the values, then one row per step (see docs/tables.md). */
export function comparisonTable(c: ComparisonArithmetic): BuiltTable {
  const rows = c.steps.method === "paired" ? pairedRows(c, c.steps) : welchRows(c, c.steps);
  return { columns: c.steps.method === "paired" ? PAIRED_COLUMNS : WELCH_COLUMNS, rowsTotal: rows.length, rows, shortened: false };
}

/** The rows of the confidence level and the interval, common to both methods, as [item, value]. */
function endSteps(c: ComparisonArithmetic, s: PairedSteps | WelchSteps): [string, Cell][] {
  return [
    ["confidence", c.confidence],
    ["comparisons", c.comparisons],
    ["confidence_each", c.confidence_each],
    ["p", s.p],
    ["t", s.t],
    ["half_width", s.half_width],
    ["ci_low", s.ci_low],
    ["ci_high", s.ci_high],
    ...(s.note !== null ? [["note", s.note] as [string, Cell]] : []),
  ];
}

/** sum, mean, sum of squares (and the mean's rounding correction when it matters), variance, sd. */
function spreadRows(s: SpreadSteps): [string, Cell][] {
  return [
    ["sum", s.sum],
    ["mean", s.mean],
    ["sum_squared_deviations", s.sum_squared],
    ...(meanCorrectionMatters(s) ? [["mean_rounding_correction", s.mean_correction] as [string, Cell]] : []),
    ["variance", s.variance],
    ["sd", s.sd],
  ];
}

function pairedRows(c: ComparisonArithmetic, s: PairedSteps): Cell[][] {
  const rows: Cell[][] = [["scenarios", null, c.a, c.b, null, null, null]];
  for (const r of s.rows) rows.push(["pair", r.run, r.a, r.b, r.difference, r.deviation, r.squared]);
  for (const u of c.unpaired) rows.push(["unpaired", u.run, u.scenario === c.a ? u.value : null, u.scenario === c.a ? null : u.value, null, null, null]);
  const step = (item: string, v: Cell): Cell[] => [item, null, null, null, v, null, null];
  rows.push(step("n", s.n));
  for (const [item, v] of spreadRows(s)) rows.push(item === "mean" ? ["mean", null, s.mean_a, s.mean_b, v, null, null] : step(item, v));
  rows.push(step("standard_error", s.standard_error), step("df", s.df));
  for (const [item, v] of endSteps(c, s)) rows.push(step(item, v));
  return rows;
}

function welchRows(c: ComparisonArithmetic, s: WelchSteps): Cell[][] {
  const rows: Cell[][] = [];
  const sides: [string, WelchSide][] = [[c.a, s.a], [c.b, s.b]];
  for (const [name, side] of sides) for (const r of side.rows) rows.push(["run", name, r.run, r.value, r.deviation, r.squared]);
  const step = (item: string, scenario: string | null, v: Cell): Cell[] => [item, scenario, null, v, null, null];
  for (const [name, side] of sides) {
    rows.push(step("n", name, side.n));
    for (const [item, v] of spreadRows(side)) rows.push(step(item, name, v));
    rows.push(step("variance_over_n", name, side.variance_over_n));
  }
  rows.push(
    step("difference", null, s.difference),
    step("standard_error_squared", null, s.standard_error_squared),
    step("standard_error", null, s.standard_error),
    step("share", c.a, s.share_a),
    step("share", c.b, s.share_b),
    step("df_term", c.a, s.df_term_a),
    step("df_term", c.b, s.df_term_b),
    step("df", null, s.df),
  );
  for (const [item, v] of endSteps(c, s)) rows.push(step(item, null, v));
  return rows;
}

/** A comparison's table as a file: its CSV text, digest and index entry (no preview: the page shows `ComparisonArithmetic`). */
export function comparisonTableFile(c: ComparisonArithmetic): TableFile {
  const table = comparisonTable(c);
  const csv = tableToCsv(table);
  return {
    csv,
    record: {
      scenario: c.a,
      run: null,
      measure: c.measure,
      kind: "comparison",
      file: c.file,
      columns: table.columns,
      rows_total: table.rowsTotal,
      rows_written: table.rows.length,
      shortened: false,
      sha256: sha256(csv),
      preview: null,
      comparison: { index: c.index, a: c.a, b: c.b, method: c.method },
    },
  };
}
