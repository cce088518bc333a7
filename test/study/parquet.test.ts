/**
 * The same run as CSV, gzip CSV and Parquet (CONTRACT.md sections 1, 9 and 11): results.json and
 * every calculation table are identical apart from the run file's name and digest, and the
 * tables' `line` column, which is the line of the text for CSV (the header is line 1) and the
 * row's 1-based position for Parquet, so one less for the same row. A report made from Parquet
 * runs passes `sojourn verify` (through the built command line: `npm run build` first).
 */
import { readFileSync, rmSync, writeFileSync } from "node:fs";
import { spawnSync } from "node:child_process";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { afterAll, describe, expect, it } from "vitest";
import type { CompressionCodec } from "hyparquet";
import { simulateQueue } from "../../src/demo/queue.js";
import { studyOf } from "../helpers/runStudyFrom.js";
import { csv, gz, tempFolder } from "../helpers/tempStudy.js";
import { type EventRow, eventsParquet } from "../helpers/parquet.js";
import { sojourn } from "../helpers/cli.js";

const MAIN = fileURLToPath(new URL("../../dist/cli/main.js", import.meta.url));

const rows: EventRow[] = [...simulateQueue({ arrivalRate: 1, serviceRate: 0.6, servers: 2, horizon: 200, seed: 5, decimals: 5 })].map(
  (r) => [r.time, r.series, r.value, r.entity === null || r.entity === undefined ? null : String(r.entity)],
);

const manifest = (file: string) => `title: encodings
warmup: 20
scenarios:
  - {name: s, end: 200, runs: [runs/${file}]}
measures:
  - {name: q, kind: level, series: queue, at_least: [1]}
  - {name: u, kind: utilization, series: busy, capacity: 2}
  - {name: w, kind: observation, series: wait}
  - {name: d, kind: count, series: depart}
  - {name: inside, kind: level, from: {enter: arrive, leave: depart}}
  - {name: stay, kind: observation, from: {start: arrive, end: depart}}
`;

/** results.json with the run's file name and digest taken out. */
function withoutFile(results: unknown): string {
  return JSON.stringify(results, (key, value: unknown) => (key === "file" || key === "sha256" ? "<file>" : value));
}

/** A table's CSV text with its line columns (`line`, `start_line`, ...) moved by `shift` (the text otherwise as written). */
function shiftLines(text: string, shift: number): string {
  const lines = text.split("\n");
  const at = lines[0].split(",").flatMap((name, i) => (name === "line" || name.endsWith("_line") ? [i] : []));
  return lines
    .map((l, i) => {
      if (i === 0 || l === "") return l;
      const cells = l.split(",");
      for (const a of at) if (cells[a] !== "") cells[a] = String(Number(cells[a]) + shift);
      return cells.join(",");
    })
    .join("\n");
}

async function runOf(file: string, content: string | Buffer) {
  const r = await studyOf(manifest(file), { [`runs/${file}`]: content });
  rmSync(r.dir, { recursive: true, force: true });
  return r;
}

describe("one run as CSV, gzip CSV and Parquet (CONTRACT.md section 9)", () => {
  const codecs: CompressionCodec[] = ["UNCOMPRESSED", "SNAPPY", "GZIP", "ZSTD"];

  it("gives identical results.json and calculation tables apart from the file's name, digest and line numbering", async () => {
    const text = csv(rows);
    const reference = await runOf("rep-01.csv", text);
    const variants = [await runOf("rep-01.csv.gz", gz(text))];
    for (const codec of codecs) variants.push(await runOf("rep-01.parquet", eventsParquet(rows, { codec, rowGroupSize: 97 })));
    const tableText = (r: typeof reference, shift: number) => r.tableFiles.map((t) => `${t.record.file}\n${shiftLines(t.csv, shift)}`);
    expect(reference.tableFiles.length).toBeGreaterThan(3);
    expect(reference.tableFiles.some((t) => t.csv.split("\n")[0].split(",").includes("line"))).toBe(true);
    variants.forEach((v, i) => {
      expect(withoutFile(v.outcome.results)).toBe(withoutFile(reference.outcome.results));
      // gzip CSV numbers lines as CSV does; Parquet numbers rows, one less than the CSV line
      expect(tableText(v, i === 0 ? 0 : 1)).toEqual(tableText(reference, 0));
    });
    const digests = new Set([reference, ...variants].map((r) => r.outcome.results.scenarios[0].runs[0].sha256));
    expect(digests.size).toBe(1 + variants.length);
  });
});

describe("sojourn verify on a report made from Parquet runs", () => {
  const dir = tempFolder({
    "study.yaml": manifest("*.parquet").replace("runs: [runs/*.parquet]", 'runs: "runs/*.parquet"'),
    "runs/rep-01.parquet": eventsParquet(rows, { codec: "SNAPPY", rowGroupSize: 200 }),
    "runs/rep-02.parquet": eventsParquet(rows.slice(0, 400), { codec: "GZIP" }),
  });
  afterAll(() => rmSync(dir, { recursive: true, force: true }));

  it("reports, then verifies every digest and number; a changed Parquet file fails verify", () => {
    const made = sojourn(["report", "study.yaml", "--out", "report"], dir);
    expect(made.stderr).toContain("s / rep-01 (1055 rows)");
    expect(made.stderr).toContain("s / rep-02 (400 rows)");
    expect(made.status).toBe(0);
    const results = JSON.parse(readFileSync(join(dir, "report", "results.json"), "utf8")) as { scenarios: { runs: { id: string }[] }[] };
    expect(results.scenarios[0].runs.map((r) => r.id)).toEqual(["rep-01", "rep-02"]);
    const ok = sojourn(["verify", "report"], dir);
    expect(ok.status).toBe(0);
    expect(ok.stdout).not.toMatch(/FAILED/);
    // read on the reader thread (every file counts as large): the same results.json, byte for byte
    const threaded = spawnSync(process.execPath, [MAIN, "report", "study.yaml", "--out", "threaded", "--workers", "1", "--quiet"], {
      cwd: dir,
      encoding: "utf8",
      env: { ...process.env, SOURCE_DATE_EPOCH: "1780000000", SOJOURN_PARALLEL_BYTES: "1" },
    });
    expect(threaded.status).toBe(0);
    expect(readFileSync(join(dir, "threaded", "results.json"), "utf8")).toBe(readFileSync(join(dir, "report", "results.json"), "utf8"));
    // the same rows written again with another codec: other bytes, so the digest no longer matches
    writeFileSync(join(dir, "runs", "rep-02.parquet"), eventsParquet(rows.slice(0, 400), { codec: "UNCOMPRESSED" }));
    const changed = sojourn(["verify", "report"], dir);
    expect(changed.status).toBe(1);
    expect(changed.stdout).toMatch(/FAILED.*rep-02\.parquet/);
  });
});
