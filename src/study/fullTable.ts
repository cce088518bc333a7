import type { Study } from "../manifest/types.js";
import { tableToCsv } from "../measures/table.js";
import { analyzeRun } from "./analyzeRun.js";
import { locate } from "./locate.js";
import { resolveWarmup } from "./warmup.js";

/**
 * The full calculation table(s) of one run and measure, however long: the report folder keeps
 * long tables shortened (head, checkpoints, tail); this regenerates every row on demand.
 * Returns the CSV text of the main table and of any extra tables (quantiles, within).
 */
export async function fullTable(study: Study, names: { scenario: string; run: string; measure: string }): Promise<{ suffix: string; csv: string }[]> {
  const { scenario, run, measure } = locate(study, names.scenario, names.run, names.measure);
  const warmup = await resolveWarmup(study, scenario);
  const a = await analyzeRun({
    scenario,
    run,
    warmup: warmup.time,
    measures: [measure],
    tables: { maxRows: Number.MAX_SAFE_INTEGER, edgeRows: 0 },
    trace: false,
    batches: null,
    slice: null,
  });
  return a.outputs.get(measure.name)!.tables.map((t) => ({ suffix: t.suffix, csv: tableToCsv(t.table) }));
}
