/**
 * One section per measure: what it means, its charts, each run's figures, the further figures
 * across runs, batch means and runs needed.
 */
import type { Measure, Scenario } from "../../manifest/types.js";
import { runsNeededWhy } from "../../messages/warnings.js";
import type { BatchMeansReading, Readings, RunStats, StudyOutcome } from "../../outcome/index.js";
import { formatPercent, MISSING } from "../number.js";
import { key, type ReportContext } from "./anchors.js";
import { measureCharts } from "./measureCharts.js";
import { fixedText } from "../../study/responseCurves.js";
import { type Cell, type MeasureSection, tableView, type TableView } from "./view.js";
import { batchMeansOf, capacityText, figureLabel, fmt, intervalText, kindLabel, link, primaryName, q, text } from "./words.js";

/** The section of the `mi`-th measure of the study. */
export function measureSection(ctx: ReportContext, name: string, mi: number): MeasureSection {
  const { study, results, unit, scenarioNames, measureOf, measureIds, batchIds, ivId, tbId } = ctx;
  const id = measureIds[mi];
  const m = measureOf(scenarioNames[0], name);
  const charts = measureCharts(ctx, name, m, id);
  const needed = runsNeededTable(m, results.scenarios);
  const curves = curvesTable(m, ctx);
  return {
    id,
    name: m.label,
    key: name,
    unit: m.unit,
    kind: kindLabel(m.kind),
    statement: statement(m, study.scenarios, unit),
    charts,
    runs: { ...runTable(m, results.scenarios, unit, tbId), id: ctx.runsTableId(name) },
    extras: extrasTable(m, results.scenarios, ivId),
    batchMeans: batchMeansTable(m, results.scenarios, ctx.outcome.readings, batchIds),
    runsNeeded: needed === null ? null : { ...needed, id: ctx.runsNeededId(name) },
    ...(curves === null ? {} : { curves }),
  };
}

/**
 * The points of the measure's response curves: one row per point, its mean and interval linked
 * to the arithmetic of the scenario's summary interval (across runs) or to its batch values.
 */
function curvesTable(m: Measure, ctx: ReportContext): TableView | null {
  const rows: Cell[][] = [];
  for (const curve of ctx.results.response_curves ?? []) {
    if (curve.measure !== m.name) continue;
    for (const g of curve.groups) for (const p of g.points) {
      const href = p.interval_method === "batch-means" ? (ctx.batchIds.get(key(p.scenario, m.name)) ?? null) : ctx.ivId(p.scenario, m.name, "value");
      rows.push([
        text(curve.factor), text(fixedText(g.fixed, fmt) || MISSING), text(p.scenario), text(fmt(p.value)),
        link(fmt(p.mean), href), link(intervalText(p.ci_low, p.ci_high), href), text(fmt(p.n)),
      ]);
    }
  }
  if (rows.length === 0) return null;
  return tableView(
    `${m.label}: the points of its response curves (${m.unit === null ? "" : `values in ${m.unit}; `}each point is its scenario's summary interval, linked to its arithmetic)`,
    ["Factor", "Other factors", "Scenario", "Factor value", "Mean", "Interval", "n"],
    rows,
  );
}

function statement(measure: Measure, scenarios: Scenario[], unit: string): string {
  const m = measure;
  let s: string;
  switch (m.kind) {
    case "level":
      s = m.source.type === "series"
        ? `The level of series ${q(m.source.series)} (${fmt(m.initial)} before its first row), averaged over time: area under the level divided by the window's length in ${unit}.`
        : `The number of entities that have had event ${q(m.source.enter)} and not yet event ${q(m.source.leave)}, averaged over time (area divided by the window's length in ${unit}).`;
      break;
    case "utilization": {
      const caps = scenarios.map((sc) => {
        const own = sc.measures.find((x) => x.name === m.name);
        return `${sc.name}: ${own ? capacityText(own) : capacityText(m)}`;
      });
      const busy = m.source.type === "series" ? `series ${q(m.source.series)}` : `entities that have had event ${q(m.source.enter)} and not yet event ${q(m.source.leave)}`;
      s = `Busy units (${busy}) over available units, as area(busy) / area(capacity). Capacity by scenario: ${caps.join("; ")}.`;
      break;
    }
    case "observation":
      s = m.source.type === "series"
        ? `The mean of the values of series ${q(m.source.series)} recorded inside the window.`
        : `For each entity, the time (${unit}) from its event ${q(m.source.start)} to its event ${q(m.source.end)}, recorded at the second event; entities without the second event are censored and counted, not averaged.`;
      break;
    case "count":
      s = `The number of rows of series ${q(m.series)} inside the window; the rate is that number per ${unit} of window.`;
      break;
  }
  if (m.where !== null) {
    const each = m.where.map((w) => `column ${q(w.column)} holds ${w.values.map((v) => q(String(v))).join(" or ")}`);
    s = `${s} Only rows whose ${each.join(" and whose ")} count.`;
  }
  // With one run per scenario there is no interval across runs to speak of.
  return scenarios.some((sc) => sc.runs.length >= 2) ? `${s} Across runs, each run's ${primaryName(m.kind)} is one value of the interval.` : s;
}

