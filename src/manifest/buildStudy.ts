/**
 * The meaning checks and the normalization: a schema-valid `StudySpec` becomes a `Study` with
 * every default filled in, every name resolved and every run file found. Each check throws a
 * located message for the first problem it meets.
 */
import { DEFAULT_ROW_LIMIT } from "../ingest/feeder.js";
import { manifestMessages } from "../messages/index.js";
import { closest } from "./didYouMean.js";
import type { KeyPath } from "./keyPath.js";
import type { ManifestSource } from "./manifestSource.js";
import { resolveRuns, type ResolvedRun } from "./resolveRuns.js";
import {
  KEYS_FOR_KIND,
  OVERRIDABLE_KEYS,
  type AnalysisSpec,
  type ComparisonSpec,
  type MeasureSpec,
  type OverrideSpec,
  type ScenarioSpec,
  type SelectionSpec,
  type StudySpec,
  type TargetSpec,
  type WarmupSpec,
} from "./spec.js";
import type { Analysis, ColumnMap, Layout, WhereFilter, Comparison, Measure, MeasureSource, RunRef, Scenario, Selection, Study, Target, Warmup } from "./types.js";

export const DEFAULT_COLUMNS: ColumnMap = { time: "time", series: "series", value: "value", entity: "entity" };
export const DEFAULT_QUANTILES: readonly number[] = [0.5, 0.9, 0.95];
export const DEFAULT_CONFIDENCE = 0.95;
export const DEFAULT_TIME_UNIT = "time";
export const DEFAULT_TABLES = { maxRows: 5000, edgeRows: 500 };
/** The most time slices an MSER-5 warm-up may cut one run's window into (docs/manifest.md). */
export const MAX_SLICES = 100_000;

/** What `buildStudy` needs besides the spec. */
export interface StudyContext {
  /** Absolute path of the manifest. */
  manifestPath: string;
  manifestText: string;
  /** Absolute folder the run paths are relative to. */
  baseDir: string;
  /** The title when the manifest gives none. */
  defaultTitle: string;
}

/** Own-property lookup, so that a name such as `constructor` never finds `Object.prototype`. */
function own<T>(record: Record<string, T> | undefined, key: string): T | undefined {
  return record !== undefined && Object.hasOwn(record, key) ? record[key] : undefined;
}

