/**
 * The charts of a measure's section: interval and run values across runs, level traces,
 * histogram and distribution of observations, and time at each value.
 */
import type { TopLevelSpec } from "vega-lite";
import type { Measure, Study } from "../../manifest/types.js";
import type { LevelTrace, ResponseCurve, StudyOutcome, TimeAtValueMean } from "../../outcome/index.js";
import { fixedText } from "../../study/responseCurves.js";
import {
  ecdfChart,
  ecdfSteps,
  evenSample,
  histogramChart,
  intervalChart,
  MAX_ECDF_POINTS,
  MAX_HISTOGRAM_VALUES,
  responseCurveChart,
  runsChart,
  timeAtValueChart,
  traceChart,
  tracedAsBand,
} from "../charts.js";
import { formatPercent } from "../number.js";
import type { ReportContext } from "./anchors.js";
import type { Chart } from "./view.js";
import { fmt, primaryName, q, valueTitle, withUnit } from "./words.js";

/** The charts of one measure's section, with ids under the section's id. */
export function measureCharts(ctx: ReportContext, name: string, m: Measure, id: string): Chart[] {
  const { study, outcome, results, unit, scenarioNames, readingOf } = ctx;
  const label = m.label;
  const vTitle = valueTitle(m);
  const charts: Chart[] = [];
  let chartNo = 0;
  const chartId = (what: string) => `${id}-chart-${++chartNo}-${what}`;
  const severalRuns = results.scenarios.some((sr) => sr.runs.length >= 2);
  // The interval each scenario's summary row shows (the study's choice: across runs or batch means).
  const readings = results.scenarios.map((sr) => readingOf(sr.name, name));
  const fromBatches = results.scenarios.filter((_, i) => readings[i]?.method === "batch-means").map((sr) => q(sr.name));

  // Charts across runs say nothing when no scenario has two runs (one dot, no interval), unless
  // a scenario's interval is from the batch means of its one long run.
  if (severalRuns || fromBatches.length > 0) charts.push({
    id: chartId("interval"),
    caption: `${label}: the mean and its ${formatPercent(study.confidence)} confidence interval, by scenario` +
      (m.unit === null ? "" : `; unit: ${m.unit}`) + ". " +
      (fromBatches.length === 0
        ? "Each interval is across the runs (one value per run)."
        : fromBatches.length === results.scenarios.length
          ? "Each interval is from the batch means of the scenario's single long run (Student t, k − 1 degrees of freedom)."
          : `The intervals of ${fromBatches.join(", ")} are from the batch means of a single long run (Student t, k − 1 degrees of freedom); the others are across the runs.`),
    spec: intervalChart(results.scenarios.map((sr, i) => {
      const r = readings[i];
      return { scenario: sr.name, mean: r?.mean ?? null, low: r?.ci_low ?? null, high: r?.ci_high ?? null, label: fmt(r?.mean ?? null) };
    }), fromBatches.length === 0 ? vTitle : valueTitle(m, false)),
  });
  if (severalRuns) charts.push({
    id: chartId("runs"),
    caption: `${label}: each run's ${primaryName(m.kind)} (dots) and the scenario mean (bar)` + (m.unit === null ? "." : `; unit: ${m.unit}.`),
    spec: runsChart(results.scenarios.flatMap((sr) => sr.runs.flatMap((r) => {
      const v = r.measures[name]?.value;
      return v === undefined || v === null ? [] : [{ scenario: sr.name, run: r.id, value: v }];
    })), scenarioNames, vTitle),
  });
  for (const sr of results.scenarios) {
    const tr = outcome.traces.find((t) => t.scenario === sr.name && t.measure === name);
    if (!tr) continue;
    charts.push({ id: chartId("trace"), ...traceView(m, sr.name, tr, unit) });
  }
  if (m.kind === "observation") {
    const rows = outcome.samples.filter((s) => s.measure === name)
      .flatMap((s) => evenSample(s.values, Math.floor(MAX_HISTOGRAM_VALUES / Math.max(1, results.scenarios.length))).map((value) => ({ scenario: s.scenario, value })));
    if (rows.length > 0) {
      const sampled = outcome.samples.filter((s) => s.measure === name).some((s) => s.values.length < s.total);
      charts.push({
        id: chartId("histogram"),
        caption: `${label}: histogram of the observations inside the window, all runs of each scenario together` +
          (m.unit === null ? "" : ` (values in ${m.unit})`) + "." +
          (sampled ? " Drawn from an even sample of the observations; the statistics use all of them." : ""),
        spec: histogramChart(rows, scenarioNames, withUnit(label, m.unit ?? "observed value"), "observations"),
      });
    }
    const ecdf = ecdfView(name, m, outcome.samples.filter((s) => s.measure === name), scenarioNames, study);
    if (ecdf !== null) charts.push({ id: chartId("distribution"), ...ecdf });
  }
  if (m.kind === "level" || m.kind === "utilization") {
    const tav = timeAtValueView(m, outcome.readings.timeAtValue, unit);
    if (tav !== null) charts.push({ id: chartId("time-at-value"), ...tav });
  }
  for (const curve of results.response_curves ?? []) {
    if (curve.measure !== name) continue;
    const view = curveView(m, curve, study.confidence);
    if (view !== null) charts.push({ id: chartId("response-curve"), ...view });
  }
  return charts;
}

