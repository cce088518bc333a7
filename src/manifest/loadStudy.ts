/**
 * Reading a study manifest: the edge where what the user wrote becomes the trusted `Study`.
 *
 *   manifest file ──read, decodeManifest (UTF-8 only)──▶ text
 *        ──parseManifest (bounded depth and aliases)──▶ YAML document with positions
 *        ──checkSchema (docs/manifest.schema.json)──▶ StudySpec
 *        ──buildStudy (names, windows, globs, overrides, defaults)──▶ Study
 *
 * Every problem stops at the first one found, as a `UserError` naming the file, line, column and
 * key path.
 */
import { stat } from "node:fs/promises";
import { basename, dirname, extname, resolve } from "node:path";
import { notFileKind } from "../ingest/runFile.js";
import { fileBytes } from "../regularFile.js";
import { UserError } from "../messages/error.js";
import { manifestMessages } from "../messages/index.js";
import { buildStudy } from "./buildStudy.js";
import { checkSchema } from "./checkSchema.js";
import { decodeManifest, parseManifest } from "./manifestSource.js";
import type { Study } from "./types.js";

export interface LoadOptions {
  /** The manifest's text; when given, the file is not read. */
  text?: string;
  /** The folder run paths are relative to (default: the manifest's folder). */
  baseDir?: string;
}

/**
 * Reads (or takes `options.text`), parses, validates and normalizes a manifest into a `Study`.
 * `manifestPath` is shown in messages exactly as given.
 */
export async function loadStudy(manifestPath: string, options: LoadOptions = {}): Promise<Study> {
  const absolutePath = resolve(manifestPath);
  const text = options.text ?? (await readManifest(manifestPath));
  const source = parseManifest(text, manifestPath);
  const spec = checkSchema(source);
  return buildStudy(spec, source, {
    manifestPath: absolutePath,
    manifestText: text,
    baseDir: resolve(options.baseDir ?? dirname(absolutePath)),
    defaultTitle: basename(absolutePath, extname(absolutePath)),
  });
}

/** Largest manifest read (bytes): a manifest of 20 000 runs written out one per line is about 1 MB. */
export const MAX_MANIFEST_BYTES = 16 * 1024 * 1024;

async function readManifest(path: string): Promise<string> {
  let bytes: Buffer;
  try {
    // A pipe, a socket or a device (also through a link) would be read without end: refused by kind.
    const info = await stat(path);
    if (info.isDirectory()) throw manifestMessages.manifestIsFolder(path);
    const kind = notFileKind(info);
    if (kind !== null) throw manifestMessages.manifestNotAFile(path, kind);
    if (info.size > MAX_MANIFEST_BYTES) throw manifestMessages.manifestFileTooLarge(path, info.size, MAX_MANIFEST_BYTES);
    // Opened without waiting and checked again on the open file, in case the path changed meanwhile.
    bytes = await fileBytes(path);
    if (bytes.length > MAX_MANIFEST_BYTES) throw manifestMessages.manifestFileTooLarge(path, bytes.length, MAX_MANIFEST_BYTES);
  } catch (error) {
    if (error instanceof UserError) throw error;
    const code = (error as NodeJS.ErrnoException).code;
    if (code === "ENOENT") throw manifestMessages.manifestNotFound(path);
    if (code === "EISDIR") throw manifestMessages.manifestIsFolder(path);
    if (code === "EACCES" || code === "EPERM") throw manifestMessages.manifestUnreadable(path, "permission denied");
    throw manifestMessages.manifestUnreadable(path, (error as Error).message);
  }
  return decodeManifest(bytes, path);
}
