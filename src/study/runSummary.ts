/**
 * One run's analysis as a small file, so that a study can be analysed where its runs are and
 * reported elsewhere (docs/distributed.md):
 *
 *   run file ──analyzeRun──▶ RunAnalysis ──encodeSummary──▶ <scenario>/<run>.json
 *   <scenario>/<run>.json ──decodeSummary (digests checked)──▶ RunAnalysis ──▶ runStudy as usual
 *
 * The file holds everything `runStudy` takes from a run: the run's results, its input record
 * (with the SHA-256 of the run file), the calculation tables, the chart trace, and the observation
 * values (for the histogram sample, batch means and quantiles), these as base64 of little-endian
 * doubles so that every bit survives. It also holds a digest of the plan it was made with (the
 * scenario's measures, window, warm-up, columns and table limits) and a digest of itself.
 */
import { sha256 } from "../digest.js";
import type { Measure, Study } from "../manifest/types.js";
import { fileDigest } from "../regularFile.js";
import { checkShape, type Shape, shapeText } from "../shape.js";
import * as msg from "../messages/summary.js";
import * as studyMessages from "../messages/study.js";
import { analyzeRun, type RunAnalysis, type RunPlan } from "./analyzeRun.js";
import { resolveWarmup } from "./warmup.js";
import type { AnalyzeRuns } from "./pool.js";
import { safeName } from "./tables.js";

export const SUMMARY_FORMAT = "sojourn-run-summary/1";

interface SummaryFile {
  format: string;
  scenario: string;
  run: string;
  file: string;
  input_sha256: string;
  plan_sha256: string;
  analysis: unknown;
  digest?: string;
}

const NUMBER_OR_NULL: Shape = { oneOf: ["number", "null"] };
const FLOATS: Shape = { test: (v) => v instanceof Float64Array, expected: "a list of doubles (base64)" };

/** An input record (`InputRecord`) as written to record.json and to a run summary. */
export const INPUT_RECORD_SHAPE: Shape = {
  object: {
    scenario: "string",
    run: "string",
    file: "string",
    bytes: "number",
    sha256: "sha256",
    rows: "number",
    left_out: { object: { after_end: "number", before_window: "number", unused_series: "number" } },
    series_rows: { record: "number" },
  },
};

const TRACE_LINE: Shape = {
  object: {
    steps: { oneOf: ["null", { array: { object: { time: "number", value: "number", area: "number" } } }] },
    slices: { array: { object: { from: "number", to: "number", low: "number", high: "number", mean: "number", area_to: "number" } } },
    min: "number",
    max: "number",
  },
};

/** One measure's output (`MeasureOutput`) in a summary, after the reviver made its arrays. */
const OUTPUT_SHAPE: Shape = {
  object: {
    stats: { object: { kind: "string" } },
    tables: {
      array: {
        object: {
          suffix: "string",
          table: { object: { columns: { array: "string" }, rowsTotal: "number", rows: { array: { array: { oneOf: ["number", "string", "null"] } } }, shortened: "boolean" } },
        },
      },
    },
    trace: { object: { level: TRACE_LINE, capacity: { oneOf: ["null", TRACE_LINE] } } },
    observations: FLOATS,
    observationTimes: FLOATS,
    batchMeans: { array: "number" },
    slices: { array: "number" },
    warnings: { array: "string" },
  },
  optional: ["trace", "observations", "observationTimes", "batchMeans", "slices"],
};

/** The shape of a summary file as `encodeSummary` writes it (outputs checked one by one). */
const SUMMARY_SHAPE: Shape = {
  object: {
    format: "string",
    scenario: "string",
    run: "string",
    file: "string",
    input_sha256: "sha256",
    plan_sha256: "sha256",
    digest: "sha256",
    analysis: {
      object: {
        result: {
          object: {
            id: "string",
            file: "string",
            sha256: "sha256",
            start: "number",
            end: NUMBER_OR_NULL,
            measures: { record: { object: { kind: "string", value: NUMBER_OR_NULL } } },
          },
        },
        input: INPUT_RECORD_SHAPE,
        window: { object: { start: "number", collectFrom: "number", end: NUMBER_OR_NULL, warmup: NUMBER_OR_NULL } },
        outputs: { test: (v) => v instanceof Map, expected: "the measures' outputs" },
        warnings: { array: { object: { measure: { oneOf: ["string", "null"] }, message: "string" } } },
      },
    },
  },
};

/** `<scenario>/<run>.json` inside a summaries folder (names made safe as for the tables). */
export function summaryPath(scenario: string, run: string): string {
  return `${safeName(scenario)}/${safeName(run)}.json`;
}

/** The plans of one scenario's runs as `runStudy` makes them. */
export function scenarioPlans(study: Study, scenario: Study["scenarios"][number], warmup: number | null): RunPlan[] {
  const batches = scenario.analysis.type === "batch-means" ? scenario.analysis.batches : null;
  return scenario.runs.map((run, i) => ({ scenario, run, warmup, measures: scenario.measures, tables: study.tables, trace: i === 0, batches, slice: null }));
}

