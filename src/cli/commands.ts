import { join, resolve } from "node:path";
import { loadStudy } from "../manifest/loadStudy.js";
import type { Study } from "../manifest/types.js";
import * as clusterMessages from "../messages/cluster.js";
import { UserError } from "../messages/index.js";
import { terminalJson, terminalText } from "../messages/terminal.js";
import { mark } from "../timing.js";

// Each command loads what it needs when it runs, so that starting the command line stays quick.
const story = () => import("../story/makeReport.js");

let status = 0;
/** The exit status a command asked for without throwing (verify's verdict). */
export function exitStatus(): number {
  return status;
}

// Every line shown holds names from files and manifests: control characters in them are escaped
// (messages/terminal.ts), line feeds too, so that a name can neither drive the terminal nor fake a line.
const say = (line: string) => process.stdout.write(terminalText(line) + "\n");
const sayJson = (value: unknown, indent?: number) => process.stdout.write(terminalJson(value, indent) + "\n");
const progressTo = (quiet: boolean | undefined) => (quiet ? undefined : (m: string) => process.stderr.write(`  ${terminalText(m)}\n`));

/** Says on standard error when fewer workers are used than `--workers` or SOJOURN_WORKERS asked for. */
async function noteWorkers(study: Study, workers: number | undefined): Promise<void> {
  const { chooseWorkers } = await import("../study/pool.js");
  const { note } = chooseWorkers(study.scenarios.reduce((n, s) => n + s.runs.length, 0), workers);
  if (note !== null) process.stderr.write(`sojourn: ${terminalText(note)}\n`);
}

export async function report(
  manifest: string,
  o: ReportFlags,
): Promise<void> {
  const started = Date.now();
  if (o.on === "slurm") return reportOnSlurm(manifest, o, started);
  const { makeReport } = await story();
  mark("report modules loaded");
  const r = await makeReport(manifest, {
    ...reportOutput(o),
    onStudy: (study) => noteWorkers(study, o.workers),
    workers: o.workers,
    fromSummaries: o.fromSummaries,
  });
  summarize(r.dir, r.outcome.warnings.length, Date.now() - started, r.pdfPages);
}

/** What a report writes and how it tells its progress: the same for a local report and one on Slurm. */
function reportOutput(o: ReportFlags) {
  return { out: o.out, force: o.force ?? false, pdf: o.pdf ?? false, edition: o.edition, paper: o.paper, chrome: o.chrome, onProgress: progressTo(o.quiet) };
}

interface ReportFlags {
  out: string;
  pdf?: boolean;
  edition: "audit" | "client";
  paper: "A4" | "Letter";
  chrome?: string;
  force?: boolean;
  quiet?: boolean;
  workers?: number;
  fromSummaries?: string;
  on?: "local" | "slurm";
  work?: string;
  wait?: boolean;
  partition?: string;
  account?: string;
  memPerTask?: string;
  timePerTask?: string;
  maxRunning?: number;
  sbatchArg?: string[];
}

