import type { Study } from "../manifest/types.js";
import { runStudy } from "../study/runStudy.js";
import { sha256 } from "../digest.js";
import { makeRecord, recordJson, type StudyRecord } from "./record.js";
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { StagedDir } from "./outputDir.js";
import { errorCode, outputFs, type OutputFs } from "../fileSystem.js";
import { studyInputs } from "./ownership.js";
import { onInterrupt } from "../interrupt.js";
import * as msg from "../messages/output.js";
import { toolVersion } from "./version.js";
import type { StudyOutcome } from "../outcome/index.js";
import { mark } from "../timing.js";
import { loadTQuantile } from "../stats/tQuantile.js";
import { DEFAULT_EDITION, type Edition } from "../report/edition.js";
import type { RenderedReport } from "../report/html.js";

export interface PublishOptions {
  out: string;
  force: boolean;
  pdf: boolean;
  paper: "A4" | "Letter";
  /** Which edition report.html and report.pdf are (src/report/edition.ts); default the audit edition. */
  edition?: Edition;
  chrome?: string;
  /** The report's date (ISO); default now, or SOURCE_DATE_EPOCH when set. */
  generatedAt?: string;
  onProgress?: (message: string) => void;
  /** Worker threads for the runs (see `RunStudyOptions.workers`). */
  workers?: number;
  /** Take the runs from per-run summaries in this folder (see `RunStudyOptions.fromSummaries`). */
  fromSummaries?: string;
  /** The calls that write the folder (tests make one fail); default node:fs (src/fileSystem.ts). */
  fs?: OutputFs;
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

/**
 * Computes a study and writes its report folder atomically:
 *
 *   runStudy (tables/*.csv written as each run ends) ──▶ results.json ──▶ report.html, charts/*.svg ──▶ record.json
 *     ──▶ commit ──▶ report.pdf ──▶ record.json again, with the PDF's digest
 *
 * The PDF comes last, after the folder is in place, so that a missing browser still leaves a
 * complete HTML report (and the command then fails with a message on how to get one).
 */
export async function publishStudy(study: Study, options: PublishOptions): Promise<Published> {
  const progress = options.onProgress ?? (() => {});
  const fs = options.fs ?? outputFs();
  const staged = new StagedDir(options.out, { force: options.force, inputs: studyInputs(study, options.fromSummaries), fs });
  let record: StudyRecord;
  try {
    // Each run's calculation tables go to disk as soon as the run is analysed (memory stays flat).
    const computed = runStudy(study, {
      onProgress: progress,
      workers: options.workers,
      fromSummaries: options.fromSummaries,
      writeTable: (file, csv) => staged.write(file, csv),
    });
    // The report's modules (templates, chart renderer) and the t quantile load while the runs are read.
    const reportModules = Promise.all([import("../report/model/index.js"), import("../report/html.js")]);
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
    const edition = options.edition ?? DEFAULT_EDITION;
    const rendered = await reportFiles(study, outcome, page, edition);
    put("report.html", rendered.html);
    for (const c of rendered.charts) put(c.file, c.svg);
    mark("report.html written");
    progress(`wrote report.html (${edition} edition) and ${rendered.charts.length} chart files under charts/`);
    record = makeRecord(study, staged.final, outcome.inputs, outputs, page.generatedAt, edition);
    staged.write("record.json", recordJson(record));
    staged.commit();
    mark("report folder in place");
    const pdfPages = options.pdf ? await addPdf(staged, study, record, options, fs) : null;
    return { dir: staged.final, outcome, pdfPages };
  } catch (e) {
    staged.abandon();
    throw e;
  }
}

/**
 * Prints report.pdf into the finished folder:
 *
 *   print to a scratch file beside DIR ──▶ record.json rewritten with the PDF's digest ──▶
 *   scratch file moved to DIR/report.pdf
 *
 * so the folder never holds a PDF its record does not list. A failure or an interruption leaves
 * the folder complete without the PDF and removes the scratch files (and the browser's profile).
 */
async function addPdf(staged: StagedDir, study: Study, record: StudyRecord, options: PublishOptions, fs: OutputFs): Promise<number> {
  const progress = options.onProgress ?? (() => {});
  const { renderPdf } = await import("../report/pdf.js");
  const html = readFileSync(join(staged.final, "report.html"), "utf8");
  const scratch = staged.scratch("pdf");
  const scratchRecord = staged.scratch("rec");
  const clean = () => {
    for (const p of [scratch, `${scratch}.partial`, scratchRecord]) fs.remove(p);
  };
  const release = onInterrupt(clean, () => msg.pdfInterrupted(staged.shown).message);
  try {
    const r = await renderPdf(html, scratch, { chrome: options.chrome, paper: options.paper, title: study.title, onProgress: progress, fs });
    record.pdf = { file: "report.pdf", sha256: sha256(readFileSync(scratch)), pages: r.pages };
    fs.writeFile(scratchRecord, recordJson(record));
    fs.rename(scratchRecord, join(staged.final, "record.json"));
    fs.rename(scratch, join(staged.final, "report.pdf"));
    progress(`wrote report.pdf (${r.pages} pages)`);
    return r.pages;
  } catch (e) {
    clean();
    const code = errorCode(e);
    if (code !== null) throw msg.pdfUnwritable(staged.shown, code);
    throw e;
  } finally {
    release();
  }
}
