/**
 * The bad-input catalogue as data: every kind of bad input Sojourn knows, with a small invented
 * study that shows it, the command to run, the exit status and the catalogue message it must
 * print. `catalogue.test.ts` runs each case through the built command line, checks it, and
 * checks that `docs/bad-input.md` shows exactly the output of the run (and rewrites the page with
 * `SOJOURN_WRITE_DOCS=1`).
 *
 * Sources: CONTRACT.md section 5 (an input error exits with status 1, names the file and the
 * line or manifest key path, says what to do, shows no stack trace; a usage error exits with 2),
 * sections 1 and 3 for what counts as bad, and the message catalogue `src/messages/*.ts` for the
 * words.
 */
import { execFileSync, spawnSync } from "node:child_process";
import { createHash } from "node:crypto";
import { appendFileSync, chmodSync, mkdirSync, realpathSync, symlinkSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { gzipSync } from "node:zlib";
import { ROW_LIMIT_MAX } from "../../src/ingest/feeder.js";
import { RUN_EXTENSIONS } from "../../src/ingest/runFile.js";
import { PARQUET_CODECS } from "../../src/ingest/parquetFile.js";
import { type EventRow, eventsParquet, parquetFile, parquetWithSchema } from "../helpers/parquet.js";
import { type Place, type UserError, ingestMessages, initMessages, manifestMessages, reportMessages } from "../../src/messages/index.js";
import * as outputMessages from "../../src/messages/output.js";
import * as studyMessages from "../../src/messages/study.js";
import * as warnings from "../../src/messages/warnings.js";
import * as summaryMessages from "../../src/messages/summary.js";
import * as verifyMessages from "../../src/messages/verify.js";

export interface BadInputCase {
  /** Anchor of the entry in docs/bad-input.md. */
  id: string;
  /** Heading of the entry. */
  title: string;
  /** What the bad input is, in one or two sentences (Markdown). */
  what: string;
  /** Files of the study folder; `study.yaml` is the manifest. Buffers are written as bytes. */
  files: Record<string, string | Buffer>;
  /** The files shown as the example in the doc, in this order. */
  show: string[];
  /** Command-line arguments, run in the study folder. */
  args: string[];
  /** Expected exit status. */
  status: 0 | 1 | 2;
  /** The catalogue message expected on standard error (status 1), built from `src/messages`. */
  message?: () => UserError;
  /** When the whole message cannot be rebuilt in the test: the text it must start with. */
  startsWith?: () => string;
  /** The place the message must name: `file:line`, `file` or `file:line:column (at path)`. */
  place?: string;
  /** For status 0 or 2: texts the output (stdout + stderr) must contain. */
  contains?: string[];
  /** Prepares the folder after the files are written (permissions, folders). */
  setup?: (dir: string) => void;
  /** Run the command as an unprivileged user when the tests run as root (file permissions). */
  unprivileged?: boolean;
  /**
   * Also run with `--debug` and expect the stack trace. One entry per message catalogue is
   * enough: one top-level handler prints every error (src/cli/program.ts).
   */
  debug?: boolean;
  /** After the command: files of the study folder that must exist with this content (null: must not exist). */
  afterwards?: Record<string, string | null>;
  /** Environment variables for the command. */
  env?: Record<string, string>;
}

const STUDY = "study.yaml";

/** A manifest with one scenario over `runs/*.csv` and the given measure lines. */
function manifest(measures: string, scenario = "{name: morning, end: 10, runs: runs/*.csv}", top = ""): string {
  return `title: Bakery counter\ntime_unit: min\n${top}scenarios:\n  - ${scenario}\nmeasures:\n${measures}`;
}
const QUEUE = "  - {name: queue, kind: level, series: queue}\n";
const ENTITIES = "  - {name: in_shop, kind: level, from: {enter: arrive, leave: leave}}\n";
const GOOD_CSV = "time,series,value,entity\n0,queue,2,\n3,queue,5,\n";

/** 1-based line and column of the first occurrence of `needle` in `text`. */
export function positionOf(text: string, needle: string): { line: number; column: number } {
  const index = text.indexOf(needle);
  if (index < 0) throw new Error(`test setup: ${JSON.stringify(needle)} not found`);
  const before = text.slice(0, index);
  return { line: before.split("\n").length, column: index - before.lastIndexOf("\n") };
}

/** The manifest place of `needle` (its line and column) with a key path. */
function at(text: string, needle: string, path: string): Place {
  return { file: STUDY, ...positionOf(text, needle), path };
}

const check = ["check", STUDY];

// --- the manifests with positions, kept as constants so the expected places are found in them --
const M_YAML = manifest(QUEUE).replace("{name: queue, kind: level, series: queue}", "{name: queue, kind: level, series: queue");
const M_UNKNOWN = manifest("  - {name: queue, kind: level, seires: queue}\n");
const M_TYPE = manifest(QUEUE, "{name: morning, end: ten, runs: runs/*.csv}");
const M_WARMUP = manifest(QUEUE, "{name: morning, end: 10, runs: runs/*.csv}", "warmup: 10\n");
const M_CAPACITY = manifest("  - {name: oven, kind: utilization, series: busy, capacity: 0}\n");
const M_GLOB = manifest(QUEUE, "{name: morning, end: 10, runs: runs/afternoon/*.csv}");
const M_TWINS = manifest(QUEUE, "{name: morning, end: 10, runs: [runs/a/day-1.csv, runs/b/day-1.csv.gz]}");
const M_NORUNS = manifest(QUEUE, "{name: morning, end: 10, runs: []}");
const M_CONFIDENCE = manifest(QUEUE, undefined, "confidence: 95\n");
const M_MISSING = manifest(QUEUE, "{name: morning, end: 10, runs: [runs/day-1.csv, runs/day-9.csv]}");
const M_DUPKEY = manifest(QUEUE, "{name: morning, end: 10, end: 12, runs: runs/*.csv}");
const M_NOEND = manifest(QUEUE, "{name: morning, runs: runs/*.csv}");
const M_ENDSTART = manifest(QUEUE, "{name: morning, start: 10, end: 5, runs: runs/*.csv}");
const M_EXT = manifest(QUEUE, "{name: morning, end: 10, runs: runs/*}");
const M_MISSKEY = manifest("  - {name: queue, series: queue}\n");
const M_KIND = manifest("  - {name: queue, kind: levle, series: queue}\n");
const M_DUPNAME = manifest(QUEUE + "  - {name: queue, kind: count, series: queue}\n");
const M_OVER = manifest("  - {name: oven, kind: utilization, series: busy, capacity: ovens}\n");
const M_CLOCK = manifest(QUEUE, "{name: morning, start: 1000000000, end: 1000000000.01, runs: runs/*.csv}");
const M_ABSENT = manifest(QUEUE + "  - {name: served, kind: count, series: sevred}\n");
const M_PIPE = manifest(QUEUE, "{name: morning, end: 10, runs: [runs/day-1.csv, runs/day-2.csv]}");
const M_ROWLIMIT = manifest(QUEUE, undefined, "max_row_bytes: 1024\n");
const M_ROWLIMIT_LOW = manifest(QUEUE, undefined, "max_row_bytes: 100\n");
const M_OVERRIDE = manifest(QUEUE, "{name: morning, end: 10, runs: runs/*.csv, measures: {queeu: {initial: 1}}}");

// --- manifests for the encoding, nesting, alias and bounds cases --------------------------------
const M_LATIN1 = manifest(QUEUE, "{name: café, end: 10, runs: runs/*.csv}");
const M_DEEP = `title: ${"[".repeat(70)}${"]".repeat(70)}\n` + manifest(QUEUE).replace("title: Bakery counter\n", "");
const M_BOMB = [
  "a: &a [loaf, loaf, loaf, loaf, loaf, loaf, loaf, loaf, loaf, loaf]",
  "b: &b [*a, *a, *a, *a, *a, *a, *a, *a, *a, *a]",
  "c: &c [*b, *b, *b, *b, *b, *b, *b, *b, *b, *b]",
  "d: &d [*c, *c, *c, *c, *c, *c, *c, *c, *c, *c]",
  "e: &e [*d, *d, *d, *d, *d, *d, *d, *d, *d, *d]",
  "f: &f [*e, *e, *e, *e, *e, *e, *e, *e, *e, *e]",
  "g: &g [*f, *f, *f, *f, *f, *f, *f, *f, *f, *f]",
  "",
].join("\n") + manifest(QUEUE);
const M_ALIASES = manifest(QUEUE) + `closing: &closing 10\nrepeats: [${Array.from({ length: 1200 }, () => "*closing").join(", ")}]\n`;
const M_TAG = manifest(QUEUE, "{name: morning, end: !!timestamp 2024-03-01, runs: runs/*.csv}");
const M_YAML11 = `%YAML 1.1\n---\n${manifest(QUEUE, "{name: morning, end: 010, runs: runs/*.csv}")}`;
const M_NOANCHOR = manifest(QUEUE, "{name: morning, end: *closing, runs: runs/*.csv}");
const M_SELFALIAS = manifest(QUEUE, "{name: morning, end: 10, runs: &days [runs/day-1.csv, *days]}");
const M_LISTKEY = manifest(QUEUE, "{name: morning, end: 10, runs: runs/*.csv, [a, b]: 1}");
const M_TWICE = manifest("  - {name: wait, kind: observation, series: wait, quantiles: [0.5, 0.9, 0.5]}\n");
const M_EDGE = manifest(QUEUE, undefined, "tables: {max_rows: 1000, edge_rows: 500}\n");
const M_SLICES = manifest(QUEUE, "{name: morning, end: 600, runs: runs/*.csv}", "warmup: {method: mser-5, measure: queue, slice: 0.001}\n");
const M_QUANTILES = manifest(`  - {name: wait, kind: observation, series: wait, quantiles: [${Array.from({ length: 101 }, (_, i) => i / 100).join(", ")}]}\n`);
const M_BATCHES = manifest(QUEUE, undefined, "analysis: {method: batch-means, batches: 50000}\n");
const M_LABEL_LONG = manifest(`  - {name: queue, kind: level, series: queue, label: ${"Bread queue".repeat(20)}}\n`);
const M_LABEL_CONTROL = manifest('  - {name: queue, kind: level, series: queue, label: "Bread\\tqueue"}\n');
/** Two scenarios for the select: cases: morning with day-1 and day-2, evening with day-1 and day-3 (or day-1 only). */
const selectStudy = (evening: string, select: string): string =>
  `title: Bakery counter\ntime_unit: min\nscenarios:\n  - {name: morning, end: 10, runs: [runs/day-1.csv, runs/day-2.csv]}\n  - {name: evening, end: 10, runs: ${evening}}\nmeasures:\n${QUEUE}select:\n  - ${select}\n`;
const M_SELECT_P = selectStudy("[runs/day-1.csv, runs/day-2.csv]", "{measure: queue, better: smaller, indifference: 1, probability: 0.4}");
const M_SELECT_N0 = selectStudy("[runs/day-1.csv]", "{measure: queue, better: smaller, indifference: 1}");
const M_SELECT_PAIRED = selectStudy("[runs/day-1.csv, runs/day-3.csv]", "{measure: queue, better: smaller, indifference: 1, method: paired}");
const SELECT_RUNS = { "runs/day-1.csv": GOOD_CSV, "runs/day-2.csv": GOOD_CSV, "runs/day-3.csv": GOOD_CSV };
const M_UNIT_OVERRIDE = manifest(QUEUE, "{name: morning, end: 10, runs: runs/*.csv, measures: {queue: {unit: loaves}}}");

function gzipCut(text: string): Buffer {
  const z = gzipSync(Buffer.from(text));
  return z.subarray(0, Math.floor(z.length / 2));
}
function gzipFlipped(text: string): Buffer {
  const z = Buffer.from(gzipSync(Buffer.from(text)));
  for (let i = 12; i < z.length - 8; i++) z[i] ^= 0x5a; // damage the deflate data, keep the header
  return z;
}
const M_PARQUET = manifest(QUEUE, "{name: morning, end: 10, runs: runs/*.parquet}");
const PQ_GOOD = eventsParquet([[0, "queue", 2], [3, "queue", 5]]);
/** 400 rows in two row groups of 200, gzip pages, with 40 bytes of the second group's data overwritten. */
const PQ_DAMAGED = (() => {
  const bytes = Buffer.from(eventsParquet(Array.from({ length: 400 }, (_, i) => [i / 40, "queue", i % 5] as EventRow), { codec: "GZIP", rowGroupSize: 200 }));
  const at = Math.floor(bytes.length * 0.6);
  return bytes.fill(0xff, at, at + 40);
})();
/** A manifest whose measure reads only rows whose `stations` attribute is `oven`. */
const M_PARQUET_NESTED = manifest("  - {name: queue, kind: level, series: queue, where: {stations: oven}}\n", "{name: morning, end: 10, runs: runs/*.parquet}");
/** An event table with a list column `stations` (Parquet's three-level LIST of texts) after its flat columns. */
const PQ_NESTED = parquetWithSchema(
  [
    { name: "root", num_children: 4 },
    { name: "time", type: "DOUBLE", repetition_type: "REQUIRED" },
    { name: "series", type: "BYTE_ARRAY", converted_type: "UTF8", repetition_type: "OPTIONAL" },
    { name: "value", type: "DOUBLE", repetition_type: "OPTIONAL" },
    { name: "stations", repetition_type: "OPTIONAL", converted_type: "LIST", num_children: 1 },
    { name: "list", repetition_type: "REPEATED", num_children: 1 },
    { name: "element", type: "BYTE_ARRAY", converted_type: "UTF8", repetition_type: "OPTIONAL" },
  ],
  [
    { name: "time", data: [0, 3] },
    { name: "series", data: ["queue", "queue"] },
    { name: "value", data: [2, 5] },
    { name: "stations", data: [["oven"], ["oven", "till"]] },
  ],
);
/** A name of 300 bytes: more than the 255 most file systems take for one name. */
const LONG_NAME = "r".repeat(300);

const MAIN = fileURLToPath(new URL("../../dist/cli/main.js", import.meta.url));

/** Writes an earlier report of the study into `dir/out` (through the built command line). */
function earlierReport(dir: string, out: string): void {
  const r = spawnSync(process.execPath, [MAIN, "report", STUDY, "--out", out, "--quiet"], { cwd: dir, encoding: "utf8", env: { ...process.env, SOJOURN_WORKERS: "1" } });
  if (r.status !== 0) throw new Error(`test setup: the earlier report failed: ${r.stderr}`);
}

/** Creates folders below `dir` until the deepest one's absolute path is exactly `length` bytes; returns it. */
function deepFolder(dir: string, length: number): string {
  let path = join(realpathSync(dir), "deep-folders");
  while (path.length + 201 < length) path = join(path, "d".repeat(200));
  path = join(path, "e".repeat(length - path.length - 1));
  mkdirSync(path, { recursive: true });
  return path;
}
// --- report folders and run summaries (verify, report --from-summaries) ----------------------------
const sha = (text: string) => createHash("sha256").update(text).digest("hex");
const M_PLAIN = manifest(QUEUE);
const M_ENTITIES = manifest(
  "  - {name: wait, kind: observation, from: {start: arrived, end: started}}\n  - {name: in_shop, kind: level, from: {enter: arrived, leave: left}}\n",
  undefined,
  "layout: entities\ncolumns: {entity: id}\n",
);
const M_LEVELS = manifest(QUEUE + "  - {name: counter, kind: utilization, series: busy, capacity: 1}\n", undefined, "layout: levels\n");
const M_WHERE_EMPTY = manifest("  - {name: queue, kind: level, series: queue, where: {}}\n");
const M_WHERE_NO_VALUES = manifest("  - {name: queue, kind: level, series: queue, where: {server: []}}\n");
const M_WHERE_MAPPING = manifest("  - {name: queue, kind: level, series: queue, where: {server: {id: 0}}}\n");
const M_WHERE_EMPTY_TEXT = manifest('  - {name: queue, kind: level, series: queue, where: {class: [gold, ""]}}\n');
/** Two scenarios of a designed experiment with the given `factors` entries (empty: none). */
const factorStudy = (a: string, b: string) =>
  `title: Bakery counter\ntime_unit: min\nscenarios:\n  - {name: two-ovens, end: 10, runs: runs/*.csv${a}}\n  - {name: three-ovens, end: 10, runs: runs/*.csv${b}}\nmeasures:\n${QUEUE}`;
const M_FACTOR_TEXT = factorStudy(", factors: {ovens: two}", ", factors: {ovens: 3}");
const M_FACTOR_LACKING = factorStudy(", factors: {ovens: 2, bakers: 1}", ", factors: {ovens: 3}");
const M_FACTOR_EXTRA = factorStudy(", factors: {ovens: 2}", ", factors: {ovens: 3, bakers: 1}");
const M_FACTOR_SOME = factorStudy(", factors: {ovens: 2}", "");
const M_FACTOR_EMPTY = factorStudy(", factors: {}", "");
const M_BLANK_LABEL = manifest('  - {name: queue, kind: level, series: queue, label: "   "}\n');
const M_SERIES_AND_FROM = manifest("  - {name: queue, kind: level, series: queue, from: {enter: arrive, leave: leave}}\n");
const M_SAME_TWICE = manifest(QUEUE) + "compare:\n  - {measure: queue, scenarios: [morning, morning]}\n";
const M_ONE_BATCH = manifest(QUEUE, undefined, "analysis: {method: batch-means, batches: 1}\n");
const M_MSER_COUNT = manifest(QUEUE + "  - {name: served, kind: count, series: served}\n", undefined, "warmup: {method: mser-5, measure: served, slice: 1}\n");
const M_TARGET_EMPTY = manifest("  - {name: queue, kind: level, series: queue, target: {}}\n");
const M_RUNS_FOLDER = manifest(QUEUE, "{name: morning, end: 10, runs: [runs]}");
const M_NOT_MAPPING = "- morning\n- evening\n";
/** An event table and an entity table (one row per customer): two layouts in one runs folder. */
const EVENTS_CSV = "time,series,value\n0,queue,0\n1,queue,1\n2,queue,2\n3,queue,1\n4,queue,0\n";
const ENTITY_CSV = "id,arrived,left\n1,0.5,1.25\n2,0.75,2.5\n3,1.5,3\n4,2,3.75\n";
const M_WHERE = manifest("  - {name: queue, kind: level, series: queue, where: {sever: 0}}\n");
/** A record.json as `sojourn report` writes it, up to the key that is missing (outputs). */
const RECORD_NO_OUTPUTS = JSON.stringify(
  {
    format: "sojourn-record/1",
    tool: { name: "sojourn", version: "0.1.0" },
    node: "v20.20.2",
    manifest: { path: "../study.yaml", sha256: sha(M_PLAIN), text: M_PLAIN },
    inputs: [],
  },
  null,
  2,
) + "\n";
const RECORD_CUT = RECORD_NO_OUTPUTS.slice(0, 60);
function notJson(text: string): string {
  try {
    JSON.parse(text);
  } catch (e) {
    return `it is not JSON (${(e as Error).message})`;
  }
  throw new Error("test setup: the text is JSON");
}
/** A summary with its own digest right but no analysis in it (src/study/runSummary.ts, encodeSummary). */
const SUMMARY_EMPTY = (() => {
  const body: Record<string, unknown> = {
    format: "sojourn-run-summary/1",
    scenario: "morning",
    run: "day-1",
    file: "runs/day-1.csv",
    input_sha256: sha(GOOD_CSV),
    plan_sha256: sha("made by hand"),
  };
  body.digest = sha(JSON.stringify(body));
  return JSON.stringify(body) + "\n";
})();
const CHANGED_CSV = GOOD_CSV.replace("3,queue,5", "3,queue,6");

/** A row of `n` bytes: time, series, value and a long entity cell. */
const longRow = (time: number, n: number): string => `${time},queue,2,` + "e".repeat(n - `${time},queue,2,`.length);
const LONG_TEXT = Array.from({ length: 400 }, (_, i) => `${4 + i / 10},queue,${i % 7},`).join("\n") + "\n";

export const CASES: BadInputCase[] = [
  // --- files --------------------------------------------------------------------------------
  {
    id: "manifest-missing",
    debug: true,
    title: "The manifest does not exist",
    what: "The path given to the command names no file.",
    files: {},
    show: [],
    args: ["check", "studdy.yaml"],
    status: 1,
    message: () => manifestMessages.manifestNotFound("studdy.yaml"),
    place: "studdy.yaml",
  },
  {
    id: "run-file-missing",
    title: "A run file named in the manifest does not exist",
    what: "A plain path (no glob characters) in a scenario's `runs:` names no file.",
    files: { [STUDY]: M_MISSING, "runs/day-1.csv": GOOD_CSV },
    show: [STUDY],
    args: check,
    status: 1,
    startsWith: () => manifestMessages.runFileMissing(at(M_MISSING, "runs/day-9.csv", "scenarios[0].runs[1]"), "runs/day-9.csv", "").message.split(" (looked")[0],
  },
  {
    id: "run-file-unreadable",
    title: "A run file cannot be read",
    what: "The file exists but the user running Sojourn may not read it (here: its permissions are `000`).",
    files: { [STUDY]: manifest(QUEUE), "runs/day-1.csv": GOOD_CSV },
    show: [STUDY],
    args: check,
    status: 1,
    message: () => ingestMessages.unreadableFile("runs/day-1.csv", "EACCES"),
    place: "runs/day-1.csv",
    setup: (dir) => chmodSync(join(dir, "runs/day-1.csv"), 0),
    unprivileged: true,
  },
  {
    id: "run-path-pipe",
    title: "A run path that is a named pipe, a socket or a device",
    what: "A run path names a named pipe (FIFO), here `runs/day-2.csv` made with `mkfifo`; sockets and devices are refused the same way. A run file is read to its end and its bytes recorded, so it must be a regular file.",
    files: { [STUDY]: M_PIPE, "runs/day-1.csv": GOOD_CSV },
    show: [STUDY],
    args: check,
    status: 1,
    message: () => manifestMessages.runPathNotAFile(at(M_PIPE, "runs/day-2.csv", "scenarios[0].runs[1]"), "runs/day-2.csv", "a named pipe (FIFO)", false),
    setup: (dir) => execFileSync("mkfifo", [join(dir, "runs/day-2.csv")]),
  },
  {
    id: "run-path-device-link",
    title: "A run path that is a link to a device",
    what: "A glob matches a symbolic link to `/dev/zero` (here `runs/day-2.csv`), which would give zero bytes without end. A link to a regular file is read as that file.",
    files: { [STUDY]: manifest(QUEUE), "runs/day-1.csv": GOOD_CSV },
    show: [STUDY],
    args: check,
    status: 1,
    message: () => manifestMessages.runPathNotAFile(at(manifest(QUEUE), "runs/*.csv", "scenarios[0].runs"), "runs/day-2.csv", "a character device", true),
    setup: (dir) => symlinkSync("/dev/zero", join(dir, "runs/day-2.csv")),
  },
  {
    id: "empty-file",
    debug: true,
    title: "An empty run file",
    what: "A run file of 0 bytes: a CSV file needs at least its header row.",
    files: { [STUDY]: manifest(QUEUE), "runs/day-1.csv": "" },
    show: ["runs/day-1.csv"],
    args: check,
    status: 1,
    message: () => ingestMessages.emptyFile("runs/day-1.csv", "csv"),
    place: "runs/day-1.csv",
  },
  {
    id: "unsupported-extension",
    title: "A run file with an extension Sojourn does not read",
    what: "A glob such as `runs/*` also matches a file that is not a run file (`notes.txt`).",
    files: { [STUDY]: M_EXT, "runs/day-1.csv": GOOD_CSV, "runs/notes.txt": "baked 40 loaves\n" },
    show: [STUDY],
    args: check,
    status: 1,
    message: () => manifestMessages.unsupportedRunFile(at(M_EXT, "runs/*", "scenarios[0].runs"), "runs/notes.txt", RUN_EXTENSIONS),
  },
  // --- CSV ----------------------------------------------------------------------------------
  {
    id: "missing-column",
    title: "A missing header or a missing required column",
    what: "The first line is taken as the header; here the file has no header at all, so neither `time` nor `series` is found.",
    files: { [STUDY]: manifest(QUEUE), "runs/day-1.csv": "0,queue,2\n3,queue,5\n" },
    show: ["runs/day-1.csv"],
    args: check,
    status: 1,
    message: () => ingestMessages.missingColumns("runs/day-1.csv", [{ role: "time", name: "time" }, { role: "series", name: "series" }], ["0", "queue", "2"]),
    place: "runs/day-1.csv:1",
  },
  {
    id: "missing-entity-column",
    title: "No entity column for an entity-derived measure",
    what: "A measure with `from:` follows entities, but the file has no `entity` column.",
    files: { [STUDY]: manifest(ENTITIES), "runs/day-1.csv": "time,series\n1,arrive\n2,leave\n" },
    show: ["runs/day-1.csv"],
    args: check,
    status: 1,
    message: () => ingestMessages.missingEntityColumn("runs/day-1.csv", "entity", ["time", "series"], ["arrive", "leave"]),
    place: "runs/day-1.csv:1",
  },
  {
    id: "unterminated-quote",
    title: "An unterminated quote",
    what: "A quoted CSV field is opened and never closed, so the rest of the file is inside it.",
    files: { [STUDY]: manifest(QUEUE), "runs/day-1.csv": 'time,series,value\n0,queue,2\n3,"queue,5\n4,queue,1\n' },
    show: ["runs/day-1.csv"],
    args: check,
    status: 1,
    message: () => ingestMessages.unterminatedQuote("runs/day-1.csv", 3),
    place: "runs/day-1.csv:3",
  },
  {
    id: "text-after-quote",
    title: "Text after a closing quote",
    what: 'A field such as `"queue"x`: something other than a comma follows the closing quote.',
    files: { [STUDY]: manifest(QUEUE), "runs/day-1.csv": 'time,series,value\n0,"queue"x,2\n' },
    show: ["runs/day-1.csv"],
    args: check,
    status: 1,
    message: () => ingestMessages.textAfterQuote("runs/day-1.csv", 2),
    place: "runs/day-1.csv:2",
  },
  {
    id: "short-row",
    title: "A row cut short",
    what: "A row ends before its series column (the run stopped while writing, or a comma is missing).",
    files: { [STUDY]: manifest(QUEUE), "runs/day-1.csv": "time,series,value\n0,queue,2\n3\n" },
    show: ["runs/day-1.csv"],
    args: check,
    status: 1,
    message: () => ingestMessages.tooFewFields("runs/day-1.csv", 3, 1, 2),
    place: "runs/day-1.csv:3",
  },
  {
    id: "row-too-long",
    title: "A row longer than the row limit",
    what: "A row of a run file is longer than `max_row_bytes` (1 MiB unless the manifest says otherwise; 1024 bytes here, and line 3 of `runs/day-1.csv` is 2000 bytes long). A file that is not a run file, or has no line breaks at all, stops here at once, however large it is.",
    files: { [STUDY]: M_ROWLIMIT, "runs/day-1.csv": Buffer.from(`time,series,value,entity\n0,queue,2,\n${longRow(3, 2000)}\n`) },
    show: [STUDY],
    args: check,
    status: 1,
    message: () => ingestMessages.rowTooLong("runs/day-1.csv", 3, 1024, ROW_LIMIT_MAX),
    place: "runs/day-1.csv:3",
    // A large file is read on a second thread: the limit must reach it (every file is large here).
    env: { SOJOURN_PARALLEL_BYTES: "1" },
  },
  {
    id: "quote-too-long",
    title: "An unterminated quote in a long file",
    what: "A quoted field opens on line 3 and never closes, so the rest of the file would read as inside it; once the row limit's worth of bytes are inside the quote, Sojourn stops and names the line where the quote opened.",
    files: { [STUDY]: M_ROWLIMIT, "runs/day-1.csv": Buffer.from(`time,series,value\n0,queue,2\n3,"queue,5\n${LONG_TEXT}`) },
    show: [STUDY],
    args: check,
    status: 1,
    message: () => ingestMessages.quoteTooLong("runs/day-1.csv", 3, 1024, ROW_LIMIT_MAX),
    place: "runs/day-1.csv:3",
  },
  {
    id: "decimal-comma",
    title: "A decimal comma",
    what: "A number written with a decimal comma (`1,5` for 1.5) reads as two cells, so the row has more cells than the header has columns.",
    files: { [STUDY]: manifest(QUEUE), "runs/day-1.csv": "time,series,value\n0,queue,2\n3,queue,1,5\n" },
    show: ["runs/day-1.csv"],
    args: check,
    status: 1,
    message: () => ingestMessages.tooManyFields("runs/day-1.csv", 3, 4, 3, true),
    place: "runs/day-1.csv:3",
  },
  {
    id: "too-many-cells",
    title: "A row with more cells than the header",
    what: "A row has a cell the header gives no column for, so which cell belongs to which column is a guess.",
    files: { [STUDY]: manifest(QUEUE), "runs/day-1.csv": "time,series,value\n0,queue,2\n3,queue,5,till 2\n" },
    show: ["runs/day-1.csv"],
    args: check,
    status: 1,
    message: () => ingestMessages.tooManyFields("runs/day-1.csv", 3, 4, 3, false),
    place: "runs/day-1.csv:3",
  },
  {
    id: "duplicate-column",
    title: "A header that names a column twice",
    what: "Two columns of the header have the same name, so a row's cell for that name would be a guess.",
    files: { [STUDY]: manifest(QUEUE), "runs/day-1.csv": "time,series,value,value\n0,queue,2,3\n" },
    show: ["runs/day-1.csv"],
    args: check,
    status: 1,
    message: () => ingestMessages.duplicateColumn("runs/day-1.csv", 1, "value", 3, 4),
    place: "runs/day-1.csv:1",
  },
  {
    id: "empty-time",
    title: "An empty time cell",
    what: "A row without its simulation time.",
    files: { [STUDY]: manifest(QUEUE), "runs/day-1.csv": "time,series,value\n0,queue,2\n,queue,5\n" },
    show: ["runs/day-1.csv"],
    args: check,
    status: 1,
    message: () => ingestMessages.missingTime("runs/day-1.csv", 3),
    place: "runs/day-1.csv:3",
  },
  {
    id: "empty-series",
    title: "An empty series cell",
    what: "A row that belongs to no series.",
    files: { [STUDY]: manifest(QUEUE), "runs/day-1.csv": "time,series,value\n0,queue,2\n3,,5\n" },
    show: ["runs/day-1.csv"],
    args: check,
    status: 1,
    message: () => ingestMessages.emptySeries("runs/day-1.csv", 3),
    place: "runs/day-1.csv:3",
  },
  {
    id: "not-a-number",
    debug: true,
    title: "A time or value that is not a number",
    what: "Text where a number belongs (here a time written with a unit).",
    files: { [STUDY]: manifest(QUEUE), "runs/day-1.csv": "time,series,value\n0,queue,2\n3min,queue,5\n" },
    show: ["runs/day-1.csv"],
    args: check,
    status: 1,
    message: () => ingestMessages.notANumber("runs/day-1.csv", 3, "time", "3min"),
    place: "runs/day-1.csv:3",
  },
  {
    id: "nan",
    title: "NaN as a value",
    what: "A model that divided 0 by 0 and wrote the result.",
    files: { [STUDY]: manifest(QUEUE), "runs/day-1.csv": "time,series,value\n0,queue,2\n3,queue,NaN\n" },
    show: ["runs/day-1.csv"],
    args: check,
    status: 1,
    message: () => ingestMessages.notANumber("runs/day-1.csv", 3, "value", "NaN"),
    place: "runs/day-1.csv:3",
  },
  {
    id: "infinite",
    title: "An infinite time",
    what: "`Infinity` (or `inf`) is not a time on a simulation clock.",
    files: { [STUDY]: manifest(QUEUE), "runs/day-1.csv": "time,series,value\n0,queue,2\nInfinity,queue,0\n" },
    show: ["runs/day-1.csv"],
    args: check,
    status: 1,
    message: () => ingestMessages.notANumber("runs/day-1.csv", 3, "time", "Infinity"),
    place: "runs/day-1.csv:3",
  },
  {
    id: "overflow",
    title: "A number too large for a double",
    what: "`1e999` is a valid decimal, but beyond the largest double (about 1.8e308): it would become infinite.",
    files: { [STUDY]: manifest(QUEUE), "runs/day-1.csv": "time,series,value\n0,queue,2\n3,queue,1e999\n" },
    show: ["runs/day-1.csv"],
    args: check,
    status: 1,
    message: () => ingestMessages.notANumber("runs/day-1.csv", 3, "value", "1e999"),
    place: "runs/day-1.csv:3",
  },
  {
    id: "time-decreases",
    title: "Time decreasing within a series",
    what: "Within one series, rows must be in time order (different series may interleave freely).",
    files: { [STUDY]: manifest(QUEUE), "runs/day-1.csv": "time,series,value\n0,queue,2\n5,queue,3\n2,sold,\n4,queue,1\n" },
    show: ["runs/day-1.csv"],
    args: check,
    status: 1,
    message: () => ingestMessages.timeDecreased("runs/day-1.csv", 5, "queue", 5, 4, 3),
    place: "runs/day-1.csv:5",
  },
  // --- JSON Lines and gzip ------------------------------------------------------------------
  {
    id: "truncated-json",
    debug: true,
    title: "A truncated JSON line",
    what: "The last line of a JSON Lines file is cut short (the run stopped while writing).",
    files: { [STUDY]: manifest(QUEUE, "{name: morning, end: 10, runs: runs/*.jsonl}"), "runs/day-1.jsonl": '{"time": 0, "series": "queue", "value": 2}\n{"time": 3, "series": "qu' },
    show: ["runs/day-1.jsonl"],
    args: check,
    status: 1,
    startsWith: () => ingestMessages.badJson("runs/day-1.jsonl", 2, "").message.split(" (")[0],
    place: "runs/day-1.jsonl:2",
  },
  {
    id: "json-not-object",
    title: "A JSON line that is not an object",
    what: "A line holds an array (or a number, or a text) instead of an object.",
    files: { [STUDY]: manifest(QUEUE, "{name: morning, end: 10, runs: runs/*.jsonl}"), "runs/day-1.jsonl": '{"time": 0, "series": "queue", "value": 2}\n[3, "queue", 5]\n' },
    show: ["runs/day-1.jsonl"],
    args: check,
    status: 1,
    message: () => ingestMessages.notAnObject("runs/day-1.jsonl", 2, "an array"),
    place: "runs/day-1.jsonl:2",
  },
  {
    id: "json-wrong-type",
    title: "A JSON key of the wrong type",
    what: 'A key of the wrong JSON type, such as `"time": true`. (A number written as a JSON string, `"time": "3"`, is accepted.)',
    files: { [STUDY]: manifest(QUEUE, "{name: morning, end: 10, runs: runs/*.jsonl}"), "runs/day-1.jsonl": '{"time": 0, "series": "queue", "value": 2}\n{"time": true, "series": "queue", "value": 5}\n' },
    show: ["runs/day-1.jsonl"],
    args: check,
    status: 1,
    startsWith: () => "runs/day-1.jsonl:2: `time` (the time) is",
    place: "runs/day-1.jsonl:2",
  },
  {
    id: "json-duplicate-key",
    title: "A JSON object with a key twice",
    what: "An object of a JSON Lines file has the same key twice; a JSON reader keeps one of the two values and drops the other.",
    files: { [STUDY]: manifest(QUEUE, "{name: morning, end: 10, runs: runs/*.jsonl}"), "runs/day-1.jsonl": '{"time": 0, "series": "queue", "value": 2}\n{"time": 3, "series": "queue", "value": 5, "value": 4}\n' },
    show: ["runs/day-1.jsonl"],
    args: check,
    status: 1,
    message: () => ingestMessages.duplicateKey("runs/day-1.jsonl", 2, "value"),
    place: "runs/day-1.jsonl:2",
  },
  {
    id: "corrupt-gzip",
    debug: true,
    title: "A corrupt gzip file",
    what: "The compressed data of a `.csv.gz` file is damaged.",
    files: { [STUDY]: manifest(QUEUE, "{name: morning, end: 10, runs: runs/*.csv.gz}"), "runs/day-1.csv.gz": gzipFlipped(GOOD_CSV + LONG_TEXT) },
    show: [],
    args: check,
    status: 1,
    startsWith: () => ingestMessages.corruptGzip("runs/day-1.csv.gz", "").message.split(" (")[0],
    place: "runs/day-1.csv.gz",
  },
  {
    id: "truncated-gzip",
    title: "A gzip file cut short",
    what: "Only the first half of a `.csv.gz` file was copied.",
    files: { [STUDY]: manifest(QUEUE, "{name: morning, end: 10, runs: runs/*.csv.gz}"), "runs/day-1.csv.gz": gzipCut(GOOD_CSV + LONG_TEXT) },
    show: [],
    args: check,
    status: 1,
    startsWith: () => ingestMessages.corruptGzip("runs/day-1.csv.gz", "").message.split(" (")[0],
    place: "runs/day-1.csv.gz",
  },
  // --- Parquet --------------------------------------------------------------------------------
  {
    id: "parquet-not-parquet",
    debug: true,
    title: "A .parquet file that is not Parquet",
    what: "A CSV export saved under the name `day-1.parquet`.",
    files: { [STUDY]: M_PARQUET, "runs/day-1.parquet": GOOD_CSV },
    show: ["runs/day-1.parquet"],
    args: check,
    status: 1,
    message: () => ingestMessages.notParquet("runs/day-1.parquet", GOOD_CSV.length),
    place: "runs/day-1.parquet",
  },
  {
    id: "parquet-truncated",
    title: "A Parquet file cut short",
    what: "A Parquet file whose last 30 bytes (part of its footer) were lost in a copy.",
    files: { [STUDY]: M_PARQUET, "runs/day-1.parquet": PQ_GOOD.subarray(0, PQ_GOOD.length - 30) },
    show: [],
    args: check,
    status: 1,
    message: () => ingestMessages.truncatedParquet("runs/day-1.parquet", PQ_GOOD.length - 30, "it does not end with the 4 bytes `PAR1`"),
    place: "runs/day-1.parquet",
  },
  {
    id: "parquet-missing-column",
    title: "A Parquet file without the time or series column",
    what: "The series column is called `kind` in the file, and the manifest does not map it.",
    files: {
      [STUDY]: M_PARQUET,
      "runs/day-1.parquet": parquetFile([
        { name: "time", data: [0, 3], type: "DOUBLE" },
        { name: "kind", data: ["queue", "queue"], type: "STRING" },
        { name: "value", data: [2, 5], type: "DOUBLE" },
      ]),
    },
    show: [],
    args: check,
    status: 1,
    message: () => ingestMessages.parquetMissingColumns("runs/day-1.parquet", [{ role: "series", name: "series" }], ["time", "kind", "value"]),
    place: "runs/day-1.parquet",
  },
  {
    id: "parquet-text-in-number-column",
    title: "Texts in a Parquet time or value column",
    what: "The time column was written as strings (`\"0\"`, `\"3\"`) instead of numbers.",
    files: {
      [STUDY]: M_PARQUET,
      "runs/day-1.parquet": parquetFile([
        { name: "time", data: ["0", "3"], type: "STRING" },
        { name: "series", data: ["queue", "queue"], type: "STRING" },
        { name: "value", data: [2, 5], type: "DOUBLE" },
      ]),
    },
    show: [],
    args: check,
    status: 1,
    message: () => ingestMessages.parquetTextNotNumber("runs/day-1.parquet", 1, "time", "time", "0"),
    place: "runs/day-1.parquet:1",
  },
  {
    id: "parquet-unusable-type",
    title: "A Parquet column of a type Sojourn cannot use",
    what: "The value column holds booleans; the row and the column's Parquet type are named.",
    files: {
      [STUDY]: M_PARQUET,
      "runs/day-1.parquet": parquetFile([
        { name: "time", data: [0, 3], type: "DOUBLE" },
        { name: "series", data: ["queue", "queue"], type: "STRING" },
        { name: "value", data: [true, false], type: "BOOLEAN" },
      ]),
    },
    show: [],
    args: check,
    status: 1,
    message: () => ingestMessages.parquetUnusableType("runs/day-1.parquet", 1, "value", "value", "BOOLEAN", "numbers (a double, float, integer or decimal column)"),
    place: "runs/day-1.parquet:1",
  },
  {
    id: "parquet-nested-column",
    title: "A nested Parquet column that the study reads",
    what: "The manifest picks rows by `where: {stations: oven}`, but `stations` is a list column: each row holds several texts.",
    files: { [STUDY]: M_PARQUET_NESTED, "runs/day-1.parquet": PQ_NESTED },
    show: [STUDY],
    args: check,
    status: 1,
    message: () => ingestMessages.parquetNestedColumn("runs/day-1.parquet", "stations", "a nested group (LIST)"),
    place: "runs/day-1.parquet",
  },
  {
    id: "parquet-null-time",
    title: "A null time in a Parquet file",
    what: "Row 2 of the file has no time.",
    files: {
      [STUDY]: M_PARQUET,
      "runs/day-1.parquet": parquetFile([
        { name: "time", data: [0, null], type: "DOUBLE" },
        { name: "series", data: ["queue", "queue"], type: "STRING" },
        { name: "value", data: [2, 5], type: "DOUBLE" },
      ]),
    },
    show: [],
    args: check,
    status: 1,
    message: () => ingestMessages.parquetNullTime("runs/day-1.parquet", 2, "time"),
    place: "runs/day-1.parquet:2",
  },
  {
    id: "parquet-not-finite",
    title: "A NaN or infinite number in a Parquet file",
    what: "A double column may hold NaN and infinities, which are no time and no value; a null cell is the empty value.",
    files: { [STUDY]: M_PARQUET, "runs/day-1.parquet": eventsParquet([[0, "queue", 2], [3, "queue", NaN]]) },
    show: [],
    args: check,
    status: 1,
    message: () => ingestMessages.parquetNotFinite("runs/day-1.parquet", 2, "value", "value", NaN),
    place: "runs/day-1.parquet:2",
  },
  {
    id: "parquet-empty-series",
    title: "A null or empty series in a Parquet file",
    what: "Row 2 belongs to no series.",
    files: { [STUDY]: M_PARQUET, "runs/day-1.parquet": eventsParquet([[0, "queue", 2], [3, "", 5]]) },
    show: [],
    args: check,
    status: 1,
    message: () => ingestMessages.parquetEmptySeries("runs/day-1.parquet", 2, "series"),
    place: "runs/day-1.parquet:2",
  },
  {
    id: "parquet-time-decreases",
    title: "Time goes backwards in a Parquet file",
    what: "Within one series the rows must be in time order, as in a CSV file; the rows are named by their position.",
    files: { [STUDY]: M_PARQUET, "runs/day-1.parquet": eventsParquet([[0, "queue", 2], [5, "queue", 3], [4, "queue", 1]]) },
    show: [],
    args: check,
    status: 1,
    message: () => ingestMessages.parquetTimeDecreased("runs/day-1.parquet", 3, "time", "queue", 5, 4, 2),
    place: "runs/day-1.parquet:3",
  },
  {
    id: "parquet-unsupported-compression",
    title: "A Parquet file compressed with a codec Sojourn cannot read",
    what: "The pages are compressed with LZO, for which there is no decompressor.",
    files: { [STUDY]: M_PARQUET, "runs/day-1.parquet": eventsParquet([[0, "queue", 2]], { codec: "LZO" }) },
    show: [],
    args: check,
    status: 1,
    message: () => ingestMessages.unsupportedParquetCodec("runs/day-1.parquet", "time", "LZO", PARQUET_CODECS),
    place: "runs/day-1.parquet",
  },
  {
    id: "parquet-damaged",
    title: "Damaged data in a Parquet file",
    what: "Bytes in the middle of the second row group were overwritten; the footer is intact, so the row group and its rows are named.",
    files: { [STUDY]: M_PARQUET, "runs/day-1.parquet": PQ_DAMAGED },
    show: [],
    args: check,
    status: 1,
    startsWith: () => ingestMessages.damagedParquet("runs/day-1.parquet", 2, 201, 400, "").message.split(": ").slice(0, 2).join(": ") + ": ",
    place: "runs/day-1.parquet:201",
  },
  // --- rows that break a measure's rules ------------------------------------------------------
  {
    id: "level-without-value",
    title: "A level row without a value",
    what: "Each row of a level's series gives the new level, so it needs a value.",
    files: { [STUDY]: manifest(QUEUE), "runs/day-1.csv": "time,series,value\n0,queue,2\n3,queue,\n" },
    show: ["runs/day-1.csv"],
    args: check,
    status: 1,
    message: () => studyMessages.levelRowWithoutValue("runs/day-1.csv", 3, "queue", "queue"),
    place: "runs/day-1.csv:3",
  },
  {
    id: "observation-without-value",
    title: "An observation row without a value",
    what: "Each row of an observation series is one observation, so it needs a value.",
    files: { [STUDY]: manifest("  - {name: wait, kind: observation, series: wait}\n"), "runs/day-1.csv": "time,series,value\n1,wait,2.5\n3,wait,\n" },
    show: ["runs/day-1.csv"],
    args: check,
    status: 1,
    message: () => studyMessages.observationRowWithoutValue("runs/day-1.csv", 3, "wait", "wait"),
    place: "runs/day-1.csv:3",
  },
  {
    id: "row-without-entity",
    title: "An entity-derived measure row without an entity id",
    what: "A measure with `from:` pairs events by entity; a row of its series with an empty entity cannot be paired.",
    files: { [STUDY]: manifest(ENTITIES), "runs/day-1.csv": "time,series,value,entity\n1,arrive,,c1\n2,arrive,,\n" },
    show: ["runs/day-1.csv"],
    args: check,
    status: 1,
    message: () => studyMessages.rowWithoutEntity("runs/day-1.csv", 3, "arrive", "in_shop"),
    place: "runs/day-1.csv:3",
  },
  {
    id: "leave-without-enter",
    debug: true,
    title: "A leave event without an enter",
    what: "An entity leaves that never entered (or left already).",
    files: { [STUDY]: manifest(ENTITIES), "runs/day-1.csv": "time,series,value,entity\n1,arrive,,c1\n2,leave,,c2\n" },
    show: ["runs/day-1.csv"],
    args: check,
    status: 1,
    message: () => studyMessages.leaveWithoutEnter("runs/day-1.csv", 3, "c2", "leave", "in_shop", "arrive"),
    place: "runs/day-1.csv:3",
  },
  {
    id: "duplicate-start",
    title: "A duplicate entity start",
    what: "An entity enters again before it left: two visits under one id.",
    files: { [STUDY]: manifest(ENTITIES), "runs/day-1.csv": "time,series,value,entity\n1,arrive,,c1\n2,arrive,,c1\n" },
    show: ["runs/day-1.csv"],
    args: check,
    status: 1,
    message: () => studyMessages.duplicateEnter("runs/day-1.csv", 3, "c1", "arrive", "in_shop", 2),
    place: "runs/day-1.csv:3",
  },
  {
    id: "series-in-no-run",
    title: "A measure's series that appears in no run",
    what: "A measure reads a series that has no row in any run of a scenario: almost always a misspelt name, which would otherwise give a confident 0. A series of a rare event that may truly never happen says `may_be_absent: true` (see docs/manifest.md).",
    files: { [STUDY]: M_ABSENT, "runs/day-1.csv": "time,series,value\n0,queue,2\n3,served,\n5,queue,1\n", "runs/day-2.csv": "time,series,value\n0,queue,1\n4,served,\n" },
    show: [STUDY, "runs/day-1.csv"],
    args: check,
    status: 1,
    message: () => studyMessages.seriesInNoRun(at(M_ABSENT, "sevred", "measures[1].series"), "served", "sevred", "morning", 2, "served", ["queue", "served"]),
  },
  {
    id: "capacity-series-absent",
    title: "A capacity series with no row in a run",
    what: "A utilization's capacity series has no row in a run and `capacity_initial` is 0, so the capacity would be 0 throughout: usually the capacity series' name is misspelt.",
    files: {
      [STUDY]: manifest("  - {name: oven, kind: utilization, series: busy, capacity: open_oven}\n"),
      "runs/day-1.csv": "time,series,value\n0,open_ovens,2\n1,busy,1\n",
    },
    show: [STUDY, "runs/day-1.csv"],
    args: check,
    status: 1,
    message: () => studyMessages.capacitySeriesAbsent("runs/day-1.csv", "oven", "open_oven", "open_ovens"),
    place: "runs/day-1.csv",
  },
  {
    id: "capacity-area-zero",
    title: "A capacity series that is zero over the whole window",
    what: "Utilization divides by the capacity's area; a capacity series that stays 0 leaves nothing to divide by.",
    files: {
      [STUDY]: manifest("  - {name: oven, kind: utilization, series: busy, capacity: open_ovens}\n"),
      "runs/day-1.csv": "time,series,value\n0,open_ovens,0\n1,busy,0\n",
    },
    show: [STUDY, "runs/day-1.csv"],
    args: check,
    status: 1,
    message: () => studyMessages.capacityNotPositive("runs/day-1.csv", "oven"),
    place: "runs/day-1.csv",
  },
  {
    id: "figure-overflow",
    title: "Numbers so large that a figure overflows",
    what: "Each number is finite, but a level of `1e308` held for 10 time units has an area beyond the largest double (about 1.8e308). Results never hold `Infinity` (JSON would write it as `null`), so this is an input error.",
    files: { [STUDY]: manifest(QUEUE), "runs/day-1.csv": "time,series,value\n0,queue,1e308\n" },
    show: ["runs/day-1.csv"],
    args: check,
    status: 1,
    message: () => studyMessages.runFigureOverflow("runs/day-1.csv", "queue", "value"),
    place: "runs/day-1.csv",
  },
  // --- not errors ---------------------------------------------------------------------------
  {
    id: "rows-after-end",
    title: "Rows outside the window (not an error)",
    what: "Rows after the window's `end` are left out and counted; the count is printed by `check` and kept in the report's input audit (`left_out.after_end`).",
    files: { [STUDY]: manifest(QUEUE), "runs/day-1.csv": "time,series,value\n0,queue,2\n3,queue,5\n11,queue,1\n12,queue,0\n" },
    show: ["runs/day-1.csv"],
    args: check,
    status: 0,
    contains: ["4 rows (2 after end, 0 before collection, 0 of unread series)"],
  },
  {
    id: "series-never-appears",
    title: "A measure whose series is missing from some runs (a warning per run)",
    what: "A measure reads a series that some runs have no row of. Each run without it gets a warning; in those runs the level stays at its `initial` value. (A series in no run at all is an error: see the entry \"A measure's series that appears in no run\".)",
    files: { [STUDY]: manifest(QUEUE), "runs/day-1.csv": "time,series,value\n0,queue,2\n3,queue,5\n9.5,queue,1\n", "runs/day-2.csv": "time,series,value\n0,served,\n4,served,\n" },
    show: [STUDY, "runs/day-2.csv"],
    args: check,
    status: 0,
    contains: ['1 warning(s):', 'morning / day-2 / queue: series "queue" never appears in runs/day-2.csv'],
  },
  {
    id: "busy-above-capacity",
    title: "A busy level above its capacity (a warning per run)",
    what: "The capacity series drops below the busy level for a while. The ratio of areas (here 20/34) stays below 1 and would hide it; the warning names the first interval, the line that started it and the total time.",
    files: { [STUDY]: M_OVER, "runs/day-1.csv": "time,series,value\n0,busy,2\n0,ovens,4\n6,ovens,1\n8,ovens,4\n9.5,busy,2\n" },
    show: [STUDY, "runs/day-1.csv"],
    args: check,
    status: 0,
    contains: [
      "1 warning(s):",
      `morning / day-1 / oven: ${warnings.busyAboveCapacity("oven", "runs/day-1.csv", { intervals: 1, time: 2, from: 6, to: 8, busy: 2, capacity: 1, line: 4, series: "ovens" }, 20 / 34)}`,
    ],
  },
  {
    id: "durations-few-digits",
    title: "Clock values so large that durations lose digits (a warning per run)",
    what: "Times near 1e9 with steps of a thousandth: a double holds 1e9 to about 1.2e-7, so a duration of 0.001 keeps about 4 significant digits. The warning says how many, from the spacing of doubles at the largest time and the shortest duration.",
    files: { [STUDY]: M_CLOCK, "runs/day-1.csv": "time,series,value\n1000000000,queue,2\n1000000000.001,queue,3\n1000000000.002,queue,1\n1000000000.01,queue,0\n" },
    show: [STUDY, "runs/day-1.csv"],
    args: check,
    status: 0,
    contains: ["1 warning(s):", "morning / day-1: runs/day-1.csv: the run's times reach 1000000000.01, where one step of a double is 1.1920928955078125e-7", "durations keep only about 3.9 significant digits (fewer than 6)"],
  },
  {
    id: "run-ends-early",
    title: "A run whose rows stop long before the end (a warning on the run and its summary rows)",
    what: "`day-2` has no row after time 4 in a window that ends at 10: more than a tenth of the window is empty, so the run may have stopped early or its file been cut short. The report says so on the scenario's summary rows too.",
    files: { [STUDY]: manifest(QUEUE), "runs/day-1.csv": "time,series,value\n0,queue,2\n3,queue,5\n9.5,queue,1\n", "runs/day-2.csv": "time,series,value\n0,queue,2\n4,queue,0\n" },
    show: ["runs/day-2.csv"],
    args: check,
    status: 0,
    contains: ["1 warning(s):", `morning / day-2: ${warnings.runEndsEarly("runs/day-2.csv", 4, 10, 0, 0.1)}`],
  },
  {
    id: "runs-without-value",
    title: "A run left out of a summary (a warning on the summary row)",
    what: "`day-2` has no `wait` observation inside its window, so the interval of `wait` is over 1 of 2 runs; the warning (and the summary row of the report) names the run.",
    files: {
      [STUDY]: manifest("  - {name: wait, kind: observation, series: wait}\n"),
      "runs/day-1.csv": "time,series,value\n2,wait,1.5\n9.5,wait,2\n",
      "runs/day-2.csv": "time,series,value\n9.5,tick,\n12,wait,3\n",
    },
    show: ["runs/day-2.csv"],
    args: check,
    status: 0,
    contains: [`morning / wait: ${warnings.runsWithoutValue(["day-2"], 1, 2)}`],
  },
  {
    id: "carriage-return-line-ends",
    title: "Lines that end in a carriage return alone (not an error)",
    what: "Some old programs end each line with a carriage return alone instead of a line feed. The first line break of a file decides: in such a file every lone carriage return is read as a line break, so the rows and their line numbers are those of the same file with line feeds.",
    files: { [STUDY]: manifest(QUEUE), "runs/day-1.csv": Buffer.from("time,series,value\r0,queue,2\r3,queue,5\r11,queue,1\r") },
    show: [STUDY],
    args: check,
    status: 0,
    contains: ["3 rows (1 after end, 0 before collection, 0 of unread series)"],
  },
  // --- the manifest -------------------------------------------------------------------------
  {
    id: "invalid-yaml",
    title: "Invalid YAML",
    what: "A flow mapping `{...}` that is never closed.",
    files: { [STUDY]: M_YAML, "runs/day-1.csv": GOOD_CSV },
    show: [STUDY],
    args: check,
    status: 1,
    startsWith: () => "study.yaml:",
  },
  {
    id: "duplicate-key",
    title: "A key written twice",
    what: "The same key twice in one mapping; YAML would otherwise silently keep one.",
    files: { [STUDY]: M_DUPKEY, "runs/day-1.csv": GOOD_CSV },
    show: [STUDY],
    args: check,
    status: 1,
    message: () => manifestMessages.duplicateKey({ file: STUDY, ...positionOf(M_DUPKEY, "end: 12") }, "end"),
  },
  {
    id: "unknown-key",
    debug: true,
    title: "An unknown key (with a did-you-mean)",
    what: "A misspelt key; Sojourn suggests the nearest allowed key.",
    files: { [STUDY]: M_UNKNOWN, "runs/day-1.csv": GOOD_CSV },
    show: [STUDY],
    args: check,
    status: 1,
    startsWith: () => manifestMessages.unknownKey(at(M_UNKNOWN, "seires", "measures[0].seires"), "seires", "a level measure", [], "series").message.split(" in ")[0],
    contains: ['Did you mean "series"?'],
  },
  {
    id: "not-allowed-value",
    title: "A value outside the allowed set (with a did-you-mean)",
    what: "A misspelt `kind`.",
    files: { [STUDY]: M_KIND, "runs/day-1.csv": GOOD_CSV },
    show: [STUDY],
    args: check,
    status: 1,
    message: () => manifestMessages.notAllowedValue(at(M_KIND, "levle", "measures[0].kind"), "levle", ["level", "utilization", "observation", "count"], "level"),
  },
  {
    id: "missing-key",
    title: "A required key is missing",
    what: "A measure without its `kind`.",
    files: { [STUDY]: M_MISSKEY, "runs/day-1.csv": GOOD_CSV },
    show: [STUDY],
    args: check,
    status: 1,
    startsWith: () => manifestMessages.missingKey(at(M_MISSKEY, "{name: queue", "measures[0].kind"), "kind", "a measure", null).message.split("\n")[0],
  },
  {
    id: "wrong-type",
    title: "A value of the wrong type",
    what: "Text where a number belongs.",
    files: { [STUDY]: M_TYPE, "runs/day-1.csv": GOOD_CSV },
    show: [STUDY],
    args: check,
    status: 1,
    startsWith: () => manifestMessages.wrongType(at(M_TYPE, "ten", "scenarios[0].end"), "a number", 'a text ("ten")', null, false).message.split("\n")[0],
  },
  {
    id: "where-empty",
    title: "An empty where",
    what: "`where: {}` names no column to filter on.",
    files: { [STUDY]: M_WHERE_EMPTY, "runs/day-1.csv": GOOD_CSV },
    show: [STUDY],
    args: check,
    status: 1,
    message: () => manifestMessages.whereColumnCount(at(M_WHERE_EMPTY, "{}", "measures[0].where"), 0, 1),
  },
  {
    id: "where-no-values",
    title: "A where column with an empty list of values",
    what: "`where: {server: []}`: a list of values to keep needs at least one value.",
    files: { [STUDY]: M_WHERE_NO_VALUES, "runs/day-1.csv": GOOD_CSV },
    show: [STUDY],
    args: check,
    status: 1,
    startsWith: () => manifestMessages.wrongItemCount(at(M_WHERE_NO_VALUES, "[]", "measures[0].where.server"), 0, "at least 1 item", null).message.split("\n")[0],
  },
  {
    id: "where-wrong-type",
    title: "A where value that is neither a value nor a list",
    what: "A where column takes a number, a text or a list of them; here a mapping.",
    files: { [STUDY]: M_WHERE_MAPPING, "runs/day-1.csv": GOOD_CSV },
    show: [STUDY],
    args: check,
    status: 1,
    startsWith: () => manifestMessages.wrongType(at(M_WHERE_MAPPING, "{id: 0}", "measures[0].where.server"), "a number, a text or a list", "a mapping", null, false).message.split("\n")[0],
  },
  {
    id: "where-empty-text",
    title: "An empty text among a where's values",
    what: "An empty text matches no cell (an empty cell matches nothing), so it is refused.",
    files: { [STUDY]: M_WHERE_EMPTY_TEXT, "runs/day-1.csv": GOOD_CSV },
    show: [STUDY],
    args: check,
    status: 1,
    message: () => manifestMessages.emptyText(at(M_WHERE_EMPTY_TEXT, '""', "measures[0].where.class[1]")),
  },
  {
    id: "factor-not-a-number",
    title: "A factor value that is not a number",
    what: "A factor's value places the scenario on a response curve's axis, so it must be a finite number.",
    files: { [STUDY]: M_FACTOR_TEXT, "runs/day-1.csv": GOOD_CSV },
    show: [STUDY],
    args: check,
    status: 1,
    startsWith: () => manifestMessages.wrongType(at(M_FACTOR_TEXT, "two}", "scenarios[0].factors.ovens"), "a number", 'a text ("two")', null, false).message.split("\n")[0],
  },
  {
    id: "factor-missing",
    title: "A scenario that lacks a factor",
    what: "The first scenario with factors names `ovens` and `bakers`; the second gives only `ovens`.",
    files: { [STUDY]: M_FACTOR_LACKING, "runs/day-1.csv": GOOD_CSV },
    show: [STUDY],
    args: check,
    status: 1,
    message: () => manifestMessages.factorsDiffer(at(M_FACTOR_LACKING, "{ovens: 3}", "scenarios[1].factors"), "three-ovens", ["bakers"], [], "two-ovens"),
  },
  {
    id: "factor-extra",
    title: "A scenario that names a factor the others do not",
    what: "The second scenario gives `bakers`, which the first scenario with factors does not name.",
    files: { [STUDY]: M_FACTOR_EXTRA, "runs/day-1.csv": GOOD_CSV },
    show: [STUDY],
    args: check,
    status: 1,
    message: () => manifestMessages.factorsDiffer({ ...at(M_FACTOR_EXTRA, "bakers", "scenarios[1].factors.bakers") }, "three-ovens", [], ["bakers"], "two-ovens"),
  },
  {
    id: "factor-on-some-scenarios",
    title: "Factors on only some scenarios",
    what: "Either no scenario has `factors`, or every one does; the second scenario has none.",
    files: { [STUDY]: M_FACTOR_SOME, "runs/day-1.csv": GOOD_CSV },
    show: [STUDY],
    args: check,
    status: 1,
    message: () => manifestMessages.factorsDiffer(at(M_FACTOR_SOME, "{name: three-ovens", "scenarios[1]"), "three-ovens", ["ovens"], [], "two-ovens"),
  },
  {
    id: "factors-empty",
    title: "An empty factors",
    what: "`factors: {}` names no factor.",
    files: { [STUDY]: M_FACTOR_EMPTY, "runs/day-1.csv": GOOD_CSV },
    show: [STUDY],
    args: check,
    status: 1,
    message: () => manifestMessages.factorCount(at(M_FACTOR_EMPTY, "{}", "scenarios[0].factors"), 0, 1),
  },
  {
    id: "manifest-is-folder",
    title: "The manifest path names a folder",
    what: "`sojourn check runs` names the folder of run files, not the manifest.",
    files: { "runs/day-1.csv": GOOD_CSV },
    show: [],
    args: ["check", "runs"],
    status: 1,
    message: () => manifestMessages.manifestIsFolder("runs"),
  },
  {
    id: "manifest-empty",
    title: "An empty manifest",
    what: "The manifest file holds nothing (or only comments).",
    files: { [STUDY]: "# to do\n", "runs/day-1.csv": GOOD_CSV },
    show: [STUDY],
    args: check,
    status: 1,
    message: () => manifestMessages.manifestEmpty(STUDY),
  },
  {
    id: "manifest-not-a-mapping",
    title: "A manifest that is a list",
    what: "The file is a YAML list, not a mapping of keys.",
    files: { [STUDY]: M_NOT_MAPPING, "runs/day-1.csv": GOOD_CSV },
    show: [STUDY],
    args: check,
    status: 1,
    message: () => manifestMessages.notAMapping({ file: STUDY, line: 1, column: 1, path: "" }, "a list"),
  },
  {
    id: "blank-label",
    title: "A label of spaces only",
    what: "A `label` that holds only spaces would show nothing.",
    files: { [STUDY]: M_BLANK_LABEL, "runs/day-1.csv": GOOD_CSV },
    show: [STUDY],
    args: check,
    status: 1,
    message: () => manifestMessages.blankText(at(M_BLANK_LABEL, '"   "', "measures[0].label")),
  },
  {
    id: "series-and-from",
    title: "A measure with both series and from",
    what: "A measure reads one series, or derives from entity events, not both.",
    files: { [STUDY]: M_SERIES_AND_FROM, "runs/day-1.csv": GOOD_CSV },
    show: [STUDY],
    args: check,
    status: 1,
    message: () => manifestMessages.seriesAndFrom(at(M_SERIES_AND_FROM, "{name: queue", "measures[0]"), "queue"),
  },
  {
    id: "compare-same-scenario",
    title: "A comparison of a scenario with itself",
    what: "Both scenarios of the comparison are `morning`.",
    files: { [STUDY]: M_SAME_TWICE, "runs/day-1.csv": GOOD_CSV },
    show: [STUDY],
    args: check,
    status: 1,
    message: () => manifestMessages.sameScenarioTwice(at(M_SAME_TWICE, "morning]}", "compare[0].scenarios[1]"), "morning"),
  },
  {
    id: "one-batch",
    title: "Batch means with one batch",
    what: "`batches: 1` leaves no spread between batches to make an interval from.",
    files: { [STUDY]: M_ONE_BATCH, "runs/day-1.csv": GOOD_CSV },
    show: [STUDY],
    args: check,
    status: 1,
    message: () => manifestMessages.tooFewBatches(at(M_ONE_BATCH, "1}", "analysis.batches"), 1),
  },
  {
    id: "mser-count-measure",
    title: "An MSER-5 warm-up judged on a count",
    what: "MSER-5 needs a quantity that varies over time; a count measure has none.",
    files: { [STUDY]: M_MSER_COUNT, "runs/day-1.csv": GOOD_CSV },
    show: [STUDY],
    args: check,
    status: 1,
    message: () => manifestMessages.mserCountMeasure(at(M_MSER_COUNT, "served, slice", "warmup.measure"), "served"),
  },
  {
    id: "target-empty",
    title: "An empty precision target",
    what: "`target: {}` gives neither `half_width` nor `relative`.",
    files: { [STUDY]: M_TARGET_EMPTY, "runs/day-1.csv": GOOD_CSV },
    show: [STUDY],
    args: check,
    status: 1,
    message: () => manifestMessages.targetNeedsOneKey(at(M_TARGET_EMPTY, "{}", "measures[0].target"), 0),
  },
  {
    id: "run-path-is-folder",
    title: "A run path that names a folder",
    what: "`runs: [runs]` names the folder, not its files.",
    files: { [STUDY]: M_RUNS_FOLDER, "runs/day-1.csv": GOOD_CSV },
    show: [STUDY],
    args: check,
    status: 1,
    message: () => manifestMessages.runPathIsFolder(at(M_RUNS_FOLDER, "runs]", "scenarios[0].runs[0]"), "runs"),
  },
  {
    id: "init-runs-folder-missing",
    title: "The runs folder does not exist",
    what: "`sojourn init` is given a folder name that is not there.",
    files: {},
    show: [],
    args: ["init", "runz"],
    status: 1,
    message: () => initMessages.runsDirNotFound("runz"),
    afterwards: { [STUDY]: null },
  },
  {
    id: "init-runs-folder-is-file",
    title: "A run file instead of its folder",
    what: "`sojourn init` reads a folder of run files; here it is given one file.",
    files: { "runs/day-1.csv": GOOD_CSV },
    show: [],
    args: ["init", "runs/day-1.csv"],
    status: 1,
    message: () => initMessages.runsDirIsFile("runs/day-1.csv"),
    afterwards: { [STUDY]: null },
  },
  {
    id: "init-no-run-files",
    title: "A folder with no run files",
    what: "The folder is empty (a file with another extension would be listed as skipped first).",
    files: {},
    setup: (dir) => mkdirSync(join(dir, "runs")),
    show: [],
    args: ["init", "runs"],
    status: 1,
    startsWith: () => initMessages.noRunFiles("runs", 0).message.split(" (")[0],
    afterwards: { [STUDY]: null },
  },
  {
    id: "init-mixed-layouts",
    title: "Run files of two layouts in one folder",
    what: "Scenario `a` has an event table, scenario `b` a table of one row per customer; one manifest reads one layout.",
    files: { "runs/a/day-1.csv": EVENTS_CSV, "runs/b/day-1.csv": ENTITY_CSV },
    show: ["runs/a/day-1.csv", "runs/b/day-1.csv"],
    args: ["init", "runs"],
    status: 1,
    startsWith: () => initMessages.mixedLayouts("runs/a/day-1.csv", "", "runs/b/day-1.csv", "").message.split(" looks like")[0],
    afterwards: { [STUDY]: null },
  },
  {
    id: "duplicate-name",
    title: "Two measures with one name",
    what: "Names identify measures in the report and in `results.json`, so they must differ.",
    files: { [STUDY]: M_DUPNAME, "runs/day-1.csv": GOOD_CSV },
    show: [STUDY],
    args: check,
    status: 1,
    message: () => manifestMessages.duplicateName(at(M_DUPNAME, "queue, kind: count", "measures[1].name"), "measure", "queue", 6),
  },
  {
    id: "confidence-out-of-range",
    title: "An out-of-range confidence",
    what: "`confidence: 95` where a level between 0 and 1 is meant.",
    files: { [STUDY]: M_CONFIDENCE, "runs/day-1.csv": GOOD_CSV },
    show: [STUDY],
    args: check,
    status: 1,
    message: () => manifestMessages.confidenceOutOfRange(at(M_CONFIDENCE, "95", "confidence"), 95),
  },
  {
    id: "row-limit-out-of-range",
    title: "A row limit out of range",
    what: "`max_row_bytes` is a number of bytes from 1024 (1 KiB) to 268435456 (256 MiB).",
    files: { [STUDY]: M_ROWLIMIT_LOW, "runs/day-1.csv": GOOD_CSV },
    show: [STUDY],
    args: check,
    status: 1,
    message: () =>
      manifestMessages.numberOutOfRange(
        at(M_ROWLIMIT_LOW, "100", "max_row_bytes"),
        100,
        "at least 1024",
        "the longest row of a run file in bytes, a whole number from 1024 (1 KiB) to 268435456 (256 MiB); default 1048576 (1 MiB)",
      ),
  },
  {
    id: "no-end",
    title: "A level measure without a window end",
    what: "A time average needs the length of time it is taken over.",
    files: { [STUDY]: M_NOEND, "runs/day-1.csv": GOOD_CSV },
    show: [STUDY],
    args: check,
    status: 1,
    startsWith: () => "study.yaml:",
    contains: ['the level measure "queue" needs a window end'],
  },
  {
    id: "end-not-after-start",
    title: "A window that ends before it starts",
    what: "`end` at or before `start`.",
    files: { [STUDY]: M_ENDSTART, "runs/day-1.csv": GOOD_CSV },
    show: [STUDY],
    args: check,
    status: 1,
    startsWith: () => "study.yaml:",
    contains: ['the window of scenario "morning" ends at 5, which is not after its start 10'],
  },
  {
    id: "warmup-past-end",
    title: "Warm-up at or past the end",
    what: "A warm-up that leaves nothing to collect.",
    files: { [STUDY]: M_WARMUP, "runs/day-1.csv": GOOD_CSV },
    show: [STUDY],
    args: check,
    status: 1,
    message: () => manifestMessages.warmupPastEnd(at(M_WARMUP, "10", "warmup"), "morning", "day-1", 10, 10),
  },
  {
    id: "capacity-not-positive",
    title: "Capacity of 0 or less",
    what: "A utilization against no units at all.",
    files: { [STUDY]: M_CAPACITY, "runs/day-1.csv": GOOD_CSV },
    show: [STUDY],
    args: check,
    status: 1,
    startsWith: () => "study.yaml:6:",
  },
  {
    id: "glob-matches-nothing",
    title: "A glob matching nothing",
    what: "A pattern in `runs:` that matches no file.",
    files: { [STUDY]: M_GLOB, "runs/day-1.csv": GOOD_CSV },
    show: [STUDY],
    args: check,
    status: 1,
    startsWith: () => manifestMessages.globMatchedNothing(at(M_GLOB, "runs/afternoon", "scenarios[0].runs"), "runs/afternoon/*.csv", "").message.split(" in the folder")[0],
  },
  {
    id: "duplicate-run-id",
    title: "Two runs with the same id in one scenario",
    what: "A run's id is its file name without extensions; `runs/a/day-1.csv` and `runs/b/day-1.csv.gz` are both `day-1`.",
    files: { [STUDY]: M_TWINS, "runs/a/day-1.csv": GOOD_CSV, "runs/b/day-1.csv.gz": gzipSync(GOOD_CSV) },
    show: [STUDY],
    args: check,
    status: 1,
    message: () => manifestMessages.duplicateRunId(at(M_TWINS, "runs/b/day-1.csv.gz", "scenarios[0].runs[1]"), "morning", "day-1", "runs/a/day-1.csv", "runs/b/day-1.csv.gz"),
  },
  {
    id: "no-runs",
    title: "A scenario with no runs",
    what: "`runs: []`.",
    files: { [STUDY]: M_NORUNS },
    show: [STUDY],
    args: check,
    status: 1,
    startsWith: () => "study.yaml:4:",
    contains: ["(at scenarios[0].runs)"],
  },
  {
    id: "unknown-override",
    title: "An override for a measure that does not exist",
    what: "A scenario's `measures:` names a misspelt measure.",
    files: { [STUDY]: M_OVERRIDE, "runs/day-1.csv": GOOD_CSV },
    show: [STUDY],
    args: check,
    status: 1,
    startsWith: () => "study.yaml:4:",
    contains: ['there is no measure named "queeu"', 'Did you mean "queue"?'],
  },
  // --- manifest: encoding, nesting, aliases and bounds ---------------------------------------
  {
    id: "manifest-not-utf8",
    title: "A manifest that is not UTF-8",
    what: "The manifest was saved in Latin-1 (Windows-1252), where `é` is the single byte `0xE9`; Sojourn reads manifests as UTF-8 and names the line, column and byte offset of the first byte that is not UTF-8.",
    files: { [STUDY]: Buffer.from(M_LATIN1, "latin1"), "runs/day-1.csv": GOOD_CSV },
    show: [],
    args: check,
    status: 1,
    message: () => manifestMessages.manifestNotUtf8({ file: STUDY, ...positionOf(M_LATIN1, "é") }, 0xe9, Buffer.from(M_LATIN1, "latin1").indexOf(0xe9)),
  },
  {
    id: "manifest-utf16",
    title: "A manifest saved as UTF-16",
    what: "Some editors save text as UTF-16 with a byte-order mark; Sojourn reads manifests as UTF-8.",
    files: { [STUDY]: Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from(manifest(QUEUE), "utf16le")]), "runs/day-1.csv": GOOD_CSV },
    show: [],
    args: check,
    status: 1,
    message: () => manifestMessages.manifestWideEncoding(STUDY, "UTF-16"),
    place: STUDY,
  },
  {
    id: "manifest-too-deep",
    title: "Lists nested deeper than 64 levels",
    what: "A manifest needs fewer than 10 levels of nesting; more than 64 is a typing slip or a hostile file, stopped before it can exhaust the reader.",
    files: { [STUDY]: M_DEEP, "runs/day-1.csv": GOOD_CSV },
    show: [STUDY],
    args: check,
    status: 1,
    message: () => manifestMessages.manifestTooDeep({ file: STUDY, line: 1, column: 8 + 63 }, 64),
  },
  {
    id: "manifest-alias-bomb",
    title: "Aliases that expand without end",
    what: "Each list repeats the one before ten times (a \"billion laughs\" file): seven short lines stand for ten million values. Sojourn counts the values as the aliases would write them out and stops at a million.",
    files: { [STUDY]: M_BOMB, "runs/day-1.csv": GOOD_CSV },
    show: [STUDY],
    args: check,
    status: 1,
    // Counted by hand: the list a holds 11 values, b 111, ..., e 111111; with the root and the keys
    // 134463 values come before f's first alias, and the 8th *e, f[7], passes a million; "f: &f [" is
    // 7 characters and each "*e, " 4.
    startsWith: () => `study.yaml:6:${positionOf(M_BOMB, "f: ").column + 7 + 4 * 7} (at f[7]): with its aliases (*name) written out, the manifest would hold more than 1,000,000 values`,
  },
  {
    id: "too-many-aliases",
    title: "More than 1000 anchors and aliases",
    what: "A manifest that repeats one value 1200 times with `*closing` (not shown). Sojourn resolves at most 1000 anchors and aliases, since each one is looked up among all the others.",
    files: { [STUDY]: M_ALIASES, "runs/day-1.csv": GOOD_CSV },
    show: [],
    args: check,
    status: 1,
    // &closing is the first of the 1000; the alias repeats[998] is the 1000th, repeats[999] the 1001st
    // "repeats: [" is 10 characters and each "*closing, " 10 more
    message: () => manifestMessages.tooManyAnchors({ file: STUDY, line: positionOf(M_ALIASES, "repeats:").line, column: 11 + 10 * 999, path: "repeats[999]" }, 1000),
  },
  {
    id: "alias-without-anchor",
    title: "An alias with no anchor",
    what: "`*closing` repeats the value marked `&closing`, but nothing is marked so before it.",
    files: { [STUDY]: M_NOANCHOR, "runs/day-1.csv": GOOD_CSV },
    show: [STUDY],
    args: check,
    status: 1,
    message: () => manifestMessages.aliasWithoutAnchor(at(M_NOANCHOR, "*closing", "scenarios[0].end"), "closing"),
  },
  {
    id: "alias-inside-itself",
    title: "An alias inside the value it repeats",
    what: "The list marked `&days` contains `*days`, so it would contain itself without end.",
    files: { [STUDY]: M_SELFALIAS, "runs/day-1.csv": GOOD_CSV },
    show: [STUDY],
    args: check,
    status: 1,
    message: () => manifestMessages.aliasInsideItself(at(M_SELFALIAS, "*days", "scenarios[0].runs[1]"), "days"),
  },
  {
    id: "key-not-text",
    title: "A list used as a key",
    what: "YAML allows a list as a mapping key; a manifest's keys are names.",
    files: { [STUDY]: M_LISTKEY, "runs/day-1.csv": GOOD_CSV },
    show: [STUDY],
    args: check,
    status: 1,
    message: () => manifestMessages.keyNotText(at(M_LISTKEY, "[a, b]", "scenarios[0]"), "a list"),
  },
  {
    id: "yaml-tag",
    title: "A YAML tag that makes a value a date",
    what: "`!!timestamp` (and `!!binary`, `!!set`, a tag of one's own such as `!when`) would make the value something JSON has not; Sojourn reads texts, numbers, true or false, lists and mappings, and refuses the tag instead of reading the value as something else.",
    files: { [STUDY]: M_TAG, "runs/day-1.csv": GOOD_CSV },
    show: [STUDY],
    args: check,
    status: 1,
    message: () => manifestMessages.tagNotAllowed(at(M_TAG, "2024-03-01", "scenarios[0].end"), "!!timestamp"),
  },
  {
    id: "yaml-version",
    title: "A manifest that asks for YAML 1.1",
    what: "Under a `%YAML 1.1` line, `end: 010` would be the number 8 and `n` would mean false. Sojourn reads YAML 1.2 only, where `010` is 10.",
    files: { [STUDY]: M_YAML11, "runs/day-1.csv": GOOD_CSV },
    show: [STUDY],
    args: check,
    status: 1,
    message: () => manifestMessages.yamlVersion({ file: STUDY, line: 1, column: 1 }, "1.1"),
  },
  {
    id: "listed-twice",
    title: "A quantile listed twice",
    what: "Each number in `quantiles`, `within` or `at_least` names a figure, an interval and a calculation table of its own, so a number may be listed once.",
    files: { [STUDY]: M_TWICE, "runs/day-1.csv": GOOD_CSV },
    show: [STUDY],
    args: check,
    status: 1,
    message: () => manifestMessages.listedTwice(at(M_TWICE, "0.5]", "measures[0].quantiles[2]"), "quantiles", 0.5, 0),
  },
  {
    id: "too-many-quantiles",
    title: "More than 100 quantiles",
    what: "`quantiles`, `within` and `at_least` take at most 100 numbers each.",
    files: { [STUDY]: M_QUANTILES, "runs/day-1.csv": GOOD_CSV },
    show: [],
    args: check,
    status: 1,
    startsWith: () => `study.yaml:${positionOf(M_QUANTILES, "[0,").line}:${positionOf(M_QUANTILES, "[0,").column} (at measures[0].quantiles): this list has 101 items, and it must have at most 100 items`,
  },
  {
    id: "too-many-batches",
    title: "More than 10000 batches",
    what: "Batch means takes from 2 to 10000 batches per run (20 to 30 is common).",
    files: { [STUDY]: M_BATCHES, "runs/day-1.csv": GOOD_CSV },
    show: [STUDY],
    args: check,
    status: 1,
    startsWith: () => `study.yaml:${positionOf(M_BATCHES, "50000").line}:${positionOf(M_BATCHES, "50000").column} (at analysis.batches): 50000 is out of range: it must be at most 10000`,
  },
  {
    id: "label-too-long",
    title: "A label or unit longer than 200 characters",
    what: "A measure's `label` and `unit` are captions: at most 200 characters each.",
    files: { [STUDY]: M_LABEL_LONG, "runs/day-1.csv": GOOD_CSV },
    show: [],
    args: check,
    status: 1,
    message: () => manifestMessages.textTooLong(at(M_LABEL_LONG, "Bread queue", "measures[0].label"), 220, 200),
  },
  {
    id: "label-control-character",
    title: "A control character in a label or unit",
    what: "Tabs, line breaks and other control characters (direction overrides too) are refused in a `label` or `unit`: they would change how the caption reads.",
    files: { [STUDY]: M_LABEL_CONTROL, "runs/day-1.csv": GOOD_CSV },
    show: [STUDY],
    args: check,
    status: 1,
    message: () => manifestMessages.controlCharacter(at(M_LABEL_CONTROL, '"Bread', "measures[0].label"), 0x09, 6),
  },
  {
    id: "unit-per-scenario",
    title: "A label or unit given per scenario",
    what: "A measure is one quantity in every scenario, so its `label` and `unit` go in its definition, not in a scenario's overrides.",
    files: { [STUDY]: M_UNIT_OVERRIDE, "runs/day-1.csv": GOOD_CSV },
    show: [STUDY],
    args: check,
    status: 1,
    message: () => manifestMessages.shownTheSameEverywhere(at(M_UNIT_OVERRIDE, "unit: loaves", "scenarios[0].measures.queue.unit"), "unit"),
  },
  {
    id: "edge-rows-too-many",
    title: "edge_rows that leave no room in max_rows",
    what: "A shortened table keeps `edge_rows` rows at each end and checkpoints in between, so `2 × edge_rows` must be less than `max_rows`.",
    files: { [STUDY]: M_EDGE, "runs/day-1.csv": GOOD_CSV },
    show: [STUDY],
    args: check,
    status: 1,
    message: () => manifestMessages.edgeRowsTooMany(at(M_EDGE, "500}", "tables.edge_rows"), 500, 1000),
  },
  {
    id: "too-many-slices",
    title: "An MSER-5 slice far too short for the run",
    what: "A slice of 0.001 cuts a window of 600 into 600,000 slices; Sojourn keeps at most 100,000 per run, and says the shortest slice that fits.",
    files: { [STUDY]: M_SLICES, "runs/day-1.csv": GOOD_CSV },
    show: [STUDY],
    args: check,
    status: 1,
    message: () => manifestMessages.tooManySlices(at(M_SLICES, "0.001", "warmup.slice"), "morning", "day-1", 0.001, 0, 600, 600000, 100000),
  },
  {
    id: "select-probability",
    title: "A probability of correct selection a blind pick would reach",
    what: "Among k scenarios, picking one at random is right with probability 1/k, so `probability` must be above 1/k (here 1/2) and below 1.",
    files: { [STUDY]: M_SELECT_P, ...SELECT_RUNS },
    show: [STUDY],
    args: check,
    status: 1,
    message: () => manifestMessages.selectionProbabilityOutOfRange(at(M_SELECT_P, "0.4", "select[0].probability"), 0.4, 2),
  },
  {
    id: "select-first-stage",
    title: "A selection without first_stage over scenarios with different run counts",
    what: "`first_stage` (the n0 runs every scenario had before the runs needed were known) may be left out only when every scenario of the selection has the same number of runs.",
    files: { [STUDY]: M_SELECT_N0, ...SELECT_RUNS },
    show: [STUDY],
    args: check,
    status: 1,
    message: () => manifestMessages.selectionFirstStageNeeded(at(M_SELECT_N0, "{measure", "select[0]"), [{ scenario: "morning", runs: 2 }, { scenario: "evening", runs: 1 }]),
  },
  {
    id: "select-paired-runs",
    title: "A paired selection whose first stages have different run ids",
    what: "`method: paired` matches the runs of the scenarios by run id (common random numbers): the first-stage runs of every scenario must have the same ids in the same order.",
    files: { [STUDY]: M_SELECT_PAIRED, ...SELECT_RUNS },
    show: [STUDY],
    args: check,
    status: 1,
    message: () => manifestMessages.selectionPairedRunsDiffer(at(M_SELECT_PAIRED, "paired", "select[0].method"), "morning", "evening", ["day-1", "day-2"], ["day-1", "day-3"]),
  },
  // --- output and PDF -----------------------------------------------------------------------
  {
    id: "out-not-ours",
    debug: true,
    title: "An output folder that holds the user's own files",
    what: "`--out` names a folder that is not empty and holds no record of an earlier Sojourn report. Sojourn refuses and names the first file, so no file of the user's is lost; `--force` replaces the folder (but never one that holds the manifest or an input of the study).",
    files: { [STUDY]: manifest(QUEUE), "runs/day-1.csv": GOOD_CSV, "thesis/chapter-1.md": "# Queues\n" },
    show: [],
    args: ["report", STUDY, "--out", "thesis", "--quiet"],
    status: 1,
    message: () => outputMessages.outHoldsForeign("thesis", "chapter-1.md", "no-record"),
    afterwards: { "thesis/chapter-1.md": "# Queues\n", "thesis/results.json": null },
    place: "thesis",
  },
  {
    id: "out-user-file-in-report",
    title: "A file of the user's inside an earlier report folder",
    what: "`report` is a folder an earlier `sojourn report` wrote, and the user has since put a file of their own into it. A report folder is replaced only when its `record.json` lists every file in it with its digest.",
    files: { [STUDY]: manifest(QUEUE), "runs/day-1.csv": GOOD_CSV },
    setup: (dir) => {
      earlierReport(dir, "report");
      writeFileSync(join(dir, "report", "my-notes.txt"), "compare with last week\n");
    },
    show: [],
    args: ["report", STUDY, "--out", "report", "--quiet"],
    status: 1,
    message: () => outputMessages.outHoldsForeign("report", "my-notes.txt", "not-listed"),
    afterwards: { "report/my-notes.txt": "compare with last week\n" },
  },
  {
    id: "out-report-file-changed",
    title: "A file of an earlier report that was changed since",
    what: "The user has written into `report.html` of an earlier report. Its digest no longer matches `record.json`, so replacing the folder would lose the change.",
    files: { [STUDY]: manifest(QUEUE), "runs/day-1.csv": GOOD_CSV },
    setup: (dir) => {
      earlierReport(dir, "report");
      appendFileSync(join(dir, "report", "report.html"), "<!-- checked by the supervisor -->\n");
    },
    show: [],
    args: ["report", STUDY, "--out", "report", "--quiet"],
    status: 1,
    message: () => outputMessages.outHoldsForeign("report", "report.html", "changed"),
  },
  {
    id: "out-holds-study",
    title: "An output folder that holds the study itself, with --force",
    what: "`--out .` in the study's own folder: replacing it would delete the manifest and the run files. Sojourn never replaces a folder that is, holds or is a parent of an input of the study (links resolved), not even with `--force`.",
    files: { [STUDY]: manifest(QUEUE), "runs/day-1.csv": GOOD_CSV },
    show: [],
    args: ["report", STUDY, "--out", ".", "--force", "--quiet"],
    status: 1,
    message: () => outputMessages.outHoldsInput(".", STUDY, "manifest"),
    afterwards: { [STUDY]: manifest(QUEUE), "runs/day-1.csv": GOOD_CSV, "results.json": null },
  },
  {
    id: "out-unreadable",
    unprivileged: true,
    title: "An output folder that cannot be read",
    what: "`--out` names a folder the user may not list, so Sojourn cannot see whether it holds files of someone's.",
    files: { [STUDY]: manifest(QUEUE), "runs/day-1.csv": GOOD_CSV, "private/keep.txt": "mine\n" },
    setup: (dir) => chmodSync(join(dir, "private"), 0o700),
    show: [],
    args: ["report", STUDY, "--out", "private", "--quiet"],
    status: 1,
    message: () => outputMessages.outUnreadable("private", "EACCES"),
  },
  {
    id: "table-out-not-ours",
    title: "`table --out` names a file of the user's",
    what: "`sojourn table --out FILE` writes over an existing file only when it is a calculation table Sojourn wrote (its first line is a table header and every line has as many cells), or with `--force`.",
    files: { [STUDY]: manifest(QUEUE), "runs/day-1.csv": GOOD_CSV, "queue.csv": "my own queue counts, by hand\n" },
    show: [],
    args: ["table", STUDY, "--scenario", "morning", "--run", "day-1", "--measure", "queue", "--out", "queue.csv"],
    status: 1,
    message: () => outputMessages.outFileNotOurs("queue.csv", "calculation table", "its first line is not the header of a calculation table"),
    afterwards: { "queue.csv": "my own queue counts, by hand\n" },
  },
  {
    id: "summary-out-is-input",
    title: "`summarize-run --out` names a run file, with --force",
    what: "A typing slip sends the summary over the run file itself. Sojourn never writes over the manifest or an input of the study, not even with `--force`.",
    files: { [STUDY]: manifest(QUEUE), "runs/day-1.csv": GOOD_CSV },
    show: [],
    args: ["summarize-run", STUDY, "--scenario", "morning", "--run", "day-1", "--out", "runs/day-1.csv", "--force"],
    status: 1,
    message: () => outputMessages.outFileIsInput("runs/day-1.csv", "run file"),
    afterwards: { "runs/day-1.csv": GOOD_CSV },
  },
  {
    id: "table-out-is-folder",
    title: "`table --out` names a folder",
    what: "`--out` of `table` and `summarize-run` names the file to write.",
    files: { [STUDY]: manifest(QUEUE), "runs/day-1.csv": GOOD_CSV },
    show: [],
    args: ["table", STUDY, "--scenario", "morning", "--run", "day-1", "--measure", "queue", "--out", "runs"],
    status: 1,
    message: () => outputMessages.outFileIsFolder("runs"),
  },
  {
    id: "out-name-too-long",
    title: "An output folder name too long for the file system",
    what: "One name in a path may have at most 255 bytes on most file systems.",
    files: { [STUDY]: manifest(QUEUE), "runs/day-1.csv": GOOD_CSV },
    show: [],
    args: ["report", STUDY, "--out", LONG_NAME, "--quiet"],
    status: 1,
    message: () => outputMessages.outNameTooLong(LONG_NAME),
  },
  {
    id: "report-path-too-long",
    title: "A report file whose full path is too long for the system",
    what: "`deep` is a link to a folder whose path is 4053 bytes long: the report folder itself fits, but a calculation table inside it would pass the system's limit of 4095 bytes for a path.",
    files: { [STUDY]: manifest(QUEUE), "runs/day-1.csv": GOOD_CSV },
    setup: (dir) => {
      const deep = deepFolder(dir, 4053);
      symlinkSync(deep, join(dir, "deep"));
    },
    show: [],
    args: ["report", STUDY, "--out", "deep/report", "--quiet"],
    status: 1,
    // 4053 + "/report/tables/morning/runs/day-1/queue.csv" (43) = 4096 bytes
    message: () => outputMessages.reportFileNameTooLong("deep/report", "tables/morning/runs/day-1/queue.csv", 4096),
  },
  {
    id: "out-path-blocked",
    title: "A file where the output path needs a folder",
    what: "`--out notes.txt/report`, where `notes.txt` is a file.",
    files: { [STUDY]: manifest(QUEUE), "runs/day-1.csv": GOOD_CSV, "notes.txt": "ideas\n" },
    show: [],
    args: ["report", STUDY, "--out", "notes.txt/report", "--quiet"],
    status: 1,
    message: () => outputMessages.outPathBlocked("notes.txt/report", "notes.txt"),
    afterwards: { "notes.txt": "ideas\n" },
  },
  {
    id: "out-parent-not-writable",
    unprivileged: true,
    title: "An output folder inside a folder the user may not write to",
    what: "`locked` may be read but not written by the user; the report folder cannot be created in it.",
    files: { [STUDY]: manifest(QUEUE), "runs/day-1.csv": GOOD_CSV, "locked/readme.txt": "shared\n" },
    setup: (dir) => chmodSync(join(dir, "locked"), 0o555),
    show: [],
    args: ["report", STUDY, "--out", "locked/report", "--quiet"],
    status: 1,
    message: () => outputMessages.outReadOnly("locked/report", "locked", "EACCES"),
  },
  {
    id: "out-read-only",
    title: "An output folder on a read-only file system (simulated)",
    what: "The file system refuses every write with EROFS, as a disk mounted read-only does. The test simulates it with `SOJOURN_TEST_FAULT` (src/fileSystem.ts), since a real read-only mount needs privileges.",
    files: { [STUDY]: manifest(QUEUE), "runs/day-1.csv": GOOD_CSV },
    env: { SOJOURN_TEST_FAULT: "EROFS:mkdir:report" },
    show: [],
    args: ["report", STUDY, "--out", "report", "--quiet"],
    status: 1,
    message: () => outputMessages.outReadOnly("report", "the current folder", "EROFS"),
  },
  {
    id: "disk-full",
    title: "The disk fills up while the report is written (simulated)",
    what: "An earlier report is in `report`; the disk fills up while the new one writes its first calculation table (simulated with `SOJOURN_TEST_FAULT`, as ENOSPC). The unfinished report is removed and the earlier one stays as it was.",
    files: { [STUDY]: manifest(QUEUE), "runs/day-1.csv": GOOD_CSV },
    setup: (dir) => earlierReport(dir, "report"),
    env: { SOJOURN_TEST_FAULT: "ENOSPC:write:tables/" },
    show: [],
    args: ["report", STUDY, "--out", "report", "--quiet"],
    status: 1,
    message: () => outputMessages.reportDiskFull("report", "tables/morning/runs/day-1/queue.csv", "ENOSPC", true),
  },
  {
    id: "disk-full-at-start",
    title: "The disk is full before the report folder can be made (simulated)",
    what: "ENOSPC when the report folder is created (simulated with `SOJOURN_TEST_FAULT`).",
    files: { [STUDY]: manifest(QUEUE), "runs/day-1.csv": GOOD_CSV },
    env: { SOJOURN_TEST_FAULT: "ENOSPC:mkdir:report" },
    show: [],
    args: ["report", STUDY, "--out", "report", "--quiet"],
    status: 1,
    message: () => outputMessages.outDiskFull("report", "ENOSPC"),
    afterwards: { "report/results.json": null },
  },
  {
    id: "disk-error",
    title: "The disk fails while the report is written (simulated)",
    what: "An input/output error (EIO) while `report.html` is written (simulated with `SOJOURN_TEST_FAULT`).",
    files: { [STUDY]: manifest(QUEUE), "runs/day-1.csv": GOOD_CSV },
    env: { SOJOURN_TEST_FAULT: "EIO:write:report.html" },
    show: [],
    args: ["report", STUDY, "--out", "report", "--quiet"],
    status: 1,
    message: () => outputMessages.reportFileUnwritable("report", "report.html", "EIO", false),
    afterwards: { "report/results.json": null },
  },
  {
    id: "table-disk-full",
    title: "The disk is full when `table --out` writes (simulated)",
    what: "ENOSPC while the full table is written (simulated with `SOJOURN_TEST_FAULT`): the file is written beside its place and renamed, so nothing half-written is left.",
    files: { [STUDY]: manifest(QUEUE), "runs/day-1.csv": GOOD_CSV },
    env: { SOJOURN_TEST_FAULT: "ENOSPC:write:queue-full" },
    show: [],
    args: ["table", STUDY, "--scenario", "morning", "--run", "day-1", "--measure", "queue", "--out", "queue-full.csv"],
    status: 1,
    message: () => outputMessages.outFileUnwritable("queue-full.csv", "ENOSPC", false),
    afterwards: { "queue-full.csv": null },
  },
  {
    id: "pdf-no-browser",
    debug: true,
    title: "A PDF asked for with no browser",
    what: "`--pdf` needs a Chromium-family browser; here the one named does not exist. The HTML report is written all the same.",
    files: { [STUDY]: manifest(QUEUE), "runs/day-1.csv": GOOD_CSV },
    show: [],
    args: ["report", STUDY, "--out", "report", "--pdf", "--chrome", "/opt/no-such-browser/chromium", "--quiet"],
    status: 1,
    message: () => reportMessages.browserMissing("/opt/no-such-browser/chromium", "--chrome"),
    afterwards: { "report/report.pdf": null },
  },
  // --- verify and run summaries ---------------------------------------------------------------
  {
    id: "record-malformed",
    debug: true,
    title: "A report folder whose record.json lacks a key",
    what: "`sojourn verify` checks record.json's shape before it trusts anything in it: a key missing or of the wrong type is named with its path. Here `outputs` is missing.",
    files: { [STUDY]: M_PLAIN, "runs/day-1.csv": GOOD_CSV, "report/record.json": RECORD_NO_OUTPUTS },
    show: [],
    args: ["verify", "report"],
    status: 1,
    message: () => verifyMessages.recordMalformed("report", "at outputs: expected a list, found nothing (the key is missing)"),
    place: "report/record.json",
  },
  {
    id: "record-not-json",
    title: "A record.json cut short",
    what: "record.json ends in the middle (a copy that stopped, a disk that filled).",
    files: { [STUDY]: M_PLAIN, "runs/day-1.csv": GOOD_CSV, "report/record.json": RECORD_CUT },
    show: [],
    args: ["verify", "report"],
    status: 1,
    message: () => verifyMessages.recordMalformed("report", notJson(RECORD_CUT)),
  },
  {
    id: "record-fifo",
    title: "A record.json that is a named pipe",
    what: "record.json is a named pipe (FIFO), not a file. Reading it would wait for a writer for ever; `verify` checks the kind first and reads nothing.",
    files: { [STUDY]: M_PLAIN, "runs/day-1.csv": GOOD_CSV, "report/results.json": "{}\n" },
    show: [],
    setup: (dir) => {
      if (spawnSync("mkfifo", [join(dir, "report", "record.json")]).status !== 0) throw new Error("test setup: mkfifo failed");
    },
    args: ["verify", "report"],
    status: 1,
    message: () => verifyMessages.recordNotAFile("report", "a named pipe (FIFO)"),
  },
  {
    id: "report-folder-missing",
    title: "verify on a folder that does not exist",
    what: "The folder given to `sojourn verify` is not there.",
    files: { [STUDY]: M_PLAIN, "runs/day-1.csv": GOOD_CSV },
    show: [],
    args: ["verify", "reprot"],
    status: 1,
    message: () => verifyMessages.reportDirMissing("reprot", "it does not exist"),
  },
  {
    id: "summary-stale",
    debug: true,
    title: "A run summary made from an older version of its run file",
    what: "`report --from-summaries` computes the SHA-256 of each run file it can read and compares it with the one the summary was made from. Here `runs/day-1.csv` was changed after `summarize-run` wrote its summary.",
    files: { [STUDY]: M_PLAIN, "runs/day-1.csv": GOOD_CSV },
    show: [],
    setup: (dir) => {
      const r = spawnSync(process.execPath, [MAIN, "summarize-run", STUDY, "--scenario", "morning", "--run", "day-1", "--out", "sums/morning/day-1.json"], { cwd: dir, encoding: "utf8" });
      if (r.status !== 0) throw new Error(`test setup: summarize-run failed: ${r.stderr}`);
      writeFileSync(join(dir, "runs", "day-1.csv"), CHANGED_CSV);
    },
    args: ["report", STUDY, "--out", "report", "--from-summaries", "sums", "--quiet"],
    status: 1,
    message: () => summaryMessages.summaryStale("sums/morning/day-1.json", "runs/day-1.csv", sha(CHANGED_CSV), sha(GOOD_CSV)),
    afterwards: { "report/results.json": null },
  },
  {
    id: "summary-malformed",
    title: "A run summary that is not what summarize-run writes",
    what: "A summary whose own digest matches, made by hand: it has no `analysis`. Its shape is checked before anything in it is used.",
    files: { [STUDY]: M_PLAIN, "runs/day-1.csv": GOOD_CSV, "sums/morning/day-1.json": SUMMARY_EMPTY },
    show: [],
    args: ["report", STUDY, "--out", "report", "--from-summaries", "sums", "--quiet"],
    status: 1,
    message: () => summaryMessages.summaryMalformed("sums/morning/day-1.json", "at analysis: expected an object, found nothing (the key is missing)"),
    afterwards: { "report/results.json": null },
  },
  // --- layouts (contract section 9) ----------------------------------------------------------
  {
    id: "entities-id-empty",
    title: "An entity table row without its id",
    what: "With `layout: entities` every row is one entity (or one visit) and needs its id.",
    files: { [STUDY]: M_ENTITIES, "runs/day-1.csv": "id,arrived,started,left\n1,0.5,0.5,1.2\n,0.9,1.2,2.0\n" },
    show: [STUDY, "runs/day-1.csv"],
    args: check,
    status: 1,
    message: () => ingestMessages.entityIdEmpty("runs/day-1.csv", 3, "id"),
    place: "runs/day-1.csv:3",
  },
  {
    id: "entities-id-column-missing",
    title: "An entity table without its id column",
    what: "The header of an entity table has no column of the name `columns: {entity: ...}` gives (default `entity`).",
    files: { [STUDY]: M_ENTITIES, "runs/day-1.csv": "customer,arrived,started,left\n1,0.5,0.5,1.2\n" },
    show: ["runs/day-1.csv"],
    args: check,
    status: 1,
    message: () => ingestMessages.missingColumns("runs/day-1.csv", [{ role: "entity", name: "id" }], ["customer", "arrived", "started", "left"]),
    place: "runs/day-1.csv:1",
  },
  {
    id: "entities-time-not-a-number",
    title: "An entity table cell that is not a time",
    what: "Each cell of an event column is the time of that event, or empty.",
    files: { [STUDY]: M_ENTITIES, "runs/day-1.csv": "id,arrived,started,left\n1,0.5,0.5,1.2\n2,0.9,soon,2.0\n" },
    show: ["runs/day-1.csv"],
    args: check,
    status: 1,
    message: () => ingestMessages.eventTimeNotANumber("runs/day-1.csv", 3, "started", "soon"),
    place: "runs/day-1.csv:3",
  },
  {
    id: "entities-backwards",
    title: "An entity that left before it started",
    what: "On one row of an entity table, the second event of a measure's `from` (here `started`, the end of `wait`) is earlier than the first (`arrived`). Only the column pairs that a measure's `from` names are compared.",
    files: { [STUDY]: M_ENTITIES, "runs/day-1.csv": "id,arrived,started,left\n1,0.5,0.5,1.2\n2,0.9,0.7,2.0\n" },
    show: ["runs/day-1.csv"],
    args: check,
    status: 1,
    message: () => ingestMessages.eventsBackwards("runs/day-1.csv", 3, "arrived", 0.9, "started", 0.7),
    place: "runs/day-1.csv:3",
  },
  {
    id: "entities-sort-folder",
    title: "The temporary folder for sorting a large entity table cannot be written",
    what: "An entity table with more events than the sort holds in memory (`SOJOURN_SORT_EVENTS`, here set to 2) is sorted in chunk files under the temporary folder (`TMPDIR`), which here does not exist.",
    files: { [STUDY]: M_ENTITIES, "runs/day-1.csv": "id,arrived,started,left\n1,0.5,0.5,1.2\n2,0.9,1.2,2.0\n" },
    show: [],
    args: check,
    env: { SOJOURN_SORT_EVENTS: "2", TMPDIR: "/nonexistent-sojourn-tmp" },
    status: 1,
    message: () => ingestMessages.sortFilesFailed("runs/day-1.csv", "/nonexistent-sojourn-tmp", "ENOENT", 2),
    place: "runs/day-1.csv",
  },
  {
    id: "levels-time-decreased",
    title: "A levels table whose time goes backwards",
    what: "With `layout: levels` each row is an instant, and the rows are in time order.",
    files: { [STUDY]: M_LEVELS, "runs/day-1.csv": "time,queue,busy\n0,0,0\n2,1,\n1.5,,1\n" },
    show: [STUDY, "runs/day-1.csv"],
    args: check,
    status: 1,
    message: () => ingestMessages.levelTimeDecreased("runs/day-1.csv", 4, "time", 2, 1.5, 3),
    place: "runs/day-1.csv:4",
  },
  {
    id: "levels-not-a-number",
    title: "A levels table cell that is not a number",
    what: "Each cell of a level column is the level's new value, or empty (the level stays as it was).",
    files: { [STUDY]: M_LEVELS, "runs/day-1.csv": "time,queue,busy\n0,0,0\n2,two,\n" },
    show: ["runs/day-1.csv"],
    args: check,
    status: 1,
    message: () => ingestMessages.levelNotANumber("runs/day-1.csv", 3, "queue", "two"),
    place: "runs/day-1.csv:3",
  },
  {
    id: "where-column-missing",
    title: "A `where` on a column the run file does not have",
    what: "A measure's `where` names an attribute column that is not in the file's header (a misspelt name would otherwise filter out every row).",
    files: { [STUDY]: M_WHERE, "runs/day-1.csv": "time,series,value,entity,server\n0,queue,2,,0\n3,queue,5,,1\n" },
    show: [STUDY, "runs/day-1.csv"],
    args: check,
    status: 1,
    message: () => ingestMessages.whereColumnMissing("runs/day-1.csv", "sever", ["time", "series", "value", "entity", "server"]),
    place: "runs/day-1.csv:1",
  },
  // --- usage ------------------------------------------------------------------------------
  {
    id: "unknown-flag",
    title: "An unknown flag (usage error)",
    what: "A flag the command does not have. Usage errors exit with status 2.",
    files: { [STUDY]: manifest(QUEUE), "runs/day-1.csv": GOOD_CSV },
    show: [],
    args: ["check", STUDY, "--jsno"],
    status: 2,
    contains: ["unknown option '--jsno'", "(Did you mean --json?)"],
  },
  {
    id: "bad-flag-value",
    title: "A flag value that is not a number (usage error)",
    what: "`sojourn at ... --time` takes a number.",
    files: { [STUDY]: manifest(QUEUE), "runs/day-1.csv": GOOD_CSV },
    show: [],
    args: ["at", STUDY, "--scenario", "morning", "--run", "day-1", "--measure", "queue", "--time", "soon"],
    status: 2,
    contains: ["option '--time <t>' argument 'soon' is invalid. expected a number."],
  },
];
