import type { Selection, Study } from "../manifest/types.js";
import type { BuiltTable, Cell } from "../measures/table.js";
import type { Results, Warning } from "../outcome/index.js";
import { selectBest, selectionProblem } from "../stats/selectBest.js";
import type { ScenarioSample, SelectionInput, SelectionResult } from "../stats/selection.js";
import { selectionNotMade } from "../messages/warnings.js";
import { safeName, type TableFile, tableFile } from "./tables.js";

/**
 * Selecting the best scenario (issue 17), one `select:` entry at a time:
 *
 *   select: entry ──▶ per named scenario: each run's primary value of the measure, in the order
 *   the manifest lists the runs (runs without a value left out) ──▶ selectionProblem: null, or
 *   why no selection can be computed (then a warning, and no entry) ──▶ selectBest: N_i from the
 *   first n0 runs; with N_i runs present, the selection, the comparisons with the best; the subset
 *
 * The values are the ones each scenario's across-run interval summarises (also with
 * `analysis: batch-means`: one value per run), so the selection's means are results.json's.
 */
export function selectionInput(results: Results, selection: Selection): SelectionInput {
  const samples: ScenarioSample[] = selection.scenarios.map((name) => {
    const runs = results.scenarios.find((s) => s.name === name)!.runs;
    const values: { run: string; value: number }[] = [];
    for (const r of runs) {
      const v = r.measures[selection.measure]?.value;
      if (typeof v === "number") values.push({ run: r.id, value: v });
    }
    return { scenario: name, runs: values };
  });
  return { better: selection.better, method: selection.method, delta: selection.delta, pcs: selection.pcs, firstStage: selection.firstStage, samples };
}

/** The selections the study asks for, in manifest order, and a warning for each that cannot be made. */
export function selectScenarios(study: Study, results: Results): { selections: { index: number; measure: string; result: SelectionResult }[]; warnings: Warning[] } {
  const selections: { index: number; measure: string; result: SelectionResult }[] = [];
  const warnings: Warning[] = [];
  study.selections.forEach((s, index) => {
    const input = selectionInput(results, s);
    const problem = selectionProblem(input);
    if (problem !== null) warnings.push({ scenario: null, run: null, measure: s.measure, message: selectionNotMade(index, s.measure, problem) });
    else selections.push({ index, measure: s.measure, result: selectBest(input) });
  });
  return { selections, warnings };
}

/**
 * `tables/selections.best/<n>-<measure>.csv`, n the entry's 1-based position among the
 * manifest's `select:` entries (two selections may share a measure). The folder's name holds a
 * `.`, which no scenario's folder (`safeName`) ever does, so the two never meet.
 */
export function selectionTablePath(index: number, measure: string): string {
  return `tables/selections.best/${index + 1}-${safeName(measure)}.csv`;
}

export const SELECTION_COLUMNS = [
  "scenario",
  "first_stage_runs",
  "first_stage_mean",
  "first_stage_variance",
  "first_stage_sd",
  "runs_needed",
  "runs_present",
  "runs_missing",
  "mean",
  "mcb_lower",
  "mcb_upper",
  "ruled_out",
  "in_subset",
];

/**
 * A selection as a table: one row per scenario, in the manifest's order, with its first-stage
 * figures, the runs it needs, its mean over those runs, its interval of the multiple comparisons
 * with the best, and whether it is ruled out and in the subset. The cells of a selection not yet
 * made (runs missing) are empty.
 */
export function selectionTable(result: SelectionResult): BuiltTable {
  const rows: Cell[][] = result.scenarios.map((s) => {
    const c = result.comparisons_with_best?.find((b) => b.scenario === s.scenario) ?? null;
    return [
      s.scenario,
      s.first_stage_runs,
      s.first_stage_mean,
      s.first_stage_variance,
      s.first_stage_sd,
      s.runs_needed,
      s.runs_present,
      s.runs_missing,
      s.mean,
      c?.lower ?? null,
      c?.upper ?? null,
      c === null ? null : String(c.ruled_out),
      String(result.subset.includes(s.scenario)),
    ];
  });
  return { columns: SELECTION_COLUMNS, rowsTotal: rows.length, rows, shortened: false };
}

/** The table file of a selection, indexed like every calculation table (kind "selection"). */
export function selectionTableFile(index: number, measure: string, result: SelectionResult): TableFile {
  const f = tableFile({ scenario: "", run: null, measure, kind: "selection" }, selectionTablePath(index, measure), selectionTable(result));
  return { csv: f.csv, record: { ...f.record, selection: { index } } };
}
