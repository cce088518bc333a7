/**
 * `sojourn report MANIFEST --out DIR --on slurm`: the same report as `--on local`, with the
 * per-run work done by a Slurm job array (docs/distributed.md):
 *
 *   submit (here) ── WORK/study.json: the manifest's digest, DIR, the report's date, one task per run
 *       │            reuse: a summary already in WORK/summaries whose digest, plan and run file match
 *       │            (and the warm-up slices of WORK/warmup, the same way)
 *       │
 *   [MSER-5 only] ── warm-up array, one task per run of an MSER-5 scenario: `sojourn cluster-part
 *       │            WORK i` = the run's first pass (warmupPart) into WORK/warmup/<scenario>/<run>.json;
 *       │            then the warm-up job (`cluster-warmup WORK`, afterok): estimateWarmup from
 *       │            those files, the time to WORK/estimates/<scenario>.json, as a local report does
 *       │
 *   array job ────── (afterok: the warm-up job, when there is one)
 *       │            task i: `sojourn cluster-task WORK i` = summarize-run of run i into
 *       │            WORK/summaries/<scenario>/<run>.json (temporary name, then renamed);
 *       │            its exit status to WORK/status/run-i.rc, its log to WORK/logs/run-i.log
 *   report job ───── --dependency=afterok:<array>: `sojourn cluster-report WORK` = makeReport with
 *       │            --from-summaries WORK/summaries, the warm-ups estimated again from WORK/warmup
 *       │            and the recorded date, so DIR is the local report byte for byte; exit
 *       │            status to WORK/status/report.rc
 *   wait (here) ──── squeue while the jobs are known, the status files always: progress, then the
 *                    outcome, or the first failed run with its log (nothing replaced DIR)
 *
 * Everything under WORK is Sojourn's own: study.json marks the folder, and only the status files
 * of the tasks being submitted are removed before a submission.
 */
import { existsSync, mkdirSync, readdirSync, readFileSync, realpathSync, rmSync, statSync, writeFileSync, renameSync } from "node:fs";
import { dirname, join, resolve } from "node:path";
import { sha256 } from "../digest.js";
import { loadStudy } from "../manifest/loadStudy.js";
import type { Scenario, Study } from "../manifest/types.js";
import * as msg from "../messages/cluster.js";
import { checkReportDir } from "../record/outputDir.js";
import { writeOwnFiles } from "../record/outputFile.js";
import { studyInputs } from "../record/ownership.js";
import { reportDate } from "../record/publish.js";
import { fileDigest } from "../regularFile.js";
import { makeReport, type ReportOptions } from "../story/makeReport.js";
import { decodeSummary, scenarioPlans, summarizeRun, summaryPath } from "../study/runSummary.js";
import { estimateWarmup, resolveWarmup, type ResolvedWarmup, type WarmupPart } from "../study/warmup.js";
import { decodeWarmupPart, makeWarmupPart, unusable, warmupPlan } from "../study/warmupPart.js";
import { arrayList, arrayRequest, reportRequest, type TaskRequest } from "./sizing.js";
import { anyAlive, jobScript, sbatch, shellWord } from "./slurm.js";

export const WORK_FORMAT = "sojourn-slurm-work/1";

/** What a cluster user sets for the jobs. */
export interface SlurmOptions {
  partition?: string;
  account?: string;
  /** `--mem` of each task, as sbatch takes it (`2G`, `900M`); default from the run files' sizes. */
  memPerTask?: string;
  /** `--time` of each task, as sbatch takes it (`30`, `1:30:00`); default from the run files' sizes. */
  timePerTask?: string;
  /** At most this many tasks run at once (`--array=...%N`). */
  maxRunning?: number;
  /** More sbatch arguments, given to both jobs as they are. */
  sbatchArgs: string[];
}

export interface ClusterReportOptions {
  out: string;
  /** The work folder on storage every node sees; default `<DIR>.work` beside DIR. */
  work?: string;
  force: boolean;
  pdf: boolean;
  edition: "audit" | "client";
  paper: "A4" | "Letter";
  chrome?: string;
  wait: boolean;
  slurm: SlurmOptions;
  onProgress?: (message: string) => void;
  /** Seconds between two looks at the jobs (default 2). */
  pollSeconds?: number;
}

