import { mser } from "../stats/mser5.js";
import { fsum } from "../stats/fsum.js";
import type { Scenario, Study } from "../manifest/types.js";
import type { RunsWarmupEstimate, WarmupEstimate } from "../outcome/index.js";
import type { RunAnalysis, RunPlan } from "./analyzeRun.js";
import type { AnalyzeRuns } from "./pool.js";
import { inProcess } from "./pool.js";

/** The warm-up of a scenario once resolved, with the estimate behind it when one was made. */
export interface ResolvedWarmup {
  time: number | null;
  estimate: WarmupEstimate | null;
  warnings: string[];
}

/**
 * The warm-up of one scenario: none, fixed, or estimated by MSER-5 (White 1997; White, Cobb and
 * Spratt 2000) from a first pass over its runs.
 *
 * Level or utilization measure: every run's time average over slices of width s from the
 * window start, averaged slice by slice across runs (Welch 1983's averaged process), then
 * MSER-5 on that sequence; warm-up = start + 5·d·s. Observation measure: MSER-5 on each run's
 * observations in time order; warm-up = the latest time of a first kept observation.
 */
/**
 * What one run gives the MSER-5 estimate of its scenario (the first stage, a few numbers per
 * run): its slice averages for a level or utilization measure, else MSER-5's choice on its
 * observations. `first` is the time of the first kept observation, null when none is kept.
 */
export type WarmupPart = { slices: number[] } | { choice: { d: number; batches: number; first: number | null; atLimit: boolean } };

/** The plans of the first pass over a scenario whose warm-up is estimated by MSER-5, one per run. */
export function warmupPlans(scenario: Scenario): RunPlan[] {
  const w = scenario.warmup;
  if (w.type !== "mser-5") throw new Error(`warmupPlans: scenario "${scenario.name}" has no MSER-5 warm-up`);
  const measure = scenario.measures.find((m) => m.name === w.measure)!;
  const isLevel = measure.kind === "level" || measure.kind === "utilization";
  return scenario.runs.map((run) => ({
    scenario,
    run,
    warmup: null,
    measures: [measure],
    tables: { maxRows: 1, edgeRows: 0 },
    trace: false,
    batches: null,
    slice: isLevel ? w.slice : null,
    observationTimes: !isLevel,
  }));
}

/** What one run's first-pass analysis (a plan of `warmupPlans`) gives the estimate. */
export function warmupPart(plan: RunPlan, a: RunAnalysis): WarmupPart {
  const out = a.outputs.get(plan.measures[0].name)!;
  if (plan.slice !== null) return { slices: out.slices! };
  const values = out.observations!;
  const r = mser(values, 5);
  return { choice: { d: r.d, batches: r.batches, first: r.truncated < values.length ? out.observationTimes![r.truncated] : null, atLimit: r.atLimit } };
}

/**
 * The warm-up of one scenario: none, fixed, or estimated by MSER-5 (White 1997; White, Cobb and
 * Spratt 2000) from a first pass over its runs.
 *
 * Level or utilization measure: every run's time average over slices of width s from the
 * window start, averaged slice by slice across runs (Welch 1983's averaged process), then
 * MSER-5 on that sequence; warm-up = start + 5·d·s. Observation measure: MSER-5 on each run's
 * observations in time order; warm-up = the latest time of a first kept observation.
 */
export async function resolveWarmup(study: Study, scenario: Scenario, analyze: AnalyzeRuns = inProcess): Promise<ResolvedWarmup> {
  const w = scenario.warmup;
  if (w.type === "none") return { time: null, estimate: null, warnings: [] };
  if (w.type === "fixed") return { time: w.time, estimate: null, warnings: [] };
  const plans = warmupPlans(scenario);
  // What each run gives is taken as it ends and its observation values freed; kept by run
  // index, so the order in which runs end does not matter.
  const parts: WarmupPart[] = new Array(plans.length);
  await analyze(plans, (i, a) => {
    parts[i] = warmupPart(plans[i], a);
    a.outputs.clear();
  });
  return estimateWarmup(scenario, parts);
}

/**
 * The second half of an MSER-5 estimate: the scenario's warm-up from what each of its runs gave
 * (`warmupPart`, by run index). The same numbers give the same estimate wherever the parts were
 * made (this process, worker threads, or the tasks of a cluster job).
 */
export function estimateWarmup(scenario: Scenario, parts: readonly WarmupPart[]): ResolvedWarmup {
  const w = scenario.warmup;
  if (w.type !== "mser-5") throw new Error(`estimateWarmup: scenario "${scenario.name}" has no MSER-5 warm-up`);
  const measure = scenario.measures.find((m) => m.name === w.measure)!;
  const warnings: string[] = [];
  const start = Math.min(...scenario.runs.map((r) => r.start));
  if (measure.kind === "level" || measure.kind === "utilization") {
    const slices = parts.map((p, i) => {
      if (!("slices" in p)) throw new Error(`estimateWarmup: run "${scenario.runs[i].id}" gave no slices to a level measure`);
      return p.slices;
    });
    const count = Math.min(...slices.map((s) => s.length));
    const averages: number[] = [];
    for (let j = 0; j < count; j++) averages.push(fsum(slices.map((s) => s[j])) / slices.length);
    const r = mser(averages, 5);
    const time = start + 5 * r.d * w.slice;
    if (r.atLimit) warnings.push(limitWarning(scenario.name, measure.name));
    if (r.batches < 2) warnings.push(`MSER-5 for scenario "${scenario.name}" had fewer than two batches of 5 slices; no warm-up was removed. Use a smaller slice width.`);
    return {
      time: time > start ? time : null,
      estimate: { method: "mser-5", measure: measure.name, d: r.d, batches: r.batches, time, slice: w.slice, slice_means: averages, statistics: r.statistics, at_limit: r.atLimit },
      warnings,
    };
  }
  let best: { time: number; d: number; batches: number } | null = null;
  const runs: RunsWarmupEstimate["runs"] = [];
  for (const [i, run] of scenario.runs.entries()) {
    const p = parts[i];
    if (!("choice" in p)) throw new Error(`estimateWarmup: run "${run.id}" gave slices to an observation measure`);
    const { d, batches, first, atLimit } = p.choice;
    runs.push({ run: run.id, d, batches, time: first, at_limit: atLimit });
    if (atLimit) warnings.push(limitWarning(scenario.name, measure.name, run.id));
    if (first !== null && (best === null || first > best.time)) best = { time: first, d, batches };
  }
  const time = best?.time ?? start;
  return {
    time: time > start ? time : null,
    estimate: { method: "mser-5", measure: measure.name, d: best?.d ?? 0, batches: best?.batches ?? 0, time, runs },
    warnings,
  };
}

function limitWarning(scenario: string, measure: string, run?: string): string {
  return `MSER-5 on "${measure}" in scenario "${scenario}"${run ? `, run "${run}"` : ""} chose the largest truncation allowed (half the batches): the warm-up may not be over within the run. Make the runs longer before trusting this estimate.`;
}
