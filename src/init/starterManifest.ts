/**
 * `sojourn init`, part 2: a starter manifest (docs/manifest.md) from what `scanRuns` found.
 *
 * The text is written by hand rather than by a YAML library so that every guess can carry a
 * comment saying what it is based on and what to check.
 */
import { existsSync, readdirSync } from "node:fs";
import { basename, dirname, relative, resolve, sep } from "node:path";
import { escapePath, globSync, isDynamicPattern } from "tinyglobby";
import { RUN_EXTENSIONS } from "../ingest/runFile.js";
import { terminalText } from "../messages/terminal.js";
import type { RunsScan, ScannedScenario, SeriesFacts } from "./scanRuns.js";

/** Names that suggest a level is the number of busy units of something. */
const BUSY_NAME = /(^|[_\-. ])(busy|in[_\-. ]?use|occupied|working|serving|used)($|[_\-. ])|^busy/i;
/** Folder names too generic to be a study's title. */
const GENERIC_DIR = /^(runs?|data|output|outputs|out|results?|raw)$/i;

export interface StarterManifest {
  text: string;
  /** What the user should check, one line each. */
  checks: string[];
}

interface Measure {
  line: string;
  comment: string[];
}

/**
 * The starter manifest for `scan`, to be written at `manifestPath`. Every value in it that is a
 * guess has a comment with the reason.
 */
