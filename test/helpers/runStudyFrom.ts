import { join } from "node:path";
import { loadStudy } from "../../src/manifest/loadStudy.js";
import { runStudy } from "../../src/study/runStudy.js";
import { tempFolder } from "./tempStudy.js";

/**
 * Writes files and a manifest (YAML text) into a temp folder and runs the study; `tableFiles` are
 * the calculation tables as the study handed them out to be written (index entry and CSV text).
 */
export async function studyOf(manifest: string, files: Record<string, string | Buffer>) {
  const dir = tempFolder({ ...files, "study.yaml": manifest });
  const study = await loadStudy(join(dir, "study.yaml"));
  const written = new Map<string, string>();
  const run = await runStudy(study, { writeTable: (file, csv) => written.set(file, csv) });
  const tableFiles = run.outcome.tables.map((record) => ({ record, csv: written.get(record.file)! }));
  return { dir, study, ...run, tableFiles, manifestPath: join(dir, "study.yaml") };
}

/** The measure figures of run `i` of scenario `s`. */
export function figures(results: { scenarios: { runs: { measures: Record<string, unknown> }[] }[] }, measure: string, s = 0, i = 0) {
  return results.scenarios[s].runs[i].measures[measure] as Record<string, unknown>;
}
