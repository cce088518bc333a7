import { Command, CommanderError, InvalidArgumentError, Option } from "commander";
import { UserError } from "../messages/index.js";
import { terminalMessage, terminalText } from "../messages/terminal.js";
import { toolVersion } from "../record/version.js";
import * as commands from "./commands.js";

function number(value: string): number {
  const x = Number(value);
  if (value.trim() === "" || !Number.isFinite(x)) throw new InvalidArgumentError("expected a number.");
  return x;
}

function count(value: string): number {
  if (!/^\s*\d+\s*$/.test(value) || Number(value) < 1) throw new InvalidArgumentError("expected a whole number of at least 1.");
  return Number(value);
}

/** The command line: each command parses its flags and calls one library function. */
export function program(): Command {
  const p = new Command("sojourn")
    .description("Output analysis of discrete-event simulation runs: statistics, intervals and an audited report.")
    .version(toolVersion().version)
    .option("--debug", "show a stack trace when something fails (any command)")
    .exitOverride()
    // usage errors repeat what was typed: its control characters are escaped as in every message
    .configureOutput({
      writeOut: (text) => process.stdout.write(terminalText(text, { keepNewlines: true })),
      writeErr: (text) => process.stderr.write(terminalText(text, { keepNewlines: true })),
    })
    .showHelpAfterError("(run with --help for usage)");

  p.command("init")
    .description("scan a folder of run files and write a starter manifest, with a comment on every guess")
    .argument("<runs_dir>", "the folder of run files: one subfolder per scenario, or the files of one scenario")
    .option("--out <manifest>", "the manifest to write (default: study.yaml beside the runs folder)")
    .option("--force", "replace the manifest if it exists")
    .action(commands.init);

  p.command("report")
    .description("compute every statistic of a study and write results.json, calculation tables, report.html (and report.pdf)")
    .argument("<manifest>", "the study manifest (YAML or JSON)")
    .requiredOption("--out <dir>", "the report folder to write (replaced atomically when complete)")
    .option("--pdf", "also write report.pdf (needs Chromium)")
    .addOption(
      new Option("--edition <name>", "audit: every section and the audit appendix; client: the appendix replaced by a one-page guide to the audit files (report.html and report.pdf alike)")
        .choices(["audit", "client"])
        .default("audit"),
    )
    .addOption(new Option("--paper <size>", "PDF paper size").choices(["A4", "Letter"]).default("A4"))
    .option("--chrome <path>", "the Chromium or Chrome executable for the PDF (else $SOJOURN_CHROME, then usual places)")
    .option("--force", "replace --out even if it holds files Sojourn did not write (never a folder holding the manifest or an input)")
    .option("--quiet", "print no progress")
    .option("--workers <n>", "worker threads for the runs (default: $SOJOURN_WORKERS, else the available cores; never more than the cores or the runs; 1: no worker)", count)
    .option("--from-summaries <folder>", "take each run from <folder>/<scenario>/<run>.json (written by summarize-run) instead of its run file")
    .addOption(new Option("--on <where>", "where the runs are analysed: here, or as a Slurm job array with the report as a job after it (docs/distributed.md)").choices(["local", "slurm"]).default("local"))
    .option("--work <dir>", "--on slurm: the work folder for summaries, job scripts, logs and status files, on storage every node sees (default: <out>.work)")
    .option("--no-wait", "--on slurm: submit the jobs, print their ids and the command that follows them, and return")
    .option("--partition <name>", "--on slurm: the partition of both jobs")
    .option("--account <name>", "--on slurm: the account both jobs are charged to")
    .option("--mem-per-task <size>", "--on slurm: memory of each run's task, as sbatch --mem takes it (e.g. 2G); default from the largest run file")
    .option("--time-per-task <time>", "--on slurm: time limit of each run's task, as sbatch --time takes it (e.g. 30 or 1:30:00); default from the largest run file")
    .option("--max-running <n>", "--on slurm: at most n run tasks at once", count)
    .option("--sbatch-arg <arg>", "--on slurm: one more sbatch argument for both jobs, as it is (repeat for several, e.g. --sbatch-arg=--qos=short)", (v: string, all: string[]) => [...all, v], [] as string[])
    .action(commands.report);

  p.command("cluster-task", { hidden: true })
    .description("one task of a `report --on slurm` job array: summarise run <index> of the work folder's study")
    .argument("<work>", "the work folder")
    .argument("<index>", "the task's index (SLURM_ARRAY_TASK_ID)")
    .action(commands.clusterTask);

  p.command("cluster-part", { hidden: true })
    .description("one task of the warm-up array of `report --on slurm`: the MSER-5 first pass of warm-up task <index>")
    .argument("<work>", "the work folder")
    .argument("<index>", "the task's index (SLURM_ARRAY_TASK_ID)")
    .action(commands.clusterPart);

  p.command("cluster-warmup", { hidden: true })
    .description("the warm-up job of `report --on slurm`: each MSER-5 scenario's warm-up from its runs' first pass")
    .argument("<work>", "the work folder")
    .action(commands.clusterWarmup);

  p.command("cluster-report", { hidden: true })
    .description("the report job of `report --on slurm`: build the report folder from the work folder's summaries")
    .argument("<work>", "the work folder")
    .action(commands.clusterReport);

  p.command("check")
    .description("validate the manifest and read every run file without writing anything; print the plan")
    .argument("<manifest>", "the study manifest")
    .option("--json", "print the plan as JSON for scripts")
    .option("--workers <n>", "worker threads for the runs (default: $SOJOURN_WORKERS, else the available cores; never more than the cores or the runs; 1: no worker)", count)
    .action(commands.check);

  p.command("more-runs")
    .description("read the study (writing nothing) and print how many more runs each scenario needs: for each select: entry, and for each measure with a target")
    .argument("<manifest>", "the study manifest")
    .option("--json", "print the runs needed as JSON for scripts")
    .option("--workers <n>", "worker threads for the runs (default: $SOJOURN_WORKERS, else the available cores; never more than the cores or the runs; 1: no worker)", count)
    .action(commands.moreRuns);

  p.command("summarize-run")
    .description("analyse one run and write its results, tables and input digest to a summary file, for a report built elsewhere (report --from-summaries)")
    .argument("<manifest>", "the study manifest")
    .requiredOption("--scenario <name>", "scenario name")
    .requiredOption("--run <id>", "run id (file name without extensions)")
    .requiredOption("--out <file>", "the summary file to write (by convention <folder>/<scenario>/<run>.json)")
    .option("--force", "write over an existing file that is not an earlier run summary (never over an input of the study)")
    .action(commands.summarizeRun);

  p.command("at")
    .description("time average of a level (or utilization) measure of one run from the window start up to a time, with its arithmetic")
    .argument("<manifest>", "the study manifest")
    .requiredOption("--scenario <name>", "scenario name")
    .requiredOption("--run <id>", "run id (file name without extensions)")
    .requiredOption("--measure <name>", "measure name")
    .requiredOption("--time <t>", "the time to stop at", number)
    .option("--json", 'print {"time", "area", "duration", "mean"} as JSON')
    .action(commands.at);

  p.command("table")
    .description("write the full calculation table of one run and measure (the report folder keeps long tables shortened)")
    .argument("<manifest>", "the study manifest")
    .requiredOption("--scenario <name>", "scenario name")
    .requiredOption("--run <id>", "run id")
    .requiredOption("--measure <name>", "measure name")
    .option("--out <file>", "write to this file instead of standard output")
    .option("--force", "write over an existing file that is not an earlier calculation table (never over an input of the study)")
    .action(commands.table);

  p.command("verify")
    .description("re-derive a report folder from its study record and check every digest and number")
    .argument("<dir>", "a report folder written by `sojourn report`")
    .option("--inputs <path>", "the folder the manifest's run paths are relative to, when the inputs moved")
    .option("--root <path>", "the folder verify may read run files from (default: --inputs, else the folder that holds <dir>)")
    .action(commands.verify);

  p.command("demo")
    .description("write an invented demo study (ferry check-in) into a folder and report on it")
    .argument("<dir>", "folder for the demo study; the report goes to <dir>/report")
    .option("--pdf", "also write the PDF")
    .option("--chrome <path>", "Chromium executable for the PDF")
    .option("--quiet", "print no progress")
    .option("--force", "replace <dir>/report even if it holds files Sojourn did not write")
    .action(commands.demo);

  return p;
}

