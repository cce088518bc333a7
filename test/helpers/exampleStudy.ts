/**
 * The invented example studies of examples/ (bakery, ferry check-in) in a temporary folder: the
 * example's manifest copied as it is and its runs written by the same seeded code as the
 * example's generate.mjs, so tests never write into the repository.
 */
import { copyFileSync, mkdirSync } from "node:fs";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { BAKERY, simulateBakery } from "../../src/demo/bakery.js";
import { FERRY, writeRunCsv } from "../../src/demo/ferry.js";
import { simulateQueue } from "../../src/demo/queue.js";

const EXAMPLES = fileURLToPath(new URL("../../examples/", import.meta.url));

export type ExampleName = "bakery" | "ferry-check-in";

/** Writes the example into `dir` and returns its manifest's path. */
export async function writeExample(name: ExampleName, dir: string): Promise<string> {
  if (name === "bakery") {
    for (const [s, sc] of BAKERY.scenarios.entries()) {
      mkdirSync(join(dir, "runs", sc.name), { recursive: true });
      for (let k = 1; k <= BAKERY.replications; k++) await writeRunCsv(join(dir, "runs", sc.name, `day-${String(k).padStart(2, "0")}.csv`), simulateBakery(s, k));
    }
    copyFileSync(join(EXAMPLES, "bakery", "bakery.yaml"), join(dir, "bakery.yaml"));
    return join(dir, "bakery.yaml");
  }
  for (const sc of FERRY.scenarios) {
    mkdirSync(join(dir, "runs", sc.name), { recursive: true });
    for (let k = 1; k <= FERRY.replications; k++) {
      const rows = simulateQueue({ arrivalRate: FERRY.arrivalRate, serviceRate: FERRY.serviceRate, servers: sc.servers, horizon: FERRY.horizon, seed: 1000 + k, decimals: 3 });
      await writeRunCsv(join(dir, "runs", sc.name, `rep-${String(k).padStart(2, "0")}.csv`), rows);
    }
  }
  copyFileSync(join(EXAMPLES, "ferry-check-in", "ferry.yaml"), join(dir, "ferry.yaml"));
  return join(dir, "ferry.yaml");
}