export function starterManifest(scan: RunsScan, manifestPath: string): StarterManifest {
  const manifestDir = dirname(manifestPath);
  const rel = (p: string) => relative(manifestDir, p).split(sep).join("/") || ".";
  const checks: string[] = [];
  const out: string[] = [];
  const runCount = scan.scenarios.reduce((n, s) => n + s.runs.length, 0);
  const command = `sojourn init ${rel(scan.dir)}`;

  out.push(`# Starter manifest written by \`${command}\` from ${runCount} run file${runCount === 1 ? "" : "s"} in ${scan.scenarios.length} scenario${scan.scenarios.length === 1 ? "" : "s"}.`);
  out.push("# Every value below is a GUESS made from the first rows of the run files; the comment beside");
  out.push("# each one says what it is based on. Check them, then run:");
  out.push(`#   sojourn check ${basename(manifestPath)}`);
  out.push(`#   sojourn report ${basename(manifestPath)} --out report`);
  out.push("# The manifest reference is docs/manifest.md.");
  if (scan.cut) out.push(`# Files longer than ${scan.headRows} rows were read only in part: row counts below are of the part read.`);
  if (scan.skipped.length > 0) {
    out.push("#");
    out.push(`# Skipped ${scan.skipped.length} file${scan.skipped.length === 1 ? "" : "s"} (not in any scenario below):`);
    for (const s of scan.skipped) out.push(`#   ${s.display}: ${s.reason}`);
    checks.push(`${scan.skipped.length} file(s) were skipped (listed at the top of the manifest): fix them and run init again, or leave them out.`);
  }
  out.push("");
  out.push("version: 1");
  const dirName = basename(resolve(scan.dir));
  const title = GENERIC_DIR.test(dirName) ? basename(dirname(resolve(scan.dir))) || dirName : dirName;
  out.push(`title: ${yamlText(title)}   # GUESS: a folder's name; write what the report should be called`);
  out.push("time_unit: time   # GUESS: unknown; write the unit of the simulation clock (min, h, s)");
  checks.push("title and time_unit: write the report's title and the clock's unit.");
  out.push("confidence: 0.95   # the usual 95 % confidence intervals");
  out.push(...layoutLines(scan, checks));

  const levels = scan.series.filter((s) => s.kind === "level");
  const ends = new Map(scan.scenarios.map((sc) => [sc.name, guessEnd(sc)]));
  const singleRun = scan.scenarios.some((sc) => sc.runs.length === 1);
  const used = new Set<string>();
  const unique = (base: string) => {
    let name = base;
    for (let k = 2; used.has(name); k++) name = `${base}_${k}`;
    used.add(name);
    return name;
  };
  // An entity table's event columns all count the same entities: only the last one (the way out) gets a count.
  const layout = scan.layout;
  const lastEvent = layout.layout === "entities" ? layout.events[layout.events.length - 1] : null;
  const measured = scan.series.filter((s) => lastEvent === null || s.name === lastEvent);
  const seriesMeasure = new Map(measured.map((s) => [s.name, unique(s.kind === "count" ? `${measureName(s.name)}_count` : measureName(s.name))]));
  const pairNames = scan.pairs.map((p) => ({ level: unique(`n_${measureName(p.start)}_to_${measureName(p.end)}`), time: unique(`time_${measureName(p.start)}_to_${measureName(p.end)}`) }));
  // The warm-up is judged on the busiest level that is neither a capacity nor busy units (a queue).
  const capacitySeries = new Set(scan.capacities.map((c) => c.capacity));
  const plain = levels.filter((s) => !capacitySeries.has(s.name) && !BUSY_NAME.test(s.name)).sort((a, b) => b.rows - a.rows);
  const warmupSeries = plain[0]?.name ?? levels[0]?.name ?? scan.series.find((s) => s.kind === "observation")?.name;
  const warmupMeasure = warmupSeries === undefined || !seriesMeasure.has(warmupSeries) ? pairNames[0]?.level : seriesMeasure.get(warmupSeries)!;
  const shortest = Math.min(...[...ends.values()].map((e) => e.end));
  const slice = niceUp(shortest / 200);
  if (singleRun) {
    out.push("# GUESS: some scenario has a single run, so its interval comes from batch means within the run,");
    out.push("# and the run's start (often empty and idle) is cut off by MSER-5. Check both; see docs/manifest.md.");
    out.push("analysis: {method: batch-means, batches: 20}");
    if (warmupMeasure !== undefined) {
      out.push(`warmup: {method: mser-5, measure: ${yamlText(warmupMeasure)}, slice: ${slice}}   # slice: about 1/200 of the run`);
    }
    checks.push("analysis and warmup: a scenario has one run, so batch means and an MSER-5 warm-up were guessed.");
  } else {
    out.push("# warmup: none guessed. If the runs start empty and you study the long run, cut the start off with");
    out.push(`#   warmup: <time>   or   warmup: {method: mser-5, measure: ${warmupMeasure ?? "<measure>"}, slice: ${slice}}`);
  }

  // Measures first: the scenarios need their names for overrides.
  const measures: Measure[] = [];
  for (const s of measured) {
    const name = seriesMeasure.get(s.name)!;
    const why = lastEvent === null ? `GUESS ${s.kind}: ${s.why}` : `GUESS count: the last event column in per-row order (how many entities got that far)`;
    measures.push({ line: `{name: ${yamlText(name)}, kind: ${s.kind}, series: ${yamlText(s.name)}}`, comment: [describe(s, runCount), why] });
  }
  const overrides = new Map<string, string[]>();
  for (const c of scan.capacities) {
    const name = unique(`${measureName(c.busy)}_use`);
    const initial = c.capacityFrom > 0 ? `, capacity_initial: 0` : "";
    const comment = [`GUESS utilization of ${q(c.busy)} against the capacity series ${q(c.capacity)}: ${c.why}.`];
    if (c.capacityFrom > 0) comment.push(`${q(c.capacity)} first appears at time ${c.capacityFrom}; capacity_initial is the capacity before that: set it.`);
    measures.push({ line: `{name: ${yamlText(name)}, kind: utilization, series: ${yamlText(c.busy)}, capacity: ${yamlText(c.capacity)}${initial}}`, comment });
    checks.push(`${name}: is ${q(c.busy)} the busy units and ${q(c.capacity)} the units available?`);
  }
  for (const s of levels) {
    if (scan.capacities.some((c) => c.busy === s.name) || capacitySeries.has(s.name) || !BUSY_NAME.test(s.name) || s.min < 0) continue;
    const name = unique(`${measureName(s.name)}_use`);
    const perScenario = scan.scenarios.map((sc) => ({ sc: sc.name, max: Math.max(1, sc.maxBySeries.get(s.name) ?? 1) }));
    const study = Math.max(...perScenario.map((p) => p.max));
    for (const p of perScenario) {
      if (p.max === study) continue;
      const list = overrides.get(p.sc) ?? [];
      list.push(`${yamlText(name)}: {capacity: ${p.max}}   # GUESS: the most ${q(s.name)} seen in this scenario's runs`);
      overrides.set(p.sc, list);
    }
    measures.push({
      line: `{name: ${yamlText(name)}, kind: utilization, series: ${yamlText(s.name)}, capacity: ${study}}`,
      comment: [`GUESS utilization: the name ${q(s.name)} suggests busy units; capacity ${study} is the most seen in any run. Write the real number of units.`],
    });
    checks.push(`${name}: the capacity is the most ${q(s.name)} seen in the runs; write the real number of units${perScenario.length > 1 ? " per scenario" : ""}.`);
  }
  if (layout.layout === "entities") measures.push(...chainComment(scan));
  for (const [i, p] of scan.pairs.entries()) {
    const who = layout.layout === "entities" ? "rows" : "entities";
    const evidence = `${p.shared} ${who} had both ${q(p.start)} and ${q(p.end)}, ${p.inOrder === p.shared ? "all" : p.inOrder} in that order; ${p.open} had ${q(p.start)} only (censored if still open at the end)`;
    measures.push({
      line: `{name: ${yamlText(pairNames[i].level)}, kind: level, from: {enter: ${yamlText(p.start)}, leave: ${yamlText(p.end)}}}`,
      comment: [`GUESS from entity events: ${evidence}.`, `The number of entities that have had ${q(p.start)} and not yet ${q(p.end)} (like a number in system).`],
    });
    measures.push({
      line: `{name: ${yamlText(pairNames[i].time)}, kind: observation, from: {start: ${yamlText(p.start)}, end: ${yamlText(p.end)}}}`,
      comment: [`Each entity's time from ${q(p.start)} to ${q(p.end)} (like a time in system).`],
    });
  }
  const served = layout.layout === "entities" && layout.events.length >= 3 ? scan.pairs.find((p) => p.start === layout.events[layout.events.length - 2] && p.end === lastEvent) : undefined;
  if (served !== undefined) {
    // An entity table of three or more events: the last stage (start of service to departure) may be busy servers.
    const key = served.start + "\u0000" + served.end;
    const name = unique(`${measureName(served.start)}_to_${measureName(served.end)}_use`);
    const perScenario = scan.scenarios.map((sc) => ({ sc: sc.name, max: Math.max(1, sc.mostBetween.get(key) ?? 1) }));
    const study = Math.max(...perScenario.map((p) => p.max));
    for (const p of perScenario) {
      if (p.max === study) continue;
      const list = overrides.get(p.sc) ?? [];
      list.push(`${yamlText(name)}: {capacity: ${p.max}}   # GUESS: the most entities between ${q(served.start)} and ${q(served.end)} at once in this scenario's runs`);
      overrides.set(p.sc, list);
    }
    measures.push({
      line: `{name: ${yamlText(name)}, kind: utilization, from: {enter: ${yamlText(served.start)}, leave: ${yamlText(served.end)}}, capacity: ${study}}`,
      comment: [
        `GUESS utilization: if the time from ${q(served.start)} to ${q(served.end)} (the last two events) is service by a fixed number of servers, this is their utilization.`,
        `capacity ${study} is the most entities seen between the two at once in any run read. Write the real number of servers, or delete this measure.`,
      ],
    });
    checks.push(`${name}: the capacity is the most entities seen between ${q(served.start)} and ${q(served.end)} at once; write the real number of servers${perScenario.length > 1 ? " per scenario" : ""}, or delete it.`);
  }
  if (scan.pairs.length > 0) checks.push(`entity measures (n_..._to_..., time_..._to_...): keep the event pairs that mean something, delete the rest.`);

  out.push("scenarios:");
  for (const sc of scan.scenarios) {
    const end = ends.get(sc.name)!;
    out.push(`  - name: ${yamlText(sc.name)}   # the folder ${rel(sc.dir)}`);
    out.push(`    end: ${end.end}   # CHECK: ${end.why}`);
    const runs = runsSpec(sc, rel, manifestDir);
    const ids = sc.runs.map((r) => r.id);
    const idText = ids.length <= 3 ? ids.join(", ") : `${ids[0]}, ${ids[1]}, ..., ${ids[ids.length - 1]}`;
    if (typeof runs === "string") out.push(`    runs: ${runs}   # ${ids.length} run${ids.length === 1 ? "" : "s"}: ${idText}`);
    else {
      out.push(`    runs:   # ${ids.length} run${ids.length === 1 ? "" : "s"}; listed one by one because ${runs.why}`);
      for (const r of runs.paths) out.push(`      - ${r}`);
    }
    const o = overrides.get(sc.name);
    if (o !== undefined) {
      out.push("    measures:");
      for (const line of o) out.push(`      ${line}`);
    }
  }
  checks.push("end of each scenario: the time each run stopped (guessed from the last row).");

  out.push("measures:");
  for (const m of measures) {
    for (const c of m.comment) out.push(`  # ${c}`);
    if (m.line !== "") out.push(`  - ${m.line}`);
  }
  out.push(...attributeLines(scan, pairNames[0]?.time ?? [...seriesMeasure.values()][0]));
  out.push("");
  return { text: out.map(oneLine).join("\n"), checks };
}

