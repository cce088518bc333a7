/**
 * Messages of the run-file reader (`src/ingest/`). Each says where (file and line), what is wrong
 * and what to do. `file` is always the path as the user sees it (relative to the manifest).
 */
import { located, type UserError } from "./error.js";

/** The `columns:` manifest key, written the way a user would type it. */
function columnsKey(role: string, name = "<column name>"): string {
  return `columns: {${role}: ${name}}`;
}

function quoted(names: readonly string[]): string {
  return names.length === 0 ? "(none)" : names.map((n) => `\`${n}\``).join(", ");
}

/** A number as a user would read it back in the file. */
function shown(x: number): string {
  return Object.is(x, -0) ? "-0" : String(x);
}

const REASONS: Record<string, string> = {
  ENOENT: "file not found",
  EACCES: "permission denied",
  EPERM: "permission denied",
  EISDIR: "the path is a folder, not a file",
  ENOTDIR: "a part of the path is not a folder",
  ELOOP: "too many symbolic links in the path",
  ENAMETOOLONG: "the path is too long",
  EMFILE: "too many files are open at once",
  ENFILE: "too many files are open at once",
  EBUSY: "the file is busy or locked",
  EIO: "the disk reported an input/output error",
};

/** A system error code (`ENOENT`, ...) in words. */
export function systemReason(code: string | undefined): string {
  if (code !== undefined && Object.hasOwn(REASONS, code)) return REASONS[code];
  return `the system refused to read it (${code ?? "unknown error"})`;
}

/** The file cannot be opened or read. */
export function unreadableFile(file: string, code: string | undefined): UserError {
  const todo =
    code === "ENOENT" || code === "ENOTDIR"
      ? "check the path: run files are found relative to the manifest's folder (the scenario's `runs:`)"
      : code === "EISDIR"
        ? "list the run files in the scenario's `runs:`, or use a glob such as `runs/*.csv`"
        : code === "EACCES" || code === "EPERM"
          ? "give your user read permission on the file"
          : "check that the file can be read (copy it again if the disk or share is unreliable)";
  return located({ file }, `cannot read this run file: ${systemReason(code)}`, todo);
}

/**
 * The run path is a pipe, a socket or a device (`kind` in words, see `notFileKind`), itself or
 * through a symbolic link (`link`).
 */
export function notARegularFile(file: string, kind: string, link: boolean): UserError {
  const what = link ? `this run path is a symbolic link to ${kind}, not to a regular file` : `this run path is ${kind}, not a regular file`;
  const device = kind.endsWith("device") ? " (a device such as /dev/zero gives bytes without end)" : "";
  return located(
    { file },
    `${what}${device}: Sojourn reads a run file to its end and records its bytes, so it reads regular files only`,
    "save the run's output to a regular file first (for example `cat PIPE > runs/rep-01.csv`) and name that file in the scenario's `runs:`",
  );
}

/** The file name ends in none of the run-file extensions. */
export function unsupportedExtension(file: string, supported: readonly string[]): UserError {
  return located(
    { file },
    "the format of this run file is chosen by its extension, and this one is not supported",
    `name the file with one of: ${supported.join(", ")}`,
  );
}

/** 0 bytes, or no header row (CSV) / no object (JSON Lines). */
export function emptyFile(file: string, format: "csv" | "jsonl"): UserError {
  const what =
    format === "csv"
      ? "the run file is empty: a CSV run file needs at least a header row naming its columns"
      : "the run file is empty: a JSON Lines run file needs at least one object";
  return located({ file }, what, "write the run file again, or leave it out of the scenario's `runs:`");
}

/** The missing columns named for a message (with their role when renamed), and the manifest mapping that would name them. */
function missingWords(missing: readonly { role: string; name: string }[]): { which: string[]; map: string } {
  return {
    which: missing.map((m) => (m.role === m.name ? `\`${m.name}\`` : `\`${m.name}\` (the ${m.role})`)),
    map: `columns: {${missing.map((m) => `${m.role}: <column name>`).join(", ")}}`,
  };
}

