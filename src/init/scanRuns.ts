/**
 * `sojourn init`, part 1: what is in a folder of run files.
 *
 *   RUNS_DIR ──layout──► scenarios (a subfolder each, or the folder itself) and their run files
 *            ──readHead per file (first rows only)──► per-series facts, summed over a scenario's runs
 *            ──guess──► each series: count / level / observation; capacities; entity event pairs
 *
 * Everything here is a guess for a person to check; `starterManifest` writes it down with the
 * reason for each guess.
 */
import { readdirSync, statSync } from "node:fs";
import { basename, join, relative, sep } from "node:path";
import { initMessages, UserError } from "../messages/index.js";
import { RUN_EXTENSIONS, runFormat, runIdOf } from "../ingest/runFile.js";
import type { ColumnMap } from "../manifest/types.js";
import { DEFAULT_COLUMNS } from "./columns.js";
import { ColumnProfile, guessLayout, type LayoutGuess } from "./layoutGuess.js";
import { readCells } from "./readCells.js";
import { type FileHead, readHead } from "./readHead.js";
import { type EntityPairFacts, readEntitiesHead, readLevelsHead } from "./readLayoutHead.js";

/** Rows read per file, at most. */
export const HEAD_ROWS = 200_000;
/** Rows of each file the layout is guessed from (`layoutGuess.ts`), at most. */
export const PROFILE_ROWS = 10_000;

/** The layout of every run file read, with the file it was first seen in. */
export type ScanLayout = Exclude<LayoutGuess, { layout: null }> & { seenIn: string };

export interface ScannedRun {
  id: string;
  /** Path relative to the folder init was run from, with `/`. */
  display: string;
  /** Absolute path. */
  path: string;
  rows: number;
  cut: boolean;
  lastTime: number | null;
}

export interface ScannedScenario {
  name: string;
  /** The folder holding its files (absolute). */
  dir: string;
  runs: ScannedRun[];
  /** Largest busy level seen per series (for a constant capacity guess). */
  maxBySeries: Map<string, number>;
  /** Entity tables: the most rows between two event columns at one time in any run (`a + "\0" + b`). */
  mostBetween: Map<string, number>;
}

export interface SkippedFile {
  display: string;
  reason: string;
}

export type SeriesKind = "count" | "level" | "observation";

/** One series over all the runs read. */
export interface SeriesFacts {
  name: string;
  rows: number;
  /** Files it appears in. */
  files: number;
  valued: number;
  withEntity: number;
  min: number;
  max: number;
  integers: boolean;
  distinct: number;
  manyValues: boolean;
  steps: number;
  unitSteps: number;
  sameSteps: number;
  kind: SeriesKind;
  /** Why `kind` was guessed, in words. */
  why: string;
}

/** A level series that looks like the busy part of a capacity given by another series. */
export interface CapacityGuess {
  busy: string;
  capacity: string;
  /** The capacity series' first time in any run (0 when it starts at 0). */
  capacityFrom: number;
  why: string;
}

/** Two entity event series where one mostly comes first for the same entity. */
export interface EventPair {
  start: string;
  end: string;
  /** Entities seen in both, and in how many the start came first (at or before the end). */
  shared: number;
  inOrder: number;
  /** Entities with the start and no end (in the rows read). */
  open: number;
}

export interface RunsScan {
  dir: string;
  /** The layout of the run files (all have the same; `events` with the contract's names when none was read). */
  layout: ScanLayout;
  /** For `entities`: the order of each two event columns over all rows read. */
  entityOrder: Map<string, EntityPairFacts>;
  scenarios: ScannedScenario[];
  skipped: SkippedFile[];
  series: SeriesFacts[];
  capacities: CapacityGuess[];
  pairs: EventPair[];
  /** Some file had more rows than were read. */
  cut: boolean;
  headRows: number;
}

export interface ScanOptions {
  /** Rows read per file (default `HEAD_ROWS`). */
  headRows?: number;
  /** Called once per skipped file, as it is met. */
  onSkip?: (file: SkippedFile) => void;
}

const slash = (p: string) => p.split(sep).join("/");