/** A run's figures in the runs table's column order, by kind. */
function runFigures(st: RunStats): (number | null)[] {
  switch (st.kind) {
    case "level":
      return [st.value, st.sd, st.min, st.max, st.final, st.area, st.duration];
    case "utilization":
      return [st.value];
    case "observation":
      return [st.value, st.sd, st.n, st.min, st.max];
    case "count":
      return [st.value, st.rate];
  }
}

/** Entity-derived measures: what the engine counted about the entities themselves. */
const ENTITY_FIGURES: { label: string; pick: (st: RunStats) => number | undefined }[] = [
  { label: "censored (still open at the end)", pick: (st) => (st.kind === "observation" ? st.censored : undefined) },
  { label: "entered", pick: (st) => (st.kind === "level" ? st.entered : undefined) },
  { label: "left", pick: (st) => (st.kind === "level" ? st.left : undefined) },
  { label: "inside at the end", pick: (st) => (st.kind === "level" ? st.inside_at_end : undefined) },
];

type FigureGroup = "quantiles" | "within" | "time_at_least";
const FIGURE_GROUPS: FigureGroup[] = ["quantiles", "within", "time_at_least"];

/** A run's per-key figures of one group (quantiles, shares within, shares of time at least), if it has them. */
function groupFigures(st: RunStats, group: FigureGroup): Record<string, number | null> | undefined {
  if (group === "time_at_least") return st.kind === "level" || st.kind === "utilization" ? st.time_at_least : undefined;
  return st.kind === "observation" ? st[group] : undefined;
}

function runTable(
  m: Measure,
  scenarios: StudyOutcome["results"]["scenarios"],
  unit: string,
  tbId: (s: string, r: string | null, m: string) => string | null,
): TableView {
  const { name, kind } = m;
  // The measure's unit is said once, in the caption (the columns stay narrow); times are in the study's time unit.
  const u = m.unit;
  const cols: Record<Measure["kind"], string[]> = {
    level: ["time average", "time-weighted sd", "min", "max", "final", "area", `duration (${unit})`],
    utilization: ["utilization"],
    observation: ["mean", "sd", "n", "min", "max"],
    count: ["count", `rate (per ${unit})`],
  };
  const units = u === null ? ""
    : kind === "level" ? `values in ${u}, area in ${u} × ${unit}; `
      : kind === "count" ? `counts in ${u}; `
        : kind === "utilization" && u === "fraction" ? "shares of capacity, from 0 to 1; " : `values in ${u}; `;
  const present = ENTITY_FIGURES.filter((e) => scenarios.some((sr) => sr.runs.some((r) => {
    const st = r.measures[name];
    return st !== undefined && e.pick(st) !== undefined;
  })));
  const columns = [...cols[kind], ...present.map((e) => e.label)];
  const extraKeys: { group: FigureGroup; key: string }[] = [];
  for (const sr of scenarios) for (const r of sr.runs) {
    const st = r.measures[name];
    if (!st) continue;
    for (const group of FIGURE_GROUPS) {
      const g = groupFigures(st, group);
      if (g !== undefined) for (const k of Object.keys(g)) {
        if (!extraKeys.some((e) => e.group === group && e.key === k)) extraKeys.push({ group, key: k });
      }
    }
  }
  const rows: Cell[][] = [];
  for (const sr of scenarios) for (const r of sr.runs) {
    const st: RunStats | undefined = r.measures[name];
    const href = tbId(sr.name, r.id, name);
    const values = st === undefined ? columns.map(() => null) : [...runFigures(st), ...present.map((e) => e.pick(st) ?? null)];
    const cells = values.map((v, i) => (i === 0 ? link(fmt(v), href) : text(fmt(v))));
    const extras = extraKeys.map((e) => text(fmt((st === undefined ? undefined : groupFigures(st, e.group))?.[e.key] ?? null)));
    rows.push([text(sr.name), text(r.id), ...cells, ...extras]);
  }
  return tableView(
    `${m.label}: each run's figures (${units}the first number links to the run's calculation table)`,
    ["Scenario", "Run", ...columns, ...extraKeys.map((e) => figureLabel(kind, `${e.group}.${e.key}`))],
    rows,
  );
}