/** Required columns (time, series) missing from the CSV header, after column renaming. */
export function missingColumns(
  file: string,
  missing: readonly { role: string; name: string }[],
  found: readonly string[],
): UserError {
  const { which, map } = missingWords(missing);
  return located(
    { file, line: 1 },
    `the header has no column ${which.join(" and no column ")}; columns found: ${quoted(found)}`,
    `rename the column in the file, or map the file's own column in the manifest with \`${map}\``,
  );
}

/** A CSV header names one column twice (columns counted from 1). */
export function duplicateColumn(file: string, line: number, name: string, first: number, second: number): UserError {
  return located(
    { file, line },
    `the header names the column \`${name}\` twice (columns ${first} and ${second}), so which of its cells a row means would be a guess`,
    "rename one of the two columns in the header, or leave the extra one out of the file",
  );
}

/** A JSON Lines object with one key twice. */
export function duplicateKey(file: string, line: number, key: string): UserError {
  return located(
    { file, line },
    `the object has the key \`${key}\` twice; JSON readers keep only one of the two values, so the other would be lost without a word`,
    "write each key once in every object",
  );
}

/** An entity-based measure needs the entity column and the header has none. */
export function missingEntityColumn(
  file: string,
  column: string,
  found: readonly string[],
  series: readonly string[],
): UserError {
  return located(
    { file, line: 1 },
    `the header has no column \`${column}\` (the entity), which the entity-based measures on series ${quoted(series)} need; columns found: ${quoted(found)}`,
    `add the entity column to the file, or map the file's own column with \`${columnsKey("entity")}\``,
  );
}

/** A CSV row ends before the time or the series column. */
export function tooFewFields(file: string, line: number, found: number, needed: number): UserError {
  return located(
    { file, line },
    `this row has ${found} field${found === 1 ? "" : "s"}, but the time and series columns need at least ${needed}`,
    "check the row for a missing comma or a row cut short",
  );
}

/**
 * A CSV row with more cells than the header has columns. `decimalComma`: the extra cells look
 * like numbers written with a decimal comma (`1,5` for 1.5).
 */
export function tooManyFields(file: string, line: number, found: number, columns: number, decimalComma: boolean): UserError {
  const what = `this row has ${found} cells, but the header names only ${columns} column${columns === 1 ? "" : "s"}`;
  if (decimalComma) {
    return located(
      { file, line },
      `${what}: the extra cells look like numbers written with a decimal comma (\`1,5\` for 1.5), which a CSV file reads as two cells`,
      "write decimal numbers with a point (1.5): set the model's or the spreadsheet's export to use a point as the decimal separator",
    );
  }
  return located(
    { file, line },
    `${what}, so it is not clear which cell belongs to which column`,
    'give every row at most as many cells as the header: name the extra columns in the header, or quote a cell that holds a comma ("a,b")',
  );
}

/** A quoted CSV field is still open at the end of the file. */
export function unterminatedQuote(file: string, line: number): UserError {
  return located(
    { file, line },
    "a quoted field opened on this line is never closed: the file ends inside the quotes",
    'close the field with a double quote; inside a quoted field, write a double quote as two ("")',
  );
}

/** A byte count in words: `1 MiB (1048576 bytes)`, `1500 bytes`. */
export function byteCount(n: number): string {
  for (const [unit, size] of [
    ["GiB", 2 ** 30],
    ["MiB", 2 ** 20],
    ["KiB", 2 ** 10],
  ] as const) {
    if (n >= size && n % size === 0) return `${n / size} ${unit} (${n} bytes)`;
  }
  return `${n} byte${n === 1 ? "" : "s"}`;
}

/** How to raise the row limit, for the messages about long rows. */
function raiseLimit(limit: number, max: number): string {
  return `if the rows really are this long, raise the limit in the manifest with \`max_row_bytes: ${Math.min(2 * limit, max)}\` (in bytes, at most ${max}; at the top or in the scenario)`;
}

/** A row (CSV record or JSON line) longer than the row limit. */
export function rowTooLong(file: string, line: number, limit: number, max: number): UserError {
  return located(
    { file, line },
    `this row is longer than the row limit of ${byteCount(limit)}; rows of run files are short, so this is likely a file that is not a run file, or one without line breaks`,
    `check that the file holds one row per line; ${raiseLimit(limit, max)}`,
  );
}

