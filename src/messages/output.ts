/** Messages about the report folder and the study record. */
import { UserError } from "./error.js";

export const outNotOurs = (dir: string) =>
  new UserError(
    `${dir}: the folder exists, is not empty and is not an earlier Sojourn report, so writing into it could destroy your files.\n  What to do: choose another --out folder, empty this one, or pass --force to replace it.`,
  );

export const outIsFile = (dir: string) =>
  new UserError(`${dir}: this is a file, not a folder.\n  What to do: choose a folder name for --out.`);

export const cannotWrite = (dir: string, reason: string) =>
  new UserError(`${dir}: cannot write the report here (${reason}).\n  What to do: check the folder's permissions and free space, or choose another --out folder.`);

export const notAReport = (dir: string, reason: string) =>
  new UserError(`${dir}: not a Sojourn report folder (${reason}).\n  What to do: give the folder that \`sojourn report\` wrote (it holds record.json).`);

export const interrupted = () => new UserError("Interrupted: the report was not written; any earlier report folder is unchanged.");

// --- Output folders and files that are not Sojourn's own (nothing of the user's is ever lost) ---

/**
 * A name found on disk or typed by the user, as a terminal may show it: control characters
 * (C0, DEL, C1) written `\uXXXX`, so a file name can neither drive the terminal nor fake a line.
 */
function shown(name: string): string {
  let out = "";
  for (const c of name) {
    const code = c.charCodeAt(0);
    out += code <= 0x1f || (code >= 0x7f && code <= 0x9f) ? `\\u${code.toString(16).padStart(4, "0")}` : c;
  }
  return out;
}

/** Why a file in an existing --out folder is not a file of an earlier report. */
export type ForeignReason = "not-listed" | "changed" | "no-record" | "bad-record";

const FOREIGN_WHAT: Record<ForeignReason, string> = {
  "not-listed": "which is not a file of an earlier Sojourn report (its record.json does not list it)",
  changed: "which was changed after Sojourn wrote it (its digest differs from the one in record.json)",
  "no-record": "and no record.json of an earlier Sojourn report, so nothing in it can be shown to be Sojourn's",
  "bad-record": "which is not a study record written by Sojourn",
};

/** The --out folder holds a file Sojourn cannot show it wrote. */
export const outHoldsForeign = (dir: string, file: string, why: ForeignReason) =>
  new UserError(
    `${shown(dir)}: the folder holds ${shown(file)}, ${FOREIGN_WHAT[why]}; replacing the folder would delete it.\n` +
      `  What to do: move ${shown(file)} and any other file of yours out of the folder, or choose another --out folder. ` +
      "`--force` replaces the folder and everything in it (never the manifest or an input of the study).",
  );

/** What an input of a study is, in words. */
export type InputKind = "manifest" | "run file" | "run summary";

/** The --out folder is, holds or is a parent of an input of the study: never replaced, even with --force. */
export const outHoldsInput = (dir: string, file: string, kind: InputKind) =>
  new UserError(
    `${shown(dir)}: the folder holds ${shown(file)}, the study's ${kind}; Sojourn never replaces a folder that holds the manifest or an input of the study, not even with --force.\n` +
      "  What to do: choose an --out folder that holds none of the study's files, such as a new folder `report` beside the manifest.",
  );

/** `table --out` or `summarize-run --out` names an input of the study. */
export const outFileIsInput = (file: string, kind: InputKind) =>
  new UserError(
    `${shown(file)}: this is the study's ${kind}; Sojourn never writes over the manifest or an input of the study, not even with --force.\n` +
      "  What to do: choose another --out file.",
  );

/** What `table` and `summarize-run` write, in words. */
export type OwnFileKind = "calculation table" | "run summary";

/** `table --out` or `summarize-run --out` names an existing file that is not that command's earlier output. */
export const outFileNotOurs = (file: string, kind: OwnFileKind, why: string) =>
  new UserError(
    `${shown(file)}: the file exists and is not a ${kind} written by Sojourn (${why}); writing over it would destroy it.\n` +
      "  What to do: choose another --out file, move this one away, or pass --force to write over it.",
  );

