/**
 * The comparisons section: the difference of scenario means per measure with its interval, and
 * the study's reading of each interval (src/study/readings.ts) in words. Each row's numbers link
 * to the comparison's arithmetic in the appendix (`comparisonSteps.ts`).
 */
import type { Comparison, ComparisonReading } from "../../outcome/index.js";
import { formatPercent } from "../number.js";
import type { ReportContext } from "./anchors.js";
import { tableView, type TableView } from "./view.js";
import { fmt, intervalText, link, q, text } from "./words.js";

/** The method of a comparison in words. */
export function methodWords(method: Comparison["method"]): string {
  return method === "welch" ? "unequal variances (Welch)" : "paired runs";
}

/** The comparisons section, or null when the study compares no scenarios. */
export function comparisonsView(ctx: ReportContext): { intro: string; table: TableView; notes: string[] } | null {
  const { study, results, outcome, comparisonIds, comparisonRowIds } = ctx;
  const comps = results.comparisons ?? [];
  if (comps.length === 0) return null;
  const table = tableView(
    "Scenario comparisons",
    ["Measure", "a", "b", "Method", "Mean of a − b", "Standard error", "t", "Degrees of freedom", "Half-width", "Interval", "Confidence of each", "Reading"],
    comps.map((c, i) => {
      const href = comparisonIds[i];
      const num = (t: string) => link(t, href);
      return [
        text(ctx.labelOf(c.measure)), text(c.a), text(c.b),
        text(methodWords(c.method)),
        num(fmt(c.diff_mean)), num(fmt(c.standard_error)), num(fmt(c.t)), num(fmt(c.df)),
        num(fmt(c.half_width)), num(intervalText(c.ci_low, c.ci_high)),
        num(formatPercent(c.confidence_each)), text(readingWords(c, outcome.readings.comparisons[i], href !== null)),
      ];
    }),
  );
  return {
    intro: [
      "Each row is the difference a − b of the scenario means of one measure with its confidence interval.",
      ...(comps.length > 1
        ? [`There are ${comps.length} comparisons; each interval is at the confidence shown (Bonferroni), so that all of them hold together at ${formatPercent(study.confidence)} or more.`]
        : []),
      "An interval that excludes 0 says the scenarios differ in that measure at the stated confidence.",
      "The numbers of a row link to its arithmetic, step by step, in the appendix.",
    ].join(" "),
    table: { ...table, rowIds: comparisonRowIds },
    notes: comps.flatMap((c, i) => comparisonNote(c, comparisonIds[i] !== null)),
  };
}

/** What a comparison was made on and what it assumes (when results.json says), or why it has no arithmetic. */
function comparisonNote(c: Comparison, hasSteps: boolean): string[] {
  const which = `${c.measure}, ${q(c.a)} − ${q(c.b)}`;
  const parts: string[] = [];
  if (c.values !== undefined) parts.push(`compared on ${c.values}.`);
  if (c.assumes !== undefined) parts.push(`It assumes: ${c.assumes}`);
  if (c.lag1_a !== undefined || c.lag1_b !== undefined) {
    parts.push(`Lag-1 autocorrelation of the batch means: ${fmt(c.lag1_a ?? null)} (${q(c.a)}), ${fmt(c.lag1_b ?? null)} (${q(c.b)}).`);
  }
  if (!hasSteps) parts.push(`No arithmetic to show: ${c.verdict}.`);
  return parts.length === 0 ? [] : [`${which}: ${parts.join(" ")}`];
}

/** The study's reading of a comparison's interval, in words. */
function readingWords(c: Comparison, reading: ComparisonReading, hasSteps: boolean): string {
  const a = q(c.a);
  const b = q(c.b);
  switch (reading) {
    case "no-interval":
      return hasSteps ? "no interval (too few runs)" : "no interval (the reason is under the table)";
    case "higher":
      return `${a} is higher than ${b} (interval above 0)`;
    case "lower":
      return `${a} is lower than ${b} (interval below 0)`;
    case "no-difference":
      return "no difference shown (interval contains 0)";
  }
}
