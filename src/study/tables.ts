import { sha256 } from "../digest.js";
import { type BuiltTable, tableToCsv } from "../measures/table.js";
import type { IntervalArithmetic, TableRecord } from "../outcome/index.js";

/**
 * A user's name (scenario, run or measure) as one part of a file name, the same on every file
 * system. The mapping is injective, also where file names are compared without case:
 *
 * - `a`–`z`, `0`–`9`, `_` and `-` are kept;
 * - an uppercase letter is written `+` and the letter in lowercase (`Wait` -> `+wait`);
 * - every other byte of the name's UTF-8, `.` and `~` included, is written `~XX` in uppercase hex
 *   (`a.b` -> `a~2Eb`), so a part never holds the `.` that separates it from a table's suffix;
 * - a part that would be a reserved device name on Windows (`con`, `nul`, `com1`, ...) has its
 *   first letter written `~XX` (`con` -> `~63on`);
 * - a part longer than 100 characters keeps its first 80 (never half an escape) and ends with `~~`
 *   and the first 16 hex digits of the name's SHA-256, so it still names one name (up to a
 *   64-bit digest collision).
 *
 * Examples: `lane_queue` -> `lane_queue`, `Lane Queue` -> `+lane~20+queue`, `wait.quantiles` ->
 * `wait~2Equantiles`, `é` -> `~C3~A9`.
 */
export function safeName(name: string): string {
  let out = "";
  for (const byte of Buffer.from(name, "utf8")) {
    if ((byte >= 0x61 && byte <= 0x7a) || (byte >= 0x30 && byte <= 0x39) || byte === 0x5f || byte === 0x2d) out += String.fromCharCode(byte);
    else if (byte >= 0x41 && byte <= 0x5a) out += "+" + String.fromCharCode(byte + 0x20);
    else out += hexByte(byte);
  }
  if (out === "") return "~";
  if (WINDOWS_DEVICE.test(out)) out = hexByte(out.charCodeAt(0)) + out.slice(1);
  if (out.length <= MAX_PART) return out;
  let cut = SHORT_PART;
  // Do not split an escape: `~XX` takes three characters, `+x` two.
  if (out[cut - 1] === "~" || out[cut - 1] === "+") cut -= 1;
  else if (out[cut - 2] === "~") cut -= 2;
  return `${out.slice(0, cut)}~~${sha256(name).slice(0, 16)}`;
}

const MAX_PART = 100;
const SHORT_PART = 80;
/** Names Windows keeps for devices, with or without an extension (compared without case). */
const WINDOWS_DEVICE = /^(con|prn|aux|nul|com[0-9]|lpt[0-9])$/;

function hexByte(byte: number): string {
  return `~${byte.toString(16).toUpperCase().padStart(2, "0")}`;
}

/**
 * A figure (`quantiles.0.5`, `time_at_least.2`) as the last part of an interval table's name:
 * our own text of lowercase letters, `_`, `.` and a number; `+` and any other byte as `~XX`.
 */
function figurePart(figure: string): string {
  let out = "";
  for (const byte of Buffer.from(figure, "utf8")) {
    const ch = String.fromCharCode(byte);
    out += /[a-z0-9_.-]/.test(ch) ? ch : hexByte(byte);
  }
  return out;
}

/**
 * `tables/<scenario>/runs/<run>/<measure>[.<suffix>].csv`. The measure's part holds no `.`, so
 * the suffix (`quantiles`, `within`, `time_at_least`, `time_at_value`) can never be read as part
 * of another measure's name.
 */
export function runTablePath(scenario: string, run: string, measure: string, suffix: string): string {
  return `tables/${safeName(scenario)}/runs/${safeName(run)}/${safeName(measure)}${suffix ? "." + suffix : ""}.csv`;
}

/** `tables/<scenario>/intervals/<measure>[.<figure>].csv` */
export function intervalTablePath(scenario: string, measure: string, figure: string): string {
  return `tables/${safeName(scenario)}/intervals/${safeName(measure)}${figure === "value" ? "" : "." + figurePart(figure)}.csv`;
}

export interface TableFile {
  record: TableRecord;
  csv: string;
}

/** Rows of a calculation table the report page shows: the first `PREVIEW_HEAD` and the last `PREVIEW_TAIL`. */
export const PREVIEW_HEAD = 20;
export const PREVIEW_TAIL = 10;

/**
 * Runs per scenario whose calculation tables the report page shows (their preview rows); the
 * tables of later runs are files only. This bounds the page and the memory of a study of
 * thousands of runs; `sojourn table` gives any table in full.
 */
export const PREVIEW_RUNS = 10;

/** The rows of a table the page shows: all when few, else the head and the tail. */
export function previewRows(rows: BuiltTable["rows"]): BuiltTable["rows"] {
  return rows.length <= PREVIEW_HEAD + PREVIEW_TAIL ? rows : [...rows.slice(0, PREVIEW_HEAD), ...rows.slice(-PREVIEW_TAIL)];
}

/** A calculation table as a file: its CSV text, digest and index entry. */
export function tableFile(
  where: { scenario: string; run: string | null; measure: string; kind: string },
  file: string,
  table: BuiltTable,
): TableFile {
  const csv = tableToCsv(table);
  return {
    csv,
    record: {
      ...where,
      file,
      columns: table.columns,
      rows_total: table.rowsTotal,
      rows_written: table.rows.length,
      shortened: table.shortened,
      sha256: sha256(csv),
      preview: previewRows(table.rows),
    },
  };
}

/**
 * True when taking the mean's rounding correction off the sum of squares changes it (values close
 * together far from 0): only then do the table and the report show the correction as a step.
 */
export function meanCorrectionMatters(a: Pick<IntervalArithmetic, "sum_squared" | "mean_correction">): boolean {
  return a.sum_squared !== null && a.mean_correction !== null && a.sum_squared - a.mean_correction !== a.sum_squared;
}

export const INTERVAL_COLUMNS = ["item", "run", "value", "deviation", "squared_deviation"];

/**
 * The interval arithmetic as a table: one row per run (value, deviation from the mean, its
 * square), then one row per step (sum, mean, sum of squares, the mean's rounding correction when
 * it matters, variance, sd, df, p, t, standard error, half-width, bounds).
 */
export function intervalTable(a: IntervalArithmetic): BuiltTable {
  const rows: (number | string | null)[][] = a.rows.map((r) => ["run", r.run, r.value, r.deviation, r.squared]);
  const steps: [string, number | null][] = [
    ["n", a.n],
    ["sum", a.sum],
    ["mean", a.mean],
    ["sum_squared_deviations", a.sum_squared],
    ...(meanCorrectionMatters(a) ? [["mean_rounding_correction", a.mean_correction] as [string, number | null]] : []),
    ["variance", a.variance],
    ["sd", a.sd],
    ["df", a.df],
    ["p", a.p],
    ["t", a.t],
    ["standard_error", a.standard_error],
    ["half_width", a.half_width],
    ["ci_low", a.ci_low],
    ["ci_high", a.ci_high],
  ];
  for (const [item, v] of steps) rows.push([item, null, v, null, null]);
  if (a.note !== null) rows.push(["note", null, a.note, null, null]);
  return { columns: INTERVAL_COLUMNS, rowsTotal: rows.length, rows, shortened: false };
}
