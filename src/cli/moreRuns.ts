import type { Study } from "../manifest/types.js";
import type { Results } from "../outcome/index.js";
import { selectBest, selectionProblem } from "../stats/selectBest.js";
import { selectionInput } from "../study/selections.js";

/** One scenario's runs: held, needed in all (null when no number can be given), and still to make. */
export interface RunsToMake {
  scenario: string;
  runs_present: number;
  runs_needed: number | null;
  runs_more: number | null;
}

/**
 * What `sojourn more-runs` found: for each `select:` entry, the runs each scenario needs in all
 * for the selection (N_i, from its first stage) and how many more to make; for each measure with a
 * precision `target`, the runs each scenario needs for it (results' `runs_needed`) and how many more.
 * For people (moreRunsText) and scripts (--json).
 */
export function moreRunsPlan(study: Study, results: Results) {
  const more = (present: number, needed: number | null): RunsToMake["runs_more"] => (needed === null ? null : Math.max(0, needed - present));
  const selections = study.selections.map((s, index) => {
    const input = selectionInput(results, s);
    const problem = selectionProblem(input);
    const base = { entry: index + 1, measure: s.measure, better: s.better, indifference: s.delta, probability: s.pcs, method: s.method, first_stage: s.firstStage };
    if (problem !== null) return { ...base, problem, complete: false, scenarios: [] as RunsToMake[] };
    const r = selectBest(input);
    return {
      ...base,
      procedure: r.procedure,
      constant: { symbol: r.constant.symbol, value: r.constant.value },
      complete: r.complete,
      selected: r.selected,
      scenarios: r.scenarios.map((sc): RunsToMake => ({ scenario: sc.scenario, runs_present: sc.runs_present, runs_needed: sc.runs_needed, runs_more: sc.runs_missing })),
    };
  });
  const targets = study.measureNames.flatMap((name) => {
    const measure = study.scenarios[0].measures.find((m) => m.name === name)!;
    const withTarget = study.scenarios.filter((sc) => sc.measures.find((m) => m.name === name)!.target !== null);
    if (withTarget.length === 0) return [];
    return [{
      measure: name,
      label: measure.label,
      scenarios: withTarget.map((sc) => {
        const summary = results.scenarios.find((r) => r.name === sc.name)!.summary[name];
        const present = summary.n;
        const needed = summary.runs_needed ?? null;
        return { scenario: sc.name, target: summary.target ?? null, runs_present: present, runs_needed: needed, runs_more: more(present, needed), reason: summary.runs_needed_reason ?? null };
      }),
    }];
  });
  return { title: study.title, selections, targets };
}

export type MoreRunsPlan = ReturnType<typeof moreRunsPlan>;

/** The plan in lines for people: one block per selection and per target, one line per scenario. */
export function moreRunsText(plan: MoreRunsPlan): string[] {
  const lines: string[] = [];
  const row = (r: RunsToMake) =>
    r.runs_needed === null ? `  ${r.scenario}: ${r.runs_present} runs, no number of runs needed can be given` : `  ${r.scenario}: ${r.runs_needed} runs in all, ${r.runs_present} present, ${r.runs_more} more`;
  for (const s of plan.selections) {
    lines.push(`select entry ${s.entry}: the best ${s.measure} (${s.better} is better), indifference ${s.indifference}, probability ${s.probability}, ${s.method}, first stage ${s.first_stage} runs`);
    if ("problem" in s) {
      lines.push(`  no selection: ${s.problem}`);
      continue;
    }
    lines.push(`  ${s.procedure}, ${s.constant.symbol} = ${s.constant.value.toPrecision(6)}`);
    for (const r of s.scenarios) lines.push(row(r));
    lines.push(s.complete ? `  every scenario has its runs: the selection is made (${s.selected ?? ""} selected)` : "  make the runs still missing (new seeds, listed after the first stage), then report again");
  }
  for (const t of plan.targets) {
    lines.push(`target of ${t.measure}:`);
    for (const r of t.scenarios) {
      const what = r.target === null ? "" : "half_width" in r.target ? ` (half-width ${r.target.half_width})` : ` (relative half-width ${r.target.relative})`;
      lines.push(r.runs_needed === null ? `  ${r.scenario}${what}: ${r.runs_present} runs, no number of runs needed can be given (${r.reason ?? "unknown"})` : `${row(r)}${what}`);
    }
  }
  if (lines.length === 0) lines.push("nothing asks for more runs: the manifest has no select: entry and no measure with a target");
  return lines;
}
