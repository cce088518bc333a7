/**
 * The report's opening sentences ("In brief"): what was compared, which differences between
 * scenarios are significant at the stated level, which figures miss their precision targets or
 * have no interval, and how many warnings there are. The facts are the study's
 * (`StudyOutcome.readings.brief`, src/study/readings.ts); this file only words them.
 */
import type { Comparison, SummaryReading } from "../../outcome/index.js";
import { formatPercent } from "../number.js";
import type { ReportContext } from "./anchors.js";
import type { BriefSentence } from "./view.js";
import { selectionIds, selectionSentence } from "./selections.js";
import { fmt, intervalText, q } from "./words.js";

/** Items named in one sentence before "and N more". */
const NAMED = 5;

/** The opening sentences, in reading order. */
export function briefSentences(ctx: ReportContext): BriefSentence[] {
  const { outcome, results, study, labelOf, unitOf, runsNeededId } = ctx;
  const b = outcome.readings.brief;
  const rows = outcome.readings.summaries;
  const out: BriefSentence[] = [];
  const say = (text: string, href: string | null = null, linkText = "") => out.push({ text, href, linkText: href === null ? null : linkText });
  const toComparisons = (text: string) => say(text, "#comparisons", "(comparisons)");

  // What was compared.
  const total = b.runs.reduce((a, n) => a + n, 0);
  const measures = `${count(b.measures.length, "measure")} (${names(b.measures.map(labelOf), 10)})`;
  const runs = b.runs.every((n) => n === 1) && b.runs.length > 1 ? "one run each" : `${count(total, "run")}${b.runs.length > 1 ? ` (${b.runs.join(" + ")})` : ""}`;
  say(b.scenarios.length > 1
    ? `This study compares ${count(b.scenarios.length, "scenario")}, ${names(b.scenarios.map(q))}, in ${measures}, from ${runs}.`
    : `This study reports ${measures} of scenario ${q(b.scenarios[0] ?? "")}, from ${runs}.`);
  if (b.fromBatchMeans.length > 0) {
    say(b.fromBatchMeans.length === rows.length
      ? "Every interval comes from the batch means of a single long run."
      : `${fmt(b.fromBatchMeans.length)} of the ${fmt(rows.length)} figures take their interval from the batch means of a single long run (the rows' notes say which).`);
  }

  // Which differences are significant, at the level the study states.
  const comps = results.comparisons ?? [];
  if (comps.length > 0) {
    const each = comps[0].confidence_each;
    const level = comps.length === 1
      ? `At ${formatPercent(study.confidence)} confidence`
      : `At ${formatPercent(study.confidence)} confidence for ${comps.length === 2 ? "both" : `all ${comps.length}`} comparisons together (${formatPercent(each)} each, Bonferroni)`;
    const one = comps.length === 1;
    if (b.significant.length === 0) {
      toComparisons(b.noInterval.length === comps.length
        ? `${one ? "The comparison has" : "No comparison has"} an interval, so no difference between scenarios can be judged.`
        : `${level}, ${one ? "the difference between the scenarios is not significant: its interval contains 0" : "no difference between scenarios is significant: every interval contains 0"}` +
          `${b.noInterval.length > 0 ? " or is missing" : ""}.`);
    } else {
      const words = (i: number) => significantWords(comps[i], outcome.readings.comparisons[i] === "higher", labelOf(comps[i].measure), unitOf(comps[i].measure));
      if (one) toComparisons(`${level}, the difference is significant: ${words(b.significant[0])}`);
      else {
        const all = b.significant.length === comps.length;
        const which = all ? (comps.length === 2 ? "both differences are" : `all ${comps.length} differences are`)
          : `${b.significant.length} of the ${comps.length} differences ${b.significant.length === 1 ? "is" : "are"}`;
        say(`${level}, ${which} significant (${b.significant.length === 1 ? "its interval excludes" : "their intervals exclude"} 0):`);
        for (const i of b.significant) toComparisons(words(i));
      }
      if (b.notSignificant.length > 0) {
        toComparisons(`Not significant (interval contains 0): ${names(b.notSignificant.map((i) => pairWords(comps[i], labelOf(comps[i].measure))))}.`);
      }
    }
    if (b.noInterval.length > 0 && b.noInterval.length < comps.length) {
      toComparisons(`No interval (too few values): ${names(b.noInterval.map((i) => pairWords(comps[i], labelOf(comps[i].measure))))}.`);
    }
  }

  // Precision targets.
  const targeted = rows.filter((r) => r.target !== "none");
  if (targeted.length > 0) {
    const missed = b.targetsMissed.map((i) => rows[i]);
    if (missed.length === 0 && b.targetsNotJudged.length === 0) {
      say(targeted.length === 1 ? "The figure with a precision target meets it." : `All ${targeted.length} figures with a precision target meet it.`);
    }
    if (missed.length > 0) {
      say(`${missed.length === 1 ? "One figure misses its" : `${count(missed.length, "figure")} miss their`} precision target: ${names(missed.map((r) => `${rowName(ctx, r)} (${missedWords(r)})`))}.`,
        `#${runsNeededId(missed[0].measure)}`, "(runs needed)");
    }
    const unknown = b.targetsNotJudged.map((i) => rows[i]);
    if (unknown.length > 0) {
      say(`The precision target of ${rowNames(ctx, unknown)} cannot be judged yet.`, `#${runsNeededId(unknown[0].measure)}`, "(why)");
    }
  }

  // Figures without an interval.
  if (b.withoutInterval.length > 0) {
    const none = b.withoutInterval.map((i) => rows[i]);
    say(`${none.length === 1 ? "One figure has" : `${count(none.length, "figure")} have`} no interval (the table's notes say why): ${rowNames(ctx, none)}.`);
  }

  // Response curves: which factors, where they are drawn.
  const curves = results.response_curves ?? [];
  if (curves.length > 0) {
    const factors = [...new Set(curves.map((c) => c.factor))];
    const first = ctx.measureIds[study.measureNames.indexOf(curves[0].measure)];
    say(`Each measure is also drawn against ${factors.length === 1 ? "the factor" : "the factors"} ${names(factors.map(q))}, each point a scenario's interval above (response curves, no fitted model).`,
      first === undefined ? null : `#${first}`, "(first curve)");
  }

  // Selections of the best: the sentence each supports.
  const selected = results.selections ?? [];
  const sections = selectionIds(selected);
  selected.forEach((s, i) => say(selectionSentence(ctx, s), `#${sections[i].section}`, "(selection)"));

  if (b.warnings === 0) say("The study produced no warnings.");
  else say(`The study produced ${count(b.warnings, "warning")}.`, "#warnings", "(warnings)");
  return out;
}