async function reportOnSlurm(manifest: string, o: ReportFlags, started: number): Promise<void> {
  if (o.fromSummaries !== undefined) throw new UserError("--on slurm makes the run summaries itself: it cannot take --from-summaries.\n  What to do: leave out one of the two.", 2);
  if (o.memPerTask !== undefined && !/^\d+[KMGT]?$/i.test(o.memPerTask)) throw clusterMessages.badSize("--mem-per-task", o.memPerTask, "2G, 900M or 4096 (MB)");
  if (o.timePerTask !== undefined && !/^(\d+-)?\d+(:\d+){0,2}$/.test(o.timePerTask)) throw clusterMessages.badSize("--time-per-task", o.timePerTask, "30 (minutes), 1:30:00 or 2-00:00:00");
  const { clusterReport } = await import("../cluster/clusterReport.js");
  const wait = o.wait ?? true;
  const r = await clusterReport(manifest, {
    ...reportOutput(o),
    work: o.work,
    wait,
    slurm: { partition: o.partition, account: o.account, memPerTask: o.memPerTask, timePerTask: o.timePerTask, maxRunning: o.maxRunning, sbatchArgs: o.sbatchArg ?? [] },
    pollSeconds: pollSeconds(),
  });
  const jobs = r.jobs.runs !== null ? `job array ${r.jobs.runs} (${r.ran} runs) and report job ${r.jobs.report}` : `report job ${r.jobs.report}`;
  if (!r.finished) {
    say(`Submitted to Slurm: ${jobs}; ${r.reused} run summaries reused. Work folder: ${r.work}`);
    say("To wait for the jobs and see the outcome (the same command follows them, never submits twice):");
    const flags = [`--out ${shellArg(o.out)}`, "--on slurm", `--work ${shellArg(r.work)}`, ...slurmFlags(o)];
    say(`  sojourn report ${shellArg(manifest)} ${flags.join(" ")}`);
    return;
  }
  say(`Report written to ${r.dir} on Slurm (${jobs}; ${r.reused} run summaries reused) in ${((Date.now() - started) / 1000).toFixed(1)} s`);
  say(`  ${join(r.dir, "report.html")}   open in a browser`);
  if (o.pdf) say(`  ${join(r.dir, "report.pdf")}    if Chromium was found on the node (see ${join(r.work, "logs", "report.log")})`);
  say(`  ${join(r.dir, "results.json")}  every number at full precision`);
}

/** The flags that make the same submission again (so that following it matches its settings). */
function slurmFlags(o: ReportFlags): string[] {
  const out: string[] = [];
  if (o.pdf) out.push("--pdf");
  if (o.edition !== "audit") out.push(`--edition ${o.edition}`);
  if (o.paper !== "A4") out.push(`--paper ${o.paper}`);
  if (o.chrome !== undefined) out.push(`--chrome ${shellArg(o.chrome)}`);
  if (o.force) out.push("--force");
  if (o.partition !== undefined) out.push(`--partition ${shellArg(o.partition)}`);
  if (o.account !== undefined) out.push(`--account ${shellArg(o.account)}`);
  if (o.memPerTask !== undefined) out.push(`--mem-per-task ${shellArg(o.memPerTask)}`);
  if (o.timePerTask !== undefined) out.push(`--time-per-task ${shellArg(o.timePerTask)}`);
  if (o.maxRunning !== undefined) out.push(`--max-running ${o.maxRunning}`);
  for (const a of o.sbatchArg ?? []) out.push(`--sbatch-arg=${shellArg(a)}`);
  return out;
}

/** A word for the user's shell: as it is when it is plain, else single-quoted. */
function shellArg(s: string): string {
  return /^[\w@%+=:,./-]+$/.test(s) ? s : `'${s.replace(/'/g, `'\\''`)}'`;
}

/** Seconds between two looks at the jobs: $SOJOURN_SLURM_POLL (tests), else 2. */
function pollSeconds(): number {
  const v = Number(process.env.SOJOURN_SLURM_POLL);
  return Number.isFinite(v) && v > 0 ? v : 2;
}

export async function clusterTask(work: string, index: string): Promise<void> {
  const { clusterTask: task } = await import("../cluster/clusterReport.js");
  if (!/^\d+$/.test(index)) throw new UserError(`cluster-task: the task index ${JSON.stringify(index)} is not a whole number.\n  What to do: this command is run by the job array of \`report --on slurm\`.`, 2);
  say(await task(work, Number(index)));
}

export async function clusterPart(work: string, index: string): Promise<void> {
  const { clusterPart: part } = await import("../cluster/clusterReport.js");
  if (!/^\d+$/.test(index)) throw new UserError(`cluster-part: the task index ${JSON.stringify(index)} is not a whole number.\n  What to do: this command is run by the warm-up array of \`report --on slurm\`.`, 2);
  say(await part(work, Number(index)));
}

export async function clusterWarmup(work: string): Promise<void> {
  const { clusterWarmup: warmup } = await import("../cluster/clusterReport.js");
  say(await warmup(work));
}

