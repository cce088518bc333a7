/**
 * The report's view model: everything the HTML shows, already rounded and worded.
 *
 *   Study + StudyOutcome ──buildReportModel──▶ ReportModel ──renderHtml──▶ report.html ──renderPdf──▶ report.pdf
 *
 * Pure: no file system, no template engine, no browser. Every number a reader sees is turned
 * into text by the one rounding rule of `../number.ts`; every sentence is worded in this folder;
 * the templates only place these strings. Chart specs (vega-lite, data inline) are built here too.
 *
 * One file per part of the page: `cover.ts`, `summary.ts` (with its opening sentences in
 * `brief.ts`), `warmup.ts`, `measure.ts` (with `measureCharts.ts`), `comparisons.ts`, `warnings.ts`, `appendix.ts`; the fixed method notes and
 * limitations are in `methods.ts`, the wording helpers in `words.ts`, the anchors in `anchors.ts`
 * and the view types in `view.ts`.
 */
import type { Study } from "../../manifest/types.js";
import type { StudyOutcome } from "../../outcome/index.js";
import { SIGNIFICANT_DIGITS } from "../number.js";
import { anchor, reportContext } from "./anchors.js";
import { appendixView } from "./appendix.js";
import { comparisonsView } from "./comparisons.js";
import { coverView } from "./cover.js";
import { measureSection } from "./measure.js";
import { CURVE_CAUTION, LIMITATIONS, METHODS, SELECTION_CAUTION } from "./methods.js";
import { selectionsView } from "./selections.js";
import { summaryView } from "./summary.js";
import type { ReportModel } from "./view.js";
import { warmupSection } from "./warmup.js";
import { warningLines } from "./warnings.js";
import { dateText } from "./words.js";

export type * from "./view.js";
export { slug } from "./anchors.js";
export { TABLE_HEAD_ROWS, TABLE_ROW_CAP, TABLE_TAIL_ROWS } from "./appendix.js";
export { roundNumbersIn } from "./words.js";

/**
 * Builds the report's view model from the study and its outcome. Deterministic: the same
 * arguments give the same model (`meta.generatedAt` is the only clock).
 */
export function buildReportModel(
  study: Study,
  outcome: StudyOutcome,
  meta: { toolVersion: string; generatedAt: string },
): ReportModel {
  const ctx = reportContext(study, outcome);
  const unit = study.timeUnit;
  const warmup = warmupSection(ctx);
  const measures = study.measureNames.map((name, mi) => measureSection(ctx, name, mi));
  const comparisons = comparisonsView(ctx);
  const selections = selectionsView(ctx);
  const warnings = warningLines(outcome, ctx.warningIds, (m) => (study.measureNames.includes(m) ? ctx.labelOf(m) : m));

  const contents = [
    { href: "#summary", label: "Summary" },
    ...(warmup ? [{ href: "#warmup", label: "Warm-up" }] : []),
    ...measures.map((m) => ({ href: `#${m.id}`, label: m.name })),
    ...(comparisons ? [{ href: "#comparisons", label: "Scenario comparisons" }] : []),
    ...(selections ? [{ href: "#selections", label: "Selecting the best" }] : []),
    { href: "#methods", label: "Method notes" },
    { href: "#limitations", label: "Limitations and cautions" },
    { href: "#warnings", label: `Warnings (${warnings.length})` },
    { href: "#appendix", label: "Audit appendix" },
  ];

  return {
    title: study.title,
    generatedAt: meta.generatedAt,
    reportDate: dateText(meta.generatedAt),
    toolVersion: meta.toolVersion,
    timeUnit: unit,
    rule: `Numbers are rounded to ${SIGNIFICANT_DIGITS} significant digits, keeping every whole-number digit, without trailing zeros; results.json keeps full precision.`,
    cover: coverView(ctx, meta),
    contents,
    summary: summaryView(ctx),
    warmup,
    measures,
    selections,
    comparisons,
    methods: METHODS.map((n, i) => ({ id: anchor("method", i + 1, n.term), ...n })),
    limitations: [
      ...LIMITATIONS,
      ...((outcome.results.response_curves ?? []).length > 0 ? [CURVE_CAUTION] : []),
      ...(study.selections.length > 0 ? [SELECTION_CAUTION] : []),
    ],
    warnings,
    appendix: appendixView(ctx),
  };
}
