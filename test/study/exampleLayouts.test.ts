/**
 * examples/ferry-check-in read from the same seeded runs in three layouts (ferry.yaml: events;
 * layouts/ferry-entities.yaml: one row per vehicle; layouts/ferry-levels.yaml: a wide table of levels) gives the
 * same numbers. Tolerance 1e-12 relative: the entity table's waits are differences of times where
 * the event table carries the rounded difference, and its areas are sums over other intervals
 * (zero-length ones in between), so the last digits may differ (computed, not from a source).
 */
import { copyFileSync, mkdirSync, rmSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { afterAll, describe, expect, it } from "vitest";
import { FERRY } from "../../src/demo/ferry.js";
import { queueAsEntities, queueAsLevels } from "../../src/demo/layouts.js";
import { simulateQueue } from "../../src/demo/queue.js";
import { loadStudy } from "../../src/manifest/loadStudy.js";
import { runStudy } from "../../src/study/runStudy.js";
import { writeExample } from "../helpers/exampleStudy.js";
import { tempFolder } from "../helpers/tempStudy.js";

const EXAMPLE = fileURLToPath(new URL("../../examples/ferry-check-in/", import.meta.url));
const dir = tempFolder({});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const RUN_FIELDS = ["value", "mean", "sd", "min", "max", "area", "duration", "final", "n", "rate", "capacity_area"];
const SUMMARY_FIELDS = ["n", "mean", "sd", "half_width", "ci_low", "ci_high"];

function close(a: unknown, b: unknown, where: string): void {
  if (typeof a === "number" && typeof b === "number") {
    expect(Math.abs(a - b), `${where}: ${a} against ${b}`).toBeLessThanOrEqual(1e-12 * Math.max(1, Math.abs(b)));
  } else expect(a, where).toEqual(b);
}

describe("examples/ferry-check-in in three layouts", () => {
  it("ferry-entities.yaml and ferry-levels.yaml give the numbers of ferry.yaml to 1e-12", async () => {
    await writeExample("ferry-check-in", dir);
    for (const sc of FERRY.scenarios) {
      for (const runs of ["runs-entities", "runs-levels"]) mkdirSync(join(dir, "layouts", runs, sc.name), { recursive: true });
      for (let k = 1; k <= FERRY.replications; k++) {
        // the same model and seeds as examples/ferry-check-in/generate.mjs
        const rows = [...simulateQueue({ arrivalRate: FERRY.arrivalRate, serviceRate: FERRY.serviceRate, servers: sc.servers, horizon: FERRY.horizon, seed: 1000 + k, decimals: 3 })];
        const name = `rep-${String(k).padStart(2, "0")}.csv`;
        writeFileSync(join(dir, "layouts", "runs-entities", sc.name, name), queueAsEntities(rows));
        writeFileSync(join(dir, "layouts", "runs-levels", sc.name, name), queueAsLevels(rows));
      }
    }
    for (const m of ["ferry-entities.yaml", "ferry-levels.yaml"]) copyFileSync(join(EXAMPLE, "layouts", m), join(dir, "layouts", m));
    const results = async (m: string) => (await runStudy(await loadStudy(join(dir, m)))).outcome.results;
    const events = await results("ferry.yaml");
    let compared = 0;
    for (const other of ["layouts/ferry-entities.yaml", "layouts/ferry-levels.yaml"]) {
      const r = await results(other);
      r.scenarios.forEach((sc, s) => {
        const base = events.scenarios[s];
        expect(sc.runs.map((x) => x.id)).toEqual(base.runs.map((x) => x.id));
        for (const measure of Object.keys(sc.runs[0].measures)) {
          sc.runs.forEach((run, i) => {
            const a = run.measures[measure] as unknown as Record<string, unknown>;
            const b = base.runs[i].measures[measure] as unknown as Record<string, unknown>;
            for (const f of RUN_FIELDS) if (f in b) {
              close(a[f], b[f], `${other} ${sc.name} ${run.id} ${measure}.${f}`);
              compared++;
            }
          });
          const a = (sc.summary as unknown as Record<string, Record<string, unknown>>)[measure];
          const b = (base.summary as unknown as Record<string, Record<string, unknown>>)[measure];
          for (const f of SUMMARY_FIELDS) close(a[f], b[f], `${other} ${sc.name} summary ${measure}.${f}`);
        }
      });
    }
    // 6 + 2 measures, 2 scenarios x 8 runs, several figures each
    expect(compared).toBeGreaterThan(8 * 16 * 3);
  }, 120_000);
});
