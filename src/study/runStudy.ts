import { readFileSync } from "node:fs";
import { batchMeansInterval, observationBatches } from "../stats/batchMeans.js";
import type { Scenario, Study } from "../manifest/types.js";
import type { MeasureOutput } from "../measures/accumulator.js";
import { type RunAnalysis, type RunPlan, runTableFiles } from "./analyzeRun.js";
import { checkSeriesPresent } from "./absentSeries.js";
import { compareScenarios } from "./compare.js";
import { comparisonArithmetic, comparisonTableFile } from "./comparisonTables.js";
import { type Check, runChecks } from "./consistency.js";
import type { InputRecord, LevelTrace, Results, RunResult, RunStats, ScenarioResult, StudyOutcome, TableRecord, Warning } from "../outcome/index.js";
import { EvenSample, thinned } from "./sample.js";
import { LAG1_LIMIT, lag1TooLarge, readResults } from "./readings.js";
import { intervalChoice, summarizeMeasure } from "./summaries.js";
import { intervalTable, intervalTablePath, PREVIEW_RUNS, tableFile } from "./tables.js";
import { type ResolvedWarmup, resolveWarmup } from "./warmup.js";
import { runAnalyzer, workerCount } from "./pool.js";
import { scenarioPlans, summariesAnalyzer } from "./runSummary.js";
import { curveTableFile, responseCurves } from "./responseCurves.js";
import { selectionTableFile, selectScenarios } from "./selections.js";
import * as summaryMessages from "../messages/summary.js";
import { runsWithoutValue } from "../messages/warnings.js";

export interface StudyRun {
  outcome: StudyOutcome;
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
  /**
   * Called with each calculation table's path (relative to the report folder) and CSV text as
   * soon as its run is analysed, in any order of the runs; the text is not kept. Without it the
   * tables are only indexed (`outcome.tables`, with their digests).
   */
  writeTable?: (file: string, csv: string) => void;
  /**
   * MSER-5 warm-ups already estimated elsewhere (the first stage of `report --on slurm`), by
   * scenario name: used as they are instead of a first pass over the scenario's runs. With
   * `fromSummaries`, every MSER-5 scenario needs one.
   */
  warmups?: ReadonlyMap<string, ResolvedWarmup>;
}

/** Largest number of observation values kept per scenario and measure for the histogram. */
const SAMPLE_LIMIT = 20_000;

/** What one analysed run leaves behind once its heavy parts (tables, observations) are used. */
interface RunLeft {
  result: RunResult;
  input: InputRecord;
  warnings: Warning[];
  tables: TableRecord[];
  checks: Check[];
  traces: LevelTrace[];
}

/** A scenario while its runs come in: what each run left, by run index, and its samples. */
interface ScenarioWork {
  scenario: Scenario;
  warmup: ResolvedWarmup;
  runs: RunLeft[];
  /** Per observation measure: the run-ordered sample and the number of values in all. */
  samples: Map<string, { sample: EvenSample; total: number }>;
  /** Per run that ended before an earlier run of the scenario: its thinned values and their number. */
  waiting: Map<number, Map<string, { values: Float64Array; n: number }>>;
  /** The next run index whose values go into the samples. */
  nextSample: number;
}

