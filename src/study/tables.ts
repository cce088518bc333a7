import { sha256 } from "../digest.js";
import { type BuiltTable, tableToCsv } from "../measures/table.js";
import type { IntervalArithmetic, TableRecord } from "./outcome.js";

/** A name made safe for a file name: letters, digits, `.`, `_`, `-` kept; anything else as `~XX` (UTF-8 hex). */
export function safeName(name: string): string {
  let out = "";
  for (const byte of Buffer.from(name, "utf8")) {
    const ch = String.fromCharCode(byte);
    out += /[A-Za-z0-9_-]/.test(ch) || (ch === "." && out !== "") ? ch : `~${byte.toString(16).toUpperCase().padStart(2, "0")}`;
  }
  return out === "" ? "~" : out;
}

/** `tables/<scenario>/runs/<run>/<measure>[.<suffix>].csv` */
export function runTablePath(scenario: string, run: string, measure: string, suffix: string): string {
  return `tables/${safeName(scenario)}/runs/${safeName(run)}/${safeName(measure)}${suffix ? "." + suffix : ""}.csv`;
}

/** `tables/<scenario>/intervals/<measure>[.<figure>].csv` */
export function intervalTablePath(scenario: string, measure: string, figure: string): string {
  return `tables/${safeName(scenario)}/intervals/${safeName(measure)}${figure === "value" ? "" : "." + safeName(figure)}.csv`;
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

export const INTERVAL_COLUMNS = ["item", "run", "value", "deviation", "squared_deviation"];

/**
 * The interval arithmetic as a table: one row per run (value, deviation from the mean, its
 * square), then one row per step (sum, mean, sum of squares, variance, sd, df, p, t, standard
 * error, half-width, bounds).
 */
export function intervalTable(a: IntervalArithmetic): BuiltTable {
  const rows: (number | string | null)[][] = a.rows.map((r) => ["run", r.run, r.value, r.deviation, r.squared]);
  const steps: [string, number | null][] = [
    ["n", a.n],
    ["sum", a.sum],
    ["mean", a.mean],
    ["sum_squared_deviations", a.sum_squared],
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