/**
 * One line of the manifest with its line breaks written `\n` and `\r` and its other control
 * characters `\uXXXX` (terminalText): a name from the run files (a series, a column, a folder, a
 * file) cannot end a comment early and start a line of its own (YAML 1.2.2 section 6.6: a comment
 * runs to the end of its line). Values are double-quoted by `yamlText` (JSON's escapes, which YAML
 * 1.2.2 section 7.3.1 reads the same), so there the escapes keep the name as it is.
 *
 * Example: `oneLine('# series "a\nb"')` is `# series "a\nb"` with a backslash and an `n`.
 */
function oneLine(line: string): string {
  return terminalText(line.replaceAll("\r", "\\r").replaceAll("\n", "\\n"));
}

const q = (name: string) => JSON.stringify(name);

/** The `layout:` and `columns:` lines, each guess with what it is based on. */
function layoutLines(scan: RunsScan, checks: string[]): string[] {
  const g = scan.layout;
  const runs = scan.scenarios.reduce((n, sc) => n + sc.runs.length, 0);
  const out: string[] = [];
  const seen = g.seenIn === "" ? [] : [`# GUESS layout, from the first rows of ${q(g.seenIn)}${runs > 1 ? ` (the other ${runs - 1} run file${runs === 2 ? "" : "s"} agree)` : ""}:`];
  out.push(...seen, ...g.why.map((w) => `#   ${w}`));
  const map = (pairs: [string, string | null, string][]) => {
    const given = pairs.filter(([, name, standard]) => name !== null && name !== standard).map(([key, name]) => `${key}: ${yamlText(name!)}`);
    return given.length === 0 ? null : `{${given.join(", ")}}`;
  };
  switch (g.layout) {
    case "events": {
      out.push("layout: events   # one row per event: time, series, value, entity (the default layout)");
      const columns = map([["time", g.time, "time"], ["series", g.series, "series"], ["value", g.value, "value"], ["entity", g.entity, "entity"]]);
      if (columns !== null) {
        out.push(`columns: ${columns}   # GUESS: the contract's columns under the names this file uses (reasons above)`);
        checks.push(`columns: the event table's columns were found under other names (${columns}); check which is which.`);
      }
      break;
    }
    case "entities":
      out.push("layout: entities   # one row per entity: an id column and one column per event, each cell that event's time");
      out.push(`columns: {entity: ${yamlText(g.entity)}}   # GUESS: the id column (reasons above)`);
      checks.push(`layout: entities, id column ${q(g.entity)}, event columns ${g.events.map(q).join(", ")}: check that these are the times of events.`);
      break;
    case "levels":
      out.push("layout: levels   # one row per instant: a time column and one column per level, each cell the level's new value");
      out.push(`columns: {time: ${yamlText(g.time)}}   # GUESS: the time column (reasons above)`);
      checks.push(`layout: levels, time column ${q(g.time)}, level columns ${g.levels.map(q).join(", ")}: check that each column is a level.`);
      break;
  }
  if (g.why.some((w) => w.startsWith("UNSURE"))) checks.push("layout: init was unsure about a column (see UNSURE at the layout); check it.");
  return out;
}

