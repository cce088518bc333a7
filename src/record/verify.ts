import { lstatSync, readdirSync, realpathSync, statSync } from "node:fs";
import { dirname, join, relative, resolve, sep } from "node:path";
import { loadStudy } from "../manifest/loadStudy.js";
import type { Study } from "../manifest/types.js";
import * as msg from "../messages/verify.js";
import { UserError } from "../messages/index.js";
import { runStudy } from "../study/runStudy.js";
import type { StudyOutcome } from "../outcome/index.js";
import { sha256 } from "../digest.js";
import { reportFiles, resultsJson } from "./publish.js";
import { parseRecord, recordedManifest, type StudyRecord } from "./record.js";
import { fileBytes, fileDigest } from "../regularFile.js";
import { isInside, place, type Placed } from "./safeFile.js";
import { toolVersion } from "./version.js";

export interface VerifyLine {
  ok: boolean;
  item: string;
  detail: string;
}

export interface Verification {
  ok: boolean;
  lines: VerifyLine[];
}

export interface VerifyOptions {
  /** The folder the manifest's run paths are relative to, when the inputs moved. */
  inputs?: string;
  /**
   * The folder verify may read run files from: default `inputs` when given, else the folder that
   * holds the report folder. Nothing outside it and the report folder is read.
   */
  root?: string;
}

/** The report folder's real path, or a message when there is none. */
function reportFolder(dir: string): string {
  let real: string;
  try {
    real = realpathSync(resolve(dir));
  } catch {
    throw msg.reportDirMissing(dir, "it does not exist");
  }
  if (!statSync(real).isDirectory()) throw msg.reportDirMissing(dir, "it is not a folder");
  return real;
}

/** record.json of a report folder: a regular file inside it, with the shape `makeRecord` writes. */
async function readRecord(dir: string, folder: string): Promise<StudyRecord> {
  const placed = place(folder, "record.json", folder, folder);
  if (!placed.ok) {
    if (placed.why === "missing") throw msg.reportDirMissing(dir, "record.json is missing");
    if (placed.why === "not-a-file") throw msg.recordNotAFile(dir, placed.kind);
    if (placed.why === "outside") throw msg.recordOutside(dir, safeRealpath(join(folder, "record.json")));
    throw msg.recordUnreadable(dir, placed.reason);
  }
  let text: string;
  try {
    text = (await fileBytes(placed.path)).toString("utf8");
  } catch (e) {
    throw msg.recordUnreadable(dir, (e as NodeJS.ErrnoException).code ?? String(e));
  }
  const parsed = parseRecord(text);
  if ("problem" in parsed) throw msg.recordMalformed(dir, parsed.problem);
  return parsed.record;
}

function safeRealpath(p: string): string {
  try {
    return realpathSync(p);
  } catch {
    return p;
  }
}

/** The verdict detail for a record path that was not read. */
function notRead(p: Exclude<Placed, { ok: true }>, outside: string, missing: string): string {
  if (p.why === "outside") return outside;
  if (p.why === "missing") return missing;
  if (p.why === "not-a-file") return msg.notAFile(p.kind);
  return msg.unreadable(p.reason);
}

/**
 * Re-derives a finished report folder from its study record (issue 5, issue 12):
 *
 *   record.json (shape checked) ─▶ every input: inside the inputs' folder, a regular file, its
 *   digest ─▶ compute the study again in memory ─▶ results.json, every table, report.html (made
 *   again from the recorded date, in the recorded edition) and every chart file compared byte for
 *   byte ─▶ report.pdf's digest ─▶ verdict
 *
 * Inputs are found relative to the recorded manifest location, or under `inputs` when they moved.
 * Nothing is read outside the report folder and the inputs' folder (`root`), whatever the record
 * says: a path that leads elsewhere (`..`, an absolute path, a symbolic link) fails its line
 * unread, and so does a named pipe or a device. Nothing is written.
 */
