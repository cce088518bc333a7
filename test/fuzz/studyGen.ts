/**
 * Random studies for the property-based tests: a model (GenStudy) that the reference
 * (reference.ts) reads, and the files (manifest and run files) that Sojourn reads. All data are
 * invented by the generators.
 *
 * Every generated study is valid by CONTRACT.md sections 1–3 and 6: windows with end > start,
 * warm-ups before every end, capacity > 0, series in time order, each entity entering before it
 * leaves (unique ids per visit). The broken-input tests (broken.test.ts) damage these files.
 */
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { dirname, join } from "node:path";
import { gzipSync } from "node:zlib";
import fc from "fast-check";

export interface Row {
  time: number;
  series: string;
  value?: number;
  entity?: string;
}

export interface GenRun {
  id: string;
  format: "csv" | "jsonl";
  gzip: boolean;
  start?: number;
  end?: number;
  /** Rows in file order. */
  rows: Row[];
  /** How numbers and cells are written (random per run). */
  style: { exponent: boolean; plus: boolean; spaces: boolean; quoteAll: boolean; crlf: boolean; bom: boolean; extraColumn: boolean; order: number[] };
}

export interface GenScenario {
  name: string;
  start?: number;
  end: number;
  warmup?: number;
  runs: GenRun[];
}

export interface GenStudy {
  title: string;
  confidence: number;
  warmup?: number;
  initial: number;
  busyInitial: number;
  capacity: number;
  quantiles: number[];
  /** Measure names. */
  names: { level: string; util: string; obs: string; count: string; inside: string; stay: string };
  /** Series names. */
  series: { level: string; busy: string; obs: string; count: string; enter: string; leave: string; other: string };
  scenarios: GenScenario[];
}

/** Names of members every JavaScript object has (Object.prototype), as scenario, run, series, measure and entity names. */
export const OBJECT_MEMBER_NAMES = ["constructor", "valueOf", "hasOwnProperty", "toString", "isPrototypeOf", "__proto__", "propertyIsEnumerable", "toLocaleString"];

/** Run ids: the first ones are object members (a run id is a key of results and of the tables' folders). */
const RUN_IDS = ["__proto__", "constructor", "run-3é", "valueOf"];

/** A name: unicode, markup, quotes, commas and spaces inside; no control characters; not blank at either end. */
export const nameArb: fc.Arbitrary<string> = fc
  .oneof(
    fc.string({ unit: "grapheme", minLength: 1, maxLength: 8 }),
    fc.constantFrom("queue", "<b>q</b>", "a,b", 'say "hi"', "élan", "队列", "🚲 bikes", "&amp;", "x'y", "#1", "- dash", "null", "42", "<script>alert(1)</script>"),
    // members of every JavaScript object: a name looked up in a plain object finds them
    fc.constantFrom(...OBJECT_MEMBER_NAMES),
    // names that look like a calculation table's suffix, differ only in case, or start a formula
    fc.constantFrom("wait.quantiles", "wait.within", "queue.time_at_least", "Queue", "QUEUE", "con", "=1+2", "@x", "+1", "-1"),
  )
  .filter((s) => s.trim() === s && s.length > 0 && !/[\p{Cc}\p{Cs}\u2028\u2029\uFEFF]/u.test(s));

/** Distinct names. */
function distinctNames(count: number): fc.Arbitrary<string[]> {
  return fc.uniqueArray(nameArb, { minLength: count, maxLength: count });
}

/** Numbers of every kind a model writes: small integers, fractions, tiny, -0, large. */
export const valueArb: fc.Arbitrary<number> = fc.oneof(
  { weight: 4, arbitrary: fc.integer({ min: -5, max: 20 }) },
  { weight: 3, arbitrary: fc.double({ min: -1e3, max: 1e3, noNaN: true, noDefaultInfinity: true }) },
  { weight: 1, arbitrary: fc.constantFrom(-0, 0, 5e-324, -5e-324, 1e-300, 0.1, 1 / 3, 1e6, -1e6, 123456.789) },
);

/** A time near the window [lo, hi]: on a grid (ties), or any double in a slightly wider range. */
function timeArb(lo: number, hi: number): fc.Arbitrary<number> {
  const span = hi - lo;
  return fc.oneof(
    fc.integer({ min: -2, max: 22 }).map((k) => lo + (k * span) / 20),
    fc.double({ min: lo - span / 10, max: hi + span / 10, noNaN: true, noDefaultInfinity: true }),
    fc.constantFrom(lo, hi),
  );
}

