/**
 * The warnings section: the study's warnings (a failed consistency check among them, added by the
 * study), each with where it applies.
 */
import type { StudyOutcome } from "../../outcome/index.js";
import type { WarningLine } from "./view.js";
import { roundNumbersIn } from "./words.js";

/**
 * The warning lines, each with its anchor (`ids`, parallel to the warnings): where (scenario › run
 * › measure, the measure by its label, or "study") and the message as shown.
 */
export function warningLines(outcome: StudyOutcome, ids: string[], labelOf: (measure: string) => string): WarningLine[] {
  return outcome.warnings.map((w, i) => ({
    id: ids[i],
    where: [w.scenario, w.run, w.measure === null ? null : labelOf(w.measure)].filter((x): x is string => x !== null).join(" › ") || "study",
    message: roundNumbersIn(w.message),
  }));
}