export async function verifyReport(dir: string, options: VerifyOptions = {}): Promise<Verification> {
  const folder = reportFolder(dir);
  const record = await readRecord(dir, folder);
  const lines: VerifyLine[] = [];
  const add = (ok: boolean, item: string, detail: string) => lines.push({ ok, item, detail });

  const running = toolVersion().version;
  if (record.tool.version !== running) add(true, "tool", msg.otherVersion(record.tool.version, running));
  add(sha256(record.manifest.text) === record.manifest.sha256, "manifest", "recorded text matches its digest");

  const outcome = await recompute(record, folder, options, add);
  await checkOutputs(outcome === null ? null : await madeAgain(outcome.study, outcome.outcome, record), record, folder, add);
  await checkPdf(record, folder, add);
  for (const f of strayFiles(folder, record)) add(false, f, msg.strayFile());
  return { ok: lines.every((l) => l.ok), lines };
}

type Add = (ok: boolean, item: string, detail: string) => void;

/**
 * Checks every recorded input (inside the inputs' folder, a regular file, its digest) and, when
 * all match and the manifest still names exactly them, computes the study again in memory; null
 * when it cannot be (the reason is a line of the verdict).
 */
async function recompute(record: StudyRecord, folder: string, options: VerifyOptions, add: Add): Promise<{ study: Study; outcome: StudyOutcome } | null> {
  const manifest = recordedManifest(record, folder);
  const baseDir = options.inputs !== undefined ? resolve(options.inputs) : manifest.dir;
  const root = resolve(options.root ?? options.inputs ?? dirname(folder));
  const realRoot = safeRealpath(root);
  const rootFlag = options.inputs === undefined && options.root === undefined ? "--inputs (or --root)" : "--root";
  if (!isInside(root, baseDir)) {
    add(false, "inputs", msg.manifestOutside(baseDir, root));
    return null;
  }

  let inputsOk = true;
  const recorded = new Set<string>();
  for (const input of record.inputs) {
    recorded.add(input.file);
    const item = `input ${input.file}`;
    const placed = place(baseDir, input.file, root, realRoot);
    if (!placed.ok) {
      inputsOk = false;
      add(false, item, notRead(placed, msg.outside("the inputs' folder", root, rootFlag), msg.missingInput()));
      continue;
    }
    let d: string;
    try {
      d = await fileDigest(placed.path);
    } catch (e) {
      inputsOk = false;
      add(false, item, msg.unreadable((e as NodeJS.ErrnoException).code ?? String(e)));
      continue;
    }
    const same = d === input.sha256;
    if (!same) inputsOk = false;
    add(same, item, same ? "digest matches" : msg.inputChanged(d, input.sha256));
  }

  let study: Study;
  try {
    study = await loadStudy(manifest.path, { text: record.manifest.text, baseDir });
  } catch (e) {
    if (!(e instanceof UserError)) throw e;
    add(false, "manifest", msg.manifestNotApplicable(e.message.split("\n")[0]));
    return null;
  }
  for (const sc of study.scenarios) {
    for (const run of sc.runs) {
      if (!recorded.has(run.file)) {
        inputsOk = false;
        add(false, `input ${run.file}`, msg.extraInput());
      }
    }
  }
  if (!inputsOk) {
    add(false, "study", msg.notComputed());
    return null;
  }
  try {
    return { study, outcome: (await runStudy(study)).outcome };
  } catch (e) {
    if (!(e instanceof UserError)) throw e;
    add(false, "study", msg.studyFails(e.message.split("\n")[0]));
    return null;
  }
}

/** Every output's digest when made again from the inputs: results, tables, and the page (null: cannot be made). */
async function madeAgain(study: Study, outcome: StudyOutcome, record: StudyRecord): Promise<Map<string, string | null>> {
  const again = new Map<string, string | null>();
  again.set("results.json", sha256(resultsJson(outcome)));
  for (const t of outcome.tables) again.set(t.file, t.sha256);
  const generatedAt = record.report?.generated_at;
  if (generatedAt === undefined) {
    again.set("report.html", null);
    return again;
  }
  // A record without an edition was written before editions: the audit edition, without chart files.
  const edition = record.report?.edition;
  const made = await reportFiles(study, outcome, { toolVersion: record.tool.version, generatedAt }, edition ?? "audit");
  again.set("report.html", sha256(made.html));
  if (edition !== undefined) for (const c of made.charts) again.set(c.file, sha256(c.svg));
  return again;
}

