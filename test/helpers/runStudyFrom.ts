import { join } from "node:path";
import { loadStudy } from "../../src/manifest/loadStudy.js";
import { runStudy } from "../../src/study/runStudy.js";
import { tempFolder } from "./tempStudy.js";

/** Writes files and a manifest (YAML text) into a temp folder and runs the study. */
export async function studyOf(manifest: string, files: Record<string, string | Buffer>) {
  const dir = tempFolder({ ...files, "study.yaml": manifest });
  const study = await loadStudy(join(dir, "study.yaml"));
  const run = await runStudy(study);
  return { dir, study, ...run, manifestPath: join(dir, "study.yaml") };
}

/** The measure figures of run `i` of scenario `s`. */
export function figures(results: { scenarios: { runs: { measures: Record<string, unknown> }[] }[] }, measure: string, s = 0, i = 0) {
  return results.scenarios[s].runs[i].measures[measure] as Record<string, unknown>;
}
