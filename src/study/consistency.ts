import type { LevelMeasure, ObservationMeasure, Scenario } from "../manifest/types.js";
import type { Check, LevelRunStats, ObservationRunStats } from "../outcome/index.js";
import type { RunAnalysis } from "./analyzeRun.js";

export type { Check };

/** Relative difference |a − b| / max(|a|, |b|), 0 when both are 0. */
function relDiff(a: number, b: number): number {
  const scale = Math.max(Math.abs(a), Math.abs(b));
  return scale === 0 ? 0 : Math.abs(a - b) / scale;
}

/** Relative tolerance of the Little's law identity (common practice: a few hundred ulps of the sums). */
export const LITTLE_TOLERANCE = 1e-9;

/**
 * Checks of the run data itself (issue 4), listed in the audit appendix; a failed check is a
 * warning, never an error.
 *
 * - Little's law (Little 1961) as a sample-path identity: when an entity level (enter A, leave B)
 *   and an entity duration (start A, end B) follow the same events and the system is empty at the
 *   window's start and end, area = sum of durations, so L = (n / T) · W exactly. L counts the
 *   entities inside: the level less its `initial`.
 * - Conservation: level at c + entered − left = inside at the end.
 * - Utilization within [0, 1].
 * - Entity levels never negative.
 */
export function consistencyChecks(scenario: Scenario, analyses: RunAnalysis[]): Check[] {
  return analyses.flatMap((a) => runChecks(scenario, a));
}

/** The checks of one run (see `consistencyChecks`), in the order the appendix lists them. */
export function runChecks(scenario: Scenario, a: Pick<RunAnalysis, "result" | "outputs">): Check[] {
  const checks: Check[] = [];
  const entityLevels = scenario.measures.filter((m): m is LevelMeasure => m.kind === "level" && m.source.type === "entities");
  const entityDurations = scenario.measures.filter((m): m is ObservationMeasure => m.kind === "observation" && m.source.type === "entities");
  const run = a.result.id;
  for (const lm of entityLevels) {
    const src = lm.source as { enter: string; leave: string };
    // An entity level always carries entered, left and inside_at_end (measures/level.ts).
    const st = a.result.measures[lm.name] as LevelRunStats & Required<Pick<LevelRunStats, "entered" | "left" | "inside_at_end">>;
    const out = a.outputs.get(lm.name)!;
    const atStart = (out.tables[0].table.rows[0]?.[1] as number | undefined) ?? lm.initial;
    const insideAtStart = atStart - lm.initial;
    const balance = insideAtStart + st.entered - st.left;
    checks.push({
      check: "conservation",
      run,
      measure: lm.name,
      passed: balance === st.inside_at_end,
      message: `${insideAtStart} inside at the window start + ${st.entered} entered − ${st.left} left = ${balance}; inside at the end: ${st.inside_at_end}`,
    });
    if (st.min < lm.initial) {
      checks.push({ check: "level-non-negative", run, measure: lm.name, passed: false, message: `the number inside fell to ${st.min - lm.initial}` });
    }
    for (const om of entityDurations) {
      const os = om.source as { start: string; end: string };
      if (os.start !== src.enter || os.end !== src.leave) continue;
      const obs = a.result.measures[om.name] as ObservationRunStats;
      const n = obs.n;
      const T = st.duration;
      // L is the time-average number inside: the level less its `initial` (a level that starts at
      // 3 with nobody inside has L = 0, not 3). Older run summaries lack insideArea.
      const L = (out.insideArea ?? st.area - lm.initial * T) / T;
      const W = obs.mean ?? 0;
      const lambdaW = (n / T) * W;
      const applies = insideAtStart === 0 && st.inside_at_end === 0;
      const diff = relDiff(L, lambdaW);
      checks.push({
        check: "littles-law",
        run,
        measure: `${lm.name} / ${om.name}`,
        passed: !applies || diff <= LITTLE_TOLERANCE,
        message: applies
          ? `L = ${L}${lm.initial !== 0 ? ` (time-average number inside: the level less its initial ${lm.initial})` : ""}; λ·W = (${n} / ${T}) · ${W} = ${lambdaW}; relative difference ${diff}`
          : `not an identity here (${insideAtStart} inside at the start, ${st.inside_at_end} at the end): L = ${L}, λ·W = ${lambdaW}`,
        applies,
        L,
        lambda_w: lambdaW,
        relative_difference: diff,
      });
    }
  }
  for (const m of scenario.measures) {
    if (m.kind !== "utilization") continue;
    const u = a.result.measures[m.name].value as number;
    const within = u >= 0 && u <= 1;
    checks.push({ check: "utilization-range", run, measure: m.name, passed: within, message: `utilization ${u} ${within ? "lies" : "does not lie"} within [0, 1]` });
  }
  return checks;
}
