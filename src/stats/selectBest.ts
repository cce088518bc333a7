import { capped, needsRuns, problem, selected } from "../messages/selectBest.js";
import { equicoordinateT } from "./equicoordinate.js";
import { fsum } from "./fsum.js";
import { rinottH } from "./rinott.js";
import { MAX_RUNS } from "./runsNeeded.js";
import type {
  BestComparison,
  PooledSteps,
  ScreeningPair,
  ScreeningSteps,
  SelectionInput,
  SelectionResult,
  SelectionScenario,
  SelectionScenarioSteps,
} from "./selection.js";
import { spread, spreadSteps } from "./spread.js";
import { tQuantile } from "./tQuantile.js";

/**
 * What is wrong with a selection's input, as one message (src/messages/selectBest.ts), or null
 * when `selectBest` can run on it. The checks, in this order: k ≥ 2 scenarios; `better` and
 * `method` known; n0 a whole number ≥ 2; δ > 0 and finite; 1/k < P* < 1; no scenario named
 * twice; every scenario has at least n0 runs; every value finite; and for `paired`, no run id
 * twice in a scenario and every other scenario has each of the first n0 run ids of the FIRST
 * scenario (the first stage is those ids, in the first scenario's order, in every scenario).
 */
export function selectionProblem(input: SelectionInput): string | null {
  const { samples, firstStage: n0, delta, pcs } = input;
  const k = samples.length;
  if (k < 2) return problem.tooFewScenarios(k);
  if (input.better !== "larger" && input.better !== "smaller") return problem.better(input.better);
  if (input.method !== "independent" && input.method !== "paired") return problem.method(input.method);
  if (!(Number.isInteger(n0) && n0 >= 2)) return problem.firstStage(n0);
  if (!(delta > 0 && Number.isFinite(delta))) return problem.delta(delta);
  if (!(pcs > 1 / k && pcs < 1)) return problem.pcs(pcs, k);
  const names = new Set<string>();
  for (const s of samples) {
    if (names.has(s.scenario)) return problem.duplicateScenario(s.scenario);
    names.add(s.scenario);
  }
  for (const s of samples) if (s.runs.length < n0) return problem.fewRuns(s.scenario, s.runs.length, n0);
  for (const s of samples) for (const r of s.runs) if (!Number.isFinite(r.value)) return problem.notFinite(s.scenario, r.run, r.value);
  if (input.method === "paired") {
    for (const s of samples) {
      const seen = new Set<string>();
      for (const r of s.runs) {
        if (seen.has(r.run)) return problem.duplicateRun(s.scenario, r.run);
        seen.add(r.run);
      }
    }
    const first = samples[0];
    for (const s of samples.slice(1)) {
      const ids = new Set(s.runs.map((r) => r.run));
      for (const r of first.runs.slice(0, n0)) if (!ids.has(r.run)) return problem.unpairedRun(s.scenario, r.run, first.scenario, n0);
    }
  }
  return null;
}

/** N = max(n0, ⌈ratio⌉), ratio = (c·S/δ)², capped at MAX_RUNS; ratio null when S = 0. */
function runsFor(c: number, sd: number, delta: number, n0: number): { ratio: number | null; runs: number; capped: boolean } {
  if (sd === 0) return { ratio: null, runs: n0, capped: false };
  const ratio = ((c * sd) / delta) ** 2;
  if (!(ratio <= MAX_RUNS)) return { ratio, runs: Math.max(n0, MAX_RUNS), capped: true };
  return { ratio, runs: Math.max(n0, Math.ceil(ratio)), capped: false };
}

/** The index of the largest value, the first at a tie. */
function argmax(values: readonly number[], skip = -1): number {
  let best = -1;
  for (let i = 0; i < values.length; i++) if (i !== skip && (best < 0 || values[i] > values[best])) best = i;
  return best;
}

/**
 * The pairing order of the paired method: the first scenario's run ids in its order, then the ids
 * only later scenarios have, in the order first met.
 */
function pairingOrder(input: SelectionInput): string[] {
  const order: string[] = [];
  const seen = new Set<string>();
  for (const s of input.samples) {
    for (const r of s.runs) {
      if (!seen.has(r.run)) {
        seen.add(r.run);
        order.push(r.run);
      }
    }
  }
  return order;
}

