/**
 * Opening a run file: only regular files are read (see `notFileKind`), whatever the format.
 */
import { constants } from "node:fs";
import { type FileHandle, lstat, open, stat } from "node:fs/promises";
import type { UserError } from "../messages/error.js";
import * as ingestMessages from "../messages/ingest.js";
import { notFileKind } from "./runFile.js";

/**
 * Opens a run file for reading, and refuses what is not a regular file (a pipe, a socket, a device,
 * itself or through a link) by what it is. The path is looked at before it is opened, since opening
 * a socket fails and opening a pipe waits for a writer; the open file is looked at again, so a path
 * replaced in between is caught too. Opened without blocking: reading a regular file never blocks.
 */
export async function openRunFile(path: string, display: string): Promise<FileHandle> {
  await refuseIfNotAFile(path, display);
  const file = await open(path, constants.O_RDONLY | (constants.O_NONBLOCK ?? 0));
  const kind = notFileKind(await file.stat());
  if (kind !== null) {
    await file.close();
    throw await refusal(path, display, kind);
  }
  return file;
}

/**
 * Throws the reader's message when `path` leads to something other than a regular file (a pipe, a
 * socket, a device, a folder), itself or through a link; a path that does not exist passes (the
 * open that follows says so). For readers that open the file by other means first (`init`).
 */
export async function refuseIfNotAFile(path: string, display: string): Promise<void> {
  const kind = await stat(path).then(notFileKind, () => null);
  if (kind !== null) throw await refusal(path, display, kind);
}

async function refusal(path: string, display: string, kind: string): Promise<UserError> {
  const link = await lstat(path).then(
    (s) => s.isSymbolicLink(),
    () => false,
  );
  return kind === "a folder" ? ingestMessages.unreadableFile(display, "EISDIR") : ingestMessages.notARegularFile(display, kind, link);
}

