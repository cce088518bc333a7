import { readFileSync } from "node:fs";
import { join } from "node:path";
import { sha256 } from "../digest.js";
import { errorCode, outputFs, type OutputFs } from "../fileSystem.js";
import { onInterrupt } from "../interrupt.js";
import { loadStudy } from "../manifest/loadStudy.js";
import type { Study } from "../manifest/types.js";
import * as msg from "../messages/output.js";
import type { StudyOutcome } from "../outcome/index.js";
import { StagedDir } from "../record/outputDir.js";
import { studyInputs } from "../record/ownership.js";
import { reportDate, reportFiles, resultsJson } from "../record/publish.js";
import { makeRecord, recordJson, type StudyRecord } from "../record/record.js";
import { toolVersion } from "../record/version.js";
import { DEFAULT_EDITION, type Edition } from "../report/edition.js";
import { loadTQuantile } from "../stats/tQuantile.js";
import { runStudy, type RunStudyOptions } from "../study/runStudy.js";
import { mark } from "../timing.js";

export interface ReportOptions {
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
  /** Called once the manifest is read, before any run is (the command line notes its worker count there). */
  onStudy?: (study: Study) => void | Promise<void>;
  /** Worker threads for the runs (see `RunStudyOptions.workers`). */
  workers?: number;
  /** Take the runs from per-run summaries in this folder (see `RunStudyOptions.fromSummaries`). */
  fromSummaries?: string;
  /** MSER-5 warm-ups estimated elsewhere, by scenario (see `RunStudyOptions.warmups`). */
  warmups?: RunStudyOptions["warmups"];
  /** The calls that write the folder (tests make one fail); default node:fs (src/fileSystem.ts). */
  fs?: OutputFs;
}

export interface Published {
  dir: string;
  outcome: StudyOutcome;
  pdfPages: number | null;
}

/**
 * The story of `sojourn report MANIFEST --out DIR` (and of `sojourn demo`), from the manifest to
 * the finished folder. Each step is one module's job; the folder is written in a staging folder
 * beside DIR and swapped in whole, so a failure at any step leaves DIR as it was.
 *
 *   manifest/  loadStudy ─────────── read and check the manifest, resolve every run file
 *       │
 *   record/    StagedDir ─────────── claim DIR: refuse a folder that is not an earlier report of
 *       │                            this tool, or that holds the study's own inputs
 *   study/     runStudy ──────────── read each run (workers), compute its figures, write its
 *       │                            calculation tables to tables/ as it ends; then summaries,
 *       │                            comparisons and the study's readings (outcome/ types)
 *   record/    results.json ──────── the outcome's results, byte for byte reproducible
 *       │
 *   report/    reportFiles ───────── report model ──▶ report.html and charts/*.svg (one edition)
 *       │
 *   record/    record.json ───────── digests of every input and output; then commit: the staged
 *       │                            folder replaces DIR
 *   report/    renderPdf (--pdf) ─── print report.pdf beside DIR, add its digest to record.json,
 *                                    move it in (a missing browser still leaves a whole HTML report)
 *
 * `sojourn verify DIR` walks the same story backwards from record.json (src/record/verify.ts).
 */
export async function makeReport(manifest: string, options: ReportOptions): Promise<Published> {
  const study = await loadStudy(manifest);
  mark("manifest loaded");
  await options.onStudy?.(study);
  return reportStudy(study, options);
}

/** The story of `makeReport` from a study already read (tests build one in memory). */
export async function reportStudy(study: Study, options: ReportOptions): Promise<Published> {
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
      warmups: options.warmups,
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
async function addPdf(staged: StagedDir, study: Study, record: StudyRecord, options: ReportOptions, fs: OutputFs): Promise<number> {
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
