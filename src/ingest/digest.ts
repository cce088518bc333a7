/**
 * The SHA-256 of a run file, computed while it is read.
 *
 * For a large file read on the main thread, a worker thread reads the file a second time (from
 * the page cache) and hashes it on the other core while the main thread parses; otherwise the
 * chunks being parsed are hashed in line. Either way the digest is of the bytes as stored.
 */
import { createHash } from "node:crypto";
import { existsSync, statSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { Worker, isMainThread } from "node:worker_threads";

/**
 * Files at least this large are hashed on a worker thread (when one can be started);
 * `SOJOURN_PARALLEL_DIGEST_BYTES` overrides it (the tests use it to exercise the worker).
 */
export const PARALLEL_DIGEST_BYTES = Number(process.env.SOJOURN_PARALLEL_DIGEST_BYTES) || 32 * 1024 * 1024;

const WORKER_FILE = new URL("./digestWorker.js", import.meta.url);

export interface Digest {
  /** Hands a chunk of the file, in order (ignored when a worker hashes). */
  update(chunk: Buffer): void;
  /** The hex digest once the whole file has been handed (or hashed by the worker). */
  result(): Promise<string>;
  /** Stops a worker that is no longer needed. */
  cancel(): void;
}

function inline(): Digest {
  const hash = createHash("sha256");
  return {
    update: (chunk) => void hash.update(chunk),
    result: async () => hash.digest("hex"),
    cancel: () => {},
  };
}

function workerAvailable(): boolean {
  return isMainThread && import.meta.url.endsWith(".js") && existsSync(fileURLToPath(WORKER_FILE));
}

export function startDigest(path: string): Digest {
  let size: number;
  try {
    size = statSync(path).size;
  } catch {
    return inline(); // the reader reports the problem with the file
  }
  if (size < PARALLEL_DIGEST_BYTES || !workerAvailable()) return inline();
  const worker = new Worker(WORKER_FILE, { workerData: { path } });
  const done = new Promise<string>((resolve, reject) => {
    worker.once("message", (hex: string) => resolve(hex));
    worker.once("error", reject);
    worker.once("exit", (code) => (code !== 0 ? reject(new Error(`digest worker exited with ${code}`)) : undefined));
  });
  done.catch(() => {}); // a failure surfaces through result()
  return {
    update: () => {},
    result: () => done,
    cancel: () => void worker.terminate(),
  };
}
