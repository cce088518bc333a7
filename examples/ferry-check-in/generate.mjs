// Writes the invented ferry check-in runs (the same seeded data as `sojourn demo`) into runs/ next
// to this file, or into FOLDER/runs/ when a folder is given (the runs/ folder there is replaced).
// Build first: npm run build && node examples/ferry-check-in/generate.mjs [FOLDER]
import { mkdirSync, rmSync } from "node:fs";
import { dirname, join, resolve } from "node:path";
import process from "node:process";
import { fileURLToPath } from "node:url";
import { FERRY, writeRunCsv } from "../../dist/demo/ferry.js";
import { simulateQueue } from "../../dist/demo/queue.js";

const folder = process.argv[2] === undefined ? dirname(fileURLToPath(import.meta.url)) : resolve(process.argv[2]);
rmSync(join(folder, "runs"), { recursive: true, force: true });
for (const sc of FERRY.scenarios) {
  const dir = join(folder, "runs", sc.name);
  mkdirSync(dir, { recursive: true });
  for (let k = 1; k <= FERRY.replications; k++) {
    const rows = simulateQueue({ arrivalRate: FERRY.arrivalRate, serviceRate: FERRY.serviceRate, servers: sc.servers, horizon: FERRY.horizon, seed: 1000 + k, decimals: 3 });
    await writeRunCsv(join(dir, `rep-${String(k).padStart(2, "0")}.csv`), rows);
  }
}
process.stdout.write(`ferry-check-in: wrote ${FERRY.scenarios.length} x ${FERRY.replications} runs into ${join(folder, "runs")}` + "\n");
