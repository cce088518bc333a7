/**
 * Messages about the study manifest: reading it, its YAML syntax, its structure (from the JSON
 * Schema) and its meaning (names, windows, runs, overrides, comparisons).
 *
 * Every function returns a `UserError` whose text starts with `file:line:column (at key.path)`,
 * says what is wrong and what to do.
 */
import { UserError, located, type Place } from "./error.js";

const REFERENCE = "docs/manifest.md";

function quote(value: unknown): string {
  if (typeof value === "string") return JSON.stringify(value);
  if (typeof value === "number" && !Number.isFinite(value)) return String(value);
  return JSON.stringify(value) ?? String(value);
}

function list(items: readonly string[]): string {
  return items.join(", ");
}

function suggest(suggestion: string | null): string {
  return suggestion === null ? "" : `Did you mean ${quote(suggestion)}? `;
}

// --- reading and syntax -------------------------------------------------------------------------

export function manifestNotFound(file: string): UserError {
  return located({ file }, "the manifest file does not exist", "Check the path; a relative path starts from the folder the command runs in.");
}

export function manifestIsFolder(file: string): UserError {
  return located({ file }, "this is a folder, not a manifest file", "Give the path of the manifest file itself (for example study.yaml).");
}

export function manifestUnreadable(file: string, reason: string): UserError {
  return located({ file }, `the manifest cannot be read (${reason})`, "Check that the file exists and that you may read it.");
}

export function manifestEmpty(file: string): UserError {
  return located({ file }, "the manifest is empty", `Write at least the keys scenarios and measures; ${REFERENCE} shows a complete example.`);
}

const SYNTAX_WORDS: Partial<Record<string, string>> = {
  TAB_AS_INDENT: "a tab is used for indentation, and YAML indents with spaces only",
  MULTILINE_IMPLICIT_KEY: "a key runs over more than one line (often a missing colon or a missing closing quote)",
  MISSING_CHAR: "a closing character is missing (a quote, ] or })",
  MULTIPLE_DOCS: "the file holds more than one YAML document (a line with --- after content)",
  BLOCK_AS_IMPLICIT_KEY: "a nested block is used as a key (often a missing colon on the line before)",
  BAD_DQ_ESCAPE: "a backslash escape inside double quotes is not valid",
};

/** Invalid YAML. `code` and `reason` are the parser's; known codes are put in plain words. */
export function yamlSyntax(place: Place, code: string, reason: string): UserError {
  const words = SYNTAX_WORDS[code];
  const what = words === undefined ? reason : `${words} (the parser says: ${reason})`;
  return located(
    place,
    `the manifest is not valid YAML: ${what}`,
    "Fix the text at this line and column. Indent with spaces, put a space after each colon, and quote texts that contain a colon or a #.",
  );
}

export function duplicateKey(place: Place, key: string): UserError {
  return located(place, `the key ${quote(key)} is written twice in the same mapping`, "Keep one of the two entries.");
}

// --- structure (JSON Schema) ---------------------------------------------------------------------

/** The manifest's top level is not a mapping of keys. */
export function notAMapping(place: Place, found: string): UserError {
  return located(place, `the manifest must be a mapping of keys (title, scenarios, measures, ...), found ${found}`, `Start from the example in ${REFERENCE}.`);
}

export function unknownKey(place: Place, key: string, where: string, allowed: readonly string[], suggestion: string | null): UserError {
  return located(
    place,
    `unknown key ${quote(key)} in ${where}`,
    `${suggest(suggestion)}The keys allowed here are: ${list(allowed)}.`,
  );
}

/** A scenario override names a measure key that cannot vary between scenarios. */
export function notOverridable(place: Place, key: string, overridable: readonly string[]): UserError {
  return located(
    place,
    `the key ${quote(key)} cannot be overridden per scenario`,
    `Only these keys can: ${list(overridable)}. To read other data in one scenario, define a separate measure.`,
  );
}

export function missingKey(place: Place, key: string, where: string, description: string | null): UserError {
  const hint = description === null ? "" : ` (${description})`;
  return located(place, `${where} needs the key ${quote(key)}`, `Add ${key}${hint}.`);
}

