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
import { DEFAULT_COLUMNS } from "./columns.js";
import { type FileHead, readHead } from "./readHead.js";

/** Rows read per file, at most. */
export const HEAD_ROWS = 200_000;

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
  let cut = false;

  for (const sc of layout.scenarios) {
    const runs: ScannedRun[] = [];
    const ids = new Map<string, string>();
    const maxBySeries = new Map<string, number>();
    for (const path of sc.files) {
      const display = slash(relative(process.cwd(), path)) || basename(path);
      const id = runIdOf(path);
      const same = ids.get(id);
      if (same !== undefined) {
        skip(display, initMessages.skipDuplicateId(id, same));
        continue;
      }
      let head: FileHead;
      try {
        head = await readHead(path, display, DEFAULT_COLUMNS, limit);
      } catch (e) {
        if (!(e instanceof UserError)) throw e;
        skip(display, initMessages.skipUnreadable(display, e.message));
        continue;
      }
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
    }
    if (runs.length > 0) scenarios.push({ name: sc.name, dir: sc.dir, runs, maxBySeries });
  }

  const series: SeriesFacts[] = [...acc.values()].map(({ values: _values, ...facts }) => facts);
  for (const s of series) [s.kind, s.why] = guessKind(s, scenarios.reduce((n, sc) => n + sc.runs.length, 0));
  return {
    dir,
    scenarios,
    skipped,
    series,
    capacities: guessCapacities(series, pairCounts, firstTimes),
    pairs: guessPairs(series, entityFacts),
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
function guessPairs(series: SeriesFacts[], facts: Map<string, { shared: number; inOrder: number; open: number }>): EventPair[] {
  const order = new Map(series.map((s, i) => [s.name, i]));
  const out: EventPair[] = [];
  for (const [key, f] of facts) {
    const [start, end] = key.split("\u0000");
    const total = f.shared + f.open;
    if (f.shared === 0 || f.shared * 2 < total || f.inOrder < 0.95 * f.shared) continue;
    // The reverse direction must not also qualify (ties in both orders: keep file order).
    const back = facts.get(end + "\u0000" + start);
    if (back !== undefined && back.inOrder >= 0.95 * back.shared && order.get(end)! < order.get(start)!) continue;
    out.push({ start, end, ...f });
  }
  return out.sort((a, b) => order.get(a.start)! - order.get(b.start)! || order.get(a.end)! - order.get(b.end)!);
}
