/**
 * The summary table: per measure and scenario the mean, its interval (across runs, or from the
 * batch means of one long run, as the study chose), the relative precision, and flags on what the
 * row rests on, each linking to its detail. The opening sentences are in `brief.ts`.
 */
import type { Summary, SummaryReading } from "../../outcome/index.js";
import { rowFlag } from "../../messages/warnings.js";
import { formatPercent } from "../number.js";
import { key, type ReportContext } from "./anchors.js";
import { briefSentences } from "./brief.js";
import type { Cell, Flag, ReportModel, SummaryRow } from "./view.js";
import { fmt, intervalText, link, q, relative } from "./words.js";

/** The summary section: the opening sentences, its introduction and one row per measure and scenario. */
export function summaryView(ctx: ReportContext): ReportModel["summary"] {
  const { study, outcome, results, measureIds, ivId, batchIds, labelOf, unitOf, readingOf } = ctx;
  const rows: SummaryRow[] = [];
  study.measureNames.forEach((name, mi) => {
    results.scenarios.forEach((sr, si) => {
      const s: Summary | undefined = sr.summary[name];
      const r = readingOf(sr.name, name);
      const batches = r?.method === "batch-means";
      const href = batches ? (batchIds.get(key(sr.name, name)) ?? null) : ivId(sr.name, name, "value");
      const iv = outcome.intervals.find((a) => a.scenario === sr.name && a.measure === name && a.figure === "value");
      const mean = r?.mean ?? s?.mean ?? null;
      const halfWidth = r?.half_width ?? null;
      let note: Cell | null = null;
      if (r !== undefined && batches) {
        note = link(`From ${r.values} batch means of run ${q(r.run ?? "")}, k − 1 = ${fmt(r.df)} degrees of freedom (Student t).`, href);
      } else if (halfWidth === null) {
        note = link(s?.interval_note ?? iv?.note ?? "No interval: fewer than two run values.", null);
      }
      rows.push({
        measure: labelOf(name),
        unit: unitOf(name),
        key: name,
        measureHref: `#${measureIds[mi]}`,
        measureRows: si === 0 ? results.scenarios.length : 0,
        scenario: sr.name,
        mean: link(fmt(mean), href),
        halfWidth: link(fmt(halfWidth), href),
        interval: link(intervalText(r?.ci_low ?? null, r?.ci_high ?? null), href),
        runs: String(s?.n ?? 0),
        relative: link(relative({ mean, half_width: halfWidth }), href),
        note,
        noteKind: note === null ? null : batches ? "method" : "missing",
        flags: r === undefined ? [] : rowFlags(ctx, r, s),
      });
    });
  });
  const anyBatches = outcome.readings.summaries.some((r) => r.method === "batch-means");
  return {
    brief: briefSentences(ctx),
    intro: `Mean of each measure by scenario, with its ${formatPercent(study.confidence)} confidence interval (Student t, one value per run` +
      (anyBatches ? "; for a scenario that is one long run, one value per batch mean of that run, as the row's note says" : "") + "). " +
      "Relative precision is half-width / |mean|. Every number links to its step-by-step derivation in the appendix. " +
      "The flags under a scenario's name link to what they are about.",
    rows,
  };
}

/** The flags of one summary row, each linking to its detail (the study decided them: src/study/readings.ts). */
function rowFlags(ctx: ReportContext, r: SummaryReading, s: Summary | undefined): Flag[] {
  const { outcome, runsTableId, runsNeededId, warningIds } = ctx;
  const flags: Flag[] = [];
  const needHref = `#${runsNeededId(r.measure)}`;
  if (r.target === "missed") {
    flags.push({
      kind: "target-missed",
      text: r.runsNeeded !== null ? rowFlag.targetMissed(fmt(r.runsNeeded), fmt(r.runs)) : rowFlag.targetMissedHalfWidth(fmt(r.half_width), fmt(s?.target_half_width ?? null)),
      href: needHref,
    });
  } else if (r.target === "not-judged") {
    flags.push({ kind: "target-unknown", text: rowFlag.targetNotJudged, href: needHref });
  }
  if (r.runsWithoutValue.length > 0) flags.push({ kind: "left-out", text: rowFlag.leftOut(r.runsWithoutValue), href: `#${runsTableId(r.measure)}` });
  if (r.runsEndingEarly.length > 0) {
    // The first warning about one of those runs says what ended early and where; else the run table.
    const early = r.warnings.find((i) => r.runsEndingEarly.includes(outcome.warnings[i].run ?? ""));
    flags.push({ kind: "ends-early", text: rowFlag.endsEarly(r.runsEndingEarly), href: early === undefined ? `#${runsTableId(r.measure)}` : `#${warningIds[early]}` });
  }
  if (r.warnings.length > 0) flags.push({ kind: "warnings", text: rowFlag.warnings(r.warnings.length), href: `#${warningIds[r.warnings[0]]}` });
  return flags;
}