/** A quoted CSV field still open after the row limit's worth of bytes. */
export function quoteTooLong(file: string, line: number, limit: number, max: number): UserError {
  return located(
    { file, line },
    `a quoted field opened on this line is still open after ${byteCount(limit)} (the row limit): either its closing quote is missing, so that the rest of the file reads as inside it, or the row is longer than the limit`,
    `close the field with a double quote; inside a quoted field, write a double quote as two (""); ${raiseLimit(limit, max)}`,
  );
}

/** Something other than a comma or the end of the line follows a closing quote. */
export function textAfterQuote(file: string, line: number): UserError {
  return located(
    { file, line },
    "text follows the closing quote of a quoted field",
    'quote the whole field, and write each double quote inside it as two ("")',
  );
}

/** The time cell of a row is empty or absent. */
export function missingTime(file: string, line: number): UserError {
  return located({ file, line }, "the time cell is empty", "give every row the simulation time it happened at");
}

/** A time or value that is not a finite decimal number. */
export function notANumber(file: string, line: number, cell: "time" | "value", text: string): UserError {
  const allowed = "a decimal number such as 12, -0.5 or 1.5e3 (no hex, Infinity or NaN; at most about 1.8e308)";
  const comma = /^\s*[-+]?\d+,\d+\s*$/.test(text) ? " (it looks like a number with a decimal comma: write 1.5, not 1,5)" : "";
  return located(
    { file, line },
    `the ${cell} \`${text}\` is not a finite decimal number${comma}`,
    cell === "time" ? `write the time as ${allowed}` : `write the value as ${allowed}, or leave it empty`,
  );
}

/** The series cell of a row is empty. */
export function emptySeries(file: string, line: number): UserError {
  return located({ file, line }, "the series cell is empty", "name the series (data stream) every row belongs to");
}

/** Within one series, time went down in file order. */
export function timeDecreased(
  file: string,
  line: number,
  series: string,
  previous: number,
  time: number,
  previousLine: number,
): UserError {
  return located(
    { file, line },
    `time goes backwards in series \`${series}\`: ${shown(time)} here, after ${shown(previous)} on line ${previousLine}`,
    "write the rows of each series in time order (sort the file by time, keeping rows with equal times in their order)",
  );
}

/** A JSON Lines line that does not parse. */
export function badJson(file: string, line: number, detail: string): UserError {
  return located(
    { file, line },
    `this line is not valid JSON (${detail})`,
    "write one JSON object per line; a line cut short usually means the run stopped while writing",
  );
}

/** A JSON Lines line that parses to something other than an object. */
export function notAnObject(file: string, line: number, got: string): UserError {
  return located(
    { file, line },
    `this line holds ${got}, not a JSON object`,
    'write one object per line, such as {"time": 1.5, "series": "queue", "value": 3}',
  );
}

/** A JSON Lines object without its time or series key. */
export function missingKey(file: string, line: number, key: string, role: string): UserError {
  return located(
    { file, line },
    `the object has no \`${key}\` key (the ${role})`,
    `add the key, or map the file's own key in the manifest with \`${columnsKey(role, "<key>")}\``,
  );
}

/** A JSON Lines key of the wrong type. */
export function wrongType(
  file: string,
  line: number,
  key: string,
  role: string,
  expected: string,
  got: string,
): UserError {
  return located({ file, line }, `\`${key}\` (the ${role}) is ${got}; expected ${expected}`, `write ${expected} there`);
}

/** The gzip stream is damaged or cut short. */
export function corruptGzip(file: string, detail: string): UserError {
  return located(
    { file },
    `the gzip data of this run file is damaged or cut short (${detail})`,
    "compress or copy the run file again; `gzip -t FILE` tests a gzip file",
  );
}

/** A column a measure's `where` names is not in the file's header. */
export function whereColumnMissing(file: string, column: string, found: readonly string[]): UserError {
  return located(
    { file, line: 1 },
    `the header has no column \`${column}\`, which a measure's \`where\` filters on; columns found: ${quoted(found)}`,
    "add the column to the file, or correct the column name in the measure's `where`",
  );
}

/** `layout: entities`: a row whose id cell is empty. */
export function entityIdEmpty(file: string, line: number, column: string): UserError {
  return located(
    { file, line },
    `the entity id cell (column \`${column}\`) is empty`,
    `give every row the id of its entity, or name the id column with \`${columnsKey("entity")}\``,
  );
}

