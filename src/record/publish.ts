import type { Study } from "../manifest/types.js";
import { runStudy } from "../study/runStudy.js";
import { sha256 } from "../digest.js";
import { makeRecord, type StudyRecord } from "./record.js";
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

export function reportDate(): string {
  const epoch = process.env.SOURCE_DATE_EPOCH;
  if (epoch !== undefined && /^\d+$/.test(epoch)) return new Date(Number(epoch) * 1000).toISOString();
  return new Date().toISOString();
}

/**
 * Computes a study and writes its report folder atomically:
 *
 *   runStudy ──▶ results.json, tables/*.csv ──▶ report.html ──▶ record.json ──▶ commit ──▶ report.pdf
 *
 * The PDF comes last, after the folder is in place, so that a missing browser still leaves a
 * complete HTML report (and the command then fails with a message on how to get one).
 */
export async function publishStudy(study: Study, options: PublishOptions): Promise<Published> {
  const progress = options.onProgress ?? (() => {});
  const staged = new StagedDir(options.out, options.force);
  try {
    const computed = runStudy(study, { onProgress: progress, workers: options.workers, fromSummaries: options.fromSummaries });
    // The report's modules (templates, chart renderer) and the t quantile load while the runs are read.
    const reportModules = Promise.all([import("../report/model.js"), import("../report/html.js")]);
    setImmediate(loadTQuantile);
    const { outcome, tableFiles } = await computed;
    mark("runs analysed");
    const [{ buildReportModel }, { renderHtml }] = await reportModules;
    const outputs: StudyRecord["outputs"] = [];
    const put = (file: string, data: string) => {
      staged.write(file, data);
      outputs.push({ file, sha256: sha256(data) });
    };
    put("results.json", resultsJson(outcome));
    for (const f of tableFiles) put(f.record.file, f.csv);
    progress(`wrote ${tableFiles.length} calculation tables`);
    mark("results and tables written");
    const model = buildReportModel(study, outcome, { toolVersion: toolVersion().version, generatedAt: options.generatedAt ?? reportDate() });
    put("report.html", await renderHtml(model));
    mark("report.html written");
    progress("wrote report.html");
    staged.write("record.json", JSON.stringify(makeRecord(study, staged.final, outcome.inputs, outputs), null, 2) + "\n");
    staged.commit();
    mark("report folder in place");
    let pdfPages: number | null = null;
    if (options.pdf) {
      const { renderPdf } = await import("../report/pdf.js");
      const html = await import("node:fs").then((fs) => fs.readFileSync(`${staged.final}/report.html`, "utf8"));
      const tmpPdf = `${staged.final}/.report.pdf.tmp`;
      const r = await renderPdf(html, tmpPdf, { chrome: options.chrome, paper: options.paper, title: study.title, onProgress: progress });
      (await import("node:fs")).renameSync(tmpPdf, `${staged.final}/report.pdf`);
      pdfPages = r.pages;
      progress(`wrote report.pdf (${r.pages} pages)`);
    }
    return { dir: staged.final, outcome, pdfPages };
  } catch (e) {
    staged.abandon();
    throw e;
  }
}
