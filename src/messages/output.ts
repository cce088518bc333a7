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