/** `layout: entities`: an event cell that is not a time. */
export function eventTimeNotANumber(file: string, line: number, column: string, text: string): UserError {
  return located(
    { file, line },
    `the cell \`${text}\` of event column \`${column}\` is not a finite decimal number: with \`layout: entities\` each cell of an event column is the time of that event`,
    "write the time as a decimal number such as 12.5, or leave the cell empty when the entity never had that event",
  );
}

/** `layout: entities`: on one row, the second event of a pair is earlier than the first. */
export function eventsBackwards(file: string, line: number, first: string, firstTime: number, second: string, secondTime: number): UserError {
  return located(
    { file, line },
    `this entity's \`${second}\` (${shown(secondTime)}) is earlier than its \`${first}\` (${shown(firstTime)}), which a measure pairs with it as the earlier event`,
    `check the model's output for this entity: \`${second}\` must not come before \`${first}\`; if the columns are swapped, swap them in the measure's \`from\``,
  );
}

/** `layout: levels`: the time column went down. */
export function levelTimeDecreased(file: string, line: number, column: string, previous: number, time: number, previousLine: number): UserError {
  return located(
    { file, line },
    `time goes backwards in column \`${column}\`: ${shown(time)} here, after ${shown(previous)} on line ${previousLine}; with \`layout: levels\` the rows are instants in time order`,
    "write the rows in time order (sort the file by its time column, keeping rows with equal times in their order)",
  );
}

/** `layout: levels`: a level cell that is not a number. */
export function levelNotANumber(file: string, line: number, column: string, text: string): UserError {
  return located(
    { file, line },
    `the cell \`${text}\` of level column \`${column}\` is not a finite decimal number: with \`layout: levels\` each cell is the level's new value from this row's time on`,
    "write the value as a decimal number such as 3 or 0.5, or leave the cell empty when the level does not change",
  );
}

/** `layout: entities`: the sort's chunk files could not be written or read in the temporary folder. */
export function sortFilesFailed(file: string, folder: string, code: string | undefined, limit: number): UserError {
  return located(
    { file },
    `this entity table has more than ${limit} events, so Sojourn sorts them in chunk files under the temporary folder ${folder}, and that failed: ${code === "ENOSPC" ? "the disk is full" : systemReason(code)}`,
    "point TMPDIR at a folder with free space that you may write to, or raise the number of events sorted in memory with the environment variable SOJOURN_SORT_EVENTS",
  );
}

/** The role of a Parquet column in words: "the time", or "an attribute" for a column of no role. */
function roleOf(role: string): string {
  return role === "" ? "" : ` (the ${role})`;
}

/** A `.parquet` file without the `PAR1` marks a Parquet file starts and ends with. */
export function notParquet(file: string, bytes: number): UserError {
  const what =
    bytes === 0
      ? "the run file is empty (0 bytes): a Parquet file holds at least its schema"
      : "this file is named .parquet but is not a Parquet file: it does not start with the 4 bytes `PAR1` that every Parquet file starts with";
  return located(
    { file },
    what,
    "write the run with a Parquet writer, or name the file after its real format (.csv, .jsonl); leave an empty file out of the scenario's `runs:`",
  );
}

/** A Parquet file that starts right but whose footer is missing or unreadable. */
export function truncatedParquet(file: string, bytes: number, detail: string): UserError {
  return located(
    { file },
    `this Parquet file is cut short or damaged: it starts like a Parquet file but its footer (the schema and the list of row groups, at the end) cannot be read (${detail}; the file has ${byteCount(bytes)})`,
    "write or copy the file again: a model stopped while writing leaves a Parquet file without its footer",
  );
}

/** The pages of a row group cannot be decoded. */
export function damagedParquet(file: string, group: number, firstRow: number, lastRow: number, detail: string): UserError {
  return located(
    { file, line: firstRow },
    `the data of row group ${group} (rows ${firstRow} to ${lastRow}) of this Parquet file cannot be decoded: ${detail}`,
    "write or copy the file again; if it was written with an unusual encoding, write it again with plain or dictionary pages",
  );
}