const isChart = (file: string) => file.startsWith("charts/");

/** The verdict of a page made again: which edition, when the record says. */
function pageMadeAgain(record: StudyRecord): string {
  const e = record.report?.edition;
  return e === undefined ? "made again from the inputs byte for byte" : `made again from the inputs byte for byte (${e} edition)`;
}

/** The digest of a file of the report folder named by the record, or why it was not read. */
async function outputDigest(folder: string, file: string): Promise<{ digest: string } | { detail: string }> {
  const placed = place(folder, file, folder, folder);
  if (!placed.ok) return { detail: notRead(placed, msg.outputOutside(folder), msg.outputMissing()) };
  try {
    return { digest: await fileDigest(placed.path) };
  } catch (e) {
    return { detail: msg.unreadable((e as NodeJS.ErrnoException).code ?? String(e)) };
  }
}

/**
 * Each recorded output against the file on disk and against the output made again: a file that
 * differs from its recorded digest was changed; one that matches its recorded digest but not the
 * output made again was changed together with its digest in record.json. Without `again` (the
 * study could not be computed) only the digests are checked.
 */
async function checkOutputs(again: Map<string, string | null> | null, record: StudyRecord, folder: string, add: Add): Promise<void> {
  const listed = new Set<string>();
  for (const out of record.outputs) {
    listed.add(out.file);
    const disk = await outputDigest(folder, out.file);
    if ("detail" in disk) {
      add(false, out.file, disk.detail);
      continue;
    }
    if (disk.digest !== out.sha256) {
      add(false, out.file, msg.outputChanged());
      continue;
    }
    if (again === null) {
      add(true, out.file, "digest matches the record (not computed again)");
      continue;
    }
    const made = again.get(out.file);
    if (made === undefined) add(false, out.file, msg.notProduced());
    else if (made === null) add(false, out.file, msg.pageUndatable());
    else if (made !== disk.digest) add(false, out.file, out.file === "report.html" ? msg.pageDiffers() : out.file === "results.json" ? msg.resultsDiffer() : isChart(out.file) ? msg.chartDiffers() : msg.tableDiffers());
    else add(true, out.file, out.file === "report.html" ? pageMadeAgain(record) : out.file === "results.json" ? "computed again byte for byte" : isChart(out.file) ? "drawn again byte for byte" : "computed again, digest matches");
  }
  for (const f of again?.keys() ?? []) if (!listed.has(f)) add(false, f, msg.notRecorded());
}

/** The PDF: the digest recorded after it was printed. It cannot be made again without the same browser. */
async function checkPdf(record: StudyRecord, folder: string, add: Add): Promise<void> {
  if (record.pdf === undefined) {
    const there = place(folder, "report.pdf", folder, folder);
    if (there.ok || there.why !== "missing") add(false, "report.pdf", msg.pdfNotRecorded());
    return;
  }
  const disk = await outputDigest(folder, record.pdf.file);
  if ("detail" in disk) add(false, record.pdf.file, disk.detail === msg.outputMissing() ? msg.pdfMissing() : disk.detail);
  else if (disk.digest !== record.pdf.sha256) add(false, record.pdf.file, msg.outputChanged());
  else add(true, record.pdf.file, "digest matches the record (the PDF is the page printed by a browser; it is not made again)");
}

/** Files of the report folder that the record does not name (links are listed, not followed). */
function strayFiles(folder: string, record: StudyRecord): string[] {
  const known = new Set(["record.json", ...record.outputs.map((o) => o.file), ...(record.pdf ? [record.pdf.file] : ["report.pdf"])]);
  const stray: string[] = [];
  const walk = (abs: string) => {
    for (const name of readdirSync(abs).sort()) {
      const p = join(abs, name);
      if (lstatSync(p).isDirectory()) walk(p);
      else {
        const rel = relative(folder, p).split(sep).join("/");
        if (!known.has(rel)) stray.push(rel);
      }
    }
  };
  walk(folder);
  return stray;
}
