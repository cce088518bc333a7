// Writes the invented runs of the five ferry booth plans (src/demo/ferryPlans.ts) into runs/ next
// to this file, or into FOLDER/runs/ when a folder is given (the runs/ folder there is replaced).
// Build first: npm run build && node examples/ferry-booth-plans/generate.mjs [FOLDER]
import { mkdirSync, rmSync } from "node:fs";
import { dirname, join, resolve } from "node:path";
import process from "node:process";
import { fileURLToPath } from "node:url";
import { writeRunCsv } from "../../dist/demo/ferry.js";
import { FERRY_PLANS, planSeed } from "../../dist/demo/ferryPlans.js";
import { simulateQueue } from "../../dist/demo/queue.js";

const folder = process.argv[2] === undefined ? dirname(fileURLToPath(import.meta.url)) : resolve(process.argv[2]);
rmSync(join(folder, "runs"), { recursive: true, force: true });
for (const plan of FERRY_PLANS.plans) {
  const dir = join(folder, "runs", plan.name);
  mkdirSync(dir, { recursive: true });
  // The selection's plans also get their second-stage runs (src/demo/ferryPlans.ts).
  const runs = FERRY_PLANS.selection.plans.includes(plan.name) ? FERRY_PLANS.selection.runs : FERRY_PLANS.replications;
  for (let k = 1; k <= runs; k++) {
    const rows = simulateQueue({ arrivalRate: FERRY_PLANS.arrivalRate, serviceRate: plan.serviceRate, servers: plan.booths, horizon: FERRY_PLANS.horizon, seed: planSeed(k), decimals: 3 });
    await writeRunCsv(join(dir, `rep-${String(k).padStart(2, "0")}.csv`), rows);
  }
}
const second = FERRY_PLANS.selection.plans.length * (FERRY_PLANS.selection.runs - FERRY_PLANS.replications);
process.stdout.write(`ferry-booth-plans: wrote ${FERRY_PLANS.plans.length} x ${FERRY_PLANS.replications} first-stage runs and ${second} second-stage runs into ${join(folder, "runs")}` + "\n");
