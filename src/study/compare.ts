import { bonferroniLevel, pairedInterval, welchInterval } from "../stats/compare.js";
import type { Study } from "../manifest/types.js";
import type { Comparison, Results, RunResult } from "../outcome/index.js";

function valuesOf(runs: RunResult[], measure: string): Map<string, number> {
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
    let iv;
    let pairs: string[] | undefined;
    if (c.method === "paired") {
      pairs = [...a.keys()].filter((id) => b.has(id));
      iv = pairedInterval(pairs.map((id) => a.get(id)!), pairs.map((id) => b.get(id)!), each);
    } else {
      iv = welchInterval([...a.values()], [...b.values()], each);
    }
    let verdict: string;
    if (iv.ci_low === null || iv.ci_high === null) verdict = `no interval: ${iv.note ?? "too few runs"}`;
    else if (iv.ci_low > 0) verdict = `"${c.a}" is higher than "${c.b}" (the interval for the difference lies above zero)`;
    else if (iv.ci_high < 0) verdict = `"${c.a}" is lower than "${c.b}" (the interval for the difference lies below zero)`;
    else verdict = `no difference shown at this confidence (the interval for the difference contains zero)`;
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
      verdict,
    };
  });
}
