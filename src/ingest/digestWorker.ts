/** Worker thread: the SHA-256 of one file, read in large chunks (see digest.ts). */
import { createHash } from "node:crypto";
import { createReadStream } from "node:fs";
import { parentPort, workerData } from "node:worker_threads";

const { path } = workerData as { path: string };
const hash = createHash("sha256");
for await (const chunk of createReadStream(path, { highWaterMark: 1 << 20 })) hash.update(chunk as Buffer);
parentPort!.postMessage(hash.digest("hex"));
