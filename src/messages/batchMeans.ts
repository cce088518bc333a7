/**
 * The words of results.json that say which interval a scenario with `analysis: batch-means` shows
 * and what a comparison of two long runs assumed (docs/statistics.md, "Batch means inside long
 * runs"). User names are quoted as JSON strings; whoever shows these texts escapes them.
 */
import { runList } from "./warnings.js";

const q = (name: string) => JSON.stringify(name);

/** The summary's `interval_note` when the one run's batch means give the interval. */
export const fromBatchMeans = (run: string, k: number) =>
  `One long run (${q(run)}): the interval is from its ${k} batch means, Student t with ${k - 1} degrees of freedom; it assumes the batch means are roughly independent and normal (the lag-1 autocorrelation checks the first).`;

/** The summary's `interval_note` when a scenario with batch means has several runs. */
export const severalRuns = (runs: number) =>
  `${runs} runs: the interval is across the runs (one value per run, independent by construction), as with replications; each run's own batch-means interval stays in its figures as a check.`;

/** The summary's `interval_note` when the one run has no batch means for this measure. */
export const noBatchMeans = (run: string, kind: string) =>
  kind === "count"
    ? `One long run (${q(run)}): batch means are not formed for a count, so there is no interval.`
    : `One long run (${q(run)}): it has no batch means for this measure (too few values for the batches asked for), so there is no interval.`;

/** The summary's `interval_note` when the scenario's one run gave no value for the measure. */
export const noRunValue = (runs: readonly string[]) => `No run gave a value (${runList(runs)}), so there is no interval.`;

/** A comparison's `values` when both sides are single long runs with batch means. */
export const comparedBatches = (a: string, runA: string, ka: number, b: string, runB: string, kb: number) =>
  `the ${ka} batch means of run ${q(runA)} of ${q(a)} against the ${kb} batch means of run ${q(runB)} of ${q(b)}`;

/** A comparison's `assumes` for Welch on two runs' batch means. */
export const welchOnBatchesAssumes =
  "Each run's batch means are roughly independent and normal around the run's long-run mean, and the two runs are independent of each other (no common random numbers); their variances may differ (Welch). The lag-1 autocorrelations lag1_a and lag1_b check the first assumption: above 0.2 in size, the batches are probably too short.";

/** Why a paired comparison of two single long runs gives no interval. */
export const pairedLongRuns =
  "a paired comparison matches whole runs by id and needs at least two pairs, and two single long runs give one; pairing batch j of one run with batch j of the other would assume the runs stay in step batch by batch, which common random numbers do not ensure. Use method: welch, which compares the two runs' batch means.";

/** A comparison's `values` when one side is a single long run and the other is not. */
export const mixedBasis = (longRun: string) =>
  `the runs' values of both scenarios (one per run); the batch means of the single long run of ${q(longRun)} are not mixed with whole-run values of the other scenario`;

/** A comparison's `values` with run values on both sides. */
export const comparedRuns = "the runs' values of both scenarios (one per run)";
