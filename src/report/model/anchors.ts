/**
 * Anchors of the report page: readable, unique and HTML-safe ids, assigned once per build.
 */
import type { Measure, Study } from "../../manifest/types.js";
import type { StudyOutcome, SummaryReading } from "../../outcome/index.js";
import { batchMeansOf } from "./words.js";


/** Lower-case letters, digits and single hyphens, at most 40 characters ("" when none remain). */
export function slug(text: string): string {
  return text
    .normalize("NFKD")
    .replace(/[\u0300-\u036f]/g, "")
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, "-")
    .replace(/^-+|-+$/g, "")
    .slice(0, 40)
    .replace(/-+$/, "");
}

/** A unique, HTML-safe anchor: prefix, a running number, and a readable slug of the names. */
export function anchor(prefix: string, index: number, ...names: (string | null)[]): string {
  const s = slug(names.filter((n): n is string => n !== null).join(" "));
  return s === "" ? `${prefix}-${index}` : `${prefix}-${index}-${s}`;
}

export const key = (...parts: (string | null)[]) => JSON.stringify(parts);

/** The anchor of the note on the calculation tables that are files only. */
export const TABLES_ELSEWHERE = "tables-elsewhere";

/** What every section builder needs: the study, its outcome, and the anchors of the page. */
export interface ReportContext {
  study: Study;
  outcome: StudyOutcome;
  results: StudyOutcome["results"];
  unit: string;
  scenarioNames: string[];
  measureOf: (scenario: string, name: string) => Measure;
  tableAnchors: string[];
  intervalIds: Map<string, string>;
  measureIds: string[];
  batchIds: Map<string, string>;
  /** Per comparison of results.json: the anchor of its row in the comparisons section. */
  comparisonRowIds: string[];
  /** Per comparison of results.json: the anchor of its arithmetic in the appendix, null when it has none. */
  comparisonIds: (string | null)[];
  ivId: (scenario: string, measure: string, figure: string) => string | null;
  tbId: (scenario: string, run: string | null, measure: string) => string | null;
  /** What the client reads for a measure: its `label`, and its `unit` (null when it has none). */
  labelOf: (name: string) => string;
  unitOf: (name: string) => string | null;
  /** The study's reading of a summary row (src/study/readings.ts). */
  readingOf: (scenario: string, measure: string) => SummaryReading | undefined;
  /** The anchors of a measure's run table and runs-needed table, and of each warning. */
  runsTableId: (measure: string) => string;
  runsNeededId: (measure: string) => string;
  warningIds: string[];
}

/** The context of one build: the anchors of calculation tables, interval derivations, measures and batch values. */
export function reportContext(study: Study, outcome: StudyOutcome): ReportContext {
const results = outcome.results;
const unit = study.timeUnit;
const scenarioNames = results.scenarios.map((s) => s.name);
const measureOf = (scenario: string, name: string): Measure => {
  const sc = study.scenarios.find((s) => s.name === scenario) ?? study.scenarios[0];
  const m = sc?.measures.find((x) => x.name === name) ?? study.scenarios.flatMap((s) => s.measures).find((x) => x.name === name);
  if (!m) throw new Error(`measure ${name} is in the outcome but not in the study`);
  return m;
};

// Anchors of calculation tables and interval derivations, assigned once.
// Every table has its own anchor; a run value links to its measure's first (main) table.
// A table the page does not show (no preview rows) links to the note that says where its file is.
const tableAnchors = outcome.tables.map((t, i) => (t.preview === null ? TABLES_ELSEWHERE : anchor("table", i + 1, t.measure, t.scenario, t.run)));
const tableIds = new Map<string, string>();
outcome.tables.forEach((t, i) => {
  const k = key(t.scenario, t.run, t.measure);
  if (!tableIds.has(k)) tableIds.set(k, tableAnchors[i]);
});
const intervalIds = new Map<string, string>();
outcome.intervals.forEach((a, i) => {
  const k = key(a.scenario, a.measure, a.figure);
  if (!intervalIds.has(k)) intervalIds.set(k, anchor("calc", i + 1, a.measure, a.scenario, a.figure === "value" ? null : a.figure));
});
const measureIds = study.measureNames.map((m, i) => anchor("measure", i + 1, m));
const batchIds = new Map<string, string>();
let batchNo = 0;
for (const name of study.measureNames) for (const sr of results.scenarios) {
  if (sr.runs.some((r) => batchMeansOf(r.measures[name]) !== undefined)) batchIds.set(key(sr.name, name), anchor("batches", ++batchNo, name, sr.name));
}
const comparisonRowIds = (results.comparisons ?? []).map((c, i) => anchor("comparison", i + 1, c.measure, c.a, c.b));
const comparisonIds = (results.comparisons ?? []).map((c, i) =>
  (outcome.comparisons.some((x) => x.index === i) ? anchor("comparison-steps", i + 1, c.measure, c.a, c.b) : null));
const ivId = (scenario: string, measure: string, figure: string) => intervalIds.get(key(scenario, measure, figure)) ?? null;
const tbId = (scenario: string, run: string | null, measure: string) => tableIds.get(key(scenario, run, measure)) ?? null;
const labelOf = (name: string) => measureOf(scenarioNames[0] ?? "", name).label;
const unitOf = (name: string) => measureOf(scenarioNames[0] ?? "", name).unit;
const readingOf = (scenario: string, measure: string) => outcome.readings.summaries.find((r) => r.scenario === scenario && r.measure === measure);
const measureId = (name: string) => measureIds[study.measureNames.indexOf(name)] ?? anchor("measure", 0, name);
const runsTableId = (name: string) => `${measureId(name)}-runs`;
const runsNeededId = (name: string) => `${measureId(name)}-runs-needed`;
const warningIds = outcome.warnings.map((_, i) => `warning-${i + 1}`);
  return {
    study, outcome, results, unit, scenarioNames, measureOf, tableAnchors, intervalIds, measureIds, batchIds, comparisonRowIds, comparisonIds, ivId, tbId,
    labelOf, unitOf, readingOf, runsTableId, runsNeededId, warningIds,
  };
}
