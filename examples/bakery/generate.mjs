// Writes the invented bakery runs into runs/ next to this file.
// Build first: npm run build && node examples/bakery/generate.mjs
import { mkdirSync, rmSync } from "node:fs";
import { dirname, join } from "node:path";
import process from "node:process";
import { fileURLToPath } from "node:url";
import { BAKERY, simulateBakery } from "../../dist/demo/bakery.js";
import { writeRunCsv } from "../../dist/demo/ferry.js";

const here = dirname(fileURLToPath(import.meta.url));
rmSync(join(here, "runs"), { recursive: true, force: true });
for (const [s, sc] of BAKERY.scenarios.entries()) {
  const dir = join(here, "runs", sc.name);
  mkdirSync(dir, { recursive: true });
  for (let k = 1; k <= BAKERY.replications; k++) {
    await writeRunCsv(join(dir, `day-${String(k).padStart(2, "0")}.csv`), simulateBakery(s, k));
  }
}
process.stdout.write(`bakery: wrote ${BAKERY.scenarios.length} x ${BAKERY.replications} runs into ${join(here, "runs")}` + "\n");