const sorted = (xs: number[]) => [...xs].sort((a, b) => a - b);

/** The rows of one run: each series in time order, then interleaved at random across series. */
function rowsArb(study: Omit<GenStudy, "scenarios">, lo: number, hi: number): fc.Arbitrary<Row[]> {
  const S = study.series;
  const t = timeArb(lo, hi);
  const seriesOf = (name: string, withValue: boolean, valueOf: fc.Arbitrary<number>, minLength = 0) =>
    fc.array(fc.tuple(t, valueOf), { minLength, maxLength: 12 }).map((pairs) =>
      sorted(pairs.map((p) => p[0])).map((time, i): Row => (withValue ? { time, series: name, value: pairs[i][1] } : { time, series: name })),
    );
  const visits = fc.array(fc.tuple(t, fc.oneof(fc.constant(0), fc.double({ min: 0, max: (hi - lo) / 2, noNaN: true })), fc.boolean()), { maxLength: 10 });
  return fc
    .record({
      level: seriesOf(S.level, true, valueArb),
      busy: seriesOf(S.busy, true, fc.integer({ min: 0, max: Math.floor(study.capacity) })),
      obs: seriesOf(S.obs, true, valueArb),
      count: seriesOf(S.count, false, valueArb),
      other: seriesOf(S.other, true, valueArb, 1), // a run file needs at least one row (a JSON Lines file one object)
      visits,
      ids: fc.uniqueArray(nameArb, { minLength: 10, maxLength: 10 }),
      picks: fc.array(fc.nat(), { minLength: 200, maxLength: 200 }),
    })
    .map(({ level, busy, obs, count, other, visits, ids, picks }) => {
      const enter: Row[] = [];
      const leave: Row[] = [];
      visits.forEach(([a, d, leaves], i) => {
        enter.push({ time: a, series: S.enter, entity: ids[i] });
        const until = a + d;
        if (leaves && Number.isFinite(until)) leave.push({ time: until, series: S.leave, entity: ids[i] });
      });
      enter.sort((x, y) => x.time - y.time);
      leave.sort((x, y) => x.time - y.time);
      // Interleave: pick a random series each time; a leave waits for its own enter.
      const lists = [level, busy, obs, count, other, enter, leave].map((l) => [...l]);
      const emitted = new Set<string>();
      const out: Row[] = [];
      let k = 0;
      while (lists.some((l) => l.length > 0)) {
        const open = lists.filter((l) => l.length > 0);
        let list = open[picks[k++ % picks.length] % open.length];
        if (list === lists[6] && !emitted.has(list[0].entity as string)) list = lists[5];
        const row = list.shift() as Row;
        if (row.series === S.enter) emitted.add(row.entity as string);
        out.push(row);
      }
      return out;
    });
}

const styleArb = fc.record({
  exponent: fc.boolean(),
  plus: fc.boolean(),
  spaces: fc.boolean(),
  quoteAll: fc.boolean(),
  crlf: fc.boolean(),
  bom: fc.boolean(),
  extraColumn: fc.boolean(),
  order: fc.shuffledSubarray([0, 1, 2, 3], { minLength: 4, maxLength: 4 }),
});

