import { readFileSync } from "node:fs";
import { batchMeansInterval, observationBatches } from "../stats/batchMeans.js";
import type { Study } from "../manifest/types.js";
import type { MeasureOutput } from "../measures/accumulator.js";
import { type RunAnalysis, type RunPlan, runTableFiles } from "./analyzeRun.js";
import { checkSeriesPresent } from "./absentSeries.js";
import { compareScenarios } from "./compare.js";
import { consistencyChecks } from "./consistency.js";
import type { LevelTrace, ObservationSample, Results, ScenarioResult, StudyOutcome, Warning } from "./outcome.js";
import { summarizeMeasure } from "./summaries.js";
import { intervalTable, intervalTablePath, type TableFile, tableFile } from "./tables.js";
import { resolveWarmup } from "./warmup.js";
import { runAnalyzer, workerCount } from "./pool.js";
import { scenarioPlans, summariesAnalyzer } from "./runSummary.js";
import * as summaryMessages from "../messages/summary.js";
import { runsWithoutValue } from "../messages/warnings.js";

export interface StudyRun {
  outcome: StudyOutcome;
  /** Calculation tables to write under the report folder, in a fixed order. */
  tableFiles: TableFile[];
}

export interface RunStudyOptions {
  onProgress?: (message: string) => void;
  /**
   * Worker threads for the runs (default: `SOJOURN_WORKERS`, else the available cores, at most
   * the number of runs); 1 analyses every run in this thread. The results do not depend on it.
   */
  workers?: number;
  /**
   * Take each run's analysis from `<folder>/<scenario>/<run>.json` (written by
   * `sojourn summarize-run`) instead of reading its run file (docs/distributed.md).
   */
  fromSummaries?: string;
}

/** Largest number of observation values kept per scenario and measure for the histogram. */
const SAMPLE_LIMIT = 20_000;

/**
 * Runs a whole study:
 *
 *   Study ─┬─ per scenario ─┬─ warm-up (fixed, or MSER-5 from a first pass)
 *          │                ├─ per run: analyzeRun (one pass over the file, every measure),
 *          │                │  runs of all scenarios shared among worker threads (pool.ts)
 *          │                ├─ batch means inside each run (when asked)
 *          │                └─ per measure: across-run summaries with their interval arithmetic
 *          ├─ comparisons between scenarios (Bonferroni over all of them)
 *          └─ results.json + tables + chart data + audit records  ──▶  StudyOutcome
 *
 * Everything is in a fixed order (scenarios, runs, measures as the manifest lists them), so the
 * same inputs give the same bytes.
 */
export async function runStudy(study: Study, options: RunStudyOptions = {}): Promise<StudyRun> {
  const progress = options.onProgress ?? (() => {});
  const outcome: StudyOutcome = {
    results: {
      format: "sojourn-results/1",
      title: study.title,
      time_unit: study.timeUnit,
      confidence: study.confidence,
      warmup: warmupAsWritten(study.warmup),
      scenarios: [],
    },
    inputs: [],
    tables: [],
    intervals: [],
    traces: [],
    samples: [],
    warnings: [],
  };
  const tableFiles: TableFile[] = [];
  const totalRuns = study.scenarios.reduce((s, sc) => s + sc.runs.length, 0);
  let done = 0;

  let analyze = runAnalyzer(workerCount(totalRuns, options.workers));
  if (options.fromSummaries !== undefined) {
    const mser = study.scenarios.find((sc) => sc.warmup.type === "mser-5");
    if (mser !== undefined) throw summaryMessages.summaryNeedsFixedWarmup(mser.name);
    analyze = summariesAnalyzer(options.fromSummaries, readIfThere);
  }

  // Runs of consecutive scenarios go to the workers in one batch, so the workers stay busy
  // across scenario boundaries. An MSER-5 warm-up reads its scenario's runs first: the batch
  // before it is analysed first, so an input error is reported in the same order as one by one.
  const warmups = [];
  const all: RunAnalysis[] = [];
  let pending: RunPlan[] = [];
  const flush = async () => {
    all.push(...(await analyze(pending, (i, a) => progress(`read run ${++done}/${totalRuns}: ${pending[i].scenario.name} / ${pending[i].run.id} (${a.input.rows} rows)`))));
    pending = [];
  };
  for (const scenario of study.scenarios) {
    if (scenario.warmup.type === "mser-5" && pending.length > 0) await flush();
    const warmup = await resolveWarmup(study, scenario, analyze);
    warmups.push(warmup);
    pending.push(...scenarioPlans(study, scenario, warmup.time));
  }
  if (pending.length > 0) await flush();

  let first = 0;
  for (const [s, scenario] of study.scenarios.entries()) {
    const warmup = warmups[s];
    for (const message of warmup.warnings) outcome.warnings.push({ scenario: scenario.name, run: null, measure: null, message });
    const batches = scenario.analysis.type === "batch-means" ? scenario.analysis.batches : null;
    const analyses = all.slice(first, first + scenario.runs.length);
    first += scenario.runs.length;

    const sc: ScenarioResult = { name: scenario.name, runs: analyses.map((a) => a.result), summary: Object.create(null) };
    if (scenario.warmup.type !== "none") sc.warmup = warmup.time;
    if (warmup.estimate !== null) sc.warmup_estimate = warmup.estimate;
    if (batches !== null) sc.analysis = { method: "batch-means", batches };

    outcome.warnings.push(...checkSeriesPresent(study, scenario, analyses.map((a) => a.input)));
    for (const a of analyses) {
      outcome.inputs.push(a.input);
      for (const w of a.warnings) outcome.warnings.push({ scenario: scenario.name, run: a.result.id, measure: w.measure, message: w.message });
      tableFiles.push(...(a.tableFiles ?? runTableFiles(scenario.name, a, scenario.measures)));
      for (const m of scenario.measures) {
        const out = a.outputs.get(m.name)!;
        if (batches !== null) addBatchMeans(a, m.name, batches, study.confidence, outcome.warnings, scenario.name);
        if (out.trace !== undefined) outcome.traces.push(traceOf(scenario.name, a, m.name, out.trace));
      }
    }
    for (const m of scenario.measures) {
      const s = summarizeMeasure(scenario.name, m, sc.runs, study.confidence);
      sc.summary[m.name] = s.summary;
      const without = s.summary.runs_without_value as string[] | undefined;
      if (without !== undefined) {
        outcome.warnings.push({ scenario: scenario.name, run: null, measure: m.name, message: runsWithoutValue(without, s.summary.n, sc.runs.length) });
      }
      for (const iv of s.intervals) {
        outcome.intervals.push(iv);
        tableFiles.push(tableFile({ scenario: scenario.name, run: null, measure: m.name, kind: "interval" }, intervalTablePath(scenario.name, m.name, iv.figure), intervalTable(iv)));
      }
      if (m.kind === "observation") outcome.samples.push(sampleOf(scenario.name, m.name, analyses));
    }
    const checks = consistencyChecks(scenario, analyses);
    if (checks.length > 0) sc.checks = checks;
    for (const c of checks) if (!c.passed) outcome.warnings.push({ scenario: scenario.name, run: c.run, measure: c.measure, message: c.message });
    outcome.results.scenarios.push(sc);
  }

  const comparisons = compareScenarios(study, outcome.results);
  if (comparisons.length > 0) outcome.results.comparisons = comparisons;
  assertDistinctFiles(tableFiles);
  outcome.tables = tableFiles.map((f) => f.record);
  return { outcome, tableFiles };
}