/**
 * Nelson and Matejcik's pooled variance of the first stage: with X_ij the value of scenario i in
 * run j (j over the first stage's ids), S² = 2·ΣΣ(X_ij − X̄_i· − X̄_·j + X̄_··)² / ((k − 1)(n0 − 1)),
 * every sum exactly rounded (`fsum`).
 */
function pooledSteps(values: number[][], runs: string[]): PooledSteps {
  const k = values.length;
  const n0 = runs.length;
  const scenarioMeans = values.map((row) => fsum(row) / n0);
  const runMeans = runs.map((_, j) => fsum(values.map((row) => row[j])) / k);
  const grandMean = fsum(values.flat()) / (k * n0);
  const residuals = values.map((row, i) => row.map((x, j) => x - scenarioMeans[i] - runMeans[j] + grandMean));
  const sumSquared = fsum(residuals.flat().map((r) => r * r));
  const df = (k - 1) * (n0 - 1);
  const variance = (2 * sumSquared) / df;
  return { runs, scenario_means: scenarioMeans, run_means: runMeans, grand_mean: grandMean, residuals, sum_squared: sumSquared, df, variance, sd: Math.sqrt(variance) };
}

/**
 * The first-stage screening of Nelson, Swann, Goldsman and Song (2001), on sign·x: keep i when
 * x̄_i ≥ x̄_j − W_ij for every j ≠ i. Independent: W_ij = t·√(S_i²/n0 + S_j²/n0) with t the t
 * quantile at (P*)^(1/(k−1)) with n0 − 1 degrees of freedom (their screening without an
 * indifference amount). Paired: W_ij = t·S_ij/√n0 with S_ij² the sample variance of X_i − X_j
 * over the first stage and t at 1 − (1 − P*)/(k − 1) with n0 − 1 degrees of freedom: each of the
 * best's k − 1 paired-t comparisons fails with probability at most (1 − P*)/(k − 1), so by
 * Bonferroni's inequality the best is kept with probability at least P* whatever the correlation.
 */
function screening(input: SelectionInput, sign: 1 | -1, firstValues: number[][]): ScreeningSteps {
  const k = firstValues.length;
  const n0 = input.firstStage;
  const paired = input.method === "paired";
  const probability = paired ? 1 - (1 - input.pcs) / (k - 1) : input.pcs ** (1 / (k - 1));
  const df = n0 - 1;
  const t = tQuantile(probability, df);
  const stats = firstValues.map((v) => spread(v));
  const pairs: ScreeningPair[] = [];
  for (let i = 0; i < k; i++) {
    for (let j = 0; j < k; j++) {
      if (i === j) continue;
      const variance = paired
        ? (spread(firstValues[i].map((x, r) => x - firstValues[j][r])).variance as number) / n0
        : (stats[i].variance as number) / n0 + (stats[j].variance as number) / n0;
      const difference = sign * ((stats[i].mean as number) - (stats[j].mean as number));
      const w = t * Math.sqrt(variance);
      pairs.push({ scenario: input.samples[i].scenario, other: input.samples[j].scenario, difference, variance, w, kept: difference >= -w });
    }
  }
  return { form: input.method, probability, df, t, pairs };
}