/** A valid random study. */
export const studyArb: fc.Arbitrary<GenStudy> = fc
  .record({
    title: nameArb,
    confidence: fc.oneof(fc.constantFrom(0.8, 0.9, 0.95, 0.99), fc.double({ min: 0.5, max: 0.999, noNaN: true })),
    initial: fc.integer({ min: 0, max: 3 }),
    busyInitial: fc.integer({ min: 0, max: 2 }),
    capacity: fc.oneof(fc.integer({ min: 1, max: 4 }), fc.double({ min: 0.5, max: 10, noNaN: true })),
    quantiles: fc.constantFrom<number[]>([0.5, 0.9, 0.95], [0, 1], [0.25]),
    measureNames: distinctNames(6),
    seriesNames: distinctNames(7),
    scenarioNames: distinctNames(2),
    scenarioCount: fc.integer({ min: 1, max: 2 }),
    studyWarmup: fc.option(fc.oneof(fc.constant(0), fc.double({ min: 0, max: 4, noNaN: true })), { nil: undefined }),
  })
  .chain((base) => {
    const [level, util, obs, count, inside, stay] = base.measureNames;
    const [sLevel, busy, sObs, sCount, enter, leave, other] = base.seriesNames;
    const head: Omit<GenStudy, "scenarios"> = {
      title: base.title,
      confidence: base.confidence,
      warmup: base.studyWarmup,
      initial: base.initial,
      busyInitial: base.busyInitial,
      capacity: base.capacity,
      quantiles: base.quantiles,
      names: { level, util, obs, count, inside, stay },
      series: { level: sLevel, busy, obs: sObs, count: sCount, enter, leave, other },
    };
    const scenario = (name: string) =>
      fc
        .record({
          start: fc.option(fc.oneof(fc.constant(0), fc.double({ min: 0, max: 50, noNaN: true })), { nil: undefined }),
          length: fc.oneof(fc.integer({ min: 5, max: 100 }), fc.double({ min: 1e-3, max: 1e4, noNaN: true })),
          ownWarmup: fc.option(fc.double({ min: 0, max: 1, noNaN: true }), { nil: undefined }),
          runCount: fc.integer({ min: 1, max: 4 }),
        })
        .chain(({ start, length, ownWarmup, runCount }) => {
          const s0 = start ?? 0;
          const end = s0 + length;
          // A warm-up must lie before every run's end: keep it inside [0, end) by construction.
          // (a study-wide warm-up at or past this end is replaced by one at the start: warm-up off).
          let scenarioWarmup = ownWarmup === undefined ? undefined : s0 + ownWarmup * length * 0.9;
          if (scenarioWarmup === undefined && head.warmup !== undefined && !(head.warmup < end)) scenarioWarmup = s0;
          const effective = scenarioWarmup ?? head.warmup;
          const run = (i: number) =>
            fc
              .record({
                format: fc.constantFrom<"csv" | "jsonl">("csv", "jsonl"),
                gzip: fc.boolean(),
                ownEnd: fc.option(fc.double({ min: 0.5, max: 1.5, noNaN: true }), { nil: undefined }),
                style: styleArb,
              })
              .chain(({ format, gzip, ownEnd, style }) => {
                let runEnd = ownEnd === undefined ? undefined : s0 + ownEnd * length;
                if (runEnd !== undefined && !(runEnd > s0 && (effective === undefined || runEnd > effective))) runEnd = undefined;
                const hi = runEnd ?? end;
                return rowsArb(head, s0, hi).map((rows): GenRun => ({ id: RUN_IDS[i], format, gzip, end: runEnd, rows, style }));
              });
          return fc.tuple(...Array.from({ length: runCount }, (_, i) => run(i))).map(
            (runs): GenScenario => ({ name, start, end, warmup: scenarioWarmup, runs }),
          );
        });
    const names = base.scenarioNames.slice(0, base.scenarioCount);
    return fc.tuple(...names.map(scenario)).map((scenarios): GenStudy => ({ ...head, scenarios }));
  });

// --- writing the files ---------------------------------------------------------------------

/** A number as a model might write it (the text must read back as the same double). */
function numberText(x: number, style: GenRun["style"]): string {
  let s = Object.is(x, -0) ? "-0" : style.exponent ? x.toExponential() : String(x);
  if (style.plus && x > 0) s = "+" + s;
  return s;
}