interface Task {
  scenario: string;
  run: string;
  /** The summary file, relative to WORK. */
  summary: string;
}

/** WORK/study.json. */
interface WorkFile {
  format: string;
  /** Digest of everything that makes the jobs: same key, same jobs. */
  key: string;
  manifest: string;
  manifest_sha256: string;
  out: string;
  generated_at: string;
  report: { force: boolean; pdf: boolean; edition: "audit" | "client"; paper: "A4" | "Letter"; chrome: string | null };
  tasks: Task[];
  /** Indices of the tasks the array runs (the others were reused). */
  submitted: number[];
  /** The first-pass tasks of the runs of MSER-5 scenarios (`summary`: their part file), and those submitted. */
  parts: Task[];
  submitted_parts: number[];
  jobs: { parts: string | null; warmup: string | null; runs: string | null; report: string };
}

export interface ClusterOutcome {
  dir: string;
  work: string;
  jobs: WorkFile["jobs"];
  /** Runs summarised by this submission, and runs whose summary was reused. */
  ran: number;
  reused: number;
  /** False with `--no-wait`: the jobs are queued, nothing is known yet. */
  finished: boolean;
}

const SUMMARIES = "summaries";
const PARTS = "warmup";
const ESTIMATES = "estimates";

/** The Sojourn command line a job runs: this Node and this build, by absolute path. */
function sojournCommand(): string[] {
  return [process.execPath, realpathSync(process.argv[1])].map(shellWord);
}

function readWork(work: string): WorkFile | null {
  const file = join(work, "study.json");
  if (!existsSync(file)) {
    if (existsSync(work) && (!statSync(work).isDirectory() || readdirSync(work).length > 0)) {
      throw msg.workNotOurs(work, statSync(work).isDirectory() ? "it is not empty and holds no study.json" : "it is a file");
    }
    return null;
  }
  let parsed: WorkFile;
  try {
    parsed = JSON.parse(readFileSync(file, "utf8")) as WorkFile;
  } catch (e) {
    throw msg.workNotOurs(work, `study.json is not JSON: ${(e as Error).message}`);
  }
  if (parsed?.format !== WORK_FORMAT) throw msg.workNotOurs(work, `study.json is not "${WORK_FORMAT}"`);
  return parsed;
}

function writeAtomic(path: string, text: string): void {
  const temp = `${path}.tmp-${process.pid}`;
  writeFileSync(temp, text);
  renameSync(temp, path);
}

/**
 * One run's warm-up part from WORK, checked: its digest, its plan, and its run file's SHA-256
 * where the file can be read (as a summary is checked). Throws when it cannot be used.
 */
async function readPart(work: string, scenario: Scenario, run: string): Promise<WarmupPart> {
  const path = join(work, PARTS, summaryPath(scenario.name, run));
  const plan = warmupPlan(scenario, run);
  const { part, inputSha256 } = decodeWarmupPart(readFileSync(path, "utf8"), plan, path);
  let now: string | null = null;
  try {
    now = await fileDigest(plan.run.path);
  } catch {
    // not readable here: the part is used as it is, and the run's summary carries the warning
  }
  if (now !== null && now !== inputSha256) throw msg.warmupStale(path, plan.run.file);
  return part;
}

/** The warm-up of an MSER-5 scenario from the parts in WORK, exactly as a local report estimates it. */
async function warmupFromParts(work: string, scenario: Scenario): Promise<ResolvedWarmup> {
  const parts: WarmupPart[] = [];
  for (const run of scenario.runs) parts.push(await readPart(work, scenario, run.id));
  return estimateWarmup(scenario, parts);
}

/** Whether the summary of a task can be used as it is: its digest, plan and run file match. */
async function reusable(work: string, study: Study, task: Task, estimated: ReadonlyMap<string, ResolvedWarmup | null>): Promise<boolean> {
  const path = join(work, task.summary);
  if (!existsSync(path)) return false;
  const scenario = study.scenarios.find((s) => s.name === task.scenario)!;
  // An MSER-5 scenario's summaries are reused only when its warm-up is known from reused parts.
  const warmup = scenario.warmup.type === "mser-5" ? estimated.get(scenario.name) : await resolveWarmup(study, scenario);
  if (warmup === null || warmup === undefined) return false;
  const plan = scenarioPlans(study, scenario, warmup.time)[scenario.runs.findIndex((r) => r.id === task.run)];
  try {
    const a = decodeSummary(readFileSync(path, "utf8"), plan, path);
    return (await fileDigest(plan.run.path)) === a.input.sha256;
  } catch (e) {
    if (unusable(e)) return false;
    throw e;
  }
}