/**
 * A digest of what a plan computes: everything but the run file's absolute path (a summary made
 * on another machine, with the data in another folder, still matches).
 */
export function planDigest(plan: RunPlan): string {
  const { scenario, run } = plan;
  const what = {
    scenario: {
      name: scenario.name,
      measures: computed(scenario.measures),
      warmup: scenario.warmup,
      analysis: scenario.analysis,
      columns: scenario.columns,
      ...(scenario.layout !== "events" ? { layout: scenario.layout } : {}),
    },
    run: { id: run.id, file: run.file, start: run.start, end: run.end },
    warmup: plan.warmup,
    measures: computed(plan.measures),
    tables: plan.tables,
    trace: plan.trace,
    batches: plan.batches,
    slice: plan.slice,
  };
  return sha256(JSON.stringify(what));
}

/** A measure without what only the report shows (`label`, `unit`): changing a caption keeps the summaries. */
function computed(measures: readonly Measure[]): Record<string, unknown>[] {
  // Written as before layouts and `where` existed when a measure uses neither, so that the
  // digests of such plans stay as they were.
  return measures.map(({ label: _label, unit: _unit, where, ...rest }) => {
    const out: Record<string, unknown> = {};
    const busySeries = rest.kind === "utilization" && rest.source.type === "series" ? rest.source.series : null;
    for (const [k, v] of Object.entries(rest)) {
      if (k === "source" && busySeries !== null) out.series = busySeries;
      else out[k] = v;
    }
    if (where !== null) out.where = where;
    return out;
  });
}

/** JSON.stringify's replacer of a summary: doubles (Float64Array) as base64, every bit kept; maps as entry lists. */
export function replacer(_key: string, value: unknown): unknown {
  if (value instanceof Float64Array) {
    const bytes = Buffer.from(value.buffer, value.byteOffset, value.byteLength);
    return { $f64: (isLittleEndian ? bytes : swapped(bytes)).toString("base64") };
  }
  if (value instanceof Map) return { $map: [...value.entries()] };
  return value;
}

/** A summary's text that is JSON but not what `encodeSummary` writes. */
export class NotASummary extends Error {}

/** JSON.parse's reviver that undoes `replacer` (a malformed list throws `NotASummary`). */
export function reviver(_key: string, value: unknown): unknown {
  if (value !== null && typeof value === "object" && !Array.isArray(value)) {
    const o = value as Record<string, unknown>;
    if (typeof o.$f64 === "string") {
      const bytes = Buffer.from(o.$f64, "base64");
      if (bytes.length % 8 !== 0) throw new NotASummary(`a list of doubles is ${bytes.length} bytes long, not a multiple of 8`);
      const own = new Uint8Array(isLittleEndian ? bytes : swapped(bytes));
      return new Float64Array(own.buffer, 0, own.length / 8);
    }
    if (Array.isArray(o.$map)) {
      if (!o.$map.every((e) => Array.isArray(e) && e.length === 2 && typeof e[0] === "string")) throw new NotASummary("a map's entries are not [name, value] pairs");
      return new Map(o.$map as [string, unknown][]);
    }
  }
  return value;
}

const isLittleEndian = new Uint8Array(new Float64Array([1]).buffer)[7] === 0x3f;

function swapped(bytes: Buffer): Buffer {
  const copy = Buffer.from(bytes);
  copy.swap64();
  return copy;
}

/** The summary file's text for one analysed run. */
export function encodeSummary(plan: RunPlan, a: RunAnalysis): string {
  const body: SummaryFile = {
    format: SUMMARY_FORMAT,
    scenario: plan.scenario.name,
    run: plan.run.id,
    file: plan.run.file,
    input_sha256: a.input.sha256,
    plan_sha256: planDigest(plan),
    // The table files are made again from the tables when the report is built.
    analysis: { ...a, tableFiles: undefined },
  };
  const text = JSON.stringify(body, replacer);
  body.digest = sha256(text);
  return JSON.stringify(body, replacer) + "\n";
}

/**
 * The analysis of a summary file, after checking its own digest, that it is of the run the plan
 * names (scenario, id, file) and that it was made with the same plan. `display` names the file
 * in messages.
 */
