/**
 * Run file names: the format a file is read in, and the run id it gives.
 *
 * The format is chosen by extension (contract sections 1 and 9); the run id is the file name without
 * those extensions (`rep-07.csv.gz` -> `rep-07`).
 */

export interface RunFormat {
  format: "csv" | "jsonl" | "parquet";
  /** gzip around the whole file (a Parquet file compresses its pages itself: always false). */
  gzip: boolean;
}

const EXTENSIONS: { suffix: string; format: RunFormat }[] = [
  { suffix: ".csv.gz", format: { format: "csv", gzip: true } },
  { suffix: ".jsonl.gz", format: { format: "jsonl", gzip: true } },
  { suffix: ".ndjson.gz", format: { format: "jsonl", gzip: true } },
  { suffix: ".parquet", format: { format: "parquet", gzip: false } },
  { suffix: ".csv", format: { format: "csv", gzip: false } },
  { suffix: ".jsonl", format: { format: "jsonl", gzip: false } },
  { suffix: ".ndjson", format: { format: "jsonl", gzip: false } },
];

/** The extensions Sojourn reads, for messages. */
export const RUN_EXTENSIONS = EXTENSIONS.map((e) => e.suffix);

function baseName(path: string): string {
  const slash = Math.max(path.lastIndexOf("/"), path.lastIndexOf("\\"));
  return path.slice(slash + 1);
}

/** The format of a run file by its extension (case-insensitive), or null when unsupported. */
export function runFormat(path: string): RunFormat | null {
  const name = baseName(path).toLowerCase();
  for (const e of EXTENSIONS) if (name.endsWith(e.suffix) && name.length > e.suffix.length) return e.format;
  return null;
}

/** The run id: the file name without its run-file extensions (`rep-07.csv.gz` -> `rep-07`). */
export function runIdOf(path: string): string {
  const name = baseName(path);
  const lower = name.toLowerCase();
  for (const e of EXTENSIONS) {
    if (lower.endsWith(e.suffix) && name.length > e.suffix.length) return name.slice(0, -e.suffix.length);
  }
  return name;
}

/** What `stat` says a path is (the methods of `fs.Stats`). */
export interface FileType {
  isFile(): boolean;
  isDirectory(): boolean;
  isFIFO(): boolean;
  isSocket(): boolean;
  isCharacterDevice(): boolean;
  isBlockDevice(): boolean;
}

/**
 * What a path that is not a regular file is, in words ("a named pipe (FIFO)", ...), or null for a
 * regular file. Run files are read to their end and hashed, so only regular files qualify: a pipe
 * or a device has no end to read to (`/dev/zero` never stops), and no fixed bytes to record.
 */
export function notFileKind(type: FileType): string | null {
  if (type.isFile()) return null;
  if (type.isDirectory()) return "a folder";
  if (type.isFIFO()) return "a named pipe (FIFO)";
  if (type.isSocket()) return "a socket";
  if (type.isCharacterDevice()) return "a character device";
  if (type.isBlockDevice()) return "a block device";
  return "not a regular file";
}