/** For an entity table: the per-row order of its event columns over every row read. */
function chainComment(scan: RunsScan): Measure[] {
  const g = scan.layout;
  if (g.layout !== "entities") return [];
  const parts: string[] = [q(g.events[0])];
  const unsure: string[] = [];
  for (let i = 1; i < g.events.length; i++) {
    const f = scan.entityOrder.get(g.events[i - 1] + "\u0000" + g.events[i]);
    const inOrder = f !== undefined && f.shared > 0 && f.inOrder === f.shared;
    parts.push(`${inOrder ? "<=" : "?"} ${q(g.events[i])}`);
    if (!inOrder) unsure.push(f === undefined || f.shared === 0 ? `${q(g.events[i - 1])} and ${q(g.events[i])} are never both filled on a row` : `${q(g.events[i])} came before ${q(g.events[i - 1])} on ${f.shared - f.inOrder} row(s) (first at line ${f.firstBackwards}): no measure between them`);
  }
  const comment = [`times: ${parts.join(" ")} on every row read${unsure.length > 0 ? " where marked <=" : ""}`, ...unsure.map((u) => `UNSURE: ${u}`)];
  return [{ line: "", comment }];
}

/** Commented-out `where` suggestions for the columns that are neither events nor times, with few values. */
function attributeLines(scan: RunsScan, example: string | undefined): string[] {
  const few = scan.layout.attributes.filter((a) => a.values !== null);
  const many = scan.layout.attributes.filter((a) => a.values === null);
  if (few.length + many.length === 0) return [];
  const out = ["", "# Columns read as attributes (not times, series or levels): a measure can keep only the rows with some values."];
  for (const a of few) {
    const values = a.values!;
    out.push(`# ${q(a.name)} holds ${values.length} value${values.length === 1 ? "" : "s"} in the rows read: ${values.map(q).join(", ")}. To measure one of them, add to a measure${example === undefined ? "" : ` (say ${example})`}:`);
    out.push(`#   where: {${yamlText(a.name)}: ${yamlText(values[0])}}`);
  }
  for (const a of many) out.push(`# ${q(a.name)} holds many different values: not suggested for where.`);
  return out;
}

