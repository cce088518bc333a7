/**
 * The comparisons section: the difference of scenario means per measure with its interval.
 */
import { formatPercent } from "../number.js";
import type { ReportContext } from "./anchors.js";
import { tableView, type TableView } from "./view.js";
import { fmt, intervalText, q, text } from "./words.js";

/** The comparisons section, or null when the study compares no scenarios. */
export function comparisonsView(ctx: ReportContext): { intro: string; table: TableView } | null {
  const { study, results } = ctx;
  // Comparisons.
  const comps = Array.isArray(results.comparisons) ? (results.comparisons as Record<string, unknown>[]) : [];
  const num = (v: unknown) => (typeof v === "number" ? v : null);
  return comps.length === 0 ? null : {
    intro: `Each row is the difference a − b of the scenario means of one measure with its confidence interval. ` +
      (comps.length > 1
        ? `There are ${comps.length} comparisons; each interval is at the confidence shown (Bonferroni), so that all of them hold together at ${formatPercent(study.confidence)} or more.`
        : "") + " An interval that excludes 0 says the scenarios differ in that measure at the stated confidence.",
    table: tableView(
      "Scenario comparisons",
      ["Measure", "a", "b", "Method", "Mean of a − b", "Standard error", "t", "Degrees of freedom", "Half-width", "Interval", "Confidence of each", "Reading"],
      comps.map((c) => [
        text(String(c.measure)), text(String(c.a)), text(String(c.b)),
        text(c.method === "welch" ? "unequal variances (Welch)" : c.method === "paired" ? "paired runs" : String(c.method)),
        text(fmt(num(c.diff_mean))), text(fmt(num(c.standard_error))), text(fmt(num(c.t))), text(fmt(num(c.df))),
        text(fmt(num(c.half_width))), text(intervalText(num(c.ci_low), num(c.ci_high))),
        text(formatPercent(num(c.confidence_each))), text(verdict(c)),
      ]),
    ),
  };
}

/** The comparison's reading in words, from its interval. */
function verdict(c: Record<string, unknown>): string {
  const lo = typeof c.ci_low === "number" ? c.ci_low : null;
  const hi = typeof c.ci_high === "number" ? c.ci_high : null;
  const a = q(String(c.a));
  const b = q(String(c.b));
  if (lo === null || hi === null) return "no interval (too few runs)";
  if (lo > 0) return `${a} is higher than ${b} (interval above 0)`;
  if (hi < 0) return `${a} is lower than ${b} (interval below 0)`;
  return "no difference shown (interval contains 0)";
}