/** The chart of a measure against one factor (results.json `response_curves`), or null when no point has a mean. */
function curveView(m: Measure, curve: ResponseCurve, confidence: number): Omit<Chart, "id"> | null {
  const groups = curve.groups.map((g) => ({
    label: fixedText(g.fixed, fmt),
    points: g.points.flatMap((p) => (p.mean === null ? [] : [{ scenario: p.scenario, value: p.value, mean: p.mean, low: p.ci_low, high: p.ci_high, label: fmt(p.mean) }])),
  })).filter((g) => g.points.length > 0);
  if (groups.length === 0) return null;
  const others = Object.keys(curve.groups[0]?.fixed ?? {});
  const missing = curve.groups.flatMap((g) => g.points.filter((p) => p.mean === null || p.ci_low === null).map((p) => q(p.scenario)));
  const caption = [
    `${m.label} against ${q(curve.factor)}: each scenario's mean (dot) and ${formatPercent(confidence)} confidence interval (bar), the interval of its summary row, ` +
      `joined in order of ${q(curve.factor)}` + (m.unit === null ? "." : `; unit: ${m.unit}.`),
    groups.length > 1 ? `One panel per value of ${others.map(q).join(" and ")}.` : others.length > 0 ? `${groups[0].label}.` : "",
    "The lines only guide the eye: no value between two points was simulated, and no model is fitted.",
    missing.length > 0 ? `Without an interval: ${missing.join(", ")}.` : "",
    curve.alone !== undefined ? `Not on this curve (no other value of ${q(curve.factor)} with the same other factors): ${curve.alone.map(q).join(", ")}.` : "",
  ].filter((x) => x !== "").join(" ");
  return { caption, spec: responseCurveChart({ groups, factorTitle: curve.factor, valueTitle: valueTitle(m, false) }) };
}

/** The empirical distribution chart of an observation measure, or null without samples. */
function ecdfView(
  name: string,
  m: Measure,
  samples: StudyOutcome["samples"],
  scenarios: string[],
  study: Study,
): Omit<Chart, "id"> | null {
  const rows = samples.flatMap((s) => ecdfSteps(s.values).map((p) => ({ scenario: s.scenario, value: p.value, share: p.share })));
  if (rows.length === 0) return null;
  const within = [...new Set(study.scenarios.flatMap((sc) => sc.measures)
    .filter((x): x is Extract<Measure, { kind: "observation" }> => x.name === name && x.kind === "observation")
    .flatMap((x) => x.within))].sort((a, b) => a - b);
  const sampled = samples.filter((s) => s.values.length < s.total);
  const thinned = samples.some((s) => s.values.length > MAX_ECDF_POINTS);
  const caption = [
    `${m.label}: share of the observations at or below each value (empirical distribution), all runs of each scenario pooled` +
      (m.unit === null ? "" : `, values in ${m.unit}`) + ".",
    within.length > 0
      ? `Dashed rules mark the ${within.length === 1 ? "threshold" : "thresholds"} ${within.map((x) => fmt(x)).join(", ")}; the table of further figures gives the mean of the per-run shares within ${within.length === 1 ? "it" : "them"}, which can differ from the pooled share read here.`
      : "",
    ...sampled.map((s) => `${s.scenario}: drawn from a strided sample of ${fmt(s.values.length)} of the ${fmt(s.total)} observations.`),
    thinned ? `Each line has at most ${MAX_ECDF_POINTS} steps, at evenly spaced ranks.` : "",
    "The statistics use every observation.",
  ].filter((x) => x !== "").join(" ");
  return {
    caption,
    spec: ecdfChart({
      rows,
      scenarios: scenarios.filter((sc) => samples.some((s) => s.scenario === sc && s.values.length > 0)),
      thresholds: within.map((x) => ({ value: x, label: `≤ ${fmt(x)}` })),
      valueTitle: withUnit(m.label, m.unit ?? "observed value"),
      shareTitle: "share of observations ≤ value",
    }),
  };
}