/**
 * Whether the ended submission in WORK made its report from the run files as they are now: the
 * same runs, each run file with the digest its summary recorded.
 */
async function stillCurrent(work: string, study: Study, w: WorkFile): Promise<boolean> {
  const now = study.scenarios.flatMap((sc) => sc.runs.map((r) => ({ scenario: sc.name, run: r.id, path: r.path })));
  if (now.length !== w.tasks.length || now.some((t, i) => t.scenario !== w.tasks[i].scenario || t.run !== w.tasks[i].run)) return false;
  for (const [i, t] of now.entries()) {
    let recorded: unknown;
    try {
      recorded = (JSON.parse(readFileSync(join(work, w.tasks[i].summary), "utf8")) as { input_sha256?: unknown }).input_sha256;
    } catch {
      return false;
    }
    if (typeof recorded !== "string" || recorded !== (await fileDigest(t.path))) return false;
  }
  return true;
}

/** Submits the study (or follows the submission already in WORK with the same settings) and, unless `--no-wait`, waits for it. */
export async function clusterReport(manifest: string, o: ClusterReportOptions): Promise<ClusterOutcome> {
  const progress = o.onProgress ?? (() => {});
  const study = await loadStudy(manifest);
  const out = resolve(o.out);
  const work = resolve(o.work ?? `${out}.work`);
  // DIR is checked now with the report's own rule (and the summaries the report job will read
  // as inputs), so that a refused folder costs no job: the report job checks it again.
  checkReportDir(o.out, { force: o.force, inputs: studyInputs(study, join(work, SUMMARIES)) });
  const report = { force: o.force, pdf: o.pdf, edition: o.edition, paper: o.paper, chrome: o.chrome ?? null };
  const key = sha256(JSON.stringify({ manifest: study.manifestPath, sha: sha256(study.manifestText), out, report, slurm: o.slurm }));
  const before = readWork(work);
  const jobsOf = (w: WorkFile) => [w.jobs.parts, w.jobs.warmup, w.jobs.runs, w.jobs.report].filter((j): j is string => j !== null);

  let w: WorkFile;
  const alive = before !== null && anyAlive(jobsOf(before));
  if (before !== null && (alive || (readStatus(join(work, "status", "report.rc")) === 0 && (await stillCurrent(work, study, before))))) {
    // A submission of the same study is queued, running, or ended with a report of the run files
    // as they are now: follow it. A report of files changed since is made again.
    if (before.key !== key) {
      if (alive) throw msg.workInUse(work, jobsOf(before).join(","));
      w = await submit(study, work, out, key, report, o, progress);
    } else {
      w = before;
      progress(`following the submission already in ${work} (jobs ${jobsOf(w).join(", ")})`);
    }
  } else {
    w = await submit(study, work, out, key, report, o, progress);
  }
  const ran = w.submitted.length;
  const result = { dir: out, work, jobs: w.jobs, ran, reused: w.tasks.length - ran };
  if (!o.wait) return { ...result, finished: false };
  await follow(work, w, progress, o.pollSeconds ?? 2);
  return { ...result, finished: true };
}