/** A one-line description of a series: rows, files, values and entities. */
function describe(s: SeriesFacts, runs: number): string {
  const carries = [s.valued > 0 ? (s.valued === s.rows ? "values" : `values on ${s.valued}`) : "no values", s.withEntity > 0 ? (s.withEntity === s.rows ? "entities" : `entities on ${s.withEntity}`) : "no entities"];
  return `series ${q(s.name)}: ${s.rows} rows in ${s.files} of ${runs} run files; ${carries.join(", ")}`;
}

/** The window end of a scenario: the last row of any run, rounded up to a round number. */
function guessEnd(sc: ScannedScenario): { end: number; why: string } {
  const known = sc.runs.map((r) => r.lastTime).filter((t): t is number => t !== null);
  const unknown = sc.runs.length - known.length;
  const last = known.length > 0 ? Math.max(...known) : 0;
  const first = known.length > 0 ? Math.min(...known) : 0;
  const end = last > 0 ? niceUp(last) : 1;
  let why = `the last row of any run is at ${last}, rounded up to ${end}. Set the time the simulation stopped`;
  if (known.length > 1 && first < 0.9 * last) why += ` (runs end between ${first} and ${last}: give each run its own end if they stopped at different times)`;
  if (unknown > 0) why += `; ${unknown} compressed run(s) were read only in part, so their end is unknown`;
  return { end, why };
}

