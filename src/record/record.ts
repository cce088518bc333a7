import { basename, dirname, relative, resolve, sep } from "node:path";
import type { Study } from "../manifest/types.js";
import type { InputRecord } from "../outcome/index.js";
import { sha256 } from "../digest.js";
import { checkShape, type Shape, shapeText } from "../shape.js";
import { INPUT_RECORD_SHAPE } from "../study/runSummary.js";
import { toolVersion } from "./version.js";
import { EDITIONS, isEdition, type Edition } from "../report/edition.js";

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
   * What report.html depends on beside the inputs and the tool: its date. With it the page can
   * be made again byte for byte (`verify`). Absent in records of versions before 0.1.
   * `edition`: which edition report.html (and report.pdf) is; the chart files under charts/ are
   * listed in `outputs`. Absent in records written before editions: those are the audit edition,
   * without chart files.
   */
  report?: { generated_at: string; edition?: Edition };
  /** The PDF, once written: it is the page printed by a browser, so only its digest is checked. */
  pdf?: { file: string; sha256: string; pages: number };
}

export const RECORD_FORMAT = "sojourn-record/1";

const FILE_DIGEST: Shape = { object: { file: "string", sha256: "sha256" } };

/** The shape of record.json as `makeRecord` writes it. */
export const RECORD_SHAPE: Shape = {
  object: {
    format: { test: (v) => v === RECORD_FORMAT, expected: `"${RECORD_FORMAT}"` },
    tool: { object: { name: "string", version: "string" } },
    node: "string",
    manifest: { object: { path: "string", sha256: "sha256", text: "string" } },
    inputs: { array: INPUT_RECORD_SHAPE },
    outputs: { array: FILE_DIGEST },
    report: {
      object: { generated_at: "string", edition: { test: isEdition, expected: EDITIONS.map((e) => `"${e}"`).join(" or ") } },
      optional: ["edition"],
    },
    pdf: { object: { file: "string", sha256: "sha256", pages: "number" } },
  },
  optional: ["report", "pdf"],
};

/** record.json's text. */
export function recordJson(record: StudyRecord): string {
  return JSON.stringify(record, null, 2) + "\n";
}

/**
 * record.json's text as a record, or the reason it is not one (not JSON; a key missing or of
 * the wrong type, with its key path).
 */
export function parseRecord(text: string): { record: StudyRecord } | { problem: string } {
  let value: unknown;
  try {
    value = JSON.parse(text);
  } catch (e) {
    return { problem: `it is not JSON (${(e as Error).message})` };
  }
  const p = checkShape(value, RECORD_SHAPE);
  return p === null ? { record: value as StudyRecord } : { problem: shapeText(p) };
}

export function toPosix(p: string): string {
  return p.split(sep).join("/");
}

export function makeRecord(study: Study, reportDir: string, inputs: InputRecord[], outputs: StudyRecord["outputs"], generatedAt: string, edition: Edition): StudyRecord {
  return {
    format: RECORD_FORMAT,
    tool: toolVersion(),
    node: process.version,
    manifest: {
      path: toPosix(relative(resolve(reportDir), study.manifestPath)) || basename(study.manifestPath),
      sha256: sha256(study.manifestText),
      text: study.manifestText,
    },
    inputs,
    outputs,
    report: { generated_at: generatedAt, edition },
  };
}

/** The recorded manifest's absolute location for a report folder. */
export function recordedManifest(record: StudyRecord, reportDir: string): { path: string; dir: string } {
  const path = resolve(reportDir, ...record.manifest.path.split("/"));
  return { path, dir: dirname(path) };
}
