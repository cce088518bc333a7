/**
 * The cover: the study's facts and one line per scenario (runs, window, warm-up, analysis).
 */
import { formatPercent, MISSING } from "../number.js";
import type { ReportContext } from "./anchors.js";
import type { Fact, ScenarioLine } from "./view.js";
import { dateText, fmt, warmupText } from "./words.js";

/** The cover's facts and scenario lines. */
export function coverView(ctx: ReportContext, meta: { toolVersion: string; generatedAt: string }): { facts: Fact[]; scenarios: ScenarioLine[] } {
  const { study, results, unit } = ctx;
  const labelOf = (name: string) => (study.measureNames.includes(name) ? ctx.labelOf(name) : name);
  const totalRuns = results.scenarios.reduce((a, s) => a + s.runs.length, 0);
  const facts: Fact[] = [
    { label: "Time unit", value: unit },
    { label: "Confidence", value: formatPercent(study.confidence) },
    { label: "Warm-up", value: warmupText(study.warmup, unit, labelOf) },
    { label: "Scenarios", value: String(results.scenarios.length) },
    { label: "Runs", value: `${totalRuns} (${results.scenarios.map((s) => `${s.runs.length}`).join(" + ")})` },
    { label: "Measures", value: String(study.measureNames.length) },
    { label: "Tool", value: `Sojourn ${meta.toolVersion}` },
    { label: "Report date", value: dateText(meta.generatedAt) },
  ];
  const coverScenarios: ScenarioLine[] = results.scenarios.map((sr) => {
    const sc = study.scenarios.find((s) => s.name === sr.name);
    const windows = [...new Set(sr.runs.map((r) => `${fmt(r.start)} to ${r.end === null ? "last row" : fmt(r.end)} ${unit}`))];
    let warm = sc ? warmupText(sc.warmup, unit, labelOf) : MISSING;
    const est = sr.warmup_estimate;
    if (est !== undefined) {
      warm = `${fmt(est.time)} ${unit}, by ${est.method.toUpperCase()} on ${labelOf(est.measure)}: ` +
        `first ${fmt(est.d)} of ${fmt(est.batches)} batches dropped`;
    }
    // Which interval the summary shows follows the study's choice (interval_method), not the run count alone.
    const fromBatches = Object.values(sr.summary).some((s) => s.interval_method === "batch-means");
    const analysis = sc?.analysis.type === "batch-means"
      ? fromBatches
        ? `one long run; intervals from its ${sc.analysis.batches} batch means`
        : `independent runs; batch means within each run (${sc.analysis.batches} batches) as a check`
      : "independent runs";
    return { name: sr.name, runs: String(sr.runs.length), window: windows.join("; "), warmup: warm, analysis };
  });
  return { facts, scenarios: coverScenarios };
}