/**
 * Selects the best of k simulated scenarios with a guaranteed probability of correct selection,
 * in two stages, and gives the multiple comparisons with the best and a first-stage subset.
 *
 * `independent` — Rinott's (1978) procedure, for scenarios simulated with their own random
 * numbers, normal means and unknown, unequal variances. With h = `rinottH(k, n0, P*)` and S_i²
 * the sample variance (n0 − 1 divisor) of scenario i's first n0 runs, scenario i needs
 * N_i = max(n0, ⌈(h·S_i/δ)²⌉) runs in all (N_i = n0 when S_i = 0); once every scenario has them,
 * the best mean over its first N_i runs is selected.
 *
 * `paired` — Nelson and Matejcik's (1995) procedure NM, for scenarios simulated with common
 * random numbers: run j of every scenario used the same random numbers, and runs are matched by
 * id. The first stage is the first n0 runs of the FIRST scenario and the runs with the same ids in
 * every other; with X_ij their values, S² = 2·ΣΣ(X_ij − X̄_i· − X̄_·j + X̄_··)² / ((k − 1)(n0 − 1))
 * and g = `equicoordinateT(k − 1, (k − 1)(n0 − 1), P*)`, every scenario needs
 * N = max(n0, ⌈(g·S/δ)²⌉) paired runs: the first N ids of the pairing order (the first
 * scenario's ids, then ids only others have), in every scenario. It assumes the values are
 * normal with a covariance of sphericity type — Var(X_i − X_l) the same for every pair i ≠ l, as
 * with equal variances and one common correlation — which common random numbers make roughly
 * true; S² estimates that common variance of a difference. Nelson and Matejcik found it robust
 * when sphericity holds only roughly; with no common random numbers, use `independent`.
 *
 * Both: `better: "smaller"` works on −x throughout (means, differences, intervals), so that
 * larger is better; `selected` is the best of the oriented means, the first in input order at a
 * tie. A scenario's N_i above MAX_RUNS (10⁷) is capped at MAX_RUNS, marked `runs_capped`, and
 * the statement says that the probability is then not guaranteed.
 *
 * Once complete, the comparisons with the best: D_i = x̄_i − max_{j≠i} x̄_j over the selection's
 * runs and the interval [−(D_i − δ)⁻, (D_i + δ)⁺] for μ_i − max_{j≠i} μ_j (x⁺ = max(0, x),
 * x⁻ = max(0, −x)); all k hold together with probability at least P* after either procedure's
 * sampling (Matejcik and Nelson 1995; Nelson and Matejcik 1995). `ruled_out`: upper bound 0.
 *
 * Always, on the first stage: the subset of scenarios that could be best (`screening`).
 *
 * References: Y. Rinott (1978), Communications in Statistics — Theory and Methods A7(8), 799–811;
 * B. L. Nelson and F. J. Matejcik (1995), "Using common random numbers for indifference-zone
 * selection and multiple comparisons in simulation", Management Science 41(12), 1935–1945;
 * F. J. Matejcik and B. L. Nelson (1995), "Two-stage multiple comparisons with the best for
 * computer simulation", Operations Research 43(4), 633–640; B. L. Nelson, J. Swann, D. Goldsman
 * and W. Song (2001), "Simple procedures for selecting the best simulated system when the number
 * of alternatives is large", Operations Research 49(6), 950–963 (volumes and pages from memory).
 *
 * Example: three scenarios, n0 = 5, δ = 2, P* = 0.9, independent; first stages A 10, 12, 11, 13,
 * 14, B 15, 13, 14, 16, 12 and C 9, 10, 11, 10, 10 (S² 2.5, 2.5, 0.5), h = 3.0582 give N = 6, 6
 * and 5; with a sixth run 24 of A and 20 of B, the means are 14, 15 and 10, "B" is selected,
 * the intervals are A [−3, 1], B [−1, 3], C [−7, 0] (ruled out) and the subset is A and B
 * (test/stats/selectBest.test.ts works it through).
 *
 * Throws a plain `Error` with the message of `selectionProblem` when the input is not valid.
 */
