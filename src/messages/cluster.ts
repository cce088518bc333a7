/** Messages of `sojourn report --on slurm` (src/cluster/). */
import { UserError } from "./error.js";

export const noSlurm = (command: string, why: string) =>
  new UserError(
    `--on slurm: cannot run \`${command}\` (${why})\n  What to do: run the command on a machine that can submit Slurm jobs (a login node), with Slurm's commands on PATH, or use --on local.`,
  );

export const submitFailed = (what: string, detail: string) =>
  new UserError(`--on slurm: sbatch refused the ${what}: ${detail}\n  What to do: check --partition, --account, --sbatch-arg and the limits of the partition; nothing was written to the report folder.`);

export const taskFailed = (scenario: string, run: string, job: string, log: string, why: string) =>
  new UserError(
    `run "${run}" of scenario "${scenario}" failed on Slurm (job ${job}): ${why}\n  log: ${log}\n  No report was written; an earlier report folder is unchanged.\n  What to do: fix what the log says, then run the same command again: the runs already summarised are reused and only the rest run again.`,
  );

export const reportFailed = (job: string, log: string, why: string) =>
  new UserError(
    `the report job failed on Slurm (job ${job}): ${why}\n  log: ${log}\n  An earlier report folder is unchanged.\n  What to do: fix what the log says, then run the same command again: every run summary is reused.`,
  );

export const workInUse = (work: string, jobs: string) =>
  new UserError(
    `${work}: this work folder belongs to a study that is still queued or running on Slurm (jobs ${jobs}) with another manifest, report folder or settings\n  What to do: wait for it (or cancel it with \`scancel ${jobs}\`), or choose another --work folder.`,
  );

export const workNotOurs = (work: string, why: string) =>
  new UserError(`${work}: not a work folder of \`sojourn report --on slurm\` (${why})\n  What to do: choose a new or empty folder for --work, or the one an earlier --on slurm used.`);

export const workStudyChanged = (work: string) =>
  new UserError(
    `${work}: the manifest changed after this study was submitted to Slurm (its SHA-256 differs from the one the jobs were made for)\n  What to do: run \`sojourn report ... --on slurm\` again to submit the changed study.`,
  );

export const badSize = (flag: string, value: string, example: string) =>
  new UserError(`${flag} ${value}: not a size Sojourn can pass to Slurm\n  What to do: write it as in ${example}.`, 2);

export const warmupPartUnusable = (file: string, why: string) =>
  new UserError(
    `${file}: not the warm-up slices of this run as \`report --on slurm\` writes them (${why})\n  What to do: run the same \`sojourn report ... --on slurm\` command again: a part that does not match is made again.`,
  );

export const warmupStale = (file: string, runFile: string) =>
  new UserError(
    `${file}: the warm-up slices were made from an older version of ${runFile} (its SHA-256 differs now)\n  What to do: run the same \`sojourn report ... --on slurm\` command again: the changed runs are read again.`,
  );

export const warmupFailed = (job: string, log: string, why: string) =>
  new UserError(
    `the warm-up job (MSER-5) failed on Slurm (job ${job}): ${why}\n  log: ${log}\n  No report was written; an earlier report folder is unchanged.\n  What to do: fix what the log says, then run the same command again: the warm-up slices already made are reused.`,
  );