export function buildStudy(spec: StudySpec, source: ManifestSource, context: StudyContext): Study {
  const place = (path: KeyPath, key = false) => source.place(path, { key });
  const measureNames = spec.measures.map((m) => m.name);
  const scenarioNames = spec.scenarios.map((s) => s.name);
  const measureByName = new Map(spec.measures.map((m) => [m.name, m]));
  const scenarioSet = new Set(scenarioNames);

  // Study-wide settings.
  const confidence = spec.confidence ?? DEFAULT_CONFIDENCE;
  const timeUnit = spec.time_unit ?? DEFAULT_TIME_UNIT;
  if (!(confidence > 0 && confidence < 1)) throw manifestMessages.confidenceOutOfRange(place(["confidence"]), confidence);
  checkAnalysis(spec.analysis, ["analysis"]);
  const tables = toTables(spec.tables);
  checkUniqueNames("scenario", scenarioNames, "scenarios");
  checkUniqueNames("measure", measureNames, "measures");

  // Measures and their per-scenario overrides.
  spec.measures.forEach((measure, i) => {
    const path: KeyPath = ["measures", i];
    if (measure.kind === "level" || measure.kind === "observation" || measure.kind === "utilization") {
      const fromForm = measure.kind !== "observation" ? "{enter: SERIES, leave: SERIES}" : "{start: SERIES, end: SERIES}";
      if (measure.series !== undefined && measure.from !== undefined) throw manifestMessages.seriesAndFrom(place(path), measure.name);
      if (measure.series === undefined && measure.from === undefined) throw manifestMessages.noSource(place(path), measure.name, measure.kind, fromForm);
    }
    checkOptionValues(measure, measure.name, path);
    for (const key of ["label", "unit"] as const) checkShownText(measure[key], [...path, key]);
    for (const [scenario, options] of Object.entries(measure.scenarios ?? {})) {
      const optionsPath: KeyPath = [...path, "scenarios", scenario];
      if (!scenarioSet.has(scenario)) {
        throw manifestMessages.unknownScenario(place(optionsPath, true), scenario, scenarioNames, closest(scenario, scenarioNames));
      }
      checkOverride(options, measure, optionsPath);
    }
  });
  const warmup = spec.warmup === undefined ? ({ type: "none" } as const) : toWarmup(spec.warmup, ["warmup"]);

  // Scenarios.
  const factors = checkFactors();
  const scenarios = spec.scenarios.map((scenario, i) => buildScenario(scenario, i));
  const comparisons = (spec.compare ?? []).map((c, k) => buildComparison(c, k));
  const selections = (spec.select ?? []).map((s, k) => buildSelection(s, k));

  return {
    manifestPath: context.manifestPath,
    manifestText: context.manifestText,
    title: spec.title ?? context.defaultTitle,
    timeUnit,
    confidence,
    warmup,
    scenarios,
    measureNames,
    measureSources: new Map(
      spec.measures.map((m, i): [string, MeasureSource] => {
        const key = m.series !== undefined ? "series" : m.from !== undefined ? "from" : null;
        return [m.name, { place: place(key === null ? ["measures", i] : ["measures", i, key]), mayBeAbsent: m.may_be_absent === true }];
      }),
    ),
    comparisons,
    selections,
    tables,
    factors,
  };

  /**
   * The study's factor names: those of the first scenario with `factors`, in its order. Every
   * scenario must name the same factors (a response curve holds the other factors fixed, which
   * needs each scenario's value of each); the schema has checked that each value is a finite
   * number. A factor name is shown in the report, so it holds no control character.
   */
  function checkFactors(): string[] {
    const withFactors = spec.scenarios.findIndex((sc) => sc.factors !== undefined);
    if (withFactors === -1) return [];
    const names = Object.keys(spec.scenarios[withFactors].factors!);
    for (const name of names) checkShownText(name, ["scenarios", withFactors, "factors", name]);
    spec.scenarios.forEach((sc, i) => {
      const own = sc.factors === undefined ? [] : Object.keys(sc.factors);
      const missing = names.filter((n) => !own.includes(n));
      const extra = own.filter((n) => !names.includes(n));
      if (missing.length === 0 && extra.length === 0) return;
      const at = sc.factors === undefined ? place(["scenarios", i]) : extra.length > 0 ? place(["scenarios", i, "factors", extra[0]], true) : place(["scenarios", i, "factors"]);
      throw manifestMessages.factorsDiffer(at, sc.name, missing, extra, spec.scenarios[withFactors].name);
    });
    return names;
  }

  /**
   * The table options. An edge_rows as written must leave room for checkpoints (2 · edge_rows
   * < max_rows); the default 500 gives way to a quarter of a smaller max_rows (TableBuilder).
   */
  function toTables(written: StudySpec["tables"]): Study["tables"] {
    const maxRows = written?.max_rows ?? DEFAULT_TABLES.maxRows;
    const edgeRows = written?.edge_rows ?? DEFAULT_TABLES.edgeRows;
    if (written?.edge_rows !== undefined && 2 * edgeRows >= maxRows) throw manifestMessages.edgeRowsTooMany(place(["tables", "edge_rows"]), edgeRows, maxRows);
    return { maxRows, edgeRows };
  }

  function checkUniqueNames(what: "scenario" | "measure", names: string[], key: string): void {
    const firstAt = new Map<string, number>();
    names.forEach((name, i) => {
      const first = firstAt.get(name);
      if (first !== undefined) throw manifestMessages.duplicateName(place([key, i, "name"]), what, name, source.lineOf([key, first]));
      firstAt.set(name, i);
    });
  }

  /** A text shown to the reader (`label`, `unit`): not only spaces, no control character (the schema checks its length). */
  function checkShownText(text: string | undefined, path: KeyPath): void {
    if (text === undefined) return;
    let position = 0;
    for (const ch of text) {
      position++;
      const code = ch.codePointAt(0) as number;
      if (isControl(code)) throw manifestMessages.controlCharacter(place(path), code, position);
    }
    if (text.trim() === "") throw manifestMessages.blankText(place(path));
  }

  function checkAnalysis(analysis: AnalysisSpec | undefined, path: KeyPath): void {
    if (analysis?.method === "batch-means" && analysis.batches < 2) {
      throw manifestMessages.tooFewBatches(place([...path, "batches"]), analysis.batches);
    }
  }

  /** Values that the schema cannot judge: capacity > 0 and quantile probabilities in [0, 1]. */
  function checkOptionValues(options: OverrideSpec, measure: string, path: KeyPath): void {
    if (typeof options.capacity === "number" && options.capacity <= 0) {
      throw manifestMessages.capacityNotPositive(place([...path, "capacity"]), measure, options.capacity);
    }
    (options.quantiles ?? []).forEach((p, j) => {
      if (!(p >= 0 && p <= 1)) throw manifestMessages.quantileOutOfRange(place([...path, "quantiles", j]), p);
    });
    for (const key of ["quantiles", "within", "at_least"] as const) {
      (options[key] ?? []).forEach((x, j, all) => {
        // === takes 0 and -0 as one number, as their figure keys ("0") do
        const first = all.findIndex((y) => y === x);
        if (first !== j) throw manifestMessages.listedTwice(place([...path, key, j]), key, x, first);
      });
    }
  }

  /** An override's keys must apply to the measure's kind, and its values must be valid. */
  function checkOverride(options: OverrideSpec, measure: MeasureSpec, path: KeyPath): void {
    const allowed = KEYS_FOR_KIND[measure.kind];
    for (const key of Object.keys(options)) {
      if (!(allowed as readonly string[]).includes(key)) {
        throw manifestMessages.overrideNotForKind(place([...path, key], true), key, measure.name, measure.kind, allowed);
      }
    }
    checkOptionValues(options, measure.name, path);
  }

  function toWarmup(written: WarmupSpec, path: KeyPath): Warmup {
    if (typeof written === "number") return { type: "fixed", time: written };
    const measure = measureByName.get(written.measure);
    if (measure === undefined) {
      throw manifestMessages.unknownMeasure(place([...path, "measure"]), written.measure, measureNames, closest(written.measure, measureNames));
    }
    if (measure.kind === "count") throw manifestMessages.mserCountMeasure(place([...path, "measure"]), written.measure);
    return { type: "mser-5", measure: written.measure, slice: written.slice };
  }

  function buildScenario(scenario: ScenarioSpec, i: number): Scenario {
    const path: KeyPath = ["scenarios", i];
    const name = scenario.name;
    checkAnalysis(scenario.analysis, [...path, "analysis"]);
    for (const [measureName, options] of Object.entries(scenario.measures ?? {})) {
      const optionsPath: KeyPath = [...path, "measures", measureName];
      const measure = measureByName.get(measureName);
      if (measure === undefined) {
        throw manifestMessages.unknownMeasure(place(optionsPath, true), measureName, measureNames, closest(measureName, measureNames));
      }
      checkOverride(options, measure, optionsPath);
    }
    if (scenario.start !== undefined && scenario.end !== undefined && scenario.end <= scenario.start) {
      throw manifestMessages.endNotAfterStart(place([...path, "end"]), name, null, scenario.start, scenario.end);
    }

    const runs = resolveRuns(scenario, i, context.baseDir, source).map((run) => toRunRef(run, scenario, path));

    const warmupPath: KeyPath = scenario.warmup !== undefined ? [...path, "warmup"] : ["warmup"];
    const warmup = scenario.warmup !== undefined ? toWarmup(scenario.warmup, warmupPath) : spec.warmup !== undefined ? toWarmup(spec.warmup, warmupPath) : ({ type: "none" } as const);
    if (warmup.type === "fixed") {
      for (const run of runs) {
        if (run.end !== null && warmup.time >= run.end) throw manifestMessages.warmupPastEnd(place(warmupPath), name, run.id, warmup.time, run.end);
      }
    }

    const measures = spec.measures.map((m) => toMeasure(m, own(m.scenarios, name), own(scenario.measures, m.name), timeUnit));
    for (const measure of measures) {
      if (measure.kind !== "level" && measure.kind !== "utilization") continue;
      const open = runs.find((run) => run.end === null);
      if (open !== undefined) throw manifestMessages.needsEnd(place(path), measure.name, measure.kind, name, open.id);
    }
    if (warmup.type === "mser-5") checkSlices(warmup, measures, runs, name, [...warmupPath, "slice"]);

    const analysis: Analysis = toAnalysis(scenario.analysis ?? spec.analysis);
    const columns: ColumnMap = { ...DEFAULT_COLUMNS, ...spec.columns, ...scenario.columns };
    const layout: Layout = scenario.layout ?? spec.layout ?? "events";
    const maxRowBytes = scenario.max_row_bytes ?? spec.max_row_bytes ?? DEFAULT_ROW_LIMIT;
    const factorValues = factors.map((f) => ({ name: f, value: own(scenario.factors, f) as number }));
    return { name, runs, measures, warmup, analysis, columns, layout, maxRowBytes, factors: factorValues };
  }

  /**
   * MSER-5 on a level or utilization keeps one average per slice of each run's window: the
   * number of slices, (end - start) / slice, is bounded once the windows are known.
   */
  function checkSlices(warmup: Extract<Warmup, { type: "mser-5" }>, measures: Measure[], runs: RunRef[], scenario: string, slicePath: KeyPath): void {
    const measure = measures.find((m) => m.name === warmup.measure);
    if (measure === undefined || (measure.kind !== "level" && measure.kind !== "utilization")) return;
    for (const run of runs) {
      if (run.end === null) continue;
      const slices = Math.floor((run.end - run.start) / warmup.slice);
      if (slices > MAX_SLICES) throw manifestMessages.tooManySlices(place(slicePath), scenario, run.id, warmup.slice, run.start, run.end, slices, MAX_SLICES);
    }
  }

  function toRunRef(run: ResolvedRun, scenario: ScenarioSpec, scenarioPath: KeyPath): RunRef {
    const start = run.start ?? scenario.start ?? 0;
    const end = run.end ?? scenario.end ?? null;
    if (end !== null && end <= start) {
      const at: KeyPath = run.end !== undefined ? [...run.origin, "end"] : run.start !== undefined ? [...run.origin, "start"] : [...scenarioPath, "end"];
      throw manifestMessages.endNotAfterStart(place(at), scenario.name, run.id, start, end);
    }
    return { id: run.id, path: run.path, file: run.file, start, end };
  }

  function buildComparison(comparison: ComparisonSpec, k: number): Comparison {
    const path: KeyPath = ["compare", k];
    if (!measureNames.includes(comparison.measure)) {
      throw manifestMessages.unknownMeasure(place([...path, "measure"]), comparison.measure, measureNames, closest(comparison.measure, measureNames));
    }
    comparison.scenarios.forEach((s, j) => {
      if (!scenarioNames.includes(s)) throw manifestMessages.unknownScenario(place([...path, "scenarios", j]), s, scenarioNames, closest(s, scenarioNames));
    });
    const [a, b] = comparison.scenarios;
    if (a === b) throw manifestMessages.sameScenarioTwice(place([...path, "scenarios", 1]), a);
    const method = comparison.method ?? "welch";
    if (method === "paired") {
      const idsA = scenarios[scenarioNames.indexOf(a)].runs.map((r) => r.id);
      const idsB = scenarios[scenarioNames.indexOf(b)].runs.map((r) => r.id);
      const setA = new Set(idsA);
      const setB = new Set(idsB);
      const onlyA = idsA.filter((id) => !setB.has(id));
      const onlyB = idsB.filter((id) => !setA.has(id));
      if (onlyA.length > 0 || onlyB.length > 0) throw manifestMessages.pairedRunsDiffer(place(path), a, b, onlyA, onlyB);
    }
    return { measure: comparison.measure, a, b, method };
  }

  /**
   * A `select:` entry: a known measure, two or more different known scenarios (default all),
   * 1/k < P* < 1 (default the study's confidence), n0 runs present in every scenario (n0 may be
   * left out only when they all have the same number of runs), and for `paired` the same run ids
   * in the same order in every scenario's first stage.
   */
  function buildSelection(selection: SelectionSpec, k: number): Selection {
    const path: KeyPath = ["select", k];
    if (!measureNames.includes(selection.measure)) {
      throw manifestMessages.unknownMeasure(place([...path, "measure"]), selection.measure, measureNames, closest(selection.measure, measureNames));
    }
    const names = selection.scenarios ?? scenarioNames;
    if (selection.scenarios === undefined && names.length < 2) throw manifestMessages.selectionTooFewScenarios(place(path), names.length);
    names.forEach((s, j) => {
      if (!scenarioNames.includes(s)) throw manifestMessages.unknownScenario(place([...path, "scenarios", j]), s, scenarioNames, closest(s, scenarioNames));
      if (names.indexOf(s) !== j) throw manifestMessages.selectionScenarioTwice(place([...path, "scenarios", j]), s);
    });
    const pcs = selection.probability ?? confidence;
    if (!(pcs > 1 / names.length && pcs < 1)) {
      throw manifestMessages.selectionProbabilityOutOfRange(place(selection.probability !== undefined ? [...path, "probability"] : ["confidence"]), pcs, names.length);
    }
    const chosen = names.map((n) => scenarios[scenarioNames.indexOf(n)]);
    const counts = chosen.map((sc) => ({ scenario: sc.name, runs: sc.runs.length }));
    let firstStage = selection.first_stage;
    if (firstStage === undefined) {
      if (counts.some((c) => c.runs !== counts[0].runs)) throw manifestMessages.selectionFirstStageNeeded(place(path), counts);
      firstStage = counts[0].runs;
    }
    const stagePlace = place(selection.first_stage !== undefined ? [...path, "first_stage"] : path);
    for (const c of counts) if (c.runs < firstStage) throw manifestMessages.selectionFirstStageTooMany(stagePlace, c.scenario, c.runs, firstStage);
    const method = selection.method ?? "independent";
    if (method === "paired") {
      const head = (sc: Scenario) => sc.runs.slice(0, firstStage).map((r) => r.id);
      const first = head(chosen[0]);
      for (const sc of chosen.slice(1)) {
        const ids = head(sc);
        if (ids.some((id, i) => id !== first[i])) throw manifestMessages.selectionPairedRunsDiffer(place([...path, "method"]), chosen[0].name, sc.name, first, ids);
      }
    }
    return { measure: selection.measure, better: selection.better, delta: selection.indifference, pcs, method, firstStage, scenarios: names };
  }
}

