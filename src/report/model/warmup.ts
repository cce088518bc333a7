/**
 * The warm-up section: each scenario's MSER-5 estimate with its figures and the warm-up plot.
 */
import type { Measure } from "../../manifest/types.js";
import type { StudyOutcome } from "../../outcome/index.js";
import { MAX_WELCH_POINTS, welchChart, welchMovingAverage, welchWindow } from "../charts.js";
import { anchor, type ReportContext } from "./anchors.js";
import { type Chart, type Fact, tableView, type WarmupView } from "./view.js";
import { fmt, q, text } from "./words.js";

/** The warm-up section, or null when no scenario estimated its warm-up. */
export function warmupSection(ctx: ReportContext): { intro: string; scenarios: WarmupView[] } | null {
  const { results, unit, measureOf } = ctx;
  const warmupViews = results.scenarios.flatMap((sr, i) => {
    const v = warmupView(sr, i + 1, unit, measureOf);
    return v === null ? [] : [v];
  });
  return warmupViews.length === 0 ? null : {
    intro: "MSER-5 chooses the warm-up from the data: it drops the first d batches of five values that make the standard error of what remains smallest. " +
      "For a level or utilization the values are the runs' time averages over equal time slices, averaged over the runs slice by slice; the warm-up plot shows them with their moving average, so the choice can be judged by eye. " +
      "For an observation measure MSER-5 runs on each run's observations, and the scenario's warm-up is the latest of the runs' choices.",
    scenarios: warmupViews,
  };
}

const LIMIT_WARNING = "MSER-5 chose the largest truncation it allows (half of the batches): the warm-up may not be over within the runs. Make the runs longer before trusting these figures.";

/** The warm-up estimate of one scenario as shown, or null when the scenario has none. */
function warmupView(
  sr: StudyOutcome["results"]["scenarios"][number],
  index: number,
  unit: string,
  measureOf: (scenario: string, name: string) => Measure,
): WarmupView | null {
  const est = sr.warmup_estimate;
  if (est === undefined) return null;
  const measure = est.measure;
  // What the client reads: the measure's label (its name if the study lacks it).
  let label = measure;
  try { label = measureOf(sr.name, measure).label; } catch { /* keep the name */ }
  const time = est.time;
  const d = est.d;
  const batches = est.batches;
  const method = est.method.toUpperCase();
  const id = anchor("warmup", index, sr.name);
  const facts: Fact[] = [
    { label: "Method", value: method },
    { label: "Measure", value: label },
  ];

  if ("slice_means" in est) {
    const means = est.slice_means;
    const slice = est.slice;
    const start = sr.runs.length > 0 ? Math.min(...sr.runs.map((r) => r.start)) : 0;
    const m = means.length;
    const w = welchWindow(m);
    facts.push(
      { label: "Slice width", value: `${fmt(slice)} ${unit}` },
      { label: "Slices (m)", value: fmt(m) },
      { label: "Batches of 5 slices", value: fmt(batches) },
      { label: "Batches dropped (d)", value: fmt(d) },
      { label: "Warm-up", value: `${fmt(time)} ${unit}` },
      { label: "Moving average", value: w > 0 ? `w = ${w} (${2 * w + 1} slices)` : "none (fewer than 4 slices)" },
    );
    let chart: Chart | null = null;
    if (m > 0) {
      const ys = means;
      const mid = (j: number) => start + (j + 0.5) * slice;
      const smoothed = welchMovingAverage(ys, w).map((mean, j) => ({ time: mid(j), mean }));
      let kind: Measure["kind"] = "level";
      try { kind = measureOf(sr.name, measure).kind; } catch { /* the estimate names a measure the study lacks: keep the level wording */ }
      chart = {
        id: `${id}-chart`,
        caption: `Warm-up plot of ${label} in ${sr.name}: the average over the ${sr.runs.length} runs of each ${fmt(slice)}-${unit} slice, drawn at the slice's midpoint (thin line)` +
          (w > 0 ? `, its moving average over ${2 * w + 1} slices (w = ${w}, thick line)` : "") +
          `, and the warm-up MSER-5 chose, ${fmt(time)} ${unit} (dashed rule).` +
          (m > MAX_WELCH_POINTS ? ` The lines are drawn from an even sample of ${MAX_WELCH_POINTS} of the ${fmt(m)} slices.` : ""),
        spec: welchChart({
          slices: ys.map((mean, j) => ({ time: mid(j), mean })),
          smoothed,
          warmup: time,
          timeTitle: `time (${unit})`,
          valueTitle: kind === "utilization" ? `${label}: slice utilization` : `${label}: slice average`,
          sliceLabel: "average of the runs per slice",
          smoothLabel: w > 0 ? `moving average (w = ${w})` : "moving average",
          warmupLabel: `warm-up ${fmt(time)} ${unit}`,
        }),
      };
    }
    return {
      id,
      scenario: sr.name,
      lead: `Warm-up ${fmt(time)} ${unit}, chosen by ${method} on ${q(label)}: the first ${fmt(d)} of ${fmt(batches)} batches of five ${fmt(slice)}-${unit} slices are dropped.`,
      facts,
      chart,
      runs: null,
      warning: est.at_limit ? LIMIT_WARNING : null,
    };
  }

  // MSER-5 on each run's observations.
  const runs = est.runs;
  facts.push({ label: "Warm-up", value: `${fmt(time)} ${unit}` });
  const table = tableView(
    `${label} in ${sr.name}: MSER-5 on each run's observations in time order (the scenario's warm-up is the latest first kept observation)`,
    ["Run", "Batches of 5", "Batches dropped d", `First kept observation (${unit})`, "At the limit"],
    runs.map((r) => [
      text(r.run), text(fmt(r.batches)), text(fmt(r.d)), text(fmt(r.time)),
      text(r.at_limit ? "yes" : "no"),
    ]),
  );
  return {
    id,
    scenario: sr.name,
    lead: `Warm-up ${fmt(time)} ${unit}, chosen by ${method} on the observations of ${q(label)}, run by run: the latest time at which a run's kept observations begin.`,
    facts,
    chart: null,
    runs: table,
    warning: runs.some((r) => r.at_limit) ? LIMIT_WARNING : null,
  };
}

