/**
 * The comparisons section: the difference of scenario means per measure with its interval, and
 * the study's reading of each interval (src/study/readings.ts) in words.
 */
import type { Comparison, ComparisonReading } from "../../outcome/index.js";
import { formatPercent } from "../number.js";
import type { ReportContext } from "./anchors.js";
import { tableView, type TableView } from "./view.js";
import { fmt, intervalText, q, text } from "./words.js";

/** The comparisons section, or null when the study compares no scenarios. */
export function comparisonsView(ctx: ReportContext): { intro: string; table: TableView } | null {
  const { study, results, outcome } = ctx;
  const comps = results.comparisons ?? [];
  return comps.length === 0 ? null : {
    intro: `Each row is the difference a − b of the scenario means of one measure with its confidence interval. ` +
      (comps.length > 1
        ? `There are ${comps.length} comparisons; each interval is at the confidence shown (Bonferroni), so that all of them hold together at ${formatPercent(study.confidence)} or more.`
        : "") + " An interval that excludes 0 says the scenarios differ in that measure at the stated confidence.",
    table: tableView(
      "Scenario comparisons",
      ["Measure", "a", "b", "Method", "Mean of a − b", "Standard error", "t", "Degrees of freedom", "Half-width", "Interval", "Confidence of each", "Reading"],
      comps.map((c, i) => [
        text(ctx.labelOf(c.measure)), text(c.a), text(c.b),
        text(c.method === "welch" ? "unequal variances (Welch)" : "paired runs"),
        text(fmt(c.diff_mean)), text(fmt(c.standard_error)), text(fmt(c.t)), text(fmt(c.df)),
        text(fmt(c.half_width)), text(intervalText(c.ci_low, c.ci_high)),
        text(formatPercent(c.confidence_each)), text(readingWords(c, outcome.readings.comparisons[i])),
      ]),
    ),
  };
}

/** The study's reading of a comparison's interval, in words. */
function readingWords(c: Comparison, reading: ComparisonReading): string {
  const a = q(c.a);
  const b = q(c.b);
  switch (reading) {
    case "no-interval":
      return "no interval (too few runs)";
    case "higher":
      return `${a} is higher than ${b} (interval above 0)`;
    case "lower":
      return `${a} is lower than ${b} (interval below 0)`;
    case "no-difference":
      return "no difference shown (interval contains 0)";
  }
}
