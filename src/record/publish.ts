import type { Study } from "../manifest/types.js";
import { runStudy } from "../study/runStudy.js";
import { sha256 } from "../digest.js";
import { makeRecord, recordJson, type StudyRecord } from "./record.js";
import { StagedDir } from "./outputDir.js";
import { toolVersion } from "./version.js";
import type { StudyOutcome } from "../study/outcome.js";
import { mark } from "../timing.js";
import { loadTQuantile } from "../stats/tQuantile.js";

export interface PublishOptions {
  out: string;
  force: boolean;
  pdf: boolean;
  paper: "A4" | "Letter";
  chrome?: string;
  /** The report's date (ISO); default now, or SOURCE_DATE_EPOCH when set. */
  generatedAt?: string;
  onProgress?: (message: string) => void;
  /** Worker threads for the runs (see `RunStudyOptions.workers`). */
  workers?: number;
  /** Take the runs from per-run summaries in this folder (see `RunStudyOptions.fromSummaries`). */
  fromSummaries?: string;
}

export interface Published {
  dir: string;
  outcome: StudyOutcome;
  pdfPages: number | null;
}

/** results.json's exact bytes. */
export function resultsJson(outcome: StudyOutcome): string {
  return JSON.stringify(outcome.results, null, 2) + "\n";
}

/**
 * report.html's exact bytes: a pure function of the study, its outcome, the tool's version and
 * the report's date, so that `verify` can make the page again from the record.
 */
export async function reportHtml(study: Study, outcome: StudyOutcome, meta: { toolVersion: string; generatedAt: string }): Promise<string> {
  const [{ buildReportModel }, { renderHtml }] = await Promise.all([import("../report/model.js"), import("../report/html.js")]);
  return renderHtml(buildReportModel(study, outcome, meta));
}

export function reportDate(): string {
  const epoch = process.env.SOURCE_DATE_EPOCH;
  if (epoch !== undefined && /^\d+$/.test(epoch)) return new Date(Number(epoch) * 1000).toISOString();
  return new Date().toISOString();
}

/**
 * Computes a study and writes its report folder atomically:
 *
 *   runStudy (tables/*.csv written as each run ends) ──▶ results.json ──▶ report.html ──▶ record.json
 *     ──▶ commit ──▶ report.pdf ──▶ record.json again, with the PDF's digest
 *
 * The PDF comes last, after the folder is in place, so that a missing browser still leaves a
 * complete HTML report (and the command then fails with a message on how to get one).
 */
export async function publishStudy(study: Study, options: PublishOptions): Promise<Published> {
  const progress = options.onProgress ?? (() => {});
  const staged = new StagedDir(options.out, options.force);
  try {
    // Each run's calculation tables go to disk as soon as the run is analysed (memory stays flat).
    const computed = runStudy(study, {
      onProgress: progress,
      workers: options.workers,
      fromSummaries: options.fromSummaries,
      writeTable: (file, csv) => staged.write(file, csv),
    });
    // The report's modules (templates, chart renderer) and the t quantile load while the runs are read.
    const reportModules = Promise.all([import("../report/model.js"), import("../report/html.js")]);
    setImmediate(loadTQuantile);
    const { outcome } = await computed;
    mark("runs analysed");
    await reportModules;
    const outputs: StudyRecord["outputs"] = [];
    const put = (file: string, data: string) => {
      staged.write(file, data);
      outputs.push({ file, sha256: sha256(data) });
    };
    put("results.json", resultsJson(outcome));
    for (const t of outcome.tables) outputs.push({ file: t.file, sha256: t.sha256 });
    progress(`wrote ${outcome.tables.length} calculation tables`);
    mark("results and tables written");
    const page = { toolVersion: toolVersion().version, generatedAt: options.generatedAt ?? reportDate() };
    put("report.html", await reportHtml(study, outcome, page));
    mark("report.html written");
    progress("wrote report.html");
    const record = makeRecord(study, staged.final, outcome.inputs, outputs, page.generatedAt);
    staged.write("record.json", recordJson(record));
    staged.commit();
    mark("report folder in place");
    let pdfPages: number | null = null;
    if (options.pdf) {
      const { renderPdf } = await import("../report/pdf.js");
      const html = await import("node:fs").then((fs) => fs.readFileSync(`${staged.final}/report.html`, "utf8"));
      const tmpPdf = `${staged.final}/.report.pdf.tmp`;
      const r = await renderPdf(html, tmpPdf, { chrome: options.chrome, paper: options.paper, title: study.title, onProgress: progress });
      const fs = await import("node:fs");
      fs.renameSync(tmpPdf, `${staged.final}/report.pdf`);
      // The record gains the PDF's digest; it is replaced by rename, so it is never half-written.
      record.pdf = { file: "report.pdf", sha256: sha256(fs.readFileSync(`${staged.final}/report.pdf`)), pages: r.pages };
      fs.writeFileSync(`${staged.final}/.record.json.tmp`, recordJson(record));
      fs.renameSync(`${staged.final}/.record.json.tmp`, `${staged.final}/record.json`);
      pdfPages = r.pages;
      progress(`wrote report.pdf (${r.pages} pages)`);
    }
    return { dir: staged.final, outcome, pdfPages };
  } catch (e) {
    staged.abandon();
    throw e;
  }
}