function count(n: number, word: string): string {
  return `${fmt(n)} ${word}${n === 1 ? "" : "s"}`;
}

/** "a", "a and b", "a, b and c", at most `cap` then "and N more". */
function names(xs: string[], cap = NAMED): string {
  const shown = xs.length > cap ? [...xs.slice(0, cap), `${xs.length - cap} more`] : xs;
  return shown.length <= 1 ? (shown[0] ?? "") : `${shown.slice(0, -1).join(", ")} and ${shown.at(-1)}`;
}

function rowName(ctx: ReportContext, r: SummaryReading): string {
  return `${ctx.labelOf(r.measure)} in ${q(r.scenario)}`;
}

function rowNames(ctx: ReportContext, rs: SummaryReading[]): string {
  return names(rs.map((r) => rowName(ctx, r)));
}

function missedWords(r: SummaryReading): string {
  return r.runsNeeded !== null ? `${fmt(r.runsNeeded)} runs needed, ${fmt(r.runs)} made` : `half-width ${fmt(r.half_width)} is above the one aimed at`;
}

function pairWords(c: Comparison, label: string): string {
  return `${label}, ${q(c.a)} against ${q(c.b)}`;
}

/** One significant comparison: which side is higher (the study's reading), by how much, with the interval. */
function significantWords(c: Comparison, higher: boolean, label: string, unit: string | null): string {
  const u = unit === null ? "" : ` ${unit}`;
  const diff = c.diff_mean === null ? "" : ` by ${fmt(Math.abs(c.diff_mean))}${u}`;
  return `${label} is ${higher ? "higher" : "lower"} in ${q(c.a)} than in ${q(c.b)}${diff} ` +
    `(interval of the difference ${intervalText(c.ci_low, c.ci_high)}${u}${c.basis === "batch-means" ? ", from the batch means of the two long runs" : ""}).`;
}
