/**
 * The shapes of a selection of the best scenario (issue 17): what goes in, and every step that
 * comes out, for results.json, the calculation tables and the report's appendix.
 *
 * The procedures that fill these shapes live beside this file (selectBest.ts and its helpers);
 * the study (src/study/) gathers the run values and the report shows the steps.
 */
import type { EquicoordinatePoint } from "./equicoordinate.js";
import type { RinottConstant } from "./rinott.js";
import type { SpreadSteps } from "./spread.js";

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
  /**
   * n0 and the first-stage mean, sample variance (n0 − 1 divisor) and standard deviation, as
   * measured (not turned for `smaller`). Both methods fill them; only the independent method
   * plans from the variance (the paired method plans from `pooled_variance`).
   */
  first_stage_runs: number;
  first_stage_mean: number;
  first_stage_variance: number;
  first_stage_sd: number;
  /** N_i, the runs the scenario needs in all (first stage included). */
  runs_needed: number;
  /** The runs the study holds for the scenario. */
  runs_present: number;
  /**
   * The runs still to make: independent, max(0, N_i − runs present); paired, how many of the first
   * N run ids of the pairing order (`steps.paired_runs`, plus the ids not made yet) the scenario
   * lacks, so that a scenario which already has extra runs is not asked for them again.
   */
  runs_missing: number;
  /** The mean over the first N_i runs, when the scenario has them; else null. */
  mean: number | null;
  /**
   * True when (c·S/δ)² asked for more than MAX_RUNS (src/stats/runsNeeded.ts): `runs_needed` is then
   * MAX_RUNS, and the selection at the cap no longer has its guaranteed probability.
   */
  runs_capped: boolean;
}

/** A simultaneous interval for μ_i − (best of the other μ_j), oriented so that positive is better. */
export interface BestComparison {
  scenario: string;
  /** x̄_i − best of the other means, positive when i is better (with `smaller`, the signs are turned). */
  difference: number;
  lower: number;
  upper: number;
  /** True when `upper` = 0 (the interval lies at or below 0): the scenario cannot be the best. */
  ruled_out: boolean;
  /** The scenario's mean over its N_i runs, as measured (not turned for `smaller`). */
  mean: number;
  /** The best of the other scenarios (the first in the manifest's order at a tie) and its mean. */
  best_other: string;
  best_other_mean: number;
}

/** One scenario's arithmetic, for the appendix. */
export interface SelectionScenarioSteps {
  scenario: string;
  /** The run ids of the first stage and their values, in the order used (paired: the first scenario's order). */
  first_stage_runs: string[];
  first_stage_values: number[];
  /** n0, the sum, mean, Σ(x − x̄)², its rounding correction, variance and sd of the first stage (spread.ts). */
  first_stage: SpreadSteps;
  /**
   * (c·S/δ)² before the ceiling: c = h and S = S_i (independent), or c = g and S the pooled sd
   * (paired, the same for every scenario); null when S = 0 (then N_i = n0).
   */
  runs_ratio: number | null;
  /** Paired: the ids among the first N of the pairing order that the scenario lacks; empty for independent. */
  missing_runs: string[];
  /** The exactly rounded sum of the values over the first N_i runs, when the scenario has them. */
  sum: number | null;
}

/** Paired method: the two-way residuals of the first stage and the pooled variance S² (Nelson and Matejcik 1995). */
export interface PooledSteps {
  /** The first stage's run ids (the columns), the first n0 of the first scenario. */
  runs: string[];
  /** X̄_i·, in the scenarios' order; X̄_·j, in the runs' order; X̄_··. */
  scenario_means: number[];
  run_means: number[];
  grand_mean: number;
  /** X_ij − X̄_i· − X̄_·j + X̄_··, one row per scenario, one column per run. */
  residuals: number[][];
  /** The exactly rounded ΣΣ of the residuals squared. */
  sum_squared: number;
  /** (k − 1)(n0 − 1). */
  df: number;
  /** S² = 2·sum_squared / df and S. */
  variance: number;
  sd: number;
}

/** One comparison of the first-stage screening: is i kept against j? */
export interface ScreeningPair {
  scenario: string;
  other: string;
  /** x̄_i − x̄_j on the first stage, turned for `smaller` (positive: i looks better). */
  difference: number;
  /** The variance of the difference of means: S_i²/n0 + S_j²/n0 (independent), S_ij²/n0 (paired, S_ij² of X_i − X_j). */
  variance: number;
  /** W_ij = t·√variance. */
  w: number;
  /** difference ≥ −W_ij. */
  kept: boolean;
}

/** The first-stage screening (Nelson, Swann, Goldsman and Song 2001), for the appendix. */
export interface ScreeningSteps {
  /** `independent`: t at (P*)^(1/(k−1)); `paired`: t at 1 − (1 − P*)/(k − 1) on the differences (Bonferroni). */
  form: SelectionMethod;
  /** The probability of the t quantile, its degrees of freedom n0 − 1, and t. */
  probability: number;
  df: number;
  t: number;
  /** k(k − 1) rows: scenario i against every j ≠ i, in the scenarios' order. */
  pairs: ScreeningPair[];
}

/** Every intermediate number of a selection, so that the appendix can show the arithmetic. */
export interface SelectionSteps {
  /** +1 for `larger`, −1 for `smaller`: the procedures work on sign·x, so that larger is better. */
  sign: 1 | -1;
  scenarios: SelectionScenarioSteps[];
  /** Paired only; null for independent. */
  pooled: PooledSteps | null;
  /**
   * Paired only: the pairing order (the first scenario's run ids, then ids only other scenarios
   * have, in the order first met) cut to its first N; the selection uses these runs. Null for independent.
   */
  paired_runs: string[] | null;
  screening: ScreeningSteps;
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
  /** Σ N_i: the runs the selection uses in all (paired: k·N). */
  total_runs: number;
  /** Every intermediate number, for the appendix. */
  steps: SelectionSteps;
}
