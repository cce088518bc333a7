import { intervalArithmetic } from "../stats/interval.js";
import { runsNeeded } from "../stats/runsNeeded.js";
import type { Measure } from "../manifest/types.js";
import type { IntervalArithmetic, RunResult, Summary } from "../outcome/index.js";
import { nonFinitePath } from "./finite.js";
import * as studyMessages from "../messages/study.js";

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