/** Scans the run files of `dir` (contract section 1), reading at most `headRows` rows of each. */
export async function scanRuns(dir: string, options: ScanOptions = {}): Promise<RunsScan> {
  const limit = options.headRows ?? HEAD_ROWS;
  const layout = listLayout(dir);
  const skipped: SkippedFile[] = [];
  const skip = (display: string, reason: string) => {
    const s = { display, reason };
    skipped.push(s);
    options.onSkip?.(s);
  };
  for (const s of layout.skipped) skip(s.display, s.reason);

  const acc = new Map<string, Accumulated>();
  const pairCounts = new Map<string, { compared: number; above: number; equal: number }>();
  const firstTimes = new Map<string, number>();
  const entityFacts = new Map<string, { shared: number; inOrder: number; open: number }>();
  const scenarios: ScannedScenario[] = [];
  const entityOrder = new Map<string, EntityPairFacts>();
  let shape: ScanLayout | null = null;
  let cut = false;

  for (const sc of layout.scenarios) {
    const runs: ScannedRun[] = [];
    const ids = new Map<string, string>();
    const maxBySeries = new Map<string, number>();
    const mostBetween = new Map<string, number>();
    for (const path of sc.files) {
      const display = slash(relative(process.cwd(), path)) || basename(path);
      const id = runIdOf(path);
      const same = ids.get(id);
      if (same !== undefined) {
        skip(display, initMessages.skipDuplicateId(id, same));
        continue;
      }
      let guess: LayoutGuess;
      let head: FileHead;
      try {
        guess = await profileFile(path, display, Math.min(limit, PROFILE_ROWS));
        if (guess.layout !== null) head = await readLayoutHead(path, display, guess, limit);
      } catch (e) {
        if (!(e instanceof UserError)) throw e;
        skip(display, initMessages.skipUnreadable(display, e.message));
        continue;
      }
      if (guess.layout === null) {
        skip(display, initMessages.skipNoLayout(guess.why));
        continue;
      }
      // One layout for the study: a file unlike the first is an error, not a guess (the manifest would not read it).
      const merged: ScanLayout | null = shape === null ? { ...guess, seenIn: display } : mergeLayouts(shape, guess);
      if (merged === null) throw initMessages.mixedLayouts(shape!.seenIn, layoutWords(shape!), display, layoutWords(guess));
      shape = merged;
      head = head!;
      if (head.series.length === 0) {
        skip(display, initMessages.skipNoRows());
        continue;
      }
      ids.set(id, display);
      cut ||= head.cut;
      runs.push({ id, display, path, rows: head.rows, cut: head.cut, lastTime: head.lastTime });
      addFile(acc, head);
      for (const s of head.series) {
        if (s.valued > 0) maxBySeries.set(s.name, Math.max(maxBySeries.get(s.name) ?? -Infinity, s.max));
        firstTimes.set(s.name, Math.min(firstTimes.get(s.name) ?? Infinity, s.firstTime));
      }
      for (const [key, p] of head.pairs) {
        const q = pairCounts.get(key) ?? { compared: 0, above: 0, equal: 0 };
        q.compared += p.compared;
        q.above += p.above;
        q.equal += p.equal;
        pairCounts.set(key, q);
      }
      addEntityPairs(entityFacts, head);
      if ("mostBetween" in head) for (const [key, m] of head.mostBetween as Map<string, number>) mostBetween.set(key, Math.max(mostBetween.get(key) ?? 0, m));
      if ("entityPairs" in head) {
        for (const [key, f] of head.entityPairs as Map<string, EntityPairFacts>) {
          const e = entityOrder.get(key) ?? { shared: 0, inOrder: 0, open: 0, firstBackwards: null };
          e.shared += f.shared;
          e.inOrder += f.inOrder;
          e.open += f.open;
          if (e.firstBackwards === null && f.firstBackwards !== null) e.firstBackwards = f.firstBackwards;
          entityOrder.set(key, e);
          const g = entityFacts.get(key) ?? { shared: 0, inOrder: 0, open: 0 };
          g.shared += f.shared;
          g.inOrder += f.inOrder;
          g.open += f.open;
          entityFacts.set(key, g);
        }
      }
    }
    if (runs.length > 0) scenarios.push({ name: sc.name, dir: sc.dir, runs, maxBySeries, mostBetween });
  }

  const series: SeriesFacts[] = [...acc.values()].map(({ values: _values, ...facts }) => facts);
  const runCount = scenarios.reduce((n, sc) => n + sc.runs.length, 0);
  for (const s of series) [s.kind, s.why] = shape?.layout === "levels" ? levelKind(s) : guessKind(s, runCount);
  return {
    dir,
    layout: shape ?? { layout: "events", time: "time", series: "series", value: "value", entity: "entity", attributes: [], why: [], seenIn: "" },
    entityOrder,
    scenarios,
    skipped,
    series,
    capacities: guessCapacities(series, pairCounts, firstTimes),
    // An entity table's reader refuses a row whose pair of a measure goes backwards: every row read must be in order.
    pairs: guessPairs(series, entityFacts, shape?.layout === "entities" ? 1 : 0.95),
    cut,
    headRows: limit,
  };
}