/**
 * Runs a whole study:
 *
 *   Study ─┬─ per scenario ─┬─ warm-up (fixed, or MSER-5 from a first pass)
 *          │                ├─ per run: analyzeRun (one pass over the file, every measure),
 *          │                │  runs of all scenarios shared among worker threads (pool.ts)
 *          │                ├─ as each run ends: its tables written (writeTable), batch means,
 *          │                │  checks, its values into the samples; then only its small results kept
 *          │                └─ per measure: across-run summaries with their interval arithmetic
 *          ├─ comparisons between scenarios (Bonferroni over all of them), each with its table
 *          ├─ response curves: each measure against each factor, points = scenario summaries
 *          ├─ selections of the best (select:): runs needed, selection, comparisons with the best
 *          └─ results.json + tables + chart data + audit records  ──▶  StudyOutcome
 *
 * Runs end in any order (worker threads); what each leaves is kept at its index and the samples
 * take runs in order, so the same inputs give the same bytes. Memory holds every run's small
 * results, but of its tables and observation values only the page's share.
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
    comparisons: [],
    traces: [],
    samples: [],
    // Read again once the results are complete (below).
    readings: readResults({ format: "sojourn-results/1", title: study.title, time_unit: study.timeUnit, confidence: study.confidence, warmup: null, scenarios: [] }),
    warnings: [],
  };
  const writeTable = options.writeTable ?? (() => {});
  const totalRuns = study.scenarios.reduce((s, sc) => s + sc.runs.length, 0);
  let done = 0;

  let analyze = runAnalyzer(workerCount(totalRuns, options.workers));
  if (options.fromSummaries !== undefined) {
    const mser = study.scenarios.find((sc) => sc.warmup.type === "mser-5" && options.warmups?.get(sc.name) === undefined);
    if (mser !== undefined) throw summaryMessages.summaryNeedsFixedWarmup(mser.name);
    analyze = summariesAnalyzer(options.fromSummaries, readIfThere);
  }

  /** Takes in one analysed run, in any order, and frees its heavy parts. */
  const take = (work: ScenarioWork, index: number, a: RunAnalysis) => {
    const { scenario } = work;
    const batches = scenario.analysis.type === "batch-means" ? scenario.analysis.batches : null;
    const left: RunLeft = { result: a.result, input: a.input, warnings: [], tables: [], checks: [], traces: [] };
    for (const w of a.warnings) left.warnings.push({ scenario: scenario.name, run: a.result.id, measure: w.measure, message: w.message });
    for (const f of a.tableFiles ?? runTableFiles(scenario.name, a, scenario.measures)) {
      writeTable(f.record.file, f.csv);
      left.tables.push(index < PREVIEW_RUNS ? f.record : { ...f.record, preview: null });
    }
    const values = new Map<string, { values: Float64Array; n: number }>();
    for (const m of scenario.measures) {
      const out = a.outputs.get(m.name)!;
      if (batches !== null) addBatchMeans(a, m.name, batches, study.confidence, left.warnings, scenario.name);
      if (out.trace !== undefined) left.traces.push(traceOf(scenario.name, a, m.name, out.trace));
      if (m.kind === "observation" && out.observations !== undefined) values.set(m.name, { values: thinned(out.observations, SAMPLE_LIMIT), n: out.observations.length });
    }
    left.checks = runChecks(scenario, a);
    work.runs[index] = left;
    // Released here: the pool's arrays hold this same analysis until the batch ends.
    a.outputs.clear();
    a.tableFiles = undefined;

    work.waiting.set(index, values);
    for (let next = work.waiting.get(work.nextSample); next !== undefined; next = work.waiting.get(work.nextSample)) {
      work.waiting.delete(work.nextSample++);
      for (const [name, v] of next) {
        const s = work.samples.get(name)!;
        s.sample.add(v.values);
        s.total += v.n;
      }
    }
  };

  // Runs of consecutive scenarios go to the workers in one batch, so the workers stay busy
  // across scenario boundaries. An MSER-5 warm-up reads its scenario's runs first: the batch
  // before it is analysed first, so an input error is reported in the same order as one by one.
  const works: ScenarioWork[] = [];
  let pending: { work: ScenarioWork; index: number; plan: RunPlan }[] = [];
  const flush = async () => {
    const batch = pending;
    pending = [];
    await analyze(
      batch.map((p) => p.plan),
      (i, a) => {
        progress(`read run ${++done}/${totalRuns}: ${batch[i].work.scenario.name} / ${batch[i].plan.run.id} (${a.input.rows} rows)`);
        take(batch[i].work, batch[i].index, a);
      },
    );
  };
  for (const scenario of study.scenarios) {
    if (scenario.warmup.type === "mser-5" && pending.length > 0) await flush();
    const warmup = options.warmups?.get(scenario.name) ?? (await resolveWarmup(study, scenario, analyze));
    const work: ScenarioWork = { scenario, warmup, runs: [], samples: new Map(), waiting: new Map(), nextSample: 0 };
    for (const m of scenario.measures) if (m.kind === "observation") work.samples.set(m.name, { sample: new EvenSample(SAMPLE_LIMIT), total: 0 });
    works.push(work);
    pending.push(...scenarioPlans(study, scenario, warmup.time).map((plan, index) => ({ work, index, plan })));
  }
  if (pending.length > 0) await flush();

  for (const { scenario, warmup, runs, samples } of works) {
    for (const message of warmup.warnings) outcome.warnings.push({ scenario: scenario.name, run: null, measure: null, message });
    const sc: ScenarioResult = { name: scenario.name, runs: runs.map((r) => r.result), summary: Object.create(null) };
    if (scenario.factors.length > 0) sc.factors = Object.fromEntries(scenario.factors.map((f) => [f.name, f.value]));
    if (scenario.warmup.type !== "none") sc.warmup = warmup.time;
    if (warmup.estimate !== null) sc.warmup_estimate = warmup.estimate;
    if (scenario.analysis.type === "batch-means") sc.analysis = { method: "batch-means", batches: scenario.analysis.batches };

    outcome.warnings.push(...checkSeriesPresent(study, scenario, runs.map((r) => r.input)));
    for (const r of runs) {
      outcome.inputs.push(r.input);
      outcome.warnings.push(...r.warnings);
      outcome.tables.push(...r.tables);
      outcome.traces.push(...r.traces);
    }
    for (const m of scenario.measures) {
      const s = summarizeMeasure(scenario.name, m, sc.runs, study.confidence);
      sc.summary[m.name] = { ...s.summary, ...intervalChoice(m, sc.runs, s.summary, scenario.analysis) };
      const without = s.summary.runs_without_value as string[] | undefined;
      if (without !== undefined) {
        outcome.warnings.push({ scenario: scenario.name, run: null, measure: m.name, message: runsWithoutValue(without, s.summary.n, sc.runs.length) });
      }
      for (const iv of s.intervals) {
        outcome.intervals.push(iv);
        const f = tableFile({ scenario: scenario.name, run: null, measure: m.name, kind: "interval" }, intervalTablePath(scenario.name, m.name, iv.figure), intervalTable(iv));
        writeTable(f.record.file, f.csv);
        outcome.tables.push(f.record);
      }
      const sample = samples.get(m.name);
      if (sample !== undefined) outcome.samples.push({ scenario: scenario.name, measure: m.name, values: sample.sample.values(), total: sample.total });
    }
    const checks = runs.flatMap((r) => r.checks);
    if (checks.length > 0) sc.checks = checks;
    for (const c of checks) if (!c.passed) outcome.warnings.push({ scenario: scenario.name, run: c.run, measure: c.measure, message: c.message });
    outcome.results.scenarios.push(sc);
  }

  const comparisons = compareScenarios(study, outcome.results);
  if (comparisons.length > 0) outcome.results.comparisons = comparisons;
  for (const c of comparisonArithmetic(study, outcome.results)) {
    outcome.comparisons.push(c);
    const f = comparisonTableFile(c);
    writeTable(f.record.file, f.csv);
    outcome.tables.push(f.record);
  }
  const curves = responseCurves(study, outcome.results);
  if (curves.length > 0) outcome.results.response_curves = curves;
  for (const curve of curves) {
    const f = curveTableFile(curve);
    writeTable(f.record.file, f.csv);
    outcome.tables.push(f.record);
  }
  const chosen = selectScenarios(study, outcome.results);
  if (study.selections.length > 0) outcome.results.selections = chosen.selections.map((s) => ({ measure: s.measure, ...s.result }));
  outcome.warnings.push(...chosen.warnings);
  for (const s of chosen.selections) {
    const f = selectionTableFile(s.index, s.measure, s.result);
    writeTable(f.record.file, f.csv);
    outcome.tables.push(f.record);
  }
  outcome.readings = readResults(outcome.results, outcome.warnings);
  assertDistinctFiles(outcome.tables);
  return { outcome };
}

/**
 * Two tables at one file name (also compared without case) would overwrite each other. The
 * names of `tables.ts` are made so that this cannot happen; this is the check that it did not.
 */
function assertDistinctFiles(tables: TableRecord[]): void {
  const seen = new Map<string, string>();
  for (const record of tables) {
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
  // Batch means come from a level, utilization or observation measure (a count has neither).
  const stats = a.result.measures[measure] as Exclude<RunStats, { kind: "count" }>;
  stats.batch_means = {
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
  if (bm.lag1 !== null && lag1TooLarge(bm.lag1)) {
    warnings.push({
      scenario,
      run: a.result.id,
      measure,
      message: `the lag-1 autocorrelation of the ${k} batch means is ${bm.lag1.toFixed(3)} (above ${LAG1_LIMIT} in size): the batches are probably too short to be independent. Use fewer, larger batches (e.g. ${Math.max(2, Math.floor(k / 2))}) or a longer run.`,
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
