/**
 * Messages of `sojourn init` (`src/init/`): the errors that stop it, and the reasons it gives for
 * run files it skips. Each error says where, what is wrong and what to do.
 */
import { located, type UserError } from "./error.js";

// --- errors -------------------------------------------------------------------------------------

/** The runs folder does not exist. */
export function runsDirNotFound(dir: string): UserError {
  return located({ file: dir }, "the runs folder does not exist", "Give the folder that holds the run files (one subfolder per scenario, or the files of one scenario).");
}

/** The runs path is a file. */
export function runsDirIsFile(dir: string): UserError {
  return located({ file: dir }, "this is a file, not a folder of run files", "Give the folder the run file is in; `sojourn init` reads every run file in it.");
}

/** The runs folder cannot be listed. */
export function runsDirUnreadable(dir: string, reason: string): UserError {
  return located({ file: dir }, `the runs folder cannot be read (${reason})`, "Check that the folder exists and that you may read it.");
}

/** The manifest to write exists already and --force was not given. */
export function manifestExists(file: string): UserError {
  return located(
    { file },
    "a manifest already exists here; `sojourn init` does not overwrite it",
    "Choose another file with `--out`, or add `--force` to replace it.",
  );
}

/** The manifest path is a folder. */
export function manifestOutIsFolder(file: string): UserError {
  return located({ file }, "this is a folder; `--out` names the manifest file to write", "Give a file name, for example `--out study.yaml`.");
}

/** No readable run file was found at all. */
export function noRunFiles(dir: string, skipped: number): UserError {
  const what =
    skipped === 0
      ? "no run files found (run files end in .csv, .jsonl or .ndjson, optionally .gz, or in .parquet)"
      : `no readable run files: all ${skipped} file(s) were skipped (the reasons are listed above)`;
  return located({ file: dir }, what, "Put the run files in this folder (one subfolder per scenario), or fix the files listed as skipped.");
}

/** No run file has a row of any series. */
export function noSeries(dir: string): UserError {
  return located({ file: dir }, "the run files hold no data rows, so there is nothing to measure", "Check that the simulation wrote its rows (time, series, value, entity) into the run files.");
}

/**
 * Two run files have different layouts (or name their columns differently): one manifest reads
 * all its run files one way, so init does not guess which is right.
 */
export function mixedLayouts(first: string, firstLayout: string, other: string, otherLayout: string): UserError {
  return located(
    { file: other },
    `this run file looks like ${otherLayout}, but ${first} looks like ${firstLayout}; one manifest reads all its run files in one layout with the same column names`,
    "Put the files of each layout in a folder of their own and run `sojourn init` on each, or write the files of every run in the same layout.",
  );
}

/** The manifest cannot be written. */
export function manifestUnwritable(file: string, reason: string): UserError {
  return located({ file }, `the manifest cannot be written (${reason})`, "Check that the folder exists and that you may write in it, or choose another file with `--out`.");
}

// --- reasons for skipping a file (printed, and listed in the manifest as comments) --------------

/** Why a file was not taken as a run file: its extension. */
export function skipExtension(extensions: readonly string[]): string {
  return `not a run file: the extension is none of ${extensions.join(", ")}`;
}

/**
 * Why a file was skipped: the reader refused it. `message` is the reader's message for `display`
 * (`file:line: what\n  What to do: ...`); the reason keeps the line and the what.
 */
export function skipUnreadable(display: string, message: string): string {
  let first = message.split("\n")[0];
  if (first.startsWith(display)) first = first.slice(display.length);
  const line = /^:(\d+)(?::\d+)?: /.exec(first);
  if (line !== null) return `cannot be read as a run file: line ${line[1]}: ${first.slice(line[0].length)}`;
  return `cannot be read as a run file: ${first.replace(/^: /, "")}`;
}

/** Why a file was skipped: its first rows fit none of the layouts init recognises (`why` says what was seen). */
export function skipNoLayout(why: string): string {
  return `its layout was not recognised (events, entities or levels): ${why}; write its manifest by hand (docs/manifest.md, "Layouts of run files")`;
}

/** Why a file was skipped: a header but no data row. */
export function skipNoRows(): string {
  return "has no data rows (only a header, or blank lines)";
}

/** Why a file was skipped: another file of the scenario gives the same run id. */
export function skipDuplicateId(id: string, other: string): string {
  return `its run id "${id}" is the same as that of ${other}; run ids must differ within a scenario`;
}

/** Why a file was skipped: it lies in a folder below a scenario folder. */
export function skipTooDeep(): string {
  return "it is in a folder below a scenario folder; init reads RUNS_DIR/<scenario>/<file> only";
}