/** A column chunk compressed with a codec the reader has no decompressor for. */
export function unsupportedParquetCodec(file: string, column: string, codec: string, supported: readonly string[]): UserError {
  return located(
    { file },
    `column \`${column}\` of this Parquet file is compressed with ${codec}, which Sojourn cannot decompress (it reads ${supported.join(", ")})`,
    "write the file again with one of those compressions (snappy, gzip and zstd are the usual choices)",
  );
}

/** A Parquet file without the time or series column (after column renaming). */
export function parquetMissingColumns(
  file: string,
  missing: readonly { role: string; name: string }[],
  found: readonly string[],
): UserError {
  const { which, map } = missingWords(missing);
  return located(
    { file },
    `this Parquet file has no column ${which.join(" and no column ")}; its columns are ${quoted(found)}`,
    `name the column so when writing the file, or map the file's own column in the manifest with \`${map}\``,
  );
}

/** A Parquet file without the entity column an entity-based measure needs. */
export function parquetMissingEntity(file: string, column: string, found: readonly string[], series: readonly string[]): UserError {
  return located(
    { file },
    `this Parquet file has no column \`${column}\` (the entity), which the entity-based measures on series ${quoted(series)} need; its columns are ${quoted(found)}`,
    `write the entity column into the file, or map the file's own column with \`${columnsKey("entity")}\``,
  );
}

/** A text cell in a Parquet column that is read as numbers (time or value). */
export function parquetTextNotNumber(file: string, row: number, column: string, role: string, text: string): UserError {
  return located(
    { file, line: row },
    `row ${row}, column \`${column}\`${roleOf(role)}: the cell holds the text \`${text}\`, but the ${role} must be a number`,
    `write the ${role} column as numbers (a double, float or integer column), not as texts`,
  );
}

/** A Parquet cell of a type a role cannot use (a boolean time, a date as value, a list as series...). */
export function parquetUnusableType(file: string, row: number, column: string, role: string, type: string, expected: string): UserError {
  return located(
    { file, line: row },
    `row ${row}, column \`${column}\`${roleOf(role)}: the column's Parquet type is ${type}, which Sojourn cannot use there; it reads ${expected}`,
    `write the column as ${expected}, or map another column with \`${columnsKey(role)}\``,
  );
}

/** A Parquet column the study reads that holds a list, a struct, a map or repeated values instead of one value per row. */
export function parquetNestedColumn(file: string, column: string, type: string): UserError {
  return located(
    { file },
    `column \`${column}\` is ${type}: it holds more than one value per row (a list, a struct, a map or a repeated field), and Sojourn reads only columns with one number or text per row`,
    `write \`${column}\` as a flat column (one value per row, for example each field of a struct as a column of its own), or read another column in its place in the manifest (\`columns\` or \`where\`)`,
  );
}

/** A NaN or infinite double in a Parquet time or value column. */
export function parquetNotFinite(file: string, row: number, column: string, role: "time" | "value", x: number): UserError {
  return located(
    { file, line: row },
    `row ${row}, column \`${column}\`${roleOf(role)}: the ${role} is ${String(x)}, not a finite number`,
    role === "time" ? "give every row the finite simulation time it happened at" : "write a finite value, or leave the cell null (an empty value)",
  );
}

/** A null time in a Parquet file. */
export function parquetNullTime(file: string, row: number, column: string): UserError {
  return located(
    { file, line: row },
    `row ${row}, column \`${column}\` (the time): the time is null`,
    "give every row the simulation time it happened at",
  );
}

/** A null or empty series name in a Parquet file. */
export function parquetEmptySeries(file: string, row: number, column: string): UserError {
  return located(
    { file, line: row },
    `row ${row}, column \`${column}\` (the series): the series is null or empty`,
    "name the series (data stream) every row belongs to",
  );
}

/** Within one series, time went down in row order (a Parquet file: rows, not lines). */
export function parquetTimeDecreased(file: string, row: number, column: string, series: string, previous: number, time: number, previousRow: number): UserError {
  return located(
    { file, line: row },
    `row ${row}, column \`${column}\` (the time): time goes backwards in series \`${series}\`: ${shown(time)} here, after ${shown(previous)} on row ${previousRow}`,
    "write the rows of each series in time order (sort the rows by time, keeping rows with equal times in their order)",
  );
}
