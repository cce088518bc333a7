// Writes the invented bakery runs into runs/ next to this file, or into FOLDER/runs/ when a
// folder is given (the runs/ folder there is replaced). Build first:
// npm run build && node examples/bakery/generate.mjs [FOLDER]
import { mkdirSync, rmSync } from "node:fs";
import { dirname, join, resolve } from "node:path";
import process from "node:process";
import { fileURLToPath } from "node:url";
import { BAKERY, simulateBakery } from "../../dist/demo/bakery.js";
import { writeRunCsv } from "../../dist/demo/ferry.js";

const folder = process.argv[2] === undefined ? dirname(fileURLToPath(import.meta.url)) : resolve(process.argv[2]);
rmSync(join(folder, "runs"), { recursive: true, force: true });
for (const [s, sc] of BAKERY.scenarios.entries()) {
  const dir = join(folder, "runs", sc.name);
  mkdirSync(dir, { recursive: true });
  for (let k = 1; k <= BAKERY.replications; k++) {
    await writeRunCsv(join(dir, `day-${String(k).padStart(2, "0")}.csv`), simulateBakery(s, k));
  }
}
process.stdout.write(`bakery: wrote ${BAKERY.scenarios.length} x ${BAKERY.replications} runs into ${join(folder, "runs")}` + "\n");