export async function clusterReport(work: string): Promise<void> {
  const { clusterFinish } = await import("../cluster/clusterReport.js");
  const dir = await clusterFinish(work, progressTo(false));
  say(`Report written to ${dir}`);
}

function summarize(dir: string, warnings: number, ms: number, pdfPages: number | null): void {
  say(`Report written to ${dir} in ${(ms / 1000).toFixed(1)} s`);
  say(`  ${join(dir, "report.html")}   open in a browser`);
  if (pdfPages !== null) say(`  ${join(dir, "report.pdf")}    ${pdfPages} pages`);
  say(`  ${join(dir, "results.json")}  every number at full precision`);
  if (warnings > 0) say(`  ${warnings} warning(s): see the report's warnings section`);
}

export async function check(manifest: string, o: { json?: boolean; workers?: number }): Promise<void> {
  const study = await loadStudy(manifest);
  await noteWorkers(study, o.workers);
  const [{ runStudy }, { studyPlan, planText }] = await Promise.all([import("../study/runStudy.js"), import("./plan.js")]);
  const { outcome } = await runStudy(study, { workers: o.workers });
  const plan = studyPlan(study, outcome);
  if (o.json) sayJson(plan, 2);
  else for (const line of planText(plan)) say(line);
}

export async function moreRuns(manifest: string, o: { json?: boolean; workers?: number }): Promise<void> {
  const study = await loadStudy(manifest);
  await noteWorkers(study, o.workers);
  const [{ runStudy }, { moreRunsPlan, moreRunsText }] = await Promise.all([import("../study/runStudy.js"), import("./moreRuns.js")]);
  const { outcome } = await runStudy(study, { workers: o.workers });
  const plan = moreRunsPlan(study, outcome.results);
  if (o.json) sayJson(plan, 2);
  else for (const line of moreRunsText(plan)) say(line);
}

export async function at(manifest: string, o: { scenario: string; run: string; measure: string; time: number; json?: boolean }): Promise<void> {
  const study = await loadStudy(manifest);
  const { timeAverageAt } = await import("../study/at.js");
  const r = await timeAverageAt(study, o, o.time);
  if (o.json) sayJson(r.result);
  else for (const line of r.lines) say(line);
}

export async function table(manifest: string, o: { scenario: string; run: string; measure: string; out?: string; force?: boolean }): Promise<void> {
  const study = await loadStudy(manifest);
  const { fullTable } = await import("../study/fullTable.js");
  const tables = await fullTable(study, o);
  if (o.out === undefined) {
    // CSV is data: written as it is, unless a terminal shows it
    process.stdout.write(process.stdout.isTTY ? terminalText(tables[0].csv, { keepNewlines: true }) : tables[0].csv);
    return;
  }
  const out = o.out;
  const files = tables.map((t) => ({ path: t.suffix === "" ? out : out.replace(/(\.csv)?$/, `.${t.suffix}.csv`), text: t.csv }));
  const [{ writeOwnFiles }, { studyInputs }] = await Promise.all([import("../record/outputFile.js"), import("../record/ownership.js")]);
  writeOwnFiles(files, { kind: "calculation table", force: o.force ?? false, inputs: studyInputs(study) });
  for (const f of files) say(`wrote ${f.path}`);
}

export async function summarizeRun(manifest: string, o: { scenario: string; run: string; out: string; force?: boolean }): Promise<void> {
  const study = await loadStudy(manifest);
  const [{ summarizeRun: summarize }, { writeOwnFiles }, { studyInputs }] = await Promise.all([
    import("../study/runSummary.js"),
    import("../record/outputFile.js"),
    import("../record/ownership.js"),
  ]);
  const { text, analysis } = await summarize(study, o.scenario, o.run);
  writeOwnFiles([{ path: o.out, text }], { kind: "run summary", force: o.force ?? false, inputs: studyInputs(study) });
  say(`wrote ${o.out}: run ${o.run} of scenario ${o.scenario}, ${analysis.input.rows} rows, input sha256 ${analysis.input.sha256}`);
}