/** Runs the command line and returns the exit status (0 success, 1 input or verification failure, 2 usage). */
export async function run(argv: string[]): Promise<number> {
  const p = program();
  const debug = argv.includes("--debug");
  try {
    await p.parseAsync(argv.filter((a) => a !== "--debug"), { from: "user" });
    return commands.exitStatus();
  } catch (e) {
    if (e instanceof CommanderError) {
      // Help and version exit 0; everything else commander rejects is a usage error.
      if (e.code === "commander.helpDisplayed" || e.code === "commander.version" || e.code === "commander.help") return 0;
      return 2;
    }
    // A message quotes names from files and manifests: control characters in it are escaped,
    // line feeds too but the one before "What to do" (a stack trace keeps its lines).
    const stack = (text: string) => terminalText(text, { keepNewlines: true });
    if (e instanceof UserError) {
      process.stderr.write(`sojourn: ${terminalMessage(e.message)}\n`);
      if (debug && e.stack) process.stderr.write(stack(e.stack) + "\n");
      return e.exitCode;
    }
    process.stderr.write(`sojourn: internal error: ${terminalMessage((e as Error)?.message ?? String(e))}\n`);
    if (debug) process.stderr.write(stack(String((e as Error)?.stack)) + "\n");
    else process.stderr.write("  This is a bug in Sojourn. Run again with --debug to see where it happened, and report it.\n");
    return 1;
  }
}
