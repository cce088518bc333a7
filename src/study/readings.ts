import type {
  BatchMeansReading,
  BriefReading,
  ComparisonReading,
  Readings,
  Results,
  ScenarioResult,
  Summary,
  SummaryReading,
  TargetReading,
  TimeAtValueMean,
  Warning,
} from "../outcome/index.js";
import { fsum } from "../stats/fsum.js";

/**
 * Size of the lag-1 correlation of a run's batch means above which the batches are taken to be
 * too short to be independent (common practice: a small positive limit such as 0.2; the study
 * warns and the report flags the run).
 */
export const LAG1_LIMIT = 0.2;

/** True when a lag-1 correlation is above `LAG1_LIMIT` in size. */
export function lag1TooLarge(lag1: number | null): boolean {
  return lag1 !== null && Math.abs(lag1) > LAG1_LIMIT;
}

/** What the interval of a difference a − b says: above 0, below 0, contains 0, or missing. */
export function differenceReading(low: number | null, high: number | null): ComparisonReading {
  if (low === null || high === null) return "no-interval";
  if (low > 0) return "higher";
  if (high < 0) return "lower";
  return "no-difference";
}

/**
 * The reading of one summary row: the interval it shows (the scenario's batch means when
 * `interval_method` is "batch-means", else the contract's fields across runs), how its precision
 * target stands, the runs it leaves out or that end early, and the warnings about it.
 *
 * A target is missed across runs when the runs needed are more than the runs that gave a value
 * (`runs_needed` is the smallest k ≥ n that reaches it, so k = n means met); with batch means,
 * when the batch-means half-width is above the half-width aimed at (`target_half_width`), since
 * more runs are not what a single long run needs.
 */
export function readSummary(sr: ScenarioResult, measure: string, s: Summary, warnings: readonly Warning[]): SummaryReading {
  const bm = s.interval_method === "batch-means" ? s.batch_means : undefined;
  const iv = bm === undefined
    ? { method: "across-runs" as const, values: s.n, df: s.n >= 2 ? s.n - 1 : null, run: null, mean: s.mean, half_width: s.half_width, ci_low: s.ci_low, ci_high: s.ci_high }
    : { method: "batch-means" as const, values: bm.batches, df: bm.df, run: bm.run, mean: bm.mean, half_width: bm.half_width, ci_low: bm.ci_low, ci_high: bm.ci_high };
  let target: TargetReading = "none";
  let runsNeeded: number | null = null;
  if (s.target !== undefined) {
    if (bm !== undefined) {
      const aim = s.target_half_width ?? null;
      target = aim === null || bm.half_width === null ? "not-judged" : bm.half_width > aim ? "missed" : "met";
    } else {
      const need = s.runs_needed ?? null;
      target = need === null ? "not-judged" : need > s.n ? "missed" : "met";
      if (target === "missed") runsNeeded = need;
    }
  }
  const about: number[] = [];
  warnings.forEach((w, i) => {
    if (w.scenario === sr.name && (w.measure === measure || w.measure === null)) about.push(i);
  });
  return {
    scenario: sr.name, measure, ...iv, target, runsNeeded, runs: s.n, of: sr.runs.length,
    runsWithoutValue: s.runs_without_value ?? [], runsEndingEarly: s.runs_ending_early ?? [], warnings: about,
  };
}

/** The facts of the opening sentences, from the summary and comparison readings. */
function brief(results: Results, summaries: SummaryReading[], comparisons: ComparisonReading[], warnings: number): BriefReading {
  const at = <T>(xs: T[], keep: (x: T) => boolean) => xs.flatMap((x, i) => (keep(x) ? [i] : []));
  const measures: string[] = [];
  for (const s of summaries) if (!measures.includes(s.measure)) measures.push(s.measure);
  return {
    scenarios: results.scenarios.map((sr) => sr.name),
    measures,
    runs: results.scenarios.map((sr) => sr.runs.length),
    significant: at(comparisons, (c) => c === "higher" || c === "lower"),
    notSignificant: at(comparisons, (c) => c === "no-difference"),
    noInterval: at(comparisons, (c) => c === "no-interval"),
    targetsMissed: at(summaries, (s) => s.target === "missed"),
    targetsNotJudged: at(summaries, (s) => s.target === "not-judged"),
    withoutInterval: at(summaries, (s) => s.half_width === null),
    fromBatchMeans: at(summaries, (s) => s.method === "batch-means"),
    warnings,
  };
}

/**
 * The decisions about the numbers of `results` that the report puts into words: the reading of
 * each comparison, the lag-1 check of each run's batch means, the share of time at each value
 * averaged over the runs of a scenario (a run that never took a value counts 0 for it; only runs
 * with a time-at-value table are averaged), the reading of each summary row (`readSummary`) and
 * the facts of the opening sentences. Made once here, so the report derives nothing.
 */
export function readResults(results: Results, warnings: readonly Warning[] = []): Readings {
  const comparisons = (results.comparisons ?? []).map((c) => differenceReading(c.ci_low, c.ci_high));
  const batchMeans: BatchMeansReading[] = [];
  const timeAtValue: TimeAtValueMean[] = [];
  for (const sr of results.scenarios) {
    const names: string[] = [];
    for (const r of sr.runs) for (const name of Object.keys(r.measures)) if (!names.includes(name)) names.push(name);
    for (const name of names) {
      for (const r of sr.runs) {
        const st = r.measures[name];
        if (st === undefined || st.kind === "count" || st.batch_means === undefined) continue;
        const lag1 = st.batch_means.lag1;
        batchMeans.push({ scenario: sr.name, run: r.id, measure: name, lag1: lag1 === null ? "none" : lag1TooLarge(lag1) ? "too-large" : "ok" });
      }
      const lists = sr.runs.flatMap((r) => {
        const st = r.measures[name];
        return st !== undefined && (st.kind === "level" || st.kind === "utilization") && st.time_at_value !== undefined ? [st.time_at_value] : [];
      });
      if (lists.length === 0) continue;
      const byValue = new Map<number, number[]>();
      for (const list of lists) for (const e of list) byValue.set(e.value, [...(byValue.get(e.value) ?? []), e.share]);
      const shares = [...byValue.keys()].sort((a, b) => a - b).map((value) => ({ value, share: fsum(byValue.get(value)!) / lists.length }));
      timeAtValue.push({ scenario: sr.name, measure: name, runs: lists.length, of: sr.runs.length, shares });
    }
  }
  const summaries: SummaryReading[] = [];
  for (const sr of results.scenarios) for (const [name, s] of Object.entries(sr.summary)) summaries.push(readSummary(sr, name, s, warnings));
  return { lag1Limit: LAG1_LIMIT, comparisons, batchMeans, timeAtValue, summaries, brief: brief(results, summaries, comparisons, warnings.length) };
}