async function submit(
  study: Study,
  work: string,
  out: string,
  key: string,
  report: WorkFile["report"],
  o: ClusterReportOptions,
  progress: (m: string) => void,
): Promise<WorkFile> {
  for (const sub of ["", SUMMARIES, PARTS, ESTIMATES, "logs", "status", "jobs"]) mkdirSync(join(work, sub), { recursive: true });
  const tasks: Task[] = study.scenarios.flatMap((sc) => sc.runs.map((r) => ({ scenario: sc.name, run: r.id, summary: `${SUMMARIES}/${summaryPath(sc.name, r.id)}` })));
  const mser = study.scenarios.filter((sc) => sc.warmup.type === "mser-5");
  const parts: Task[] = mser.flatMap((sc) => sc.runs.map((r) => ({ scenario: sc.name, run: r.id, summary: `${PARTS}/${summaryPath(sc.name, r.id)}` })));
  const submittedParts: number[] = [];
  for (const [i, t] of parts.entries()) {
    try {
      await readPart(work, mser.find((sc) => sc.name === t.scenario)!, t.run);
    } catch (e) {
      if (!unusable(e)) throw e;
      submittedParts.push(i);
    }
  }
  if (parts.length > submittedParts.length) progress(`reusing ${parts.length - submittedParts.length} of ${parts.length} warm-up parts already in ${work}`);
  // The warm-up of a scenario whose parts are all reused is known now; the others' after the warm-up job.
  const estimated = new Map<string, ResolvedWarmup | null>();
  for (const sc of mser) estimated.set(sc.name, parts.some((t, i) => t.scenario === sc.name && submittedParts.includes(i)) ? null : await warmupFromParts(work, sc));
  const submitted: number[] = [];
  for (const [i, t] of tasks.entries()) if (!(await reusable(work, study, t, estimated))) submitted.push(i);
  if (tasks.length > submitted.length) progress(`reusing ${tasks.length - submitted.length} of ${tasks.length} run summaries already in ${work}`);

  // Only this submission's status files are removed: the tasks about to run, and the jobs'.
  for (const i of submitted) rmSync(join(work, "status", `run-${i}.rc`), { force: true });
  for (const i of submittedParts) rmSync(join(work, "status", `part-${i}.rc`), { force: true });
  rmSync(join(work, "status", "warmup.rc"), { force: true });
  rmSync(join(work, "status", "report.rc"), { force: true });

  const runs = study.scenarios.flatMap((sc) => sc.runs);
  const request: TaskRequest = arrayRequest(submitted.map((i) => ({ bytes: statSync(runs[i].path).size, file: runs[i].file })));
  const partRuns = mser.flatMap((sc) => sc.runs);
  const partRequest: TaskRequest = arrayRequest(submittedParts.map((i) => ({ bytes: statSync(partRuns[i].path).size, file: partRuns[i].file })));
  const common = [`--chdir=${process.cwd()}`, ...(o.slurm.partition ? [`--partition=${o.slurm.partition}`] : []), ...(o.slurm.account ? [`--account=${o.slurm.account}`] : [])];
  const w: WorkFile = {
    format: WORK_FORMAT,
    key,
    manifest: study.manifestPath,
    manifest_sha256: sha256(study.manifestText),
    out,
    generated_at: reportDate(),
    report,
    tasks,
    submitted,
    parts,
    submitted_parts: submittedParts,
    jobs: { parts: null, warmup: null, runs: null, report: "" },
  };
  writeAtomic(join(work, "study.json"), JSON.stringify(w, null, 2) + "\n");

  const cmd = sojournCommand();
  const size = (r: TaskRequest) => [`--mem=${o.slurm.memPerTask ?? `${r.memoryMb}M`}`, `--time=${o.slurm.timePerTask ?? r.minutes}`];
  if (submittedParts.length > 0) {
    const status = `${shellWord(join(work, "status", "part-"))}"$SLURM_ARRAY_TASK_ID"${shellWord(".rc")}`;
    const script = join(work, "jobs", "parts.sh");
    writeFileSync(script, jobScript("the warm-up slices, one task per run of an MSER-5 scenario", [...cmd, "cluster-part", shellWord(work), '"$SLURM_ARRAY_TASK_ID"'], status), { mode: 0o755 });
    w.jobs.parts = sbatch(
      [
        `--array=${arrayList(submittedParts)}${o.slurm.maxRunning !== undefined ? `%${o.slurm.maxRunning}` : ""}`,
        "--job-name=sojourn-warmup-parts",
        `--output=${join(work, "logs", "part-%a.log")}`,
        "--ntasks=1",
        "--cpus-per-task=1",
        ...size(partRequest),
        ...common,
        ...o.slurm.sbatchArgs,
        script,
      ],
      "job array of the warm-up slices",
    );
  }
  if (mser.length > 0) {
    const script = join(work, "jobs", "warmup.sh");
    writeFileSync(script, jobScript("the MSER-5 warm-ups, from every run's slices", [...cmd, "cluster-warmup", shellWord(work)], shellWord(join(work, "status", "warmup.rc"))), { mode: 0o755 });
    w.jobs.warmup = sbatch(
      [
        ...(w.jobs.parts !== null ? [`--dependency=afterok:${w.jobs.parts}`, "--kill-on-invalid-dep=yes"] : []),
        "--job-name=sojourn-warmup",
        `--output=${join(work, "logs", "warmup.log")}`,
        "--ntasks=1",
        "--cpus-per-task=1",
        "--mem=512M",
        "--time=10",
        ...common,
        ...o.slurm.sbatchArgs,
        script,
      ],
      "warm-up job",
    );
  }
  if (submitted.length > 0) {
    const status = `${shellWord(join(work, "status", "run-"))}"$SLURM_ARRAY_TASK_ID"${shellWord(".rc")}`;
    const script = join(work, "jobs", "runs.sh");
    writeFileSync(script, jobScript("one task per run of the study", [...cmd, "cluster-task", shellWord(work), '"$SLURM_ARRAY_TASK_ID"'], status), { mode: 0o755 });
    w.jobs.runs = sbatch(
      [
        `--array=${arrayList(submitted)}${o.slurm.maxRunning !== undefined ? `%${o.slurm.maxRunning}` : ""}`,
        ...(w.jobs.warmup !== null ? [`--dependency=afterok:${w.jobs.warmup}`, "--kill-on-invalid-dep=yes"] : []),
        "--job-name=sojourn-runs",
        `--output=${join(work, "logs", "run-%a.log")}`,
        "--ntasks=1",
        "--cpus-per-task=1",
        `--mem=${o.slurm.memPerTask ?? `${request.memoryMb}M`}`,
        `--time=${o.slurm.timePerTask ?? request.minutes}`,
        ...common,
        ...o.slurm.sbatchArgs,
        script,
      ],
      "job array of the runs",
    );
  }
  const reportScript = join(work, "jobs", "report.sh");
  writeFileSync(reportScript, jobScript("the report, once every run is summarised", [...cmd, "cluster-report", shellWord(work)], shellWord(join(work, "status", "report.rc"))), { mode: 0o755 });
  const rr = reportRequest(request);
  w.jobs.report = sbatch(
    [
      ...((w.jobs.runs ?? w.jobs.warmup) !== null ? [`--dependency=afterok:${w.jobs.runs ?? w.jobs.warmup}`, "--kill-on-invalid-dep=yes"] : []),
      "--job-name=sojourn-report",
      `--output=${join(work, "logs", "report.log")}`,
      "--ntasks=1",
      "--cpus-per-task=1",
      `--mem=${rr.memoryMb}M`,
      `--time=${rr.minutes}`,
      ...common,
      ...o.slurm.sbatchArgs,
      reportScript,
    ],
    "report job",
  );
  writeAtomic(join(work, "study.json"), JSON.stringify(w, null, 2) + "\n");
  if (w.jobs.warmup !== null) {
    progress(
      `submitted ${w.jobs.parts !== null ? `warm-up job array ${w.jobs.parts} (${submittedParts.length} runs) and ` : ""}warm-up job ${w.jobs.warmup}${w.jobs.parts !== null ? " after it" : ""} (MSER-5 in ${mser.length} scenario${mser.length === 1 ? "" : "s"}; the runs wait for it)`,
    );
  }
  progress(
    w.jobs.runs !== null
      ? `submitted job array ${w.jobs.runs} (${submitted.length} runs, ${o.slurm.memPerTask ?? `${request.memoryMb}M`} and ${o.slurm.timePerTask ?? `${request.minutes} min`} each) and report job ${w.jobs.report} after it`
      : `every run summary is reused: submitted report job ${w.jobs.report}`,
  );
  return w;
}

