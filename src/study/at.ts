import * as msg from "../messages/study.js";
import type { Study } from "../manifest/types.js";
import type { Cell } from "../measures/table.js";
import type { LevelRunStats, UtilizationRunStats } from "../outcome/index.js";
import { analyzeRun } from "./analyzeRun.js";
import { locate } from "./locate.js";
import { resolveWarmup } from "./warmup.js";

export interface AtResult {
  time: number;
  area: number;
  duration: number;
  mean: number;
}

export interface AtExplained {
  result: AtResult;
  /** The arithmetic in words, line by line. */
  lines: string[];
}

/**
 * The time average of a level (or the utilization) of one run over [c, t]: the run's window is
 * cut at t, so the interval that contains t contributes only its part up to t (prorated), exactly
 * as the warm-up cuts the interval that straddles c.
 */
export async function timeAverageAt(study: Study, names: { scenario: string; run: string; measure: string }, t: number): Promise<AtExplained> {
  const { scenario, run, measure } = locate(study, names.scenario, names.run, names.measure);
  if (measure.kind !== "level" && measure.kind !== "utilization") throw msg.atWrongKind(measure.name, measure.kind);
  const warmup = await resolveWarmup(study, scenario);
  const c = warmup.time !== null && warmup.time > run.start ? warmup.time : run.start;
  if (!(t > c) || (run.end !== null && t > run.end)) throw msg.atTimeOutside(t, c, run.end);
  const a = await analyzeRun({
    scenario,
    run: { ...run, end: t },
    warmup: warmup.time,
    measures: [measure],
    tables: { maxRows: 12, edgeRows: 5 },
    trace: false,
    batches: null,
    slice: null,
  });
  const out = a.outputs.get(measure.name)!;
  // A time average at t is asked of a level or utilization measure only (checked by the caller).
  const stats = out.stats as LevelRunStats | UtilizationRunStats;
  const duration = t - c;
  const table = out.tables[0].table;
  const lines: string[] = [];
  lines.push(`Scenario "${scenario.name}", run "${run.id}", measure "${measure.name}" (${measure.kind}), time unit ${study.timeUnit}.`);
  lines.push(`Window: from c = ${c}${warmup.time !== null && warmup.time > run.start ? " (after the warm-up)" : ""} to t = ${t}; duration t - c = ${t} - ${c} = ${duration}.`);
  lines.push(`Intervals (${table.rowsTotal} in all${table.shortened ? "; the middle ones are left out here, `sojourn table` lists them all" : ""}):`);
  const col = (name: string) => table.columns.indexOf(name);
  const fmt = (x: Cell) => (x === null ? "-" : String(x));
  let last = 0;
  for (const r of table.rows) {
    const idx = r[0] as number;
    if (idx > last + 1) lines.push("  ...");
    last = idx;
    lines.push(`  #${idx}: value ${fmt(r[col("value")])} on [${fmt(r[col("from")])}, ${fmt(r[col("to")])}]: duration ${fmt(r[col("duration")])}, area ${fmt(r[col("area")])}, running area ${fmt(r[col("running_area")])}`);
  }
  const lastRow = table.rows[table.rows.length - 1];
  lines.push(`The last interval is cut at t = ${t}: only its part from ${fmt(lastRow[col("from")])} to ${t} counts (prorated).`);
  let mean: number;
  if (measure.kind === "level") {
    mean = stats.area / duration;
    lines.push(`Time average = area / duration = ${stats.area} / ${duration} = ${mean}`);
  } else {
    mean = stats.value;
    lines.push(`Utilization = busy area / capacity area = ${stats.area} / ${(stats as UtilizationRunStats).capacity_area} = ${mean}`);
  }
  return { result: { time: t, area: stats.area, duration, mean }, lines };
}