function csvCell(text: string, style: GenRun["style"], isText: boolean): string {
  const needs = /[",\r\n]/.test(text) || (isText && text !== text.trim());
  if (needs || (style.quoteAll && isText)) return `"${text.replace(/"/g, '""')}"`;
  return style.spaces && !isText ? ` ${text} ` : text;
}

export function runFileText(run: GenRun): string {
  const { style } = run;
  if (run.format === "jsonl") {
    const keys = ["time", "series", "value", "entity"];
    return run.rows
      .map((r) => {
        const o: Record<string, unknown> = {};
        for (const k of style.order.map((i) => keys[i])) {
          if (k === "time") o.time = style.exponent ? numberText(r.time, style).replace(/^\+/, "") : r.time;
          if (k === "series") o.series = r.series;
          if (k === "value" && r.value !== undefined) o.value = Object.is(r.value, -0) ? "-0" : r.value;
          if (k === "entity" && r.entity !== undefined) o.entity = r.entity;
        }
        if (style.extraColumn) o.note = "<i>ignored</i>";
        return JSON.stringify(o);
      })
      .join(style.crlf ? "\r\n" : "\n") + "\n";
  }
  const header = style.order.map((i) => ["time", "series", "value", "entity"][i]);
  if (style.extraColumn) header.push("note");
  const nl = style.crlf ? "\r\n" : "\n";
  const lines = [header.join(",")];
  for (const r of run.rows) {
    const cells = style.order.map((i) => {
      if (i === 0) return csvCell(numberText(r.time, style), style, false);
      if (i === 1) return csvCell(r.series, style, true);
      if (i === 2) return r.value === undefined ? "" : csvCell(numberText(r.value, style), style, false);
      return r.entity === undefined ? "" : csvCell(r.entity, style, true);
    });
    if (style.extraColumn) cells.push('"x,y"');
    lines.push(cells.join(","));
  }
  return (style.bom ? "\uFEFF" : "") + lines.join(nl) + nl;
}

export function runFileName(run: GenRun): string {
  return `runs/${run.id}.${run.format}${run.gzip ? ".gz" : ""}`;
}

const q = (s: string) => JSON.stringify(s);

/** The manifest (YAML; every text JSON-quoted, which YAML reads as the same string). */
export function manifestText(study: GenStudy, scenarioFolder: (s: number) => string): string {
  const lines = [`version: 1`, `title: ${q(study.title)}`, `confidence: ${study.confidence}`];
  if (study.warmup !== undefined) lines.push(`warmup: ${study.warmup}`);
  lines.push("scenarios:");
  study.scenarios.forEach((sc, s) => {
    lines.push(`  - name: ${q(sc.name)}`);
    if (sc.start !== undefined) lines.push(`    start: ${sc.start}`);
    lines.push(`    end: ${sc.end}`);
    if (sc.warmup !== undefined) lines.push(`    warmup: ${sc.warmup}`);
    lines.push("    runs:");
    for (const r of sc.runs) {
      const path = `${scenarioFolder(s)}/${runFileName(r)}`;
      lines.push(r.end === undefined ? `      - ${q(path)}` : `      - {path: ${q(path)}, end: ${r.end}}`);
    }
  });
  const N = study.names;
  const S = study.series;
  const qs = `[${study.quantiles.join(", ")}]`;
  // Generated runs may lack a series in every run of a scenario: the contract's zero figures are
  // what the reference computes, so the measures allow it (the error without may_be_absent is
  // tested in test/study/absentSeries.test.ts).
  const absent = ", may_be_absent: true";
  lines.push(
    "measures:",
    `  - {name: ${q(N.level)}, kind: level, series: ${q(S.level)}, initial: ${study.initial}${absent}}`,
    `  - {name: ${q(N.util)}, kind: utilization, series: ${q(S.busy)}, capacity: ${study.capacity}, initial: ${study.busyInitial}${absent}}`,
    `  - {name: ${q(N.obs)}, kind: observation, series: ${q(S.obs)}, quantiles: ${qs}${absent}}`,
    `  - {name: ${q(N.count)}, kind: count, series: ${q(S.count)}${absent}}`,
    `  - {name: ${q(N.inside)}, kind: level, from: {enter: ${q(S.enter)}, leave: ${q(S.leave)}}, initial: ${study.initial}${absent}}`,
    `  - {name: ${q(N.stay)}, kind: observation, from: {start: ${q(S.enter)}, end: ${q(S.leave)}}, quantiles: ${qs}${absent}}`,
  );
  return lines.join("\n") + "\n";
}

/** The study's files: `study.yaml` and the run files under `s<scenario index>/runs/`. */
export function studyFiles(study: GenStudy): Record<string, string | Buffer> {
  const all: Record<string, string | Buffer> = { "study.yaml": manifestText(study, (s) => `s${s}`) };
  study.scenarios.forEach((sc, s) => {
    for (const r of sc.runs) {
      const text = runFileText(r);
      all[`s${s}/${runFileName(r)}`] = r.gzip ? gzipSync(Buffer.from(text)) : text;
    }
  });
  return all;
}

/** Writes the study into a fresh temporary folder; returns the folder and the manifest path. */
export function writeStudy(study: GenStudy): { dir: string; manifest: string } {
  return writeFiles(studyFiles(study));
}

export function writeFiles(files: Record<string, string | Buffer>): { dir: string; manifest: string } {
  const dir = mkdtempSync(join(tmpdir(), "sojourn-fuzz-"));
  for (const [rel, content] of Object.entries(files)) {
    const p = join(dir, rel);
    mkdirSync(dirname(p), { recursive: true });
    writeFileSync(p, content);
  }
  return { dir, manifest: join(dir, "study.yaml") };
}

export function removeStudy(dir: string): void {
  rmSync(dir, { recursive: true, force: true });
}
