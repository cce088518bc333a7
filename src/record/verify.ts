import { createHash } from "node:crypto";
import { createReadStream, existsSync, readFileSync } from "node:fs";
import { resolve } from "node:path";
import { loadStudy } from "../manifest/loadStudy.js";
import * as msg from "../messages/output.js";
import { UserError } from "../messages/index.js";
import { runStudy } from "../study/runStudy.js";
import { sha256 } from "../digest.js";
import { resultsJson } from "./publish.js";
import { recordedManifest, type StudyRecord } from "./record.js";

export interface VerifyLine {
  ok: boolean;
  item: string;
  detail: string;
}

export interface Verification {
  ok: boolean;
  lines: VerifyLine[];
}

async function fileDigest(path: string): Promise<string> {
  const h = createHash("sha256");
  for await (const chunk of createReadStream(path)) h.update(chunk as Buffer);
  return h.digest("hex");
}

function readRecord(dir: string): StudyRecord {
  const p = resolve(dir, "record.json");
  if (!existsSync(p)) throw msg.notAReport(dir, "record.json is missing");
  try {
    const r = JSON.parse(readFileSync(p, "utf8")) as StudyRecord;
    if (r.format !== "sojourn-record/1") throw new Error(`unknown format ${String(r.format)}`);
    return r;
  } catch (e) {
    throw msg.notAReport(dir, `record.json cannot be read: ${(e as Error).message}`);
  }
}

/**
 * Re-derives a finished report folder from its study record (issue 5):
 *
 *   record.json ─▶ every input digest ─▶ recompute the study in memory ─▶ results.json byte for
 *   byte ─▶ every table digest ─▶ report.html digest ─▶ verdict
 *
 * Inputs are found relative to the recorded manifest location, or under `inputs` when they moved.
 */
export async function verifyReport(dir: string, options: { inputs?: string } = {}): Promise<Verification> {
  const record = readRecord(dir);
  const lines: VerifyLine[] = [];
  const add = (ok: boolean, item: string, detail: string) => lines.push({ ok, item, detail });
  const manifest = recordedManifest(record, dir);
  const baseDir = options.inputs !== undefined ? resolve(options.inputs) : manifest.dir;

  add(sha256(record.manifest.text) === record.manifest.sha256, "manifest", "recorded text matches its digest");
  let inputsOk = true;
  const recorded = new Set<string>();
  for (const input of record.inputs) {
    recorded.add(input.file);
    const p = resolve(baseDir, ...input.file.split("/"));
    if (!existsSync(p)) {
      inputsOk = false;
      add(false, `input ${input.file}`, "missing");
      continue;
    }
    const d = await fileDigest(p);
    const same = d === input.sha256;
    if (!same) inputsOk = false;
    add(same, `input ${input.file}`, same ? "digest matches" : `changed (sha256 ${d}, recorded ${input.sha256})`);
  }

  let study;
  try {
    study = await loadStudy(manifest.path, { text: record.manifest.text, baseDir });
  } catch (e) {
    if (!(e instanceof UserError)) throw e;
    add(false, "manifest", `cannot be applied to the inputs now: ${e.message.split("\n")[0]}`);
    return { ok: false, lines };
  }
  for (const sc of study.scenarios) {
    for (const run of sc.runs) {
      if (!recorded.has(run.file)) {
        inputsOk = false;
        add(false, `input ${run.file}`, "extra: the manifest now matches this file, which the report did not use");
      }
    }
  }
  if (!inputsOk) {
    add(false, "study", "not recomputed: the inputs differ from the recorded ones");
    return { ok: false, lines };
  }

  const { outcome } = await runStudy(study);
  const recomputed = new Map<string, string>();
  recomputed.set("results.json", sha256(resultsJson(outcome)));
  for (const t of outcome.tables) recomputed.set(t.file, t.sha256);

  for (const out of record.outputs) {
    const onDisk = resolve(dir, ...out.file.split("/"));
    const diskDigest = existsSync(onDisk) ? await fileDigest(onDisk) : null;
    if (diskDigest === null) {
      add(false, out.file, "missing from the report folder");
      continue;
    }
    if (diskDigest !== out.sha256) {
      add(false, out.file, "changed since the report was written (digest differs from the record)");
      continue;
    }
    if (out.file === "report.html") {
      add(true, out.file, "digest matches the record");
      continue;
    }
    const again = recomputed.get(out.file);
    if (again === undefined) add(false, out.file, "not produced when the study is recomputed");
    else if (again !== out.sha256) add(false, out.file, out.file === "results.json" ? "recomputed results differ" : "recomputed table differs");
    else add(true, out.file, out.file === "results.json" ? "recomputed byte for byte" : "recomputed digest matches");
  }
  const listed = new Set(record.outputs.map((o) => o.file));
  for (const f of recomputed.keys()) if (!listed.has(f)) add(false, f, "recomputed study produces this output, which the record lacks");
  return { ok: lines.every((l) => l.ok), lines };
}