/** `table --out` or `summarize-run --out` names a folder. */
export const outFileIsFolder = (file: string) =>
  new UserError(`${shown(file)}: this is a folder; --out names the file to write.\n  What to do: give a file name, such as ${shown(file.replace(/[\\/]+$/, ""))}/table.csv.`);

// --- The environment: names too long, full disks, read-only places ------------------------------

/** A system error code in words, for the messages below. */
export function writeReason(code: string): string {
  return WRITE_REASONS[code] ?? `the system refused (${code})`;
}

const WRITE_REASONS: Record<string, string> = {
  ENOSPC: "the disk is full",
  EDQUOT: "the disk quota is used up",
  EROFS: "the file system is read-only",
  EACCES: "permission denied",
  EPERM: "the operation is not permitted",
  ENAMETOOLONG: "the name is too long for the file system",
  ENOTDIR: "a part of the path is a file, not a folder",
  EISDIR: "a folder is in the way",
  EEXIST: "a file is in the way",
  ENOENT: "the system does not allow creating it there",
  EIO: "the disk reported an input/output error",
  EMFILE: "too many files are open at once",
  ENFILE: "too many files are open at once",
  EBUSY: "the file or folder is busy or locked",
  ELOOP: "too many symbolic links in the path",
};

/** The longest part of a path, with its length in bytes (UTF-8). */
function longestPart(path: string): { part: string; bytes: number } {
  let best = { part: "", bytes: 0 };
  for (const part of path.split(/[\\/]/)) {
    const bytes = Buffer.byteLength(part, "utf8");
    if (bytes > best.bytes) best = { part, bytes };
  }
  return best;
}

/** An abbreviation of a long name: its start, an ellipsis and its end. */
function abbreviated(name: string): string {
  return name.length <= 60 ? name : `${name.slice(0, 40)}…${name.slice(-12)}`;
}

/** `--out` (a folder or a file) has a name or a path longer than the file system takes. */
export const outNameTooLong = (dir: string) => {
  const { part, bytes } = longestPart(dir);
  const what =
    bytes > 255
      ? `the name ${shown(abbreviated(part))} is ${bytes} bytes long, and most file systems take at most 255 bytes for one name`
      : `the path is ${Buffer.byteLength(dir, "utf8")} bytes long, more than the file system takes`;
  return new UserError(`${shown(abbreviated(dir))}: cannot write here: ${what} (ENAMETOOLONG).\n  What to do: choose a shorter --out name.`);
};

/** A file of the report has a name (or a path) longer than the file system takes. */
export const reportFileNameTooLong = (dir: string, file: string, pathBytes: number) => {
  const { part, bytes } = longestPart(file);
  const what =
    bytes > 255
      ? `its name ${shown(abbreviated(part))} is ${bytes} bytes long, more than the file system takes (255 bytes on most)`
      : `its full path would be ${pathBytes} bytes long, more than the system takes (4095 bytes on Linux)`;
  const todo =
    bytes > 255
      ? "the name is made from a scenario, run or measure name (a character other than a lowercase letter, a digit, `_` or `-` is written with two bytes or more); shorten that name in the manifest."
      : "write the report to a folder with a shorter path (--out), or shorten the scenario, run or measure names in the manifest.";
  return new UserError(
    `${shown(abbreviated(dir))}: cannot write ${shown(abbreviated(file))}: ${what} (ENAMETOOLONG). Nothing was replaced: any earlier report in the folder is intact.\n  What to do: ${todo}`,
  );
};

/** The disk filled up (or the quota ran out) while the report folder was being written. */
export const reportDiskFull = (dir: string, file: string, code: string, earlier: boolean) =>
  new UserError(
    `${shown(dir)}: ${writeReason(code)} (${code}): Sojourn could not write ${shown(file)} of the new report and removed what it had written. ` +
      (earlier ? "The earlier report in the folder is intact." : "Nothing was written to the folder.") +
      "\n  What to do: free space on the disk (or choose --out on another disk) and run the command again.",
  );

