/**
 * The warnings section: the study's warnings and every failed consistency check, once each.
 */
import type { StudyOutcome } from "../../study/outcome.js";
import { key } from "./anchors.js";
import { checksOf } from "./appendix.js";
import type { WarningLine } from "./view.js";
import { roundNumbersIn } from "./words.js";

/** The warning lines: where (scenario › run › measure, or "study") and the message as shown. */
export function warningLines(outcome: StudyOutcome): WarningLine[] {
  const results = outcome.results;
  const warningsIn = [...outcome.warnings];
  const seen = new Set(warningsIn.map((w) => key(w.scenario, w.run, w.measure, w.message)));
  for (const sr of results.scenarios) for (const c of checksOf(sr)) {
    if (c.passed) continue;
    const k = key(sr.name, c.run, c.measure, c.message);
    if (seen.has(k)) continue;
    seen.add(k);
    warningsIn.push({ scenario: sr.name, run: c.run, measure: c.measure, message: c.message });
  }
  const warnings: WarningLine[] = warningsIn.map((w) => ({
    where: [w.scenario, w.run, w.measure].filter((x): x is string => x !== null).join(" › ") || "study",
    message: roundNumbersIn(w.message),
  }));
  return warnings;
}
