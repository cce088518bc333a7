/**
 * What one Slurm task asks for, from the size of its run file (docs/distributed.md, "Sizing the
 * tasks"). The rule is a planning rule, not a measurement, and is written where users read it:
 *
 *   effective size  E = file bytes × expansion (CSV and JSON Lines 1; gzip 6; Parquet 4)
 *   memory          256 MB + 1 MB per MB of E          (rows carry ≥ 8 bytes; a kept observation 8)
 *   time            10 min + 1 min per 1,000 MB of E    (read at ≥ 20 MB/s, a third of the
 *                                                        measured CSV speed of docs/performance.md)
 *
 * One job array has one request for all its tasks: the array asks for what its largest run file
 * needs. `--mem-per-task` and `--time-per-task` replace the rule.
 */

/** How many bytes of text one byte of the file stands for (common practice: typical ratios). */
export function expansion(file: string): number {
  if (/\.gz$/i.test(file)) return 6;
  if (/\.parquet$/i.test(file)) return 4;
  return 1;
}

const MB = 1024 * 1024;

export interface TaskRequest {
  /** Memory in MB (`sbatch --mem`). */
  memoryMb: number;
  /** Time limit in minutes (`sbatch --time`). */
  minutes: number;
}

/** The request of a task that reads one run file of `bytes` bytes named `file`. */
export function taskRequest(bytes: number, file: string): TaskRequest {
  const e = (bytes * expansion(file)) / MB;
  return { memoryMb: 256 + Math.ceil(e), minutes: 10 + Math.ceil(e / 1000) };
}

/** The request of an array of tasks: what its largest task needs. */
export function arrayRequest(files: { bytes: number; file: string }[]): TaskRequest {
  let out: TaskRequest = { memoryMb: 256, minutes: 10 };
  for (const f of files) {
    const r = taskRequest(f.bytes, f.file);
    out = { memoryMb: Math.max(out.memoryMb, r.memoryMb), minutes: Math.max(out.minutes, r.minutes) };
  }
  return out;
}

/**
 * The report job's request: it reads every summary (small beside its run file: at most the
 * table rows and 8 bytes per observation), so 1 GB plus the tasks' largest request, 30 minutes.
 */
export function reportRequest(task: TaskRequest): TaskRequest {
  return { memoryMb: 1024 + task.memoryMb, minutes: 30 };
}

/** Array indices as Slurm's `--array` list: runs of consecutive indices as ranges (`0-3,7,9-10`). */
export function arrayList(indices: readonly number[]): string {
  const sorted = [...indices].sort((a, b) => a - b);
  const parts: string[] = [];
  for (let i = 0; i < sorted.length; ) {
    let j = i;
    while (j + 1 < sorted.length && sorted[j + 1] === sorted[j] + 1) j++;
    parts.push(i === j ? String(sorted[i]) : `${sorted[i]}-${sorted[j]}`);
    i = j + 1;
  }
  return parts.join(",");
}
