/**
 * The summary table: per measure and scenario the mean of the run values, its interval, the
 * relative precision and what the row rests on.
 */
import { runsEndEarlyOnRow, runWarningsOnRow, runsWithoutValue } from "../../messages/warnings.js";
import type { Summary } from "../../outcome/index.js";
import { LATE_FRACTION } from "../../study/runChecks.js";
import { formatPercent } from "../number.js";
import type { ReportContext } from "./anchors.js";
import type { SummaryRow } from "./view.js";
import { fmt, intervalText, link, relative } from "./words.js";

/** The summary section: its introduction and one row per measure and scenario. */
export function summaryView(ctx: ReportContext): { intro: string; rows: SummaryRow[] } {
  const { study, outcome, results, measureIds, ivId } = ctx;
  const summaryRows: SummaryRow[] = [];
  study.measureNames.forEach((name, mi) => {
    results.scenarios.forEach((sr, si) => {
      const s: Summary | undefined = sr.summary[name];
      const href = ivId(sr.name, name, "value");
      const iv = outcome.intervals.find((a) => a.scenario === sr.name && a.measure === name && a.figure === "value");
      summaryRows.push({
        measure: name,
        measureHref: `#${measureIds[mi]}`,
        measureRows: si === 0 ? results.scenarios.length : 0,
        scenario: sr.name,
        mean: link(fmt(s?.mean ?? null), href),
        halfWidth: link(fmt(s?.half_width ?? null), href),
        interval: link(intervalText(s?.ci_low ?? null, s?.ci_high ?? null), href),
        runs: String(s?.n ?? 0),
        relative: link(relative({ mean: s?.mean ?? null, half_width: s?.half_width ?? null }), href),
        note: s && s.half_width === null ? (iv?.note ?? "No interval: fewer than two run values.") : null,
        warnings: summaryWarnings(s, sr.runs.length, outcome.warnings.filter((w) => w.scenario === sr.name && w.run !== null && (w.measure === name || w.measure === null)).length),
      });
    });
  });
  return {
    intro: `Mean of the run values of each measure by scenario, with its ${formatPercent(study.confidence)} confidence interval (Student t, one value per run). ` +
      "Relative precision is half-width / |mean|. Every number links to its step-by-step derivation in the appendix.",
    rows: summaryRows,
  };
}

/**
 * The warnings shown on a summary row: from the summary's lists of runs (src/study/summaries.ts),
 * and how many warnings the runs behind the row have (about this measure or the whole run).
 */
function summaryWarnings(s: Summary | undefined, runs: number, runWarnings: number): string[] {
  const out: string[] = [];
  const list = (v: string[] | undefined) => (v !== undefined && v.length > 0 ? v : null);
  const without = list(s?.runs_without_value);
  if (s && without !== null) out.push(runsWithoutValue(without, s.n, runs));
  const early = list(s?.runs_ending_early);
  if (early !== null) out.push(runsEndEarlyOnRow(early, LATE_FRACTION));
  if (runWarnings > 0) out.push(runWarningsOnRow(runWarnings));
  return out;
}
