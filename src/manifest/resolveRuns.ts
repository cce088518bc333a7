/**
 * A scenario's `runs` entry turned into run files: globs expanded (sorted, so the result does not
 * depend on the order a folder lists its files), plain paths checked, ids taken from file names.
 */
import { lstatSync, statSync } from "node:fs";
import { relative, resolve, sep } from "node:path";
import { globSync, isDynamicPattern } from "tinyglobby";
import { RUN_EXTENSIONS, notFileKind, runFormat, runIdOf } from "../ingest/runFile.js";
import { manifestMessages } from "../messages/index.js";
import type { KeyPath } from "./keyPath.js";
import type { ManifestSource } from "./manifestSource.js";
import type { ScenarioSpec } from "./spec.js";

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
