/**
 * The collection window of one run (contract section 3).
 *
 * `start` is where the run's window opens, `collectFrom` (c = max(start, warm-up)) where
 * statistics begin, and `end` where they stop. A row exactly at c or at end is inside.
 */
export interface RunWindow {
  start: number;
  /** c = max(start, warm-up). */
  collectFrom: number;
  /** null when the manifest gives no end (only observation and count measures work then). */
  end: number | null;
  /** The warm-up time when one applies (> start), else null. */
  warmup: number | null;
}

export function makeWindow(start: number, end: number | null, warmup: number | null): RunWindow {
  const collectFrom = warmup !== null && warmup > start ? warmup : start;
  return { start, collectFrom, end, warmup: warmup !== null && warmup > start ? warmup : null };
}

/** T = end - c, the duration statistics are taken over; null without an end. */
export function windowDuration(w: RunWindow): number | null {
  return w.end === null ? null : w.end - w.collectFrom;
}
