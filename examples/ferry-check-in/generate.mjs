// Writes the invented ferry check-in runs (the same seeded data as `sojourn demo`) into runs/ next
// to this file, or into FOLDER/runs/ when a folder is given (the runs/ folder there is replaced);
// the same runs as one row per vehicle into layouts/runs-entities/ and as a wide table of levels
// into layouts/runs-levels/ (layouts/ferry-entities.yaml, layouts/ferry-levels.yaml).
// Build first: npm run build && node examples/ferry-check-in/generate.mjs [FOLDER]
import { mkdirSync, rmSync, writeFileSync } from "node:fs";
import { dirname, join, resolve } from "node:path";
import process from "node:process";
import { fileURLToPath } from "node:url";
import { FERRY, writeRunCsv } from "../../dist/demo/ferry.js";
import { simulateQueue } from "../../dist/demo/queue.js";
import { queueAsEntities, queueAsLevels } from "../../dist/demo/layouts.js";

const folder = process.argv[2] === undefined ? dirname(fileURLToPath(import.meta.url)) : resolve(process.argv[2]);
for (const runs of ["runs", "layouts/runs-entities", "layouts/runs-levels"]) rmSync(join(folder, runs), { recursive: true, force: true });
for (const sc of FERRY.scenarios) {
  const dir = join(folder, "runs", sc.name);
  mkdirSync(dir, { recursive: true });
  for (let k = 1; k <= FERRY.replications; k++) {
    const rows = simulateQueue({ arrivalRate: FERRY.arrivalRate, serviceRate: FERRY.serviceRate, servers: sc.servers, horizon: FERRY.horizon, seed: 1000 + k, decimals: 3 });
    const rowList = [...rows];
    const name = `rep-${String(k).padStart(2, "0")}.csv`;
    await writeRunCsv(join(dir, name), rowList);
    for (const [runs, text] of [["layouts/runs-entities", queueAsEntities(rowList)], ["layouts/runs-levels", queueAsLevels(rowList)]]) {
      mkdirSync(join(folder, runs, sc.name), { recursive: true });
      writeFileSync(join(folder, runs, sc.name, name), text);
    }
  }
}
process.stdout.write(`ferry-check-in: wrote ${FERRY.scenarios.length} x ${FERRY.replications} runs into ${join(folder, "runs")}, layouts/runs-entities and layouts/runs-levels` + "\n");
