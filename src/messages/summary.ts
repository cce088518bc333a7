/** Messages of per-run summaries (`sojourn summarize-run`, `sojourn report --from-summaries`). */
import { UserError } from "./error.js";

export const summaryMissing = (file: string, scenario: string, run: string) =>
  new UserError(
    `${file}: no summary of run "${run}" of scenario "${scenario}" (the manifest lists this run)\n  What to do: write it with \`sojourn summarize-run MANIFEST --scenario ${scenario} --run ${run} --out ${file}\`, or remove the run from the manifest.`,
  );

export const summaryUnreadable = (file: string, why: string) =>
  new UserError(`${file}: this is not a run summary written by \`sojourn summarize-run\` (${why})\n  What to do: write the summary again with \`sojourn summarize-run\`.`);

export const summaryTampered = (file: string) =>
  new UserError(`${file}: the summary's contents do not match the digest written inside it: the file was changed or cut short after it was written\n  What to do: write the summary again from its run file with \`sojourn summarize-run\`.`);

export const summaryOtherRun = (file: string, what: string, found: string, expected: string) =>
  new UserError(
    `${file}: the summary is of a different run than the manifest lists here: its ${what} is ${found}, the manifest's is ${expected}\n  What to do: check that the summaries folder belongs to this manifest, or write the summary again with \`sojourn summarize-run\`.`,
  );

export const summaryOtherSettings = (file: string, scenario: string, run: string) =>
  new UserError(
    `${file}: the summary of run "${run}" of scenario "${scenario}" was made with other settings (measures, window, warm-up, columns or table limits differ from this manifest's)\n  What to do: write the summary again with \`sojourn summarize-run\` from this manifest.`,
  );

export const summaryNeedsFixedWarmup = (scenario: string) =>
  new UserError(
    `scenario "${scenario}" estimates its warm-up with MSER-5, which needs every run of the scenario at once; per-run summaries cannot be made or used for it yet\n  What to do: give the scenario a fixed warm-up (e.g. the estimate of an earlier report, \`warmup: 30\`), or report on the raw run files.`,
  );

export const summaryStale = (file: string, runFile: string, now: string, recorded: string) =>
  new UserError(
    `${file}: the summary is stale: run file ${runFile} changed after the summary was made (its SHA-256 is now ${now}; the summary was made from ${recorded})\n  What to do: write the summary again from the run file with \`sojourn summarize-run\`, or put back the run file it was made from.`,
  );

export const summaryMalformed = (file: string, why: string) =>
  new UserError(
    `${file}: this is not a run summary as \`sojourn summarize-run\` writes it (${why})\n  What to do: write the summary again with \`sojourn summarize-run\`.`,
  );

/** The report's warning when a summary was used without checking it against its run file. */
export const summaryUnchecked = (runFile: string, reason: string) =>
  `run file ${runFile} cannot be read here (${reason}), so its summary was used as it is: the run's numbers rest on the summary's own digest of the file, not on the file`;