/** A file of the report could not be written for another reason of the system. */
export const reportFileUnwritable = (dir: string, file: string, code: string, earlier: boolean) =>
  new UserError(
    `${shown(dir)}: cannot write ${shown(file)} of the new report: ${writeReason(code)} (${code}). ` +
      (earlier ? "The earlier report in the folder is intact." : "Nothing was written to the folder.") +
      "\n  What to do: check the disk and the folder's permissions, or choose another --out folder, and run the command again.",
  );

/** The report folder cannot be made in `place` (the nearest folder that exists) because it is read-only. */
export const outReadOnly = (dir: string, place: string, code: string) =>
  new UserError(
    `${shown(dir)}: cannot create the report folder: ${shown(place)} is ${code === "EROFS" ? "on a read-only file system" : "not writable for you"} (${code}).\n` +
      `  What to do: choose an --out folder on a disk you can write to (for example in your home folder)${code === "EROFS" ? "" : `, or get write permission on ${shown(place)}`}.`,
  );

/** A part of the --out path is a file, not a folder. */
export const outPathBlocked = (dir: string, file: string) =>
  new UserError(
    `${shown(dir)}: cannot create the report folder: ${shown(file)} is a file, not a folder.\n  What to do: choose another --out path, or move ${shown(file)} away.`,
  );

/** The disk is full (or read-only, ...) for one file that `table` or `summarize-run` writes. */
export const outFileUnwritable = (file: string, code: string, existed: boolean) =>
  new UserError(
    `${shown(abbreviated(file))}: cannot write the file: ${writeReason(code)} (${code}). ` +
      (existed ? "The earlier file is intact." : "Nothing was written.") +
      `\n  What to do: ${FILE_TODO[code] ?? "check the disk and the folder's permissions, or choose another --out file."}`,
  );

const FILE_TODO: Record<string, string> = {
  ENAMETOOLONG: "choose a shorter --out name.",
  ENOTDIR: "choose another --out path: a part of this one is a file, not a folder.",
  ENOSPC: "free space on the disk, or choose --out on another disk.",
  EDQUOT: "free space on the disk, or choose --out on another disk.",
  EROFS: "choose an --out file on a disk you can write to.",
  EACCES: "choose an --out file in a folder you can write to.",
  EPERM: "choose an --out file in a folder you can write to.",
};

/** The PDF could not be written (a full disk, ...); the HTML report is in place. */
export const pdfUnwritable = (dir: string, code: string) =>
  new UserError(
    `${shown(dir)}: cannot write report.pdf: ${writeReason(code)} (${code}). The report folder is complete without the PDF (results.json, tables, report.html, record.json).\n` +
      "  What to do: free space on the disk and run the command again with --pdf.",
  );

/** Ctrl-C or SIGTERM while the PDF was being printed. */
export const pdfInterrupted = (dir: string) =>
  new UserError(`Interrupted: the PDF was not written; the report folder ${shown(dir)} is complete without it, and the browser's temporary files were removed.`);

/** The disk is full before anything of the report could be written. */
export const outDiskFull = (dir: string, code: string) =>
  new UserError(
    `${shown(dir)}: cannot create the report folder: ${writeReason(code)} (${code}). Nothing was written.\n  What to do: free space on the disk (or choose --out on another disk) and run the command again.`,
  );

/** The existing --out folder cannot be read, so Sojourn cannot tell whether it holds files of the user's. */
export const outUnreadable = (dir: string, code: string) =>
  new UserError(
    `${shown(dir)}: cannot read the folder to check what it holds: ${writeReason(code)} (${code}); Sojourn replaces a folder only when it can see every file in it.\n  What to do: choose another --out folder, or get read permission on this one.`,
  );