/** A status file's exit status, or null when there is none (yet). */
function readStatus(path: string): number | null {
  try {
    const text = readFileSync(path, "utf8").trim();
    return /^\d+$/.test(text) ? Number(text) : null;
  } catch {
    return null;
  }
}

/** Why a job failed, as its log says: Sojourn's message (first line), else the log's last line. */
function failureOf(log: string, status: number | null): string {
  let text = "";
  try {
    text = readFileSync(log, "utf8");
  } catch {
    // no log: Slurm did not start the job, or the log is elsewhere
  }
  const lines = text.split("\n").filter((l) => l.trim() !== "");
  const ours = lines.find((l) => l.startsWith("sojourn: "));
  if (ours !== undefined) return ours.slice("sojourn: ".length);
  if (status !== null) return `exit status ${status}${lines.length > 0 ? `; the log ends: ${lines[lines.length - 1]}` : ""}`;
  return `the job ended without finishing (cancelled, killed, or over its time or memory limit)${lines.length > 0 ? `; the log ends: ${lines[lines.length - 1]}` : ""}`;
}

const sleep = (s: number) => new Promise((r) => setTimeout(r, s * 1000));

/** Waits for the submission in WORK to end; throws the first failed run or the report's failure. */
async function follow(work: string, w: WorkFile, progress: (m: string) => void, poll: number): Promise<void> {
  const jobs = [w.jobs.parts, w.jobs.warmup, w.jobs.runs, w.jobs.report].filter((j): j is string => j !== null);
  const reportRc = join(work, "status", "report.rc");
  let shown = -1;
  let shownParts = -1;
  for (;;) {
    const partsDone = w.submitted_parts.filter((i) => readStatus(join(work, "status", `part-${i}.rc`)) === 0).length;
    if (partsDone !== shownParts && w.submitted_parts.length > 0) {
      progress(`warm-up slices made on Slurm: ${partsDone} of ${w.submitted_parts.length} (job array ${w.jobs.parts})`);
      shownParts = partsDone;
    }
    const done = w.submitted.filter((i) => readStatus(join(work, "status", `run-${i}.rc`)) === 0).length;
    if (done !== shown && w.submitted.length > 0) {
      progress(`runs summarised on Slurm: ${done} of ${w.submitted.length}${w.jobs.runs !== null ? ` (job array ${w.jobs.runs})` : ""}`);
      shown = done;
    }
    const rc = readStatus(reportRc);
    if (rc !== null) {
      if (rc === 0) return;
      throw msg.reportFailed(w.jobs.report, join(work, "logs", "report.log"), failureOf(join(work, "logs", "report.log"), rc));
    }
    // Ended without a report status: look at the status files once more (a job may just have written one).
    if (!anyAlive(jobs) && readStatus(reportRc) === null) break;
    await sleep(poll);
  }
  for (const i of w.submitted_parts) {
    const rc = readStatus(join(work, "status", `part-${i}.rc`));
    if (rc === 0) continue;
    const t = w.parts[i];
    const log = join(work, "logs", `part-${i}.log`);
    throw msg.taskFailed(t.scenario, t.run, `${w.jobs.parts}_${i}`, log, failureOf(log, rc));
  }
  if (w.jobs.warmup !== null && readStatus(join(work, "status", "warmup.rc")) !== 0) {
    const log = join(work, "logs", "warmup.log");
    throw msg.warmupFailed(w.jobs.warmup, log, failureOf(log, readStatus(join(work, "status", "warmup.rc"))));
  }
  for (const i of w.submitted) {
    const rc = readStatus(join(work, "status", `run-${i}.rc`));
    if (rc === 0) continue;
    const t = w.tasks[i];
    const log = join(work, "logs", `run-${i}.log`);
    throw msg.taskFailed(t.scenario, t.run, `${w.jobs.runs}_${i}`, log, failureOf(log, rc));
  }
  const log = join(work, "logs", "report.log");
  throw msg.reportFailed(w.jobs.report, log, failureOf(log, null));
}