export function selectBest(input: SelectionInput): SelectionResult {
  const wrong = selectionProblem(input);
  if (wrong !== null) throw new Error(wrong);
  const { samples, firstStage: n0, delta, pcs, method } = input;
  const k = samples.length;
  const sign: 1 | -1 = input.better === "larger" ? 1 : -1;
  const paired = method === "paired";

  // The values each scenario uses, in order: its own (independent) or in the pairing order (paired).
  const order = paired ? pairingOrder(input) : null;
  const byId = samples.map((s) => new Map(s.runs.map((r) => [r.run, r.value])));
  const firstIds = samples.map((s) => (order ? order.slice(0, n0) : s.runs.slice(0, n0).map((r) => r.run)));
  const firstValues = samples.map((_, i) => firstIds[i].map((id) => byId[i].get(id) as number));
  const firstStats = firstValues.map((v) => spread(v));

  const rinott = paired ? null : rinottH(k, n0, pcs);
  const point = paired ? equicoordinateT(k - 1, (k - 1) * (n0 - 1), pcs) : null;
  const c = rinott ? rinott.h : (point?.value as number);
  const pooled = paired ? pooledSteps(firstValues, firstIds[0]) : null;
  const plans = samples.map((_, i) => runsFor(c, pooled ? pooled.sd : (firstStats[i].sd as number), delta, n0));

  // The values over the first N_i runs, when the scenario has them all.
  const common = paired ? plans[0].runs : 0;
  const pairedRuns = order ? order.slice(0, common) : null;
  const used = samples.map((s, i): { values: number[] | null; missing: string[]; count: number } => {
    if (!pairedRuns) {
      const missing = Math.max(0, plans[i].runs - s.runs.length);
      return { values: missing === 0 ? s.runs.slice(0, plans[i].runs).map((r) => r.value) : null, missing: [], count: missing };
    }
    const lacking = pairedRuns.filter((id) => !byId[i].has(id));
    const count = lacking.length + (common - pairedRuns.length);
    return { values: count === 0 ? pairedRuns.map((id) => byId[i].get(id) as number) : null, missing: lacking, count };
  });
  const sums = used.map((u) => (u.values ? fsum(u.values) : null));
  const means = used.map((u, i) => (u.values ? (sums[i] as number) / u.values.length : null));
  const complete = used.every((u) => u.values !== null);

  const scenarios: SelectionScenario[] = samples.map((s, i) => ({
    scenario: s.scenario,
    first_stage_runs: n0,
    first_stage_mean: firstStats[i].mean as number,
    first_stage_variance: firstStats[i].variance as number,
    first_stage_sd: firstStats[i].sd as number,
    runs_needed: plans[i].runs,
    runs_present: s.runs.length,
    runs_missing: used[i].count,
    mean: means[i],
    runs_capped: plans[i].capped,
  }));

  let selectedName: string | null = null;
  let comparisons: BestComparison[] | null = null;
  if (complete) {
    const oriented = means.map((m) => sign * (m as number));
    selectedName = samples[argmax(oriented)].scenario;
    comparisons = samples.map((s, i) => {
      const other = argmax(oriented, i);
      const difference = oriented[i] - oriented[other];
      const upper = Math.max(0, difference + delta);
      return {
        scenario: s.scenario,
        difference,
        lower: Math.min(0, difference - delta),
        upper,
        ruled_out: upper === 0,
        mean: means[i] as number,
        best_other: samples[other].scenario,
        best_other_mean: means[other] as number,
      };
    });
  }

  const screen = screening(input, sign, firstValues);
  const subset = samples.filter((s) => screen.pairs.every((p) => p.scenario !== s.scenario || p.kept)).map((s) => s.scenario);
  const totalRuns = plans.reduce((a, p) => a + p.runs, 0);
  let statement = complete
    ? selected(method, selectedName as string, delta, pcs, totalRuns, (comparisons as BestComparison[]).filter((b) => b.ruled_out).map((b) => b.scenario))
    : needsRuns(method, delta, pcs, c, scenarios.filter((s) => s.runs_missing > 0).map((s) => ({ scenario: s.scenario, runs: s.runs_missing })));
  const cappedNames = scenarios.filter((s) => s.runs_capped).map((s) => s.scenario);
  if (cappedNames.length > 0) statement += capped(cappedNames, MAX_RUNS);

  const steps: SelectionScenarioSteps[] = samples.map((s, i) => ({
    scenario: s.scenario,
    first_stage_runs: firstIds[i],
    first_stage_values: firstValues[i],
    first_stage: spreadSteps(firstStats[i]),
    runs_ratio: plans[i].ratio,
    missing_runs: used[i].missing,
    sum: sums[i],
  }));

  return {
    input: { better: input.better, method, delta, pcs, first_stage: n0, k },
    procedure: paired ? "Nelson and Matejcik (1995)" : "Rinott (1978)",
    constant: rinott ? { symbol: "h", value: rinott.h, steps: rinott } : { symbol: "g", value: c, steps: point as NonNullable<typeof point> },
    pooled_variance: pooled ? pooled.variance : null,
    pooled_df: pooled ? pooled.df : null,
    scenarios,
    complete,
    selected: selectedName,
    comparisons_with_best: comparisons,
    subset,
    statement,
    total_runs: totalRuns,
    steps: { sign, scenarios: steps, pooled, paired_runs: pairedRuns, screening: screen },
  };
}
