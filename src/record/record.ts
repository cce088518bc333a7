import { basename, dirname, relative, resolve, sep } from "node:path";
import type { Study } from "../manifest/types.js";
import type { InputRecord } from "../study/outcome.js";
import { sha256 } from "../digest.js";
import { toolVersion } from "./version.js";

/** The study record: what anyone needs to re-derive a report folder later (issue 5). */
export interface StudyRecord {
  format: "sojourn-record/1";
  tool: { name: string; version: string };
  node: string;
  manifest: {
    /** Where the manifest was, relative to the report folder, `/` separators. */
    path: string;
    sha256: string;
    text: string;
  };
  inputs: InputRecord[];
  /** Digest of every output but the PDF, in writing order. */
  outputs: { file: string; sha256: string }[];
  /**
   * The PDF's digest, added when `--pdf` wrote one (the record is rewritten just before the PDF
   * is moved into the folder), so that the next report can tell the PDF is Sojourn's.
   */
  pdf?: { file: "report.pdf"; sha256: string };
}

export function toPosix(p: string): string {
  return p.split(sep).join("/");
}

export function makeRecord(study: Study, reportDir: string, inputs: InputRecord[], outputs: StudyRecord["outputs"]): StudyRecord {
  return {
    format: "sojourn-record/1",
    tool: toolVersion(),
    node: process.version,
    manifest: {
      path: toPosix(relative(resolve(reportDir), study.manifestPath)) || basename(study.manifestPath),
      sha256: sha256(study.manifestText),
      text: study.manifestText,
    },
    inputs,
    outputs,
  };
}

/** The recorded manifest's absolute location for a report folder. */
export function recordedManifest(record: StudyRecord, reportDir: string): { path: string; dir: string } {
  const path = resolve(reportDir, ...record.manifest.path.split("/"));
  return { path, dir: dirname(path) };
}