function loadWork(work: string): WorkFile {
  const w = readWork(resolve(work));
  if (w === null) throw msg.workNotOurs(work, "it holds no study.json");
  return w;
}

async function workStudy(work: string, w: WorkFile): Promise<Study> {
  const study = await loadStudy(w.manifest);
  if (sha256(study.manifestText) !== w.manifest_sha256) throw msg.workStudyChanged(work);
  return study;
}

/** One array task (`sojourn cluster-task WORK i`): summarize-run of task i into the work folder. */
export async function clusterTask(work: string, index: number): Promise<string> {
  const w = loadWork(work);
  const t = w.tasks[index];
  if (t === undefined) throw msg.workNotOurs(work, `it has no task ${index}`);
  const study = await workStudy(work, w);
  const scenario = study.scenarios.find((s) => s.name === t.scenario)!;
  const estimated = scenario.warmup.type === "mser-5" ? readEstimate(work, scenario.name) : undefined;
  const { text, analysis } = await summarizeRun(study, t.scenario, t.run, estimated);
  const path = join(resolve(work), t.summary);
  writeOwnFiles([{ path, text }], { kind: "run summary", force: false, inputs: studyInputs(study) });
  return `wrote ${path}: run ${t.run} of scenario ${t.scenario}, ${analysis.input.rows} rows, input sha256 ${analysis.input.sha256}`;
}

