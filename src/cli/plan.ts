import type { Measure, Study } from "../manifest/types.js";
import type { StudyOutcome } from "../outcome/index.js";

/** What a measure reads, and its `where` when it has one. */
function reads(m: Measure): string {
  const base = readsSource(m);
  if (m.where === null) return base;
  return `${base}, only rows where ${m.where.map((w) => `${w.column} is ${w.values.map((v) => JSON.stringify(v)).join(" or ")}`).join(" and ")}`;
}

function readsSource(m: Measure): string {
  switch (m.kind) {
    case "level":
      return m.source.type === "series" ? `series "${m.source.series}"` : `entities entering at "${m.source.enter}", leaving at "${m.source.leave}"`;
    case "observation":
      return m.source.type === "series" ? `series "${m.source.series}"` : `entity time from "${m.source.start}" to "${m.source.end}"`;
    case "utilization":
      return `${m.source.type === "series" ? `series "${m.source.series}"` : `entities entering at "${m.source.enter}", leaving at "${m.source.leave}"`} over capacity ${m.capacity.type === "constant" ? m.capacity.value : `series "${m.capacity.series}"`}`;
    case "count":
      return `series "${m.series}"`;
  }
}

/** What `sojourn check` found: the plan it would run, for people (planText) and scripts (--json). */
export function studyPlan(study: Study, outcome: StudyOutcome) {
  return {
    title: study.title,
    time_unit: study.timeUnit,
    confidence: study.confidence,
    scenarios: study.scenarios.map((sc, i) => {
      const result = outcome.results.scenarios[i];
      return {
        name: sc.name,
        ...(sc.layout !== "events" ? { layout: sc.layout } : {}),
        warmup: sc.warmup.type === "none" ? null : sc.warmup.type === "fixed" ? sc.warmup.time : { method: "mser-5", measure: sc.warmup.measure, slice: sc.warmup.slice, estimated: result.warmup ?? null },
        analysis: sc.analysis.type === "batch-means" ? { method: "batch-means", batches: sc.analysis.batches } : { method: "replications" },
        runs: sc.runs.map((r) => {
          const input = outcome.inputs.find((x) => x.scenario === sc.name && x.run === r.id)!;
          return { id: r.id, file: r.file, start: r.start, end: r.end, rows: input.rows, left_out: input.left_out };
        }),
        measures: sc.measures.map((m) => ({ name: m.name, kind: m.kind, reads: reads(m) })),
      };
    }),
    comparisons: study.comparisons,
    warnings: outcome.warnings,
  };
}

export function planText(plan: ReturnType<typeof studyPlan>): string[] {
  const out: string[] = [];
  out.push(`Study "${plan.title}" (time unit ${plan.time_unit}, confidence ${plan.confidence})`);
  for (const sc of plan.scenarios) {
    const w = sc.warmup === null ? "no warm-up" : typeof sc.warmup === "number" ? `warm-up ${sc.warmup}` : `warm-up by MSER-5 on ${sc.warmup.measure}: ${sc.warmup.estimated ?? "none"}`;
    const layout = "layout" in sc ? `, layout ${sc.layout}` : "";
    out.push(`  scenario ${sc.name}: ${sc.runs.length} run(s)${layout}, ${w}, ${sc.analysis.method === "batch-means" ? `batch means (${sc.analysis.batches} batches)` : "replications"}`);
    for (const r of sc.runs) {
      const lo = r.left_out;
      out.push(`    run ${r.id}  ${r.file}  window [${r.start}, ${r.end ?? "no end"}]  ${r.rows} rows (${lo.after_end} after end, ${lo.before_window} before collection, ${lo.unused_series} of unread series)`);
    }
  }
  out.push("  measures:");
  for (const m of plan.scenarios[0]?.measures ?? []) out.push(`    ${m.name} (${m.kind}): ${m.reads}`);
  for (const c of plan.comparisons) out.push(`  compare ${c.measure}: ${c.a} vs ${c.b} (${c.method})`);
  if (plan.warnings.length > 0) {
    out.push(`  ${plan.warnings.length} warning(s):`);
    for (const w of plan.warnings) out.push(`    ${[w.scenario, w.run, w.measure].filter((x) => x !== null).join(" / ")}: ${w.message}`);
  }
  out.push("Everything was read without error. Next: sojourn report MANIFEST --out DIR");
  return out;
}