interface Layout {
  scenarios: { name: string; dir: string; files: string[] }[];
  skipped: SkippedFile[];
}

/** Scenario folders and their files, in code-point order of names. */
function listLayout(dir: string): Layout {
  let stat;
  try {
    stat = statSync(dir);
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    if (code === "ENOENT" || code === "ENOTDIR") throw initMessages.runsDirNotFound(dir);
    throw initMessages.runsDirUnreadable(dir, code ?? String(e));
  }
  if (!stat.isDirectory()) throw initMessages.runsDirIsFile(dir);
  const skipped: SkippedFile[] = [];
  const show = (p: string) => slash(relative(process.cwd(), p));
  const entries = (d: string) =>
    readdirSync(d, { withFileTypes: true })
      .filter((e) => !e.name.startsWith("."))
      .sort((a, b) => (a.name < b.name ? -1 : a.name > b.name ? 1 : 0));
  const filesOf = (d: string, deeper: boolean): string[] => {
    const out: string[] = [];
    for (const e of entries(d)) {
      const p = join(d, e.name);
      if (e.isDirectory()) {
        if (deeper) continue;
        for (const f of walk(p)) skipped.push({ display: show(f), reason: initMessages.skipTooDeep() });
      } else if (runFormat(e.name) === null) skipped.push({ display: show(p), reason: initMessages.skipExtension(RUN_EXTENSIONS) });
      else out.push(p);
    }
    return out;
  };
  const walk = (d: string): string[] => entries(d).flatMap((e) => (e.isDirectory() ? walk(join(d, e.name)) : [join(d, e.name)]));

  const scenarios: Layout["scenarios"] = [];
  const top = filesOf(dir, true);
  if (top.length > 0) scenarios.push({ name: scenarioName(dir), dir, files: top });
  for (const e of entries(dir)) {
    if (!e.isDirectory()) continue;
    const d = join(dir, e.name);
    scenarios.push({ name: e.name, dir: d, files: filesOf(d, false) });
  }
  return { scenarios, skipped };
}

/** A name for the scenario of files lying directly in `dir`. */
function scenarioName(dir: string): string {
  return basename(dir.replace(/[/\\]+$/, "")) || "base";
}

type Accumulated = SeriesFacts & { values: Set<number> };

function addFile(acc: Map<string, Accumulated>, head: FileHead): void {
  for (const h of head.series) {
    let s = acc.get(h.name);
    if (s === undefined) {
      s = { name: h.name, rows: 0, files: 0, valued: 0, withEntity: 0, min: Infinity, max: -Infinity, integers: true, distinct: 0, manyValues: false, steps: 0, unitSteps: 0, sameSteps: 0, kind: "count", why: "", values: new Set() };
      acc.set(h.name, s);
    }
    s.rows += h.rows;
    s.files++;
    s.valued += h.valued;
    s.withEntity += h.withEntity;
    s.min = Math.min(s.min, h.min);
    s.max = Math.max(s.max, h.max);
    s.integers &&= h.integers || h.valued === 0;
    s.steps += h.steps;
    s.unitSteps += h.unitSteps;
    s.sameSteps += h.sameSteps;
    const values = s.values;
    if (h.manyValues) s.manyValues = true;
    else for (const v of h.distinct) values.add(v);
    if (values.size > 64) s.manyValues = true;
    s.distinct = values.size;
  }
}

