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

export function manifestNotAFile(file: string, kind: string): UserError {
  return located({ file }, `this is ${kind}, not a regular file; Sojourn reads the manifest whole and records its text, so it reads regular files only`, "Save the manifest to a regular file (for example study.yaml) and give its path.");
}

export function manifestFileTooLarge(file: string, bytes: number, limit: number): UserError {
  return located({ file }, `the manifest is ${bytes} bytes, more than the ${limit} bytes a manifest may have`, "A manifest names its run files (globs name thousands in one line) and holds no data; check that this is the manifest and not a run file.");
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

/** The manifest's bytes are not UTF-8 text; `byte` is the first byte that cannot be read. */
export function manifestNotUtf8(place: Place, byte: number, offset: number): UserError {
  const hex = `0x${byte.toString(16).toUpperCase().padStart(2, "0")}`;
  const latin = byte >= 0xa0 ? ` (${hex} is ${JSON.stringify(String.fromCharCode(byte))} in Latin-1 or Windows-1252, a common cause)` : "";
  return located(
    place,
    `the manifest is not valid UTF-8 text: the byte ${hex} at byte offset ${offset} does not belong to a UTF-8 character${latin}`,
    "Save the manifest as UTF-8 (in most editors: Save with encoding, UTF-8), then run the command again.",
  );
}

/** The manifest starts with a UTF-16 or UTF-32 byte-order mark. */
export function manifestWideEncoding(file: string, encoding: string): UserError {
  return located({ file }, `the manifest is saved as ${encoding}, and Sojourn reads manifests in UTF-8`, "Save the manifest as UTF-8 (in most editors: Save with encoding, UTF-8), then run the command again.");
}

/** Mappings and lists nested deeper than `limit` levels. */
export function manifestTooDeep(place: Place, limit: number): UserError {
  return located(
    place,
    `the manifest nests mappings and lists more than ${limit} levels deep here`,
    `A study manifest needs fewer than 10 levels (${REFERENCE} shows every key). Look for brackets [ { that are opened and never closed, or an indentation that keeps growing.`,
  );
}

/** An alias (*name) with no anchor (&name) before it. */
export function aliasWithoutAnchor(place: Place, name: string): UserError {
  return located(
    place,
    `the alias *${name} refers to no anchor: there is no &${name} before it`,
    `Write &${name} on the value to repeat, before its first *${name}; or write the value itself here.`,
  );
}

/** An alias inside the value its own anchor marks: the manifest would never end. */
export function aliasInsideItself(place: Place, name: string): UserError {
  return located(place, `the alias *${name} is inside the value that &${name} marks, so that value would contain itself without end`, `Move *${name} out of the value marked &${name}, or write the value itself.`);
}

/** With every alias written out, the manifest would hold more than `limit` values. */
export function manifestTooLarge(place: Place, limit: number): UserError {
  return located(
    place,
    `with its aliases (*name) written out, the manifest would hold more than ${limit.toLocaleString("en-US")} values; the count passes that here`,
    "Aliases that repeat other aliases multiply: repeat the values you need once each, or list fewer values. A study manifest holds a few hundred values.",
  );
}

/** More anchors and aliases than Sojourn resolves. */
export function tooManyAnchors(place: Place, limit: number): UserError {
  return located(place, `the manifest has more than ${limit.toLocaleString("en-US")} anchors and aliases (&name, *name)`, "Write the repeated values out, or repeat fewer of them: a study manifest needs a handful of aliases at most.");
}

/** An explicit YAML tag (`!foo`, `!!binary`) that does not give a plain text, number, true/false, list or mapping. */
export function tagNotAllowed(place: Place, tag: string): UserError {
  return located(
    place,
    `the tag ${tag} does not fit here: a manifest holds texts, numbers, true or false, lists and mappings, and the tag makes this value something else or does not fit it`,
    'Remove the tag and write the value plainly; to make a number-like name a text, quote it ("2024").',
  );
}

/** A `%YAML` directive for another version than 1.2. */
export function yamlVersion(place: Place, version: string): UserError {
  return located(
    place,
    `the manifest asks for YAML ${version}, and Sojourn reads YAML 1.2 only (in YAML 1.1, 010 is the number 8 and n is false)`,
    "Remove the %YAML line (and the --- after it, if nothing else needs it).",
  );
}

/** A mapping key written as a list, a mapping or an alias. */
export function keyNotText(place: Place, found: string): UserError {
  return located(place, `a mapping key must be a text, found ${found}`, "Write the key as a plain name followed by a colon, such as name: queue.");
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

// --- selecting the best (select:) ---------------------------------------------------------------

export function selectionScenarioTwice(place: Place, scenario: string): UserError {
  return located(place, `the selection names scenario ${quote(scenario)} twice`, "Name each scenario once.");
}

export function selectionTooFewScenarios(place: Place, count: number): UserError {
  return located(place, `a selection of the best needs at least two scenarios, and the study has ${count}`, "Add scenarios to the study, or remove the select entry.");
}

export function selectionProbabilityOutOfRange(place: Place, probability: number, k: number): UserError {
  return located(
    place,
    `the probability of a correct selection is ${quote(probability)}, but among ${k} scenarios it must be above 1/${k} (what a blind pick achieves) and below 1`,
    `Write a probability such as 0.95 (between ${quote(1 / k)} and 1, both left out).`,
  );
}

export function selectionFirstStageNeeded(place: Place, counts: readonly { scenario: string; runs: number }[]): UserError {
  return located(
    place,
    `the scenarios of this selection have different numbers of runs (${counts.map((c) => `${quote(c.scenario)} ${c.runs}`).join(", ")}), so the first stage is not known`,
    `Write first_stage: N0, the number of runs every scenario had in the first stage (at most ${Math.min(...counts.map((c) => c.runs))} here).`,
  );
}

export function selectionFirstStageTooMany(place: Place, scenario: string, runs: number, firstStage: number): UserError {
  return located(
    place,
    `scenario ${quote(scenario)} has ${runs} run${runs === 1 ? "" : "s"}, fewer than the first stage of ${firstStage}`,
    `Add runs until every scenario has the first stage's ${firstStage}, or write a smaller first_stage.`,
  );
}

export function selectionPairedRunsDiffer(place: Place, first: string, scenario: string, firstIds: readonly string[], ids: readonly string[]): UserError {
  return located(
    place,
    `a paired selection needs the same run ids at the head of every scenario, but the first stage of ${quote(first)} is ${list(firstIds)} and of ${quote(scenario)} is ${list(ids)}`,
    "Give every scenario its first-stage runs with the same ids (the same seeds), in the same order, or use method: independent.",
  );
}

/** A scenario's `factors` do not name the factors of the first scenario that has them. */
export function factorsDiffer(place: Place, scenario: string, missing: readonly string[], extra: readonly string[], first: string): UserError {
  const parts: string[] = [];
  if (missing.length > 0) parts.push(`lacks ${missing.length === 1 ? "the factor" : "the factors"} ${list(missing.map(quote))}`);
  if (extra.length > 0) parts.push(`names ${extra.length === 1 ? "the factor" : "the factors"} ${list(extra.map(quote))} that scenario ${quote(first)} does not`);
  return located(
    place,
    `scenario ${quote(scenario)} ${parts.join(" and ")}; every scenario must give a value to the same factors as scenario ${quote(first)}, the first with factors`,
    "Give every scenario the same factor names under factors:, each with its value in that scenario, or leave factors out everywhere.",
  );
}

export function factorCount(place: Place, count: number, limit: number): UserError {
  return located(
    place,
    count === 0 ? "factors is empty" : `factors names ${count} factors, more than the ${limit} allowed`,
    count === 0 ? "Name at least one factor with its value, such as {booths: 3}, or leave factors out." : `Keep at most ${limit} factors per scenario.`,
  );
}

/** A `where` with no column, or with more columns than allowed. */
export function whereColumnCount(place: Place, count: number, limit: number): UserError {
  return located(
    place,
    count === 0 ? "where is empty: it names no column" : `where names ${count} columns, more than the ${limit} allowed`,
    count === 0
      ? "Give at least one attribute column with the value or values to keep, such as {server: 0} or {class: [gold, silver]}, or leave where out to count every row."
      : `Keep at most ${limit} columns in one where; a row counts only if every column named holds one of its values.`,
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

/** A number written twice in one list of quantiles or thresholds. */
export function listedTwice(place: Place, key: string, value: number, firstIndex: number): UserError {
  return located(place, `${value} is listed twice in ${key} (first as item ${firstIndex}, counting from 0)`, "List each number once: each one names a figure, a calculation table and an interval of its own.");
}

/** `tables.edge_rows` leaves no room for checkpoint rows within `tables.max_rows`. */
export function edgeRowsTooMany(place: Place, edgeRows: number, maxRows: number): UserError {
  return located(
    place,
    `edge_rows ${edgeRows} keeps ${2 * edgeRows} rows at the head and the tail, which is not less than max_rows ${maxRows}`,
    `Make edge_rows less than half of max_rows (such as ${Math.max(1, Math.floor(maxRows / 10))}), or raise max_rows.`,
  );
}

/** The MSER-5 slice width cuts a run's window into more slices than Sojourn keeps. */
export function tooManySlices(place: Place, scenario: string, run: string, slice: number, start: number, end: number, slices: number, limit: number): UserError {
  const count = slices < 1e15 ? slices.toLocaleString("en-US") : slices.toExponential(2);
  return located(
    place,
    `the MSER-5 slice ${slice} cuts the window [${start}, ${end}] of run ${quote(run)} of scenario ${quote(scenario)} into ${count} slices; at most ${limit.toLocaleString("en-US")} are kept`,
    `Use a slice of at least ${roundUp((end - start) / limit)} (a slice is usually a few times the time between changes of the level, and a run has a few hundred to a few thousand of them).`,
  );
}

/** `x` rounded up to 3 significant digits: 0.30000000000000004 -> 0.301, 12345 -> 12400. */
function roundUp(x: number): number {
  if (!(x > 0) || !Number.isFinite(x)) return x;
  const step = 10 ** (Math.floor(Math.log10(x)) - 2);
  const up = Number((Math.ceil(x / step - 1e-9) * step).toPrecision(3));
  return up >= x ? up : Number((up + step).toPrecision(3));
}

/** A text longer than the schema allows (`label`, `unit`). */
export function textTooLong(place: Place, length: number, limit: number): UserError {
  return located(place, `this text has ${length} characters, more than the ${limit} allowed`, `Write a shorter text (at most ${limit} characters); a long explanation belongs in the study's README, not in a caption.`);
}

/** A text of only spaces where something is shown to the reader (`label`, `unit`). */
export function blankText(place: Place): UserError {
  return located(place, "this text holds only spaces", "Write the text to show, or leave the key out.");
}

/** A control character inside a text shown to the reader (`label`, `unit`). */
export function controlCharacter(place: Place, codePoint: number, position: number): UserError {
  const code = `U+${codePoint.toString(16).toUpperCase().padStart(4, "0")}`;
  return located(
    place,
    `this text holds the control character ${code} at character ${position}`,
    "Remove it: a label or unit is shown on one line of the report, and tabs, line breaks and direction controls would change how it reads. Write plain text.",
  );
}

/** A scenario override gives a measure's `label` or `unit`, which are the same in every scenario. */
export function shownTheSameEverywhere(place: Place, key: "label" | "unit"): UserError {
  return located(
    place,
    `the key ${quote(key)} cannot be overridden per scenario`,
    `A measure's ${key} is the same in every scenario, so that its figures side by side and its comparisons are of one quantity. Give ${key} in the measure's definition under measures:.`,
  );
}