/** The smallest number >= x with two significant digits (478.3 -> 480, 9987 -> 10000, 0.213 -> 0.22). */
export function niceUp(x: number): number {
  if (!(x > 0)) return 1;
  const step = 10 ** (Math.floor(Math.log10(x)) - 1);
  const n = Math.ceil(Number((x / step).toPrecision(12)));
  return Number((n * step).toPrecision(12));
}

/**
 * A glob when it matches exactly the scenario's runs, else the list of paths. A folder or file
 * name may hold glob characters (`{x}`, `[1]`, `(a)`, `!`): each text is kept only if the manifest
 * will read it as naming exactly those files (src/manifest/resolveRuns.ts: a text with glob
 * characters is a glob, any other a plain path), a path with its glob characters escaped when
 * that is what it takes.
 */
function runsSpec(sc: ScannedScenario, rel: (p: string) => string, manifestDir: string): string | { paths: string[]; why: string } {
  const names = sc.runs.map((r) => basename(r.path));
  let why = "the folder holds skipped files too";
  const suffix = RUN_EXTENSIONS.find((e) => names[0].endsWith(e));
  if (suffix !== undefined && names.every((n) => n.endsWith(suffix))) {
    const matches = readdirSync(sc.dir).filter((n) => !n.startsWith(".") && n.endsWith(suffix) && n.length > suffix.length);
    if (matches.length === names.length && matches.every((n) => names.includes(n))) {
      const folder = rel(sc.dir);
      const glob = folder === "." ? `*${suffix}` : `${escapePath(folder)}/*${suffix}`;
      if (namesExactly(glob, sc.runs.map((r) => rel(r.path)))) return yamlText(glob);
      why = "no glob names exactly these files (the folder's name holds glob characters)";
    }
  }
  const paths = sc.runs.map((r) => {
    const path = rel(r.path);
    return yamlText([path, escapePath(path)].find((p) => namesExactly(p, [path])) ?? path);
  });
  return { paths, why };

  /** Whether the `runs` entry `entry` names exactly the files `paths` (both relative to the manifest's folder). */
  function namesExactly(entry: string, paths: string[]): boolean {
    const found = isDynamicPattern(entry)
      ? globSync(entry, { cwd: manifestDir, onlyFiles: true, expandDirectories: false, absolute: true }).map((p) => resolve(p))
      : existsSync(resolve(manifestDir, entry)) ? [resolve(manifestDir, entry)] : [];
    const wanted = paths.map((p) => resolve(manifestDir, p));
    return found.length === wanted.length && wanted.every((p) => found.includes(p));
  }
}

/** A measure name from a series name: letters, digits and `_`. */
function measureName(series: string): string {
  const s = series.replace(/[^A-Za-z0-9_]+/g, "_").replace(/^_+|_+$/g, "");
  return s === "" ? "series" : /^[0-9]/.test(s) ? `s_${s}` : s;
}

/** A YAML scalar: plain when it is safe everywhere (also inside `{...}`), else double-quoted. */
export function yamlText(s: string): string {
  const plain = /^[A-Za-z0-9_./][A-Za-z0-9_.\-/*]*$/.test(s) && !/^(true|false|null|~|yes|no|on|off|y|n)$/i.test(s) && !/^[-+.0-9][0-9_.eE+-]*$/.test(s);
  return plain ? s : JSON.stringify(s);
}
