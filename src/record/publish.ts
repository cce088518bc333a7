import type { Study } from "../manifest/types.js";
import type { StudyOutcome } from "../outcome/index.js";
import { DEFAULT_EDITION, type Edition } from "../report/edition.js";
import type { RenderedReport } from "../report/html.js";

/** results.json's exact bytes. */
export function resultsJson(outcome: StudyOutcome): string {
  return JSON.stringify(outcome.results, null, 2) + "\n";
}

/**
 * report.html's exact bytes and the chart files': a pure function of the study, its outcome, the
 * tool's version, the report's date and the edition, so that `verify` can make them again from
 * the record.
 */
export async function reportFiles(
  study: Study,
  outcome: StudyOutcome,
  meta: { toolVersion: string; generatedAt: string },
  edition: Edition = DEFAULT_EDITION,
): Promise<RenderedReport> {
  const [{ buildReportModel }, { renderReport }] = await Promise.all([import("../report/model/index.js"), import("../report/html.js")]);
  return renderReport(buildReportModel(study, outcome, meta), edition);
}

/** report.html's exact bytes (see `reportFiles`). */
export async function reportHtml(study: Study, outcome: StudyOutcome, meta: { toolVersion: string; generatedAt: string }, edition: Edition = DEFAULT_EDITION): Promise<string> {
  return (await reportFiles(study, outcome, meta, edition)).html;
}

export function reportDate(): string {
  const epoch = process.env.SOURCE_DATE_EPOCH;
  if (epoch !== undefined && /^\d+$/.test(epoch)) return new Date(Number(epoch) * 1000).toISOString();
  return new Date().toISOString();
}