function extrasTable(
  m: Measure,
  scenarios: StudyOutcome["results"]["scenarios"],
  ivId: (s: string, m: string, f: string) => string | null,
): TableView | null {
  const { name, kind } = m;
  const rows: Cell[][] = [];
  for (const group of FIGURE_GROUPS) {
    for (const sr of scenarios) {
      const g = sr.summary[name]?.[group];
      if (g === undefined) continue;
      for (const [k, s] of Object.entries(g)) {
        const href = ivId(sr.name, name, `${group}.${k}`);
        rows.push([
          text(figureLabel(kind, `${group}.${k}`)), text(sr.name),
          link(fmt(s.mean), href), link(fmt(s.half_width), href), link(intervalText(s.ci_low, s.ci_high), href), text(String(s.n)),
        ]);
      }
    }
  }
  if (rows.length === 0) return null;
  return tableView(
    `${m.label}: further figures across runs (each run's figure is one value of the interval; shares run from 0 to 1)`,
    ["Figure", "Scenario", "Mean", "Half-width", "Interval", "Runs"],
    rows,
  );
}

/** The words of the study's lag-1 check of one run's batch means (src/study/readings.ts). */
function lag1Words(reading: BatchMeansReading["lag1"], limit: number): string {
  return { none: "no lag-1 (too few batches)", "too-large": `|lag-1| > ${limit}: batches too short`, ok: "ok" }[reading];
}

function batchMeansTable(m: Measure, scenarios: StudyOutcome["results"]["scenarios"], readings: Readings, batchIds: Map<string, string>): TableView | null {
  const name = m.name;
  const rows: Cell[][] = [];
  for (const sr of scenarios) for (const r of sr.runs) {
    const b = batchMeansOf(r.measures[name]);
    const reading = readings.batchMeans.find((x) => x.scenario === sr.name && x.run === r.id && x.measure === name);
    if (b === undefined || reading === undefined) continue;
    const flagged = reading.lag1 === "too-large";
    const flag: Cell = { ...text(lag1Words(reading.lag1, readings.lag1Limit)), ...(flagged ? { flag: true } : {}) };
    rows.push([
      text(sr.name), link(r.id, batchIds.get(key(sr.name, name)) ?? null), text(fmt(b.batches)), text(fmt(b.mean)),
      text(fmt(b.half_width)), text(intervalText(b.ci_low, b.ci_high)), text(fmt(b.lag1)), flag,
    ]);
  }
  if (rows.length === 0) return null;
  return tableView(
    `${m.label}: batch means within each run (${m.unit === null ? "" : `values in ${m.unit}; `}interval for the run's long-run mean; each run links to its batch values in the appendix)`,
    ["Scenario", "Run", "Batches", "Mean", "Half-width", "Interval", "Lag-1 correlation", "Check"],
    rows,
  );
}

function runsNeededTable(m: Measure, scenarios: StudyOutcome["results"]["scenarios"]): TableView | null {
  const name = m.name;
  const rows: Cell[][] = [];
  for (const sr of scenarios) {
    const s = sr.summary[name];
    if (s?.target === undefined) continue;
    const need = s.runs_needed ?? null;
    const t = s.target;
    const target = "relative" in t ? `relative error ${formatPercent(t.relative)}` : `half-width ${fmt(t.half_width)}`;
    const aim = s.target_half_width ?? null;
    const why = need === null && s.runs_needed_reason != null ? runsNeededWhy(s.runs_needed_reason, s.n) : null;
    rows.push([
      text(sr.name), text(target), text(fmt(aim)), text(String(s.n)), text(fmt(s.half_width)),
      why === null ? text(fmt(need)) : { ...text(`${MISSING} ${why}`), flag: true },
    ]);
  }
  if (rows.length === 0) return null;
  return tableView(
    `${m.label}: runs needed for the target precision (${m.unit === null ? "" : `half-widths in ${m.unit}; `}smallest k with t · s / √k ≤ the half-width aimed at; a relative error γ aims at γ/(1 + γ) · |mean|)`,
    ["Scenario", "Target", "Half-width aimed at", "Runs now", "Half-width now", "Runs needed"],
    rows,
  );
}
