import { describe, expect, it } from "vitest";
import { csv, gz, jsonl } from "../helpers/tempStudy.js";
import { studyOf } from "../helpers/runStudyFrom.js";
import { simulateQueue } from "../../src/demo/queue.js";

const rows = [...simulateQueue({ arrivalRate: 1, serviceRate: 0.6, servers: 2, horizon: 200, seed: 3, decimals: 5 })].map(
  (r) => [r.time, r.series, r.value, r.entity] as [number, string, number | null, string | null],
);
const text = csv(rows);
const variants: Record<string, string | Buffer> = {
  "runs/plain.csv": text,
  "runs/bomcrlf.csv": "\uFEFF" + text.replace(/\n/g, "\r\n"),
  "runs/quoted.csv": text
    .split("\n")
    .map((l, i) => (i === 0 || l === "" ? l : l.split(",").map((c) => `"${c}"`).join(",")))
    .join("\n"),
  "runs/lines.jsonl": jsonl(rows),
  "runs/packed.csv.gz": gz(text),
  "runs/packedlines.jsonl.gz": gz(jsonl(rows)),
};

const manifest = `title: encodings
warmup: 20
scenarios:
  - {name: s, end: 200, runs: runs/*}
measures:
  - {name: q, kind: level, series: queue, at_least: [1]}
  - {name: u, kind: utilization, series: busy, capacity: 2}
  - {name: w, kind: observation, series: wait}
  - {name: d, kind: count, series: depart}
  - {name: inside, kind: level, from: {enter: arrive, leave: depart}}
  - {name: stay, kind: observation, from: {start: arrive, end: depart}}
`;

describe("the same run in every encoding (CONTRACT.md section 1)", () => {
  it("CSV, CSV with BOM and CRLF, quoted CSV, JSON Lines and gzip give identical run statistics", async () => {
    const { outcome } = await studyOf(manifest, variants);
    const runs = outcome.results.scenarios[0].runs;
    expect(runs.map((r) => r.id).sort()).toEqual(["bomcrlf", "lines", "packed", "packedlines", "plain", "quoted"]);
    const reference = JSON.stringify(runs.find((r) => r.id === "plain")!.measures);
    for (const r of runs) expect(JSON.stringify(r.measures)).toBe(reference);
    // identical values give a zero spread across runs: sd 0 exactly (common practice: a constant has no variance)
    expect(outcome.results.scenarios[0].summary.q.sd).toBe(0);
  });
});