/**
 * Two tables at one file name (also compared without case) would overwrite each other. The
 * names of `tables.ts` are made so that this cannot happen; this is the check that it did not.
 */
function assertDistinctFiles(files: TableFile[]): void {
  const seen = new Map<string, string>();
  for (const { record } of files) {
    const key = record.file.toLowerCase();
    const before = seen.get(key);
    if (before !== undefined) throw new Error(`two calculation tables would share one file: ${before} and ${record.file}`);
    seen.set(key, record.file);
  }
}

function readIfThere(path: string): string | null {
  try {
    return readFileSync(path, "utf8");
  } catch (e) {
    if ((e as { code?: unknown }).code === "ENOENT") return null;
    throw e;
  }
}

function warmupAsWritten(w: Study["warmup"]): Results["warmup"] {
  if (w.type === "none") return null;
  if (w.type === "fixed") return w.time;
  return { method: "mser-5", measure: w.measure, slice: w.slice };
}

/** Batch means inside one run (issue 4): level batches come from the accumulator, observations are cut here. */
function addBatchMeans(a: RunAnalysis, measure: string, k: number, confidence: number, warnings: Warning[], scenario: string): void {
  const out = a.outputs.get(measure)!;
  let means: number[] | null = null;
  if (out.batchMeans !== undefined) means = out.batchMeans;
  else if (out.observations !== undefined) {
    if (out.observations.length >= k) means = observationBatches(out.observations, k);
    else warnings.push({ scenario, run: a.result.id, measure, message: `only ${out.observations.length} observations, fewer than the ${k} batches asked for: no batch means for this run` });
  }
  if (means === null) return;
  const bm = batchMeansInterval(means, confidence);
  a.result.measures[measure].batch_means = {
    batches: bm.batches,
    mean: bm.mean,
    half_width: bm.half_width,
    ci_low: bm.ci_low,
    ci_high: bm.ci_high,
    lag1: bm.lag1,
    sd: bm.sd,
    df: bm.df,
    t: bm.t,
    batch_values: means,
  };
  if (bm.lag1 !== null && Math.abs(bm.lag1) > 0.2) {
    warnings.push({
      scenario,
      run: a.result.id,
      measure,
      message: `the lag-1 autocorrelation of the ${k} batch means is ${bm.lag1.toFixed(3)} (above 0.2 in size): the batches are probably too short to be independent. Use fewer, larger batches (e.g. ${Math.max(2, Math.floor(k / 2))}) or a longer run.`,
    });
  }
}

function traceOf(scenario: string, a: RunAnalysis, measure: string, trace: NonNullable<MeasureOutput["trace"]>): LevelTrace {
  return {
    scenario,
    run: a.result.id,
    measure,
    start: a.window.start,
    from: a.window.collectFrom,
    to: a.window.end as number,
    warmup: a.window.warmup,
    level: trace.level,
    capacity: trace.capacity,
  };
}

/** Up to SAMPLE_LIMIT observation values of a scenario, evenly strided over all its runs. */
function sampleOf(scenario: string, measure: string, analyses: RunAnalysis[]): ObservationSample {
  let total = 0;
  for (const a of analyses) total += a.outputs.get(measure)!.observations?.length ?? 0;
  const stride = Math.max(1, Math.ceil(total / SAMPLE_LIMIT));
  const values: number[] = [];
  let i = 0;
  for (const a of analyses) {
    const obs = a.outputs.get(measure)!.observations;
    if (obs === undefined) continue;
    for (let j = 0; j < obs.length; j++, i++) if (i % stride === 0) values.push(obs[j]);
  }
  return { scenario, measure, values, total };
}