function addEntityPairs(facts: Map<string, { shared: number; inOrder: number; open: number }>, head: FileHead): void {
  const events = head.series.filter((h) => h.entityTimes !== null && h.valued * 2 < h.rows);
  for (const a of events) {
    for (const b of events) {
      if (a === b) continue;
      const key = a.name + "\u0000" + b.name;
      const f = facts.get(key) ?? { shared: 0, inOrder: 0, open: 0 };
      for (const [entity, ta] of a.entityTimes!) {
        const tb = b.entityTimes!.get(entity);
        if (tb === undefined) f.open++;
        else {
          f.shared++;
          if (ta <= tb) f.inOrder++;
        }
      }
      facts.set(key, f);
    }
  }
}

/**
 * Count, level or observation, from the values. A level is held over time and changes in small
 * steps (whole numbers moving by 1: a queue, busy servers), or changes rarely between a few whole
 * values (a staffing schedule). Anything else with values is a series of observations.
 */
function guessKind(s: SeriesFacts, runs: number): [SeriesKind, string] {
  if (s.valued * 2 < s.rows) {
    return ["count", s.withEntity > 0 ? "rows without values (events with an entity): counted" : "rows without values: counted"];
  }
  const range = `${s.min} to ${s.max}`;
  if (s.integers) {
    const unit = s.steps > 0 ? s.unitSteps / s.steps : 0;
    if (s.steps > 0 && unit >= 0.75) {
      return ["level", `whole numbers ${range}, ${Math.round(unit * 100)} % of changes by 1: looks like a level held over time`];
    }
    const perRun = s.rows / Math.max(1, runs);
    if (!s.manyValues && s.distinct <= 20 && perRun <= 50 && s.sameSteps * 2 <= s.steps) {
      return ["level", `a few whole numbers (${range}) changing rarely (${perRun.toFixed(1)} rows per run): looks like a setting held over time, such as a schedule`];
    }
  }
  const distinct = s.manyValues ? "many distinct values" : `${s.distinct} distinct value${s.distinct === 1 ? "" : "s"}`;
  return ["observation", `${distinct} (${range})${s.integers ? "" : ", not all whole numbers"}: looks like one observation per row`];
}

/** A level x that never exceeds level y, reaches it, and y changes far less often: x is busy, y capacity. */
function guessCapacities(series: SeriesFacts[], pairs: Map<string, { compared: number; above: number; equal: number }>, firstTimes: Map<string, number>): CapacityGuess[] {
  const levels = series.filter((s) => s.kind === "level");
  const out: CapacityGuess[] = [];
  for (const x of levels) {
    const ys = levels
      .filter((y) => y !== x && y.rows * 4 <= x.rows && y.min >= 0)
      .map((y) => ({ y, p: pairs.get(x.name + "\u0000" + y.name) }))
      .filter(({ p }) => p !== undefined && p.compared >= 10 && p.above === 0 && p.equal > 0)
      .sort((a, b) => a.y.rows - b.y.rows);
    if (ys.length === 0) continue;
    const { y, p } = ys[0];
    out.push({
      busy: x.name,
      capacity: y.name,
      capacityFrom: firstTimes.get(y.name) ?? 0,
      why: `"${x.name}" never exceeded "${y.name}" in ${p!.compared} comparisons and reached it ${p!.equal} times, and "${y.name}" changes far less often`,
    });
  }
  return out;
}

/** Entity event pairs: most entities seen in both, and almost always in this order. */
function guessPairs(series: SeriesFacts[], facts: Map<string, { shared: number; inOrder: number; open: number }>, inOrderShare: number): EventPair[] {
  const order = new Map(series.map((s, i) => [s.name, i]));
  const out: EventPair[] = [];
  for (const [key, f] of facts) {
    const [start, end] = key.split("\u0000");
    const total = f.shared + f.open;
    if (f.shared === 0 || f.shared * 2 < total || f.inOrder < inOrderShare * f.shared) continue;
    // The reverse direction must not also qualify (ties in both orders: keep file order).
    const back = facts.get(end + "\u0000" + start);
    if (back !== undefined && back.inOrder >= inOrderShare * back.shared && order.get(end)! < order.get(start)!) continue;
    out.push({ start, end, ...f });
  }
  return out.sort((a, b) => order.get(a.start)! - order.get(b.start)! || order.get(a.end)! - order.get(b.end)!);
}

