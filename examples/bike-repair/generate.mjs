// Writes the invented bike repair shop runs (one long run per scenario) into runs/ next to this
// file, or into FOLDER/runs/ when a folder is given (the runs/ folder there is replaced).
// Build first: npm run build && node examples/bike-repair/generate.mjs [FOLDER]
import { mkdirSync, rmSync } from "node:fs";
import { dirname, join, resolve } from "node:path";
import process from "node:process";
import { fileURLToPath } from "node:url";
import { BIKE_SHOP, simulateBikeShop } from "../../dist/demo/bikeShop.js";
import { writeRunCsv } from "../../dist/demo/ferry.js";

const folder = process.argv[2] === undefined ? dirname(fileURLToPath(import.meta.url)) : resolve(process.argv[2]);
rmSync(join(folder, "runs"), { recursive: true, force: true });
for (const [s, sc] of BIKE_SHOP.scenarios.entries()) {
  const dir = join(folder, "runs", sc.name);
  mkdirSync(dir, { recursive: true });
  await writeRunCsv(join(dir, "long-run.csv"), simulateBikeShop(s));
}
process.stdout.write(`bike-repair: wrote ${BIKE_SHOP.scenarios.length} long runs into ${join(folder, "runs")}` + "\n");
