/**
 * `sojourn init RUNS_DIR`: a starter manifest from a folder of run files.
 *
 *   RUNS_DIR ──scanRuns (first rows of each file)──► series, kinds, capacities, event pairs
 *            ──starterManifest──► YAML text with a comment on every guess
 *            ──loadStudy (the text, not yet written)──► it loads ──► write MANIFEST (never over one)
 */
import { existsSync, statSync, writeFileSync } from "node:fs";
import { dirname, isAbsolute, join, relative, resolve } from "node:path";
import { loadStudy } from "../manifest/loadStudy.js";
import { initMessages } from "../messages/index.js";
import * as outputMessages from "../messages/output.js";
import { realLocation } from "../record/ownership.js";
import { type RunsScan, scanRuns, type SkippedFile } from "./scanRuns.js";
import { starterManifest } from "./starterManifest.js";

export interface InitOptions {
  /** The manifest to write (default: `study.yaml` in the folder that holds RUNS_DIR). */
  out?: string;
  /** Replace an existing manifest. */
  force?: boolean;
  /** Rows read per file (default `HEAD_ROWS`). */
  headRows?: number;
  onSkip?: (file: SkippedFile) => void;
}

export interface InitResult {
  /** The manifest written, as the caller named it (or the default). */
  manifest: string;
  text: string;
  scan: RunsScan;
  /** What to check in the manifest, one line each. */
  checks: string[];
}

/** The default manifest path for a runs folder: `study.yaml` beside it. */
export function defaultManifest(runsDir: string): string {
  const path = join(dirname(resolve(runsDir)), "study.yaml");
  const shown = relative(process.cwd(), path);
  return shown.startsWith("..") || isAbsolute(shown) ? path : shown;
}

/** Scans `runsDir`, writes a starter manifest, and returns what it wrote. */
export async function initStudy(runsDir: string, options: InitOptions = {}): Promise<InitResult> {
  const manifest = options.out ?? defaultManifest(runsDir);
  refuseOverwrite(manifest, options.force ?? false);
  const scan = await scanRuns(runsDir, { headRows: options.headRows, onSkip: options.onSkip });
  if (scan.scenarios.length === 0) throw initMessages.noRunFiles(runsDir, scan.skipped.length);
  if (scan.series.length === 0) throw initMessages.noSeries(runsDir);
  // --force replaces an earlier manifest, never one of the run files just read (links resolved).
  const target = realLocation(manifest);
  if (scan.scenarios.some((sc) => sc.runs.some((r) => realLocation(r.path) === target))) throw outputMessages.outFileIsInput(manifest, "run file");
  const { text, checks } = starterManifest(scan, resolve(manifest));
  try {
    await loadStudy(manifest, { text });
  } catch (e) {
    // A manifest init wrote that does not load is init's fault, not the user's.
    throw new Error(`init made a manifest that does not load: ${(e as Error).message}\n${text}`, { cause: e });
  }
  refuseOverwrite(manifest, options.force ?? false);
  try {
    writeFileSync(manifest, text, { flag: options.force ? "w" : "wx" });
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    if (code === "EEXIST") throw initMessages.manifestExists(manifest);
    throw initMessages.manifestUnwritable(manifest, code ?? (e as Error).message);
  }
  return { manifest, text, scan, checks };
}

function refuseOverwrite(manifest: string, force: boolean): void {
  if (!existsSync(manifest)) return;
  if (statSync(manifest).isDirectory()) throw initMessages.manifestOutIsFolder(manifest);
  if (!force) throw initMessages.manifestExists(manifest);
}
