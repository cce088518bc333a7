/**
 * One section per measure: what it means, its charts, each run's figures, the further figures
 * across runs, batch means and runs needed.
 */
import type { Measure, Scenario } from "../../manifest/types.js";
import { runsNeededWhy } from "../../messages/warnings.js";
import type { RunResult, RunStats, StudyOutcome, Summary } from "../../study/outcome.js";
import { formatPercent, MISSING } from "../number.js";
import { key, type ReportContext } from "./anchors.js";
import { measureCharts } from "./measureCharts.js";
import { type Cell, type MeasureSection, tableView, type TableView } from "./view.js";
import { capacityText, figureLabel, fmt, intervalText, isRecord, kindLabel, link, numOrNull, primaryName, q, text } from "./words.js";

/** The section of the `mi`-th measure of the study. */
export function measureSection(ctx: ReportContext, name: string, mi: number): MeasureSection {
  const { study, results, unit, scenarioNames, measureOf, measureIds, batchIds, ivId, tbId } = ctx;
  const id = measureIds[mi];
  const m = measureOf(scenarioNames[0], name);
  const charts = measureCharts(ctx, name, m, id);
  return {
    id,
    name,
    kind: kindLabel(m.kind),
    statement: statement(m, study.scenarios, unit),
    charts,
    runs: runTable(name, m.kind, results.scenarios, unit, tbId),
    extras: extrasTable(name, m.kind, results.scenarios, ivId),
    batchMeans: batchMeansTable(name, results.scenarios, batchIds),
    runsNeeded: runsNeededTable(name, results.scenarios),
  };
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
      s = `Busy units (series ${q(m.series)}) over available units, as area(busy) / area(capacity). Capacity by scenario: ${caps.join("; ")}.`;
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
  // With one run per scenario there is no interval across runs to speak of.
  return scenarios.some((sc) => sc.runs.length >= 2) ? `${s} Across runs, each run's ${primaryName(m.kind)} is one value of the interval.` : s;
}

function runTable(
  name: string,
  kind: Measure["kind"],
  scenarios: StudyOutcome["results"]["scenarios"],
  unit: string,
  tbId: (s: string, r: string | null, m: string) => string | null,
): TableView {
  const cols: Record<Measure["kind"], string[]> = {
    level: ["time average", "time-weighted sd", "min", "max", "final", "area", `duration (${unit})`],
    utilization: ["utilization"],
    observation: ["mean", "sd", "n", "min", "max"],
    count: ["count", `rate (per ${unit})`],
  };
  const fields: Record<Measure["kind"], string[]> = {
    level: ["value", "sd", "min", "max", "final", "area", "duration"],
    utilization: ["value"],
    observation: ["value", "sd", "n", "min", "max"],
    count: ["value", "rate"],
  };
  // Entity-derived measures: what the engine counted about the entities themselves.
  const entityFields: [string, string][] = [
    ["censored", "censored (still open at the end)"],
    ["entered", "entered"],
    ["left", "left"],
    ["inside_at_end", "inside at the end"],
  ];
  const present = entityFields.filter(([f]) => scenarios.some((sr) => sr.runs.some((r) => typeof r.measures[name]?.[f] === "number")));
  cols[kind] = [...cols[kind], ...present.map(([, label]) => label)];
  fields[kind] = [...fields[kind], ...present.map(([f]) => f)];
  const extraKeys: { group: string; key: string }[] = [];
  for (const sr of scenarios) for (const r of sr.runs) {
    const st = r.measures[name];
    if (!st) continue;
    for (const group of ["quantiles", "within", "time_at_least"]) {
      const g = st[group];
      if (g && typeof g === "object") for (const k of Object.keys(g)) {
        if (!extraKeys.some((e) => e.group === group && e.key === k)) extraKeys.push({ group, key: k });
      }
    }
  }
  const rows: Cell[][] = [];
  for (const sr of scenarios) for (const r of sr.runs) {
    const st: RunStats | undefined = r.measures[name];
    const href = tbId(sr.name, r.id, name);
    const cells = fields[kind].map((f, i) => {
      const v = st?.[f as keyof RunStats];
      const t = fmt(typeof v === "number" ? v : null);
      return i === 0 ? link(t, href) : text(t);
    });
    const extras = extraKeys.map((e) => {
      const g = st?.[e.group] as Record<string, number> | undefined;
      return text(fmt(g?.[e.key] ?? null));
    });
    rows.push([text(sr.name), text(r.id), ...cells, ...extras]);
  }
  return tableView(
    `${name}: each run's figures (the first number links to the run's calculation table)`,
    ["Scenario", "Run", ...cols[kind], ...extraKeys.map((e) => figureLabel(kind, `${e.group}.${e.key}`))],
    rows,
  );
}

