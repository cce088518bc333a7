/**
 * Reading a file that must be a regular file, without ever waiting on a named pipe or reading a
 * device: the file is opened with O_NONBLOCK (opening a pipe then returns at once instead of
 * waiting for a writer) and its kind is checked on the open file before anything is read.
 */
import { createHash } from "node:crypto";
import { closeSync, constants, createReadStream, fstatSync, openSync, type Stats } from "node:fs";

/** What a file system entry is, in words, for one that is not a regular file. */
export function kindOf(st: Stats): string {
  if (st.isDirectory()) return "a folder";
  if (st.isFIFO()) return "a named pipe (FIFO)";
  if (st.isCharacterDevice() || st.isBlockDevice()) return "a device";
  if (st.isSocket()) return "a socket";
  return "not a regular file";
}

/** Opens a regular file to read; throws (code ENOTREG) for anything else, after closing it. */
export function openRegular(path: string): number {
  const fd = openSync(path, constants.O_RDONLY | (constants.O_NONBLOCK ?? 0));
  const st = fstatSync(fd);
  if (!st.isFile()) {
    closeSync(fd);
    throw Object.assign(new Error(`${path} is ${kindOf(st)}`), { code: "ENOTREG" });
  }
  return fd;
}

/** The SHA-256 of a regular file's bytes, read in 1 MiB pieces. */
export async function fileDigest(path: string): Promise<string> {
  const h = createHash("sha256");
  for await (const chunk of createReadStream("", { fd: openRegular(path), highWaterMark: 1 << 20 })) h.update(chunk as Buffer);
  return h.digest("hex");
}

/** A regular file's bytes. */
export async function fileBytes(path: string): Promise<Buffer> {
  const parts: Buffer[] = [];
  for await (const chunk of createReadStream("", { fd: openRegular(path), highWaterMark: 1 << 20 })) parts.push(chunk as Buffer);
  return Buffer.concat(parts);
}