export async function verify(dir: string, o: { inputs?: string; root?: string }): Promise<void> {
  const { verifyReport } = await import("../record/verify.js");
  const v = await verifyReport(dir, o);
  for (const l of v.lines) say(`${l.ok ? "ok      " : "FAILED  "}${l.item}: ${l.detail}`);
  const failed = v.lines.filter((l) => !l.ok).length;
  say(v.ok ? `VERIFIED: ${v.lines.length} items checked, all match.` : `NOT VERIFIED: ${failed} of ${v.lines.length} items do not match.`);
  if (!v.ok) status = 1;
}

export async function demo(dir: string, o: { pdf?: boolean; chrome?: string; quiet?: boolean; force?: boolean }): Promise<void> {
  const [{ demoDirUsable, writeFerryStudy }, { makeReport }] = await Promise.all([import("../demo/ferry.js"), story()]);
  if (!demoDirUsable(dir)) {
    throw new UserError(`${dir}: the folder exists and is not an earlier demo folder.\n  What to do: choose a new or empty folder for the demo.`);
  }
  const progress = progressTo(o.quiet);
  progress?.("generating the invented ferry check-in study (seeded, 2 scenarios x 8 runs)");
  const { folderError, makeFolders } = await import("../record/outputDir.js");
  const { nodeFs } = await import("../fileSystem.js");
  let manifest: string;
  try {
    // one level at a time: node's recursive mkdir never returns on some file systems (/proc)
    makeFolders(resolve(dir), nodeFs);
    manifest = await writeFerryStudy(dir);
  } catch (e) {
    throw folderError(dir, resolve(dir), e);
  }
  const started = Date.now();
  // DIR/report is replaced when it is the demo's own earlier report, or with --force (never a file of the study).
  const r = await makeReport(manifest, { out: join(dir, "report"), force: o.force ?? false, pdf: o.pdf ?? false, paper: "A4", chrome: o.chrome, onProgress: progress });
  say(`Demo study written to ${resolve(dir)} (manifest ${manifest})`);
  summarize(r.dir, r.outcome.warnings.length, Date.now() - started, r.pdfPages);
}

export async function init(runsDir: string, o: { out?: string; force?: boolean }): Promise<void> {
  const { initStudy } = await import("../init/initStudy.js");
  const { relative } = await import("node:path");
  const r = await initStudy(runsDir, { out: o.out, force: o.force ?? false, onSkip: (s) => process.stderr.write(`  ${terminalText(`skipped ${s.display}: ${s.reason}`)}\n`) });
  const rel = relative(process.cwd(), r.manifest);
  const shown = o.out ?? (rel.startsWith("..") ? r.manifest : rel);
  const runs = r.scan.scenarios.reduce((n, s) => n + s.runs.length, 0);
  say(`Read ${runs} run file(s) in ${r.scan.scenarios.length} scenario(s): ${r.scan.scenarios.map((s) => `${s.name} (${s.runs.length})`).join(", ")}`);
  if (r.scan.skipped.length > 0) say(`Skipped ${r.scan.skipped.length} file(s); the reasons are above and at the top of the manifest.`);
  say("Series found (rows read, what the rows carry, guessed kind):");
  const width = Math.max(...r.scan.series.map((s) => s.name.length));
  for (const s of r.scan.series) {
    const carries = [s.valued > 0 ? "values" : "", s.withEntity > 0 ? "entities" : ""].filter((x) => x !== "").join("+") || "-";
    say(`  ${s.name.padEnd(width)}  ${String(s.rows).padStart(9)}  ${carries.padEnd(15)} ${s.kind}`);
  }
  for (const p of r.scan.pairs) say(`  entity events "${p.start}" -> "${p.end}": a level and a duration between them`);
  say(`Wrote ${shown}: a starter manifest. Every value in it is a guess with a comment. Check:`);
  for (const c of r.checks) say(`  - ${c}`);
  say("Then:");
  say(`  sojourn check ${shown}`);
  say(`  sojourn report ${shown} --out report`);
}
