import { createWriteStream, existsSync, mkdirSync, readdirSync } from "node:fs";
import { once } from "node:events";
import { join } from "node:path";
import { type DemoRow, type QueueModel, simulateQueue } from "./queue.js";

/** Marker file of a demo folder: the demo may replace a folder holding it. */
export const DEMO_MANIFEST = "ferry-study.yaml";

/** The invented demo: a ferry terminal's check-in lanes with two or three open booths. */
export const FERRY = {
  arrivalRate: 0.9, // vehicles per minute
  serviceRate: 0.5, // check-ins per minute per booth
  horizon: 480, // minutes (an eight-hour shift)
  replications: 8,
  scenarios: [
    { name: "two-booths", servers: 2 },
    { name: "three-booths", servers: 3 },
  ],
};

/** Writes rows as CSV (time,series,value,entity) to a file, streaming. */
export async function writeRunCsv(path: string, rows: Iterable<DemoRow>): Promise<number> {
  const out = createWriteStream(path);
  let buf = "time,series,value,entity\n";
  let n = 0;
  for (const r of rows) {
    buf += `${r.time},${r.series},${r.value ?? ""},${r.entity ?? ""}\n`;
    n++;
    if (buf.length > 1 << 16) {
      if (!out.write(buf)) await once(out, "drain");
      buf = "";
    }
  }
  out.end(buf);
  await once(out, "finish");
  return n;
}

const MANIFEST = `# Demo study written by \`sojourn demo\`: invented data from a seeded queue simulation.
version: 1
title: Ferry check-in, two booths against three
time_unit: min
confidence: 0.95
warmup: 30
scenarios:
  - name: two-booths
    end: 480
    runs: runs/two-booths/*.csv
    measures:
      booth_use: {capacity: 2}
  - name: three-booths
    end: 480
    runs: runs/three-booths/*.csv
    measures:
      booth_use: {capacity: 3}
measures:
  - {name: lane_queue, kind: level, series: queue, at_least: [1, 5], label: Vehicles waiting in the lane, unit: vehicles}
  - {name: booth_use, kind: utilization, series: busy, capacity: 2, label: Booths busy}
  - {name: check_wait, kind: observation, series: wait, within: [5, 15], target: {half_width: 1}, label: Wait at the booth, unit: min}
  - {name: vehicles_done, kind: count, series: depart, label: Vehicles checked in, unit: vehicles}
  - {name: in_terminal, kind: level, from: {enter: arrive, leave: depart}, label: Vehicles in the terminal, unit: vehicles}
  - {name: time_in_terminal, kind: observation, from: {start: arrive, end: depart}, label: Time in the terminal}
compare:
  - {measure: check_wait, scenarios: [two-booths, three-booths], method: paired}
  - {measure: lane_queue, scenarios: [two-booths, three-booths], method: welch}
`;

/**
 * Writes the demo study into `dir`: run files for every scenario and replication (replication k
 * uses seed 1000 + k in every scenario: common random numbers, so paired comparison is fair),
 * and the manifest. Returns the manifest's path.
 */
export async function writeFerryStudy(dir: string): Promise<string> {
  mkdirSync(dir, { recursive: true });
  for (const sc of FERRY.scenarios) {
    const runs = join(dir, "runs", sc.name);
    mkdirSync(runs, { recursive: true });
    for (let k = 1; k <= FERRY.replications; k++) {
      const model: QueueModel = {
        arrivalRate: FERRY.arrivalRate,
        serviceRate: FERRY.serviceRate,
        servers: sc.servers,
        horizon: FERRY.horizon,
        seed: 1000 + k,
        decimals: 3,
      };
      await writeRunCsv(join(runs, `rep-${String(k).padStart(2, "0")}.csv`), simulateQueue(model));
    }
  }
  const manifest = join(dir, DEMO_MANIFEST);
  const { writeFileSync } = await import("node:fs");
  writeFileSync(manifest, MANIFEST);
  return manifest;
}

/** True when `dir` is absent, empty, or an earlier demo folder. */
export function demoDirUsable(dir: string): boolean {
  if (!existsSync(dir)) return true;
  const entries = readdirSync(dir);
  return entries.length === 0 || entries.includes(DEMO_MANIFEST);
}
