/** Shared pieces of the ingest tests: a scratch folder, run files written in each layout, a recording sink. */
import { uniform } from "../../src/demo/random.js";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { gzipSync } from "node:zlib";
import type { ColumnMap } from "../../src/manifest/types.js";
import { UserError } from "../../src/messages/error.js";
import { readRun, type ReadReport, type SeriesRequest } from "../../src/ingest/readRun.js";

export const COLUMNS: ColumnMap = { time: "time", series: "series", value: "value", entity: "entity" };

/** A scratch folder; `file(name, content)` writes into it and returns the absolute path. */
export function scratch(): { dir: string; file(name: string, content: string | Buffer): string; remove(): void } {
  const dir = mkdtempSync(join(tmpdir(), "sojourn-ingest-"));
  return {
    dir,
    file(name, content) {
      const path = join(dir, name);
      writeFileSync(path, content);
      return path;
    },
    remove() {
      rmSync(dir, { recursive: true, force: true });
    },
  };
}

export const gzip = (text: string | Buffer): Buffer => gzipSync(typeof text === "string" ? Buffer.from(text) : text);

/** Writes `text` into `folder` as `name` and gzip-compressed as `name.gz`; returns both as [file name, path]. */
export function plainAndGzip(folder: ReturnType<typeof scratch>, name: string, text: string): [string, string][] {
  return [
    [name, folder.file(name, text)],
    [`${name}.gz`, folder.file(`${name}.gz`, gzip(text))],
  ];
}

/** The message of the error `p` ends with, or null when it ends without one. */
export const errorOf = (p: Promise<unknown>): Promise<string | null> =>
  p.then(
    () => null,
    (e: Error) => e.message,
  );

/** One sink call. */
export interface Call {
  series: number;
  time: number;
  value: number;
  entity: string | undefined;
  line: number;
}

/** Reads a run file and records every sink call. */
export async function record(
  path: string,
  series: SeriesRequest[],
  extra: { columns?: ColumnMap; chunkSize?: number; display?: string; maxRowBytes?: number } = {},
): Promise<{ calls: Call[]; report: ReadReport }> {
  const calls: Call[] = [];
  const report = await readRun({
    path,
    display: extra.display ?? "runs/rep-01",
    columns: extra.columns ?? COLUMNS,
    series,
    chunkSize: extra.chunkSize,
    maxRowBytes: extra.maxRowBytes,
    onRow: (s, time, value, entity, line) => calls.push({ series: s, time, value, entity, line }),
  });
  return { calls, report };
}

/** The UserError a promise rejects with (fails the test when it resolves or rejects otherwise). */
export async function rejection(p: Promise<unknown>): Promise<UserError> {
  try {
    await p;
  } catch (e) {
    if (e instanceof UserError) return e;
    throw e;
  }
  throw new Error("expected a UserError, but the call succeeded");
}

/** Deterministic pseudo-random numbers in [0, 1) (the demo generator's mulberry32). */
export const seeded = uniform;
