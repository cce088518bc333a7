import type { LevelFigures } from "./levelStats.js";
import type { BuiltTable } from "./table.js";

export const TIME_AT_LEAST_COLUMNS = ["threshold", "intervals_at_or_above", "time", "duration", "share"];
export const TIME_AT_VALUE_COLUMNS = ["value", "time", "duration", "share"];

/**
 * The tables behind a level's shares (issue 8): for each threshold k the intervals of positive
 * duration with level ≥ k, their total time and its share of T (the level table lists those
 * intervals themselves); and, when the level takes at most 100 distinct values, the time at each
 * value. The shares at each value add up to 1 (up to rounding).
 */
export function levelShareTables(f: LevelFigures, T: number): { suffix: string; table: BuiltTable }[] {
  const out: { suffix: string; table: BuiltTable }[] = [];
  if (f.atLeastDetail.length > 0) {
    const rows = f.atLeastDetail.map((a) => [a.threshold, a.intervals, a.time, T, a.time / T]);
    out.push({ suffix: "time_at_least", table: { columns: TIME_AT_LEAST_COLUMNS, rows, rowsTotal: rows.length, shortened: false } });
  }
  if (f.timeAtValue !== null) {
    const rows = f.timeAtValue.map((v) => [v.value, v.time, T, v.share]);
    out.push({ suffix: "time_at_value", table: { columns: TIME_AT_VALUE_COLUMNS, rows, rowsTotal: rows.length, shortened: false } });
  }
  return out;
}
