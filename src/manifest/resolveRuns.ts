/**
 * A scenario's `runs` entry turned into run files: globs expanded (sorted, so the result does not
 * depend on the order a folder lists its files), plain paths checked, ids taken from file names.
 */
import { type Dirent, lstatSync, readdirSync, statSync } from "node:fs";
import { isAbsolute, join, relative, resolve, sep } from "node:path";
import picomatch from "picomatch";
import { RUN_EXTENSIONS, notFileKind, runFormat, runIdOf } from "../ingest/runFile.js";
import { manifestMessages } from "../messages/index.js";
import type { KeyPath } from "./keyPath.js";
import type { ManifestSource } from "./manifestSource.js";
import type { ScenarioSpec } from "./spec.js";
import { tinyglobby } from "./libraries.js";

const { globSync, isDynamicPattern } = tinyglobby;

/** One run file with the manifest entry it came from and the window bounds that entry gives. */
export interface ResolvedRun {
  id: string;
  path: string;
  file: string;
  start?: number;
  end?: number;
  /** Key path of the `runs` entry that named the file. */
  origin: KeyPath;
}

/** Compares by UTF-16 code units, the same on every platform and locale. */
function byCodeUnits(a: string, b: string): number {
  return a < b ? -1 : a > b ? 1 : 0;
}

function relativeFile(baseDir: string, path: string): string {
  return relative(baseDir, path).split(sep).join("/");
}

/** The files one path or glob names, relative to `baseDir` and sorted. */
function filesOf(pattern: string, origin: KeyPath, baseDir: string, source: ManifestSource): string[] {
  if (isDynamicPattern(pattern)) {
    // The walker lists regular files and links; a link may lead to a device (`/dev/zero`).
    const found = globSync(pattern, { cwd: baseDir, onlyFiles: true, expandDirectories: false, absolute: true });
    // ...but never a pipe, a socket or a device itself: look for those the pattern matches.
    const special = specialEntryMatching(pattern, baseDir);
    if (special !== null) throw manifestMessages.runPathNotAFile(source.place(origin), relativeFile(baseDir, special.path), special.kind, false);
    if (found.length === 0) throw manifestMessages.globMatchedNothing(source.place(origin), pattern, baseDir);
    const files = found.map((p) => resolve(p)).sort((a, b) => byCodeUnits(relativeFile(baseDir, a), relativeFile(baseDir, b)));
    for (const path of files) {
      const kind = kindOf(path);
      if (kind !== null && kind !== MISSING) throw manifestMessages.runPathNotAFile(source.place(origin), relativeFile(baseDir, path), kind, isLink(path));
    }
    return files;
  }
  const path = resolve(baseDir, pattern);
  const kind = kindOf(path);
  if (kind === MISSING) throw manifestMessages.runFileMissing(source.place(origin), pattern, baseDir);
  if (kind === "a folder") throw manifestMessages.runPathIsFolder(source.place(origin), pattern);
  if (kind !== null) throw manifestMessages.runPathNotAFile(source.place(origin), pattern, kind, isLink(path));
  return [path];
}

const MISSING = "missing";

/** Folders below a glob's fixed start that are looked through for pipes, sockets and devices. */
const SPECIAL_SCAN_LIMIT = 100_000;

/**
 * The first pipe, socket or device (in path order) that `pattern` matches, or null. The glob
 * walker lists only files, folders and links, so these are found by walking the folders under the
 * pattern's fixed start, as deep as the pattern reaches (any depth with `**`), without following
 * links to folders. Hidden names are skipped as the glob skips them.
 */
function specialEntryMatching(pattern: string, baseDir: string): { path: string; kind: string } | null {
  const scan = picomatch.scan(pattern);
  const root = resolve(baseDir, scan.base === "" ? "." : scan.base);
  const rest = scan.glob.split("/");
  const depth = rest.includes("**") ? Infinity : rest.length;
  // Matched as written: relative to the manifest's folder, or absolute (the folder's own name may
  // hold glob characters, so it is never made part of the pattern).
  const absolute = isAbsolute(pattern);
  const matches = picomatch(pattern);
  const shown = (path: string) => (absolute ? path.split(sep).join("/") : relativeFile(baseDir, path));
  let folders = 0;
  const walk = (dir: string, level: number): { path: string; kind: string } | null => {
    if (++folders > SPECIAL_SCAN_LIMIT) return null;
    let entries: Dirent[];
    try {
      entries = readdirSync(dir, { withFileTypes: true });
    } catch {
      return null;
    }
    entries.sort((a, b) => byCodeUnits(a.name, b.name));
    for (const e of entries) {
      if (e.name.startsWith(".")) continue;
      const path = join(dir, e.name);
      if (e.isFIFO() || e.isSocket() || e.isCharacterDevice() || e.isBlockDevice()) {
        if (matches(shown(path))) return { path, kind: notFileKind(e)! };
      } else if (e.isDirectory() && level + 1 < depth) {
        const inner = walk(path, level + 1);
        if (inner !== null) return inner;
      }
    }
    return null;
  };
  return walk(root, 0);
}

/** What the path leads to when it is not a regular file (links followed), MISSING, or null for a file. */
function kindOf(path: string): string | null {
  try {
    return notFileKind(statSync(path));
  } catch {
    return MISSING;
  }
}

function isLink(path: string): boolean {
  try {
    return lstatSync(path).isSymbolicLink();
  } catch {
    return false;
  }
}

/**
 * The runs of scenario number `index`, in the order written (each glob's matches sorted by their
 * path relative to `baseDir`). Checks extensions, duplicate ids and that there is at least one run.
 */
export function resolveRuns(scenario: ScenarioSpec, index: number, baseDir: string, source: ManifestSource): ResolvedRun[] {
  const runsPath: KeyPath = ["scenarios", index, "runs"];
  const entries = typeof scenario.runs === "string" ? [{ entry: scenario.runs, origin: runsPath }] : scenario.runs.map((entry, i) => ({ entry, origin: [...runsPath, i] }));
  const runs: ResolvedRun[] = [];
  const byId = new Map<string, ResolvedRun>();
  for (const { entry, origin } of entries) {
    const spec = typeof entry === "string" ? { path: entry } : entry;
    const patternPath = typeof entry === "string" ? origin : [...origin, "path"];
    for (const path of filesOf(spec.path, patternPath, baseDir, source)) {
      const file = relativeFile(baseDir, path);
      if (runFormat(file) === null) throw manifestMessages.unsupportedRunFile(source.place(patternPath), file, RUN_EXTENSIONS);
      const run: ResolvedRun = { id: runIdOf(file), path, file, origin };
      if (spec.start !== undefined) run.start = spec.start;
      if (spec.end !== undefined) run.end = spec.end;
      const twin = byId.get(run.id);
      if (twin !== undefined) throw manifestMessages.duplicateRunId(source.place(patternPath), scenario.name, run.id, twin.file, run.file);
      byId.set(run.id, run);
      runs.push(run);
    }
  }
  if (runs.length === 0) throw manifestMessages.noRuns(source.place(runsPath), scenario.name);
  return runs;
}