/** The layout of one file, guessed from its first `rows` rows (`layoutGuess.ts`). */
async function profileFile(path: string, display: string, rows: number): Promise<LayoutGuess> {
  const profile = new ColumnProfile();
  let header: readonly string[] = [];
  await readCells(
    path,
    display,
    rows,
    (cells, line) => profile.add(header, cells, line),
    (names) => (header = names),
  );
  return guessLayout(profile);
}

/** The contract's column map with the names the guess found (an absent value or entity keeps its default name). */
export function columnsOf(guess: Extract<LayoutGuess, { layout: "events" }>): ColumnMap {
  return { time: guess.time, series: guess.series, value: guess.value ?? DEFAULT_COLUMNS.value, entity: guess.entity ?? DEFAULT_COLUMNS.entity };
}

async function readLayoutHead(path: string, display: string, guess: Exclude<LayoutGuess, { layout: null }>, limit: number): Promise<FileHead> {
  switch (guess.layout) {
    case "events":
      return readHead(path, display, columnsOf(guess), limit);
    case "entities":
      return readEntitiesHead(path, display, guess.entity, guess.events, limit);
    case "levels":
      return readLevelsHead(path, display, guess.time, guess.levels, limit);
  }
}

/**
 * The study's layout with one more file's: the same layout and the same named columns, or null
 * when they differ. Attributes are joined; an events file without a value or entity column takes
 * the other file's.
 */
function mergeLayouts(a: ScanLayout, b: Exclude<LayoutGuess, { layout: null }>): ScanLayout | null {
  const attributes = [...a.attributes];
  for (const x of b.attributes) {
    const y = attributes.find((z) => z.name === x.name);
    if (y === undefined) attributes.push(x);
    else if (y.values !== null) {
      const values = x.values === null ? null : [...new Set([...y.values, ...x.values])];
      attributes[attributes.indexOf(y)] = { name: y.name, values: values !== null && values.length <= 12 ? values : null };
    }
  }
  const sameSet = (x: readonly string[], y: readonly string[]) => x.length === y.length && x.every((n) => y.includes(n));
  if (a.layout === "events" && b.layout === "events") {
    const pick = (x: string | null, y: string | null): string | null | undefined => (x === null ? y : y === null || x === y ? x : undefined);
    const value = pick(a.value, b.value);
    const entity = pick(a.entity, b.entity);
    if (a.time !== b.time || a.series !== b.series || value === undefined || entity === undefined) return null;
    return { ...a, value, entity, attributes: attributes.filter((x) => x.name !== value && x.name !== entity) };
  }
  if (a.layout === "entities" && b.layout === "entities") return a.entity === b.entity && sameSet(a.events, b.events) ? { ...a, attributes } : null;
  if (a.layout === "levels" && b.layout === "levels") return a.time === b.time && sameSet(a.levels, b.levels) ? { ...a, attributes } : null;
  return null;
}

/** A layout in words, for the message about files that differ. */
export function layoutWords(g: Exclude<LayoutGuess, { layout: null }>): string {
  const q = (n: string) => JSON.stringify(n);
  switch (g.layout) {
    case "events":
      return `an event table (time ${q(g.time)}, series ${q(g.series)}${g.value === null ? "" : `, value ${q(g.value)}`}${g.entity === null ? "" : `, entity ${q(g.entity)}`})`;
    case "entities":
      return `one row per entity (id ${q(g.entity)}, events ${g.events.map(q).join(", ")})`;
    case "levels":
      return `a table of levels (time ${q(g.time)}, levels ${g.levels.map(q).join(", ")})`;
  }
}

/** A column of a levels table is a level whatever its values; the reason says what they look like. */
function levelKind(s: SeriesFacts): [SeriesKind, string] {
  const range = `${s.min} to ${s.max}`;
  if (!s.integers) return ["level", `a column of the table of levels; UNSURE: its values (${range}) are not all whole numbers, so it may be a quantity other than a level`];
  const unit = s.steps > 0 ? Math.round((s.unitSteps / s.steps) * 100) : 0;
  return ["level", `a column of the table of levels: whole numbers ${range}, ${unit} % of changes by 1`];
}