/**
 * A measure for one scenario: the definition's options, then the measure's `scenarios:` entry,
 * then the scenario's `measures:` entry; a later source wins key by key.
 */
function toMeasure(spec: MeasureSpec, fromMeasure: OverrideSpec | undefined, fromScenario: OverrideSpec | undefined, timeUnit: string): Measure {
  const options: OverrideSpec = {};
  for (const layer of [spec, fromMeasure ?? {}, fromScenario ?? {}]) {
    for (const key of OVERRIDABLE_KEYS) {
      if (layer[key] !== undefined) Object.assign(options, { [key]: layer[key] });
    }
  }
  const target = toTarget(options.target);
  const name = spec.name;
  const label = spec.label ?? name;
  const unit = spec.unit ?? defaultUnit(spec, timeUnit);
  // The schema and the checks above guarantee the source keys each kind needs.
  const series = spec.series as string;
  const from = spec.from as Required<NonNullable<MeasureSpec["from"]>>;
  const where = toWhere(spec.where);
  switch (spec.kind) {
    case "level":
      return {
        kind: "level",
        name,
        target,
        label,
        unit,
        where,
        source: spec.series !== undefined ? { type: "series", series } : { type: "entities", enter: from.enter, leave: from.leave },
        initial: options.initial ?? 0,
        atLeast: options.at_least ?? [],
      };
    case "utilization":
      return {
        kind: "utilization",
        name,
        target,
        label,
        unit,
        where,
        source: spec.series !== undefined ? { type: "series", series } : { type: "entities", enter: from.enter, leave: from.leave },
        initial: options.initial ?? 0,
        capacity: typeof options.capacity === "string" ? { type: "series", series: options.capacity, initial: options.capacity_initial ?? 0 } : { type: "constant", value: options.capacity as number },
        atLeast: options.at_least ?? [],
      };
    case "observation":
      return {
        kind: "observation",
        name,
        target,
        label,
        unit,
        where,
        source: spec.series !== undefined ? { type: "series", series } : { type: "entities", start: from.start, end: from.end },
        quantiles: options.quantiles ?? [...DEFAULT_QUANTILES],
        within: options.within ?? [],
      };
    case "count":
      return { kind: "count", name, target, label, unit, where, series };
  }
}

