import type {
  BatchMeansReading,
  ComparisonReading,
  Readings,
  Results,
  TimeAtValueMean,
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
 * The decisions about the numbers of `results` that the report puts into words: the reading of
 * each comparison, the lag-1 check of each run's batch means, and the share of time at each value
 * averaged over the runs of a scenario (a run that never took a value counts 0 for it; only runs
 * with a time-at-value table are averaged). Made once here, so the report derives nothing.
 */
export function readResults(results: Results): Readings {
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
  return { lag1Limit: LAG1_LIMIT, comparisons, batchMeans, timeAtValue };
}