function extrasTable(
  name: string,
  kind: Measure["kind"],
  scenarios: StudyOutcome["results"]["scenarios"],
  ivId: (s: string, m: string, f: string) => string | null,
): TableView | null {
  const rows: Cell[][] = [];
  for (const group of ["quantiles", "within", "time_at_least"]) {
    for (const sr of scenarios) {
      const g = sr.summary[name]?.[group] as Record<string, Summary> | undefined;
      if (!g || typeof g !== "object") continue;
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
    `${name}: further figures across runs (each run's figure is one value of the interval; shares run from 0 to 1)`,
    ["Figure", "Scenario", "Mean", "Half-width", "Interval", "Runs"],
    rows,
  );
}

/** Size of the lag-1 correlation of batch means above which the batches are flagged as too short. */
export const LAG1_FLAG = 0.2;

function batchMeansTable(name: string, scenarios: StudyOutcome["results"]["scenarios"], batchIds: Map<string, string>): TableView | null {
  const rows: Cell[][] = [];
  for (const sr of scenarios) for (const r of sr.runs as RunResult[]) {
    const b = r.measures[name]?.batch_means;
    if (!isRecord(b)) continue;
    const lag1 = numOrNull(b.lag1);
    const flagged = lag1 !== null && Math.abs(lag1) > LAG1_FLAG;
    const flag: Cell = { ...text(lag1 === null ? "no lag-1 (too few batches)" : flagged ? `|lag-1| > ${LAG1_FLAG}: batches too short` : "ok"), ...(flagged ? { flag: true } : {}) };
    rows.push([
      text(sr.name), link(r.id, batchIds.get(key(sr.name, name)) ?? null), text(fmt(numOrNull(b.batches))), text(fmt(numOrNull(b.mean))),
      text(fmt(numOrNull(b.half_width))), text(intervalText(numOrNull(b.ci_low), numOrNull(b.ci_high))), text(fmt(lag1)), flag,
    ]);
  }
  if (rows.length === 0) return null;
  return tableView(
    `${name}: batch means within each run (interval for the run's long-run mean; each run links to its batch values in the appendix)`,
    ["Scenario", "Run", "Batches", "Mean", "Half-width", "Interval", "Lag-1 correlation", "Check"],
    rows,
  );
}

function runsNeededTable(name: string, scenarios: StudyOutcome["results"]["scenarios"]): TableView | null {
  const rows: Cell[][] = [];
  for (const sr of scenarios) {
    const s = sr.summary[name];
    if (s?.target === undefined) continue;
    const need = typeof s.runs_needed === "number" ? s.runs_needed : null;
    const t = s.target as { half_width?: number; relative?: number } | undefined;
    let target = MISSING;
    if (t && typeof t.relative === "number") target = `relative error ${formatPercent(t.relative)}`;
    else if (t && typeof t.half_width === "number") target = `half-width ${fmt(t.half_width)}`;
    const aim = typeof s.target_half_width === "number" ? s.target_half_width : null;
    const why = need === null && typeof s.runs_needed_reason === "string" ? runsNeededWhy(s.runs_needed_reason, s.n) : null;
    rows.push([
      text(sr.name), text(target), text(fmt(aim)), text(String(s.n)), text(fmt(s.half_width)),
      why === null ? text(fmt(need)) : { ...text(`${MISSING} ${why}`), flag: true },
    ]);
  }
  if (rows.length === 0) return null;
  return tableView(
    `${name}: runs needed for the target precision (smallest k with t · s / √k ≤ the half-width aimed at; a relative error γ aims at γ/(1 + γ) · |mean|)`,
    ["Scenario", "Target", "Half-width aimed at", "Runs now", "Half-width now", "Runs needed"],
    rows,
  );
}