export function wrongType(place: Place, expected: string, found: string, description: string | null, quoteHint: boolean): UserError {
  const parts = [`This key takes ${description ?? expected}.`];
  if (quoteHint) parts.push("A name that looks like a number must be put in quotes.");
  return located(place, `expected ${expected}, found ${found}`, parts.join(" "));
}

export function notAllowedValue(place: Place, value: unknown, allowed: readonly unknown[], suggestion: string | null): UserError {
  return located(place, `${quote(value)} is not allowed here`, `${suggest(suggestion)}Allowed: ${list(allowed.map(quote))}.`);
}

export function numberOutOfRange(place: Place, value: number, condition: string, description: string | null): UserError {
  return located(place, `${value} is out of range: it must be ${condition}`, `This key takes ${description ?? `a number ${condition}`}.`);
}

export function wrongItemCount(place: Place, count: number, condition: string, description: string | null): UserError {
  const items = count === 1 ? "1 item" : `${count} items`;
  return located(place, `this list has ${items}, and it must have ${condition}`, `This key takes ${description ?? `a list with ${condition}`}.`);
}

export function emptyText(place: Place): UserError {
  return located(place, "this text is empty", "Write a non-empty text.");
}

export function targetNeedsOneKey(place: Place, count: number): UserError {
  return located(
    place,
    `a target takes exactly one of half_width and relative, found ${count}`,
    "Write either {half_width: H} (in the measure's unit) or {relative: R} (a fraction of the mean, such as 0.05).",
  );
}

/** A structural problem no more specific message covers (the validator's own words). */
export function schemaProblem(place: Place, reason: string): UserError {
  return located(place, `this value is not valid: it ${reason}`, `See ${REFERENCE} for what this key takes.`);
}

// --- meaning --------------------------------------------------------------------------------------

export function duplicateName(place: Place, what: "scenario" | "measure", name: string, firstLine: number | undefined): UserError {
  const first = firstLine === undefined ? "" : ` (the first is on line ${firstLine})`;
  return located(place, `two ${what}s are named ${quote(name)}${first}`, `Give each ${what} a name of its own.`);
}

export function confidenceOutOfRange(place: Place, value: number): UserError {
  const hint = value > 1 && value < 100 ? ` ${value} looks like a percentage: write ${value / 100}.` : "";
  return located(place, `confidence must lie strictly between 0 and 1, found ${value}`, `Write a level such as 0.95 for 95% intervals.${hint}`);
}

export function endNotAfterStart(place: Place, scenario: string, run: string | null, start: number, end: number): UserError {
  const whose = run === null ? `scenario ${quote(scenario)}` : `run ${quote(run)} of scenario ${quote(scenario)}`;
  return located(place, `the window of ${whose} ends at ${end}, which is not after its start ${start}`, "Make end greater than start.");
}

export function warmupPastEnd(place: Place, scenario: string, run: string, warmup: number, end: number): UserError {
  return located(
    place,
    `the warm-up ${warmup} is at or past the end ${end} of run ${quote(run)} of scenario ${quote(scenario)}, so nothing would be collected`,
    "Shorten the warm-up, or set a later end for this scenario or run.",
  );
}

export function capacityNotPositive(place: Place, measure: string, value: number): UserError {
  return located(place, `the capacity of measure ${quote(measure)} is ${value}; it must be greater than 0`, "Write the number of units that can be busy, or the name of a series that gives the capacity over time.");
}

export function needsEnd(place: Place, measure: string, kind: string, scenario: string, run: string): UserError {
  return located(
    place,
    `the ${kind} measure ${quote(measure)} needs a window end, but run ${quote(run)} of scenario ${quote(scenario)} has none`,
    "Give the scenario an end (end: 600), or give each run one ({path: ..., end: 600}).",
  );
}

export function globMatchedNothing(place: Place, pattern: string, folder: string): UserError {
  return located(place, `the pattern ${quote(pattern)} matches no file in the folder ${folder}`, "Check the pattern; paths are relative to the manifest's folder.");
}

export function runFileMissing(place: Place, path: string, folder: string): UserError {
  return located(place, `the run file ${quote(path)} does not exist (looked in the folder ${folder})`, "Check the path; paths are relative to the manifest's folder.");
}