/** WORK/estimates/<scenario>.json. */
interface EstimateFile {
  format: string;
  scenario: string;
  time: number | null;
}
const ESTIMATE_FORMAT = "sojourn-warmup-estimate/1";

function readEstimate(work: string, scenario: string): { time: number | null } {
  const path = join(resolve(work), ESTIMATES, summaryPath(scenario, "warmup"));
  let e: EstimateFile;
  try {
    e = JSON.parse(readFileSync(path, "utf8")) as EstimateFile;
  } catch (err) {
    throw msg.workNotOurs(work, `its warm-up estimate ${path} cannot be read: ${(err as Error).message}`);
  }
  if (e?.format !== ESTIMATE_FORMAT || e.scenario !== scenario || !(e.time === null || typeof e.time === "number")) throw msg.workNotOurs(work, `${path} is not a warm-up estimate of scenario "${scenario}"`);
  return { time: e.time };
}

/** One task of the warm-up array (`sojourn cluster-part WORK i`): the first pass of one run of an MSER-5 scenario. */
export async function clusterPart(work: string, index: number): Promise<string> {
  const w = loadWork(work);
  const t = w.parts[index];
  if (t === undefined) throw msg.workNotOurs(work, `it has no warm-up task ${index}`);
  const study = await workStudy(work, w);
  const scenario = study.scenarios.find((s) => s.name === t.scenario)!;
  const { text, sha256: digest } = await makeWarmupPart(scenario, t.run);
  const path = join(resolve(work), t.summary);
  mkdirSync(dirname(path), { recursive: true });
  writeAtomic(path, text);
  return `wrote ${path}: warm-up slices of run ${t.run} of scenario ${t.scenario}, input sha256 ${digest}`;
}

/** The warm-up job (`sojourn cluster-warmup WORK`): each MSER-5 scenario's warm-up from its runs' parts. */
export async function clusterWarmup(work: string): Promise<string> {
  const w = loadWork(work);
  const study = await workStudy(work, w);
  const lines: string[] = [];
  for (const scenario of study.scenarios.filter((s) => s.warmup.type === "mser-5")) {
    const { time } = await warmupFromParts(resolve(work), scenario);
    const path = join(resolve(work), ESTIMATES, summaryPath(scenario.name, "warmup"));
    mkdirSync(dirname(path), { recursive: true });
    const e: EstimateFile = { format: ESTIMATE_FORMAT, scenario: scenario.name, time };
    writeAtomic(path, JSON.stringify(e) + "\n");
    lines.push(`scenario ${scenario.name}: warm-up ${time === null ? "none" : time}`);
  }
  return lines.join("\n");
}

/** The report job (`sojourn cluster-report WORK`): the local report's code on the summaries, with the recorded date. */
export async function clusterFinish(work: string, onProgress?: (m: string) => void): Promise<string> {
  const w = loadWork(work);
  // The warm-ups are estimated again from the parts (a few numbers per run), not taken from the
  // warm-up job's file: a summary made with another warm-up then fails its plan check.
  const study = await workStudy(work, w);
  const warmups = new Map<string, ResolvedWarmup>();
  for (const sc of study.scenarios) if (sc.warmup.type === "mser-5") warmups.set(sc.name, await warmupFromParts(resolve(work), sc));
  const options: ReportOptions = {
    warmups,
    out: w.out,
    force: w.report.force,
    pdf: w.report.pdf,
    edition: w.report.edition,
    paper: w.report.paper,
    chrome: w.report.chrome ?? undefined,
    generatedAt: w.generated_at,
    fromSummaries: join(resolve(work), SUMMARIES),
    onProgress,
    onStudy: (study) => {
      if (sha256(study.manifestText) !== w.manifest_sha256) throw msg.workStudyChanged(work);
    },
  };
  const r = await makeReport(w.manifest, options);
  return r.dir;
}
