import { bonferroniLevel, type DifferenceInterval, pairedInterval, welchInterval } from "../stats/compare.js";
import type { Study } from "../manifest/types.js";
import type { Comparison, Results, RunResult } from "../outcome/index.js";
import { differenceReading } from "./readings.js";
import { runBatchMeans } from "./summaries.js";
import * as batchMessages from "../messages/batchMeans.js";

/** Each run's primary value of a measure, by run id, in run order (runs without a value left out). */
export function valuesOf(runs: RunResult[], measure: string): Map<string, number> {
  const out = new Map<string, number>();
  for (const r of runs) {
    const v = r.measures[measure]?.value;
    if (typeof v === "number") out.set(r.id, v);
  }
  return out;
}

/**
 * Comparisons between scenarios (issue 4), each at the Bonferroni level 1 − (1 − confidence)/K
 * over all K listed comparisons, so that all hold together with at least the study's confidence.
 * Paired: runs matched by run id (common random numbers), t on the differences a − b. Welch:
 * difference of means with the Welch–Satterthwaite degrees of freedom (Welch 1947).
 */
export function compareScenarios(study: Study, results: Results): Comparison[] {
  const K = study.comparisons.length;
  if (K === 0) return [];
  const each = bonferroniLevel(study.confidence, K);
  return study.comparisons.map((c) => {
    const runsA = results.scenarios.find((s) => s.name === c.a)!.runs;
    const runsB = results.scenarios.find((s) => s.name === c.b)!.runs;
    const a = valuesOf(runsA, c.measure);
    const b = valuesOf(runsB, c.measure);
    const scA = study.scenarios.find((s) => s.name === c.a)!;
    const scB = study.scenarios.find((s) => s.name === c.b)!;
    const long = batchMeansBasis(c, runsA, runsB, scA.analysis.type === "batch-means", scB.analysis.type === "batch-means");
    let iv;
    let pairs: string[] | undefined;
    if (long?.values !== undefined) {
      iv = c.method === "paired" ? refusedPair(long.values.a, long.values.b, each) : welchInterval(long.values.a, long.values.b, each);
    } else if (c.method === "paired") {
      pairs = [...a.keys()].filter((id) => b.has(id));
      iv = pairedInterval(pairs.map((id) => a.get(id)!), pairs.map((id) => b.get(id)!), each);
    } else {
      iv = welchInterval([...a.values()], [...b.values()], each);
    }
    // The verdict in results.json is the same reading the report words (study/readings.ts).
    const verdict = ({
      "no-interval": `no interval: ${iv.note ?? "too few runs"}`,
      higher: `"${c.a}" is higher than "${c.b}" (the interval for the difference lies above zero)`,
      lower: `"${c.a}" is lower than "${c.b}" (the interval for the difference lies below zero)`,
      "no-difference": "no difference shown at this confidence (the interval for the difference contains zero)",
    } as const)[differenceReading(iv.ci_low, iv.ci_high)];
    return {
      measure: c.measure,
      a: c.a,
      b: c.b,
      method: c.method,
      diff_mean: iv.diff_mean,
      half_width: iv.half_width,
      ci_low: iv.ci_low,
      ci_high: iv.ci_high,
      df: iv.df,
      confidence_each: each,
      t: iv.t,
      standard_error: iv.standard_error,
      n_a: iv.n_a,
      n_b: iv.n_b,
      mean_a: iv.mean_a,
      mean_b: iv.mean_b,
      ...(pairs !== undefined ? { pairs: pairs.length } : {}),
      ...(long?.fields ?? {}),
      verdict,
    };
  });
}

/**
 * What a comparison that involves a scenario with batch means compares (null when neither side
 * has them, so those entries do not change). Both sides a single long run with batch means: the
 * two sets of batch means (`values`), Welch on them, with `basis`, `values` (in words), `assumes`
 * and the lag-1 checks. Otherwise the run values, as without batch means, and `basis` says so.
 */
function batchMeansBasis(
  c: Study["comparisons"][number],
  runsA: RunResult[],
  runsB: RunResult[],
  batchA: boolean,
  batchB: boolean,
): { values?: { a: number[]; b: number[] }; fields: Record<string, unknown> } | null {
  if (!batchA && !batchB) return null;
  const bmA = batchA && runsA.length === 1 ? runBatchMeans(runsA[0], c.measure) : null;
  const bmB = batchB && runsB.length === 1 ? runBatchMeans(runsB[0], c.measure) : null;
  if (bmA !== null && bmB !== null) {
    return {
      values: { a: bmA.batch_values, b: bmB.batch_values },
      fields: {
        basis: "batch-means",
        values: batchMessages.comparedBatches(c.a, runsA[0].id, bmA.batches, c.b, runsB[0].id, bmB.batches),
        assumes: batchMessages.welchOnBatchesAssumes,
        lag1_a: bmA.lag1,
        lag1_b: bmB.lag1,
      },
    };
  }
  const single = bmA !== null ? c.a : bmB !== null ? c.b : null;
  return { fields: { basis: "across-runs", values: single === null ? batchMessages.comparedRuns : batchMessages.mixedBasis(single) } };
}

/**
 * The values a comparison of two single long runs with batch means compares (Welch on the two sets
 * of batch means), labelled for its calculation table; null when the comparison is on run values.
 */
export function longRunValues(study: Study, results: Results, c: Study["comparisons"][number]): { a: { run: string; value: number }[]; b: { run: string; value: number }[] } | null {
  const runsA = results.scenarios.find((s) => s.name === c.a)!.runs;
  const runsB = results.scenarios.find((s) => s.name === c.b)!.runs;
  const scA = study.scenarios.find((s) => s.name === c.a)!;
  const scB = study.scenarios.find((s) => s.name === c.b)!;
  const long = batchMeansBasis(c, runsA, runsB, scA.analysis.type === "batch-means", scB.analysis.type === "batch-means");
  if (long?.values === undefined) return null;
  const label = (run: string, values: number[]) => values.map((value, i) => ({ run: `${run} batch ${i + 1}`, value }));
  return { a: label(runsA[0].id, long.values.a), b: label(runsB[0].id, long.values.b) };
}

/** A paired comparison of two single long runs: no interval, and the note says why (docs/statistics.md). */
function refusedPair(a: number[], b: number[], confidence: number): DifferenceInterval {
  const w = welchInterval(a, b, confidence);
  return { ...w, sd_diff: null, standard_error: null, df: null, t: null, half_width: null, ci_low: null, ci_high: null, note: batchMessages.pairedLongRuns };
}
