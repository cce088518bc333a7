import * as msg from "../messages/study.js";
import type { Measure, RunRef, Scenario, Study } from "../manifest/types.js";

/** Finds a scenario, a run and a measure by name, or says which names exist. */
export function locate(study: Study, scenario: string, run: string, measure: string): { scenario: Scenario; run: RunRef; measure: Measure } {
  const sc = study.scenarios.find((s) => s.name === scenario);
  if (sc === undefined) throw msg.unknownName("scenario", scenario, study.scenarios.map((s) => s.name));
  const r = sc.runs.find((x) => x.id === run);
  if (r === undefined) throw msg.unknownName(`run in scenario "${scenario}"`, run, sc.runs.map((x) => x.id));
  const m = sc.measures.find((x) => x.name === measure);
  if (m === undefined) throw msg.unknownName("measure", measure, sc.measures.map((x) => x.name));
  return { scenario: sc, run: r, measure: m };
}