/** The time-at-value bar chart of a level or utilization, or null when no run has the figures. */
function timeAtValueView(
  m: Extract<Measure, { kind: "level" | "utilization" }>,
  means: TimeAtValueMean[],
  unit: string,
): Omit<Chart, "id"> | null {
  const { name, kind, label } = m;
  const rows: { scenario: string; value: number; share: number }[] = [];
  const partial: string[] = [];
  const used: string[] = [];
  // The means over the runs are the study's (src/study/readings.ts), in scenario order.
  for (const t of means) {
    if (t.measure !== name) continue;
    used.push(t.scenario);
    if (t.runs < t.of) partial.push(`${t.scenario}: ${t.runs} of ${t.of} runs`);
    for (const s of t.shares) rows.push({ scenario: t.scenario, value: s.value, share: s.share });
  }
  if (rows.length === 0) return null;
  return {
    caption: `${label}: share of the window's time spent at each ${kind === "utilization" ? "number of busy units" : withUnit("value", m.unit)} (time at the value ÷ window length, both in ${unit}), ` +
      "averaged over the runs of each scenario; a run that never took a value counts as 0 for it." +
      (partial.length > 0 ? ` Only the runs with a time-at-value table are averaged (${partial.join("; ")}).` : "") +
      " Each run's own shares are in its time-at-value table in the appendix.",
    spec: timeAtValueChart(rows, used, kind === "utilization" ? `${label}: busy units` : withUnit(`${label}: level`, m.unit), "share of time"),
  };
}

/** A run's level over time: caption and chart (the level, or busy against capacity for a utilization). */
function traceView(m: Measure, scenario: string, tr: LevelTrace, unit: string): { caption: string; spec: TopLevelSpec } {
  const { kind, label } = m;
  const band = tracedAsBand(tr);
  const util = kind === "utilization";
  const shape = band
    ? `the ${util ? "busy level and the capacity" : "level"} as a band from the lowest to the highest value in each of ${tr.level.slices.length} equal slices of the window, with each slice's time average as a line (the run has too many changes to draw one by one; every row counts in the numbers)`
    : util ? "the busy level (area under it shaded) and the capacity" : "the level (area under it shaded)";
  const average = util
    ? `the running utilization from ${fmt(tr.from)} ${unit} (busy area over capacity area so far, right axis)`
    : `the running time average from ${fmt(tr.from)} ${unit} (area so far over elapsed time)`;
  const caption = `${label} over time in run ${tr.run} of ${scenario}: ${shape}, and ${average}` +
    (tr.from > tr.start ? `; the warm-up up to ${fmt(tr.from)} ${unit} is the grey band` : "") + ".";
  const spec = traceChart({
    start: tr.start, from: tr.from, to: tr.to, warmup: tr.warmup, level: tr.level, capacity: tr.capacity,
    timeTitle: `time (${unit})`,
    valueTitle: util ? `${label}: units busy and available` : withUnit(`${label}: level`, m.unit),
    levelLabel: util ? "busy" : "level",
    capacityLabel: "capacity",
    averageLabel: util ? "running utilization" : "running time average",
    averageTitle: util ? `${label}: running utilization` : null,
    warmupLabel: "warm-up",
  });
  return { caption, spec };
}