/**
 * A measure's `where` as the rest of Sojourn reads it: one entry per column, in the order
 * written, each with its list of values (a single value becomes a list of one).
 */
function toWhere(written: MeasureSpec["where"]): WhereFilter | null {
  if (written === undefined) return null;
  return Object.entries(written).map(([column, v]) => ({ column, values: Array.isArray(v) ? [...v] : [v] }));
}

/** The unit of a measure that gives none (docs/manifest.md, "label and unit"). */
export const UTILIZATION_UNIT = "fraction";

/**
 * A measure's unit when the manifest gives none: an observation `from: {start, end}` is a
 * duration, in the study's time unit; a utilization is a fraction of the capacity; a level, a
 * count and an observation of a series' values have no unit Sojourn could know (null).
 */
function defaultUnit(spec: MeasureSpec, timeUnit: string): string | null {
  if (spec.kind === "observation" && spec.from !== undefined) return timeUnit;
  if (spec.kind === "utilization") return UTILIZATION_UNIT;
  return null;
}

/**
 * Control characters a shown text must not hold: C0 (U+0000–U+001F, tab and line breaks too),
 * DEL and C1 (U+007F–U+009F), the line and paragraph separators (U+2028, U+2029) and the
 * bidirectional embeddings, overrides and isolates (U+202A–U+202E, U+2066–U+2069), which
 * reorder the text around them.
 */
function isControl(code: number): boolean {
  return code <= 0x1f || (code >= 0x7f && code <= 0x9f) || code === 0x2028 || code === 0x2029 || (code >= 0x202a && code <= 0x202e) || (code >= 0x2066 && code <= 0x2069);
}

function toTarget(target: TargetSpec | undefined): Target | null {
  if (target === undefined) return null;
  return "half_width" in target ? { type: "half_width", value: target.half_width } : { type: "relative", value: target.relative };
}

function toAnalysis(analysis: AnalysisSpec | undefined): Analysis {
  return analysis?.method === "batch-means" ? { type: "batch-means", batches: analysis.batches } : { type: "replications" };
}