export function decodeSummary(text: string, plan: RunPlan, display: string): RunAnalysis {
  let parsed: SummaryFile;
  try {
    parsed = JSON.parse(text, reviver) as SummaryFile;
  } catch (e) {
    if (e instanceof NotASummary) throw msg.summaryMalformed(display, e.message);
    throw msg.summaryUnreadable(display, `not JSON: ${(e as Error).message}`);
  }
  if (parsed === null || typeof parsed !== "object" || Array.isArray(parsed) || parsed.format !== SUMMARY_FORMAT) {
    throw msg.summaryUnreadable(display, `"format" is not "${SUMMARY_FORMAT}"`);
  }
  const { digest, ...rest } = parsed;
  if (typeof digest !== "string" || sha256(JSON.stringify(rest, replacer)) !== digest) throw msg.summaryTampered(display);
  // A file whose digest matches was written so, or made to match by hand: its shape is still checked.
  const shape = checkShape(parsed, SUMMARY_SHAPE);
  if (shape !== null) throw msg.summaryMalformed(display, shapeText(shape));
  const expect: [string, string, string][] = [
    ["scenario", parsed.scenario, plan.scenario.name],
    ["run id", parsed.run, plan.run.id],
    ["run file", parsed.file, plan.run.file],
  ];
  for (const [what, found, expected] of expect) if (found !== expected) throw msg.summaryOtherRun(display, what, JSON.stringify(found), JSON.stringify(expected));
  if (parsed.plan_sha256 !== planDigest(plan)) throw msg.summaryOtherSettings(display, plan.scenario.name, plan.run.id);
  const problem = outputsProblem(parsed.analysis as RunAnalysis, plan);
  if (problem !== null) throw msg.summaryMalformed(display, problem);
  const a = parsed.analysis as RunAnalysis;
  if (a.input.sha256 !== parsed.input_sha256 || a.result.sha256 !== parsed.input_sha256) throw msg.summaryTampered(display);
  return a;
}

/** What is wrong with a summary's measure outputs and results for the plan's measures, or null. */
function outputsProblem(a: RunAnalysis, plan: RunPlan): string | null {
  for (const m of plan.measures) {
    const stats = a.result.measures[m.name] as { kind: string } | undefined;
    if (stats === undefined || stats.kind !== m.kind) return `analysis.result.measures has no ${m.kind} measure "${m.name}"`;
    const out = a.outputs.get(m.name);
    const p = checkShape(out, OUTPUT_SHAPE, ["analysis", "outputs", m.name]);
    if (p !== null) return shapeText(p);
    if (out!.tables.length === 0) return `analysis.outputs["${m.name}"] has no calculation table`;
  }
  return null;
}

/**
 * An `AnalyzeRuns` that reads each run's summary from `folder` (`<scenario>/<run>.json`) instead
 * of the run file. `read` gives a file's text, or null when there is none.
 */
export function summariesAnalyzer(folder: string, read: (path: string) => string | null): AnalyzeRuns {
  return async (plans, onDone) => {
    const out: RunAnalysis[] = [];
    for (const [i, plan] of plans.entries()) {
      const path = `${folder.replace(/[\\/]+$/, "")}/${summaryPath(plan.scenario.name, plan.run.id)}`;
      const text = read(path);
      if (text === null) throw msg.summaryMissing(path, plan.scenario.name, plan.run.id);
      const a = decodeSummary(text, plan, path);
      await checkAgainstRunFile(a, plan, path);
      out.push(a);
      onDone?.(i, a);
    }
    return out;
  };
}

/**
 * A summary against its run file when the file can be read here: the file's SHA-256 now must be
 * the one the summary was made from, else the summary is stale. When the file cannot be read
 * (no permission, gone since the manifest was read, not a regular file), the summary is used as it
 * is and the report says so in a warning: its numbers then rest on the summary's own digest.
 */
async function checkAgainstRunFile(a: RunAnalysis, plan: RunPlan, display: string): Promise<void> {
  let now: string;
  try {
    now = await fileDigest(plan.run.path);
  } catch (e) {
    a.warnings.push({ measure: null, message: msg.summaryUnchecked(plan.run.file, (e as NodeJS.ErrnoException).code ?? String(e)) });
    return;
  }
  if (now !== a.input.sha256) throw msg.summaryStale(display, plan.run.file, now, a.input.sha256);
}

/**
 * Analyses one run of a study exactly as `runStudy` would (same plan) and returns its summary
 * file's text. A scenario with an MSER-5 warm-up needs all its runs for its warm-up: it is refused
 * unless `estimated` gives the warm-up time estimated from them (the cluster's first stage).
 */
export async function summarizeRun(study: Study, scenarioName: string, runId: string, estimated?: { time: number | null }): Promise<{ text: string; analysis: RunAnalysis }> {
  const scenario = study.scenarios.find((s) => s.name === scenarioName);
  if (scenario === undefined) throw studyMessages.unknownName("scenario", scenarioName, study.scenarios.map((s) => s.name));
  const index = scenario.runs.findIndex((r) => r.id === runId);
  if (index < 0) throw studyMessages.unknownName(`run in scenario "${scenarioName}"`, runId, scenario.runs.map((r) => r.id));
  let time: number | null;
  if (scenario.warmup.type === "mser-5") {
    if (estimated === undefined) throw msg.summaryNeedsFixedWarmup(scenario.name);
    time = estimated.time;
  } else time = (await resolveWarmup(study, scenario)).time;
  const plan = scenarioPlans(study, scenario, time)[index];
  const analysis = await analyzeRun(plan);
  return { text: encodeSummary(plan, analysis), analysis };
}
