/**
 * The shapes of a selection of the best scenario (issue 17): what goes in, and every step that
 * comes out, for results.json, the calculation tables and the report's appendix.
 *
 * The procedures that fill these shapes live beside this file (selectBest.ts and its helpers);
 * the study (src/study/) gathers the run values and the report shows the steps.
 */
import type { EquicoordinatePoint } from "./equicoordinate.js";
import type { RinottConstant } from "./rinott.js";

/** Which direction of the measure is better. */
export type Better = "larger" | "smaller";

/**
 * How the runs of the scenarios relate: `independent` (each scenario has its own random numbers;
 * Rinott's two-stage procedure) or `paired` (run i of every scenario used the same random
 * numbers, runs matched by id; Nelson and Matejcik's procedure).
 */
export type SelectionMethod = "independent" | "paired";

/** One scenario's run values in run order (the order the manifest lists its runs). */
export interface ScenarioSample {
  scenario: string;
  runs: { run: string; value: number }[];
}

export interface SelectionInput {
  better: Better;
  method: SelectionMethod;
  /** The indifference amount δ > 0, in the measure's unit. */
  delta: number;
  /** The probability of correct selection P*, with 1/k < P* < 1. */
  pcs: number;
  /** n0: the first n0 runs of every scenario are the first stage (n0 ≥ 2). */
  firstStage: number;
  /** Two or more scenarios, in the manifest's order. */
  samples: ScenarioSample[];
}

/** The first-stage figures of one scenario and the runs it needs. */
export interface SelectionScenario {
  scenario: string;
  /** n0 and the first-stage mean, sample variance and standard deviation (independent method). */
  first_stage_runs: number;
  first_stage_mean: number;
  first_stage_variance: number;
  first_stage_sd: number;
  /** N_i, the runs the scenario needs in all (first stage included). */
  runs_needed: number;
  /** The runs the study holds for the scenario. */
  runs_present: number;
  /** max(0, N_i − runs present). */
  runs_missing: number;
  /** The mean over the first N_i runs, when the scenario has them; else null. */
  mean: number | null;
}

/** A simultaneous interval for μ_i − (best of the other μ_j), oriented so that positive is better. */
export interface BestComparison {
  scenario: string;
  /** x̄_i − best of the other means, positive when i is better (with `smaller`, the signs are turned). */
  difference: number;
  lower: number;
  upper: number;
  /** True when the interval lies at or below −0 with `upper` = 0: the scenario is not the best. */
  ruled_out: boolean;
}

export interface SelectionResult {
  input: { better: Better; method: SelectionMethod; delta: number; pcs: number; first_stage: number; k: number };
  /** The procedure's name as published: "Rinott (1978)" or "Nelson and Matejcik (1995)". */
  procedure: string;
  /** The constant and how it was computed: Rinott's h, or the equicoordinate point g. */
  constant: { symbol: "h" | "g"; value: number; steps: RinottConstant | EquicoordinatePoint };
  /** Paired method only: the pooled variance of the differences S² and its degrees of freedom. */
  pooled_variance: number | null;
  pooled_df: number | null;
  scenarios: SelectionScenario[];
  /** True when every scenario has its N_i runs: the selection is made. */
  complete: boolean;
  /** The scenario selected (the best mean over the first N_i runs), or null while runs are missing. */
  selected: string | null;
  /** Multiple comparisons with the best on the selection's runs; null while runs are missing. */
  comparisons_with_best: BestComparison[] | null;
  /** Scenarios that could be best at P* (subset selection on the first stage). */
  subset: string[];
  /** The plain sentence the result supports, for the report's summary. */
  statement: string;
}
