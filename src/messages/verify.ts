/**
 * Messages of `sojourn verify`: the errors that stop it (a report folder it cannot read) and the
 * text of each line of its verdict (what failed and what to do).
 */
import { UserError } from "./error.js";

const REPORT_AGAIN = "write the report again with `sojourn report`, or restore the folder from a copy";

export const recordMalformed = (dir: string, why: string) =>
  new UserError(`${dir}/record.json: this is not a study record as \`sojourn report\` writes it: ${why}.\n  What to do: the file was changed or cut short; ${REPORT_AGAIN}.`);

export const recordNotAFile = (dir: string, kind: string) =>
  new UserError(`${dir}/record.json: this is ${kind}, not a file, so it was not read.\n  What to do: give the folder that \`sojourn report\` wrote; ${REPORT_AGAIN}.`);

export const recordOutside = (dir: string, real: string) =>
  new UserError(
    `${dir}/record.json: this is a link to ${real}, outside the report folder, so it was not read.\n  What to do: verify reads only the report folder and the inputs' folder; ${REPORT_AGAIN}.`,
  );

export const recordUnreadable = (dir: string, reason: string) =>
  new UserError(`${dir}/record.json: cannot be read (${reason}).\n  What to do: check the file's permissions, or ${REPORT_AGAIN}.`);

export const reportDirMissing = (dir: string, why: string) =>
  new UserError(`${dir}: not a report folder (${why}).\n  What to do: give the folder that \`sojourn report\` wrote (it holds record.json).`);

// --- lines of the verdict (detail texts; the item is the file or step) ----------------------

/** A record entry whose path leads outside the folder it must stay in; nothing was read. */
export const outside = (where: string, root: string, flag: string) =>
  `lies outside ${where} (${root}), so it was not read. What to do: if you trust this record, give the folder it is in with ${flag}`;

export const outputOutside = (folder: string) =>
  `lies outside the report folder (${folder}), so it was not read: record.json names a file elsewhere. What to do: ${REPORT_AGAIN}`;

export const notAFile = (kind: string) => `is ${kind}, not a file, so it was not read. What to do: put the file back in its place`;

export const missingInput = () => "missing. What to do: put the run file back, or give the folder the inputs moved to with --inputs";

export const unreadable = (reason: string) => `cannot be read (${reason}). What to do: check its permissions`;

export const inputChanged = (found: string, recorded: string) =>
  `changed (sha256 ${found}, recorded ${recorded}). What to do: restore the run file the report was made from, or write the report again`;

export const manifestOutside = (manifestDir: string, root: string) =>
  `record.json says the manifest was in ${manifestDir}, outside the folder verify reads inputs from (${root}), so no run file was read. What to do: if you trust this record, give that folder with --inputs (or --root)`;

export const outputChanged = () => "changed since the report was written: its digest differs from the one in record.json. What to do: " + REPORT_AGAIN;

export const outputMissing = () => "missing from the report folder. What to do: " + REPORT_AGAIN;

export const pageDiffers = () =>
  "differs from the page made again from the recorded inputs: the page, or its digest in record.json, was changed after it was written. What to do: " + REPORT_AGAIN;

export const resultsDiffer = () => "differs from the results computed again from the inputs. What to do: " + REPORT_AGAIN;

export const tableDiffers = () => "differs from the table computed again from the inputs. What to do: " + REPORT_AGAIN;

export const chartDiffers = () => "differs from the chart drawn again from the inputs. What to do: " + REPORT_AGAIN;

export const pageUndatable = () =>
  "record.json does not hold the report's date (an earlier version wrote it), so the page cannot be made again to compare. What to do: write the report again with `sojourn report`";

export const notProduced = () => "is in record.json but computing the study again does not produce it. What to do: " + REPORT_AGAIN;

export const notRecorded = () => "is produced by the study but missing from record.json. What to do: " + REPORT_AGAIN;

export const strayFile = () => "is in the report folder but not in record.json (not written by `sojourn report`). What to do: remove it, or " + REPORT_AGAIN;

export const pdfNotRecorded = () =>
  "is in the report folder but record.json holds no digest of it, so it cannot be checked. What to do: write the report again with `sojourn report --pdf`";

export const pdfMissing = () => "is in record.json but missing from the report folder. What to do: write the report again with `sojourn report --pdf`";

export const notComputed = () => "not computed again: the inputs differ from the recorded ones (see the lines above)";

export const studyFails = (firstLine: string) => `cannot be computed again from the inputs: ${firstLine}`;

export const manifestNotApplicable = (firstLine: string) => `cannot be applied to the inputs now: ${firstLine}`;

export const extraInput = () => "extra: the manifest now matches this file, which the report did not use";

export const otherVersion = (recorded: string, running: string) =>
  `the report was written by Sojourn ${recorded}, this is ${running}: a difference below may come from the version. What to do: verify with Sojourn ${recorded} to be sure`;
