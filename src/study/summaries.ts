import { intervalArithmetic } from "../stats/interval.js";
import { runsNeeded } from "../stats/runsNeeded.js";
import type { Analysis, Measure } from "../manifest/types.js";
import type { BatchMeansFigures, BatchMeansSummary, IntervalArithmetic, IntervalMethod, RunResult, Summary } from "../outcome/index.js";
import { nonFinitePath } from "./finite.js";
import * as studyMessages from "../messages/study.js";
import * as batchMessages from "../messages/batchMeans.js";

/** The contract's summary fields taken from the interval arithmetic. */
export function summaryOf(a: Omit<IntervalArithmetic, "scenario" | "measure" | "figure">): Summary {
  return { n: a.n, mean: a.mean, sd: a.sd, half_width: a.half_width, ci_low: a.ci_low, ci_high: a.ci_high };
}

/** The across-run value of one figure of each run: null figures are left out. */
function figureValues(runs: RunResult[], pick: (r: RunResult) => unknown): { run: string; value: number }[] {
  const out: { run: string; value: number }[] = [];
  for (const r of runs) {
    const v = pick(r);
    if (typeof v === "number") out.push({ run: r.id, value: v });
  }
  return out;
}

/** Run ids in code-unit order, so that a summary does not depend on the order the runs are listed in. */
function sortedIds(runs: RunResult[]): string[] {
  return runs.map((r) => r.id).sort((a, b) => (a < b ? -1 : a > b ? 1 : 0));
}

/**
 * Summaries of one measure across the runs of a scenario (contract section 4): the primary value,
 * then each per-run quantile, share within and share of time at least (issue 8), and the runs
 * needed for a target precision (issue 4). Every interval's arithmetic is kept for the appendix.
 */
export function summarizeMeasure(
  scenario: string,
  measure: Measure,
  runs: RunResult[],
  confidence: number,
): { summary: Summary; intervals: IntervalArithmetic[] } {
  const intervals: IntervalArithmetic[] = [];
  const interval = (figure: string, pick: (r: RunResult) => unknown): Summary => {
    const values = figureValues(runs, pick);
    const a = intervalArithmetic(values, confidence);
    const overflow = nonFinitePath(summaryOf(a));
    if (overflow !== null) throw studyMessages.summaryFigureOverflow(scenario, measure.name, figure === "value" ? overflow : `${figure} ${overflow}`);
    intervals.push({ scenario, measure: measure.name, figure, ...a });
    const out = summaryOf(a);
    // Runs left out of this interval because they gave no value (an observation measure with no
    // observation inside a run's window): named, so that an interval over fewer runs says so.
    if (values.length < runs.length) {
      const used = new Set(values.map((v) => v.run));
      out.runs_without_value = sortedIds(runs.filter((r) => !used.has(r.id)));
    }
    return out;
  };
  const stats = (r: RunResult) => r.measures[measure.name] as unknown as Record<string, unknown>;
  const summary = interval("value", (r) => stats(r).value);
  const early = sortedIds(runs.filter((r) => r.ends_early === true));
  if (early.length > 0) summary.runs_ending_early = early;

  const keyed = (field: "quantiles" | "within" | "time_at_least", keys: readonly number[]) => {
    if (keys.length === 0) return;
    const out: Record<string, Summary> = {};
    for (const k of keys) {
      const key = String(k);
      out[key] = interval(`${field}.${key}`, (r) => (stats(r)[field] as Record<string, unknown> | undefined)?.[key]);
    }
    summary[field] = out;
  };
  if (measure.kind === "observation") {
    keyed("quantiles", measure.quantiles);
    keyed("within", measure.within);
  } else if (measure.kind === "level" || measure.kind === "utilization") {
    keyed("time_at_least", measure.atLeast);
  }

  if (measure.target !== null) {
    summary.target = measure.target.type === "half_width" ? { half_width: measure.target.value } : { relative: measure.target.value };
    const need = runsNeeded(summary.sd, summary.n, summary.mean, confidence, measure.target);
    summary.runs_needed = need.runs;
    // Why there is no number (null when there is one), and the half-width the number aims at.
    summary.runs_needed_reason = need.reason;
    summary.target_half_width = need.halfWidth;
  }
  return { summary, intervals };
}

/** A run measure's batch means, or null when the run has none for it. */
export function runBatchMeans(run: RunResult, measure: string): BatchMeansFigures | null {
  const stats = run.measures[measure];
  return stats !== undefined && stats.kind !== "count" ? (stats.batch_means ?? null) : null;
}

/**
 * Which interval a summary row shows under `analysis: batch-means` (issue 13), as fields to add
 * to the primary figure's summary; nothing under replications, so those results do not change.
 *
 * - One run with batch means: `interval_method: "batch-means"` and `batch_means` holds the t
 *   interval of its k batch means with k − 1 degrees of freedom (Law 2015, §9.5.3). The
 *   contract's fields stay across the runs (n = 1, interval null).
 * - Several runs: `interval_method: "across-runs"`. The run values of independent replications,
 *   each after the warm-up, are independent by construction, so the interval across them needs
 *   no assumption about the batches; this is the replication/deletion approach (Law 2015, §9.5.2,
 *   from memory; Alexopoulos and Goldsman 2004 compare it with batching inside replications,
 *   from memory). Each run's batch-means interval stays in its figures as a check.
 * - One run without batch means for the measure (a count, or fewer observations than batches):
 *   `interval_method: "across-runs"` (no interval) and the note says why.
 */
export function intervalChoice(measure: Measure, runs: RunResult[], summary: Summary, analysis: Analysis): Partial<Summary> {
  if (analysis.type !== "batch-means") return {};
  if (runs.length !== 1) return { interval_method: "across-runs", interval_note: batchMessages.severalRuns(runs.length) };
  const run = runs[0];
  if (summary.n === 0) return { interval_method: "across-runs", interval_note: batchMessages.noRunValue([run.id]) };
  const bm = runBatchMeans(run, measure.name);
  if (bm === null) return { interval_method: "across-runs", interval_note: batchMessages.noBatchMeans(run.id, measure.kind) };
  const batchMeans: BatchMeansSummary = {
    method: "batch-means",
    run: run.id,
    batches: bm.batches,
    df: bm.df,
    mean: bm.mean,
    sd: bm.sd,
    t: bm.t,
    half_width: bm.half_width,
    ci_low: bm.ci_low,
    ci_high: bm.ci_high,
    lag1: bm.lag1,
  };
  const method: IntervalMethod = "batch-means";
  return { interval_method: method, batch_means: batchMeans, interval_note: batchMessages.fromBatchMeans(run.id, bm.batches) };
}