export function runPathIsFolder(place: Place, path: string): UserError {
  return located(place, `${quote(path)} is a folder, not a run file`, `Name the files, or use a glob such as ${path.replace(/\/$/, "")}/*.csv.`);
}

/** A run path (or a glob's match) that is a pipe, a socket or a device: `kind` in words. */
export function runPathNotAFile(place: Place, path: string, kind: string, link: boolean): UserError {
  return located(
    place,
    `${quote(path)} is ${link ? `a symbolic link to ${kind}` : kind}, not a regular file; Sojourn reads run files to their end and records their bytes, so it reads regular files only`,
    "Save the run's output to a regular file first (for example cat PIPE > runs/rep-01.csv) and name that file.",
  );
}

export function unsupportedRunFile(place: Place, file: string, extensions: readonly string[]): UserError {
  return located(place, `the run file ${quote(file)} has an extension Sojourn does not read`, `Use one of: ${list(extensions)}; or narrow the pattern so it matches only run files.`);
}

export function duplicateRunId(place: Place, scenario: string, id: string, first: string, second: string): UserError {
  return located(
    place,
    `scenario ${quote(scenario)} has two runs with the id ${quote(id)} (${first} and ${second})`,
    "Rename one of the files: a run's id is its file name without extensions, and must be unique within a scenario.",
  );
}

export function noRuns(place: Place, scenario: string): UserError {
  return located(place, `scenario ${quote(scenario)} has no runs`, "List at least one run file, or a glob such as runs/*.csv.");
}

export function unknownMeasure(place: Place, name: string, known: readonly string[], suggestion: string | null): UserError {
  return located(place, `there is no measure named ${quote(name)}`, `${suggest(suggestion)}The measures are: ${list(known)}.`);
}

export function unknownScenario(place: Place, name: string, known: readonly string[], suggestion: string | null): UserError {
  return located(place, `there is no scenario named ${quote(name)}`, `${suggest(suggestion)}The scenarios are: ${list(known)}.`);
}

export function overrideNotForKind(place: Place, key: string, measure: string, kind: string, keysForKind: readonly string[]): UserError {
  return located(
    place,
    `the key ${quote(key)} does not apply to the ${kind} measure ${quote(measure)}`,
    `A ${kind} measure can override: ${list(keysForKind)}.`,
  );
}

export function seriesAndFrom(place: Place, measure: string): UserError {
  return located(place, `measure ${quote(measure)} gives both series and from`, "Keep one: series reads one series; from derives the measure from entity events.");
}

export function noSource(place: Place, measure: string, kind: string, fromForm: string): UserError {
  return located(place, `the ${kind} measure ${quote(measure)} needs series or from`, `Add series: NAME, or from: ${fromForm}.`);
}

export function sameScenarioTwice(place: Place, scenario: string): UserError {
  return located(place, `the comparison names scenario ${quote(scenario)} twice`, "Name two different scenarios.");
}

export function pairedRunsDiffer(place: Place, a: string, b: string, onlyA: readonly string[], onlyB: readonly string[]): UserError {
  const parts: string[] = [];
  if (onlyA.length > 0) parts.push(`only ${quote(a)} has ${list(onlyA)}`);
  if (onlyB.length > 0) parts.push(`only ${quote(b)} has ${list(onlyB)}`);
  return located(
    place,
    `a paired comparison needs the same run ids in both scenarios, but ${parts.join("; ")}`,
    "Give both scenarios runs with the same ids (the same seeds), or use method: welch.",
  );
}

export function mserCountMeasure(place: Place, measure: string): UserError {
  return located(place, `the MSER-5 warm-up cannot use the count measure ${quote(measure)}`, "Name a level, utilization or observation measure.");
}

export function tooFewBatches(place: Place, batches: number): UserError {
  return located(place, `batch means needs at least 2 batches, found ${batches}`, "Write batches: 2 or more (20 to 30 is common).");
}

export function quantileOutOfRange(place: Place, p: number): UserError {
  const hint = p > 1 && p < 100 ? ` ${p} looks like a percentage: write ${p / 100}.` : "";
  return located(place, `the quantile probability ${p} is not between 0 and 1`, `Write probabilities such as 0.5 or 0.95.${hint}`);
}
