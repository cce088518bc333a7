/**
 * Parquet run files (CONTRACT.md section 9): `readRun` on a `.parquet` file gives the rows a CSV
 * file of the same table gives, whatever the codec and the row groups, reads one row group at a
 * time, and refuses bad files with the file, the row and the column. The reference for every
 * row is the CSV reader on the same rows (the test writes both files).
 */
import { execFileSync, spawnSync } from "node:child_process";
import { createHash } from "node:crypto";
import { readFileSync } from "node:fs";
import { afterAll, describe, expect, it } from "vitest";
import type { CompressionCodec } from "hyparquet";
import { parquetWriteBuffer } from "hyparquet-writer";
import { simulateQueue } from "../../src/demo/queue.js";
import { ingestMessages } from "../../src/messages/index.js";
import { newProbe } from "../../src/ingest/parquetFile.js";
import { type Cell, readParquet, readParquetRows } from "../../src/ingest/parquetReader.js";
import { COLUMNS, type Call, record, rejection, scratch } from "./helpers.js";
import { type EventRow, eventsParquet, parquetFile } from "../helpers/parquet.js";
import { csv } from "../helpers/tempStudy.js";

const folder = scratch();
afterAll(() => folder.remove());

const rows: EventRow[] = [...simulateQueue({ arrivalRate: 1, serviceRate: 0.6, servers: 2, horizon: 300, seed: 11, decimals: 5 })].map(
  (r) => [r.time, r.series, r.value, r.entity === null || r.entity === undefined ? null : String(r.entity)],
);
const ALL = ["queue", "busy", "wait", "arrive", "depart"].map((name) => ({ name, entity: true }));
const sha = (path: string) => createHash("sha256").update(readFileSync(path)).digest("hex");

/** The CSV reader's calls with `line` turned into the row's position (the CSV header is line 1). */
function asRows(calls: Call[]): Call[] {
  return calls.map((c) => ({ ...c, line: c.line - 1 }));
}

describe("readRun on a .parquet file (CONTRACT.md section 9)", () => {
  const csvPath = folder.file("rep.csv", csv(rows));
  const codecs: CompressionCodec[] = ["UNCOMPRESSED", "SNAPPY", "GZIP", "ZSTD", "BROTLI"];

  for (const codec of codecs) {
    it(`gives the CSV reader's rows, counts and line positions for ${codec} pages in several row groups`, async () => {
      const path = folder.file(`rep-${codec}.parquet`, eventsParquet(rows, { codec, rowGroupSize: 100 }));
      const fromCsv = await record(csvPath, ALL);
      const fromParquet = await record(path, ALL);
      expect(fromParquet.calls.length).toBeGreaterThan(500);
      expect(fromParquet.calls).toEqual(asRows(fromCsv.calls));
      expect(fromParquet.report.rows).toBe(rows.length);
      expect(fromParquet.report.seriesRows).toEqual(fromCsv.report.seriesRows);
      // the digest and size are those of the file's bytes as stored (section 1: digest as for CSV)
      expect(fromParquet.report.sha256).toBe(sha(path));
      expect(fromParquet.report.bytes).toBe(readFileSync(path).length);
    });
  }

  // Entropy-coded zstd pages need a zstd compressor, which Node 20 lacks: the zstd program, when installed.
  const zstdProgram = spawnSync("zstd", ["--version"]).status === 0;
  it.skipIf(!zstdProgram)("reads ZSTD pages compressed by the zstd program (level 3) as the CSV reader reads the CSV", async () => {
    const compress = (input: Uint8Array) => new Uint8Array(execFileSync("zstd", ["-q", "-3", "-c"], { input }));
    const columns = [
      { name: "time", data: Float64Array.from(rows, (r) => r[0]), type: "DOUBLE" as const, nullable: false },
      { name: "series", data: rows.map((r) => r[1]), type: "STRING" as const },
      { name: "value", data: rows.map((r) => r[2] ?? null), type: "DOUBLE" as const },
      { name: "entity", data: rows.map((r) => r[3] ?? null), type: "STRING" as const },
    ];
    const bytes = Buffer.from(parquetWriteBuffer({ columnData: columns, codec: "ZSTD", compressors: { ZSTD: compress }, rowGroupSize: 250 }));
    const path = folder.file("rep-zstd3.parquet", bytes);
    // really compressed: smaller than the same pages stored
    expect(bytes.length).toBeLessThan(eventsParquet(rows, { codec: "UNCOMPRESSED", rowGroupSize: 250 }).length * 0.8);
    const fromCsv = await record(csvPath, ALL);
    const fromParquet = await record(path, ALL);
    expect(fromParquet.calls).toEqual(asRows(fromCsv.calls));
  });

  it("hands the file's bytes to storedBytes in order and leaves sha256 empty", async () => {
    const path = folder.file("stored.parquet", eventsParquet(rows));
    const chunks: Buffer[] = [];
    const report = await readParquet({ path, display: "stored.parquet", columns: COLUMNS, series: ALL, onRow: () => {}, storedBytes: (c) => chunks.push(Buffer.from(c)) });
    expect(report.sha256).toBe("");
    expect(Buffer.concat(chunks).equals(readFileSync(path))).toBe(true);
  });

  it("holds one row group at a time: the rows held and the longest read are bounded by a row group", async () => {
    const many: EventRow[] = Array.from({ length: 20_000 }, (_, i) => [i / 10, i % 2 === 0 ? "queue" : "wait", i % 7, null]);
    const path = folder.file("groups.parquet", eventsParquet(many, { codec: "UNCOMPRESSED", rowGroupSize: 1000 }));
    const probe = newProbe();
    let n = 0;
    const report = await readParquet({ path, display: "groups.parquet", columns: COLUMNS, series: [{ name: "queue", entity: false }], onRow: () => n++ }, probe);
    expect(report.rows).toBe(20_000);
    expect(n).toBe(10_000);
    expect(probe.groups).toBe(20);
    expect(probe.mostRowsHeld).toBe(1000);
    // one group's chunks of 3 columns: about 1000 * (8 + 8 + a few) bytes, far below the 20 groups
    const size = readFileSync(path).length;
    expect(probe.longestRead).toBeLessThan(size / 10);
  });

  it("reads integer times and values, integer ids as their decimal text, and nulls as empty cells", async () => {
    const path = folder.file(
      "ints.parquet",
      parquetFile([
        { name: "time", data: [0n, 2n, 5n, 7n], type: "INT64" },
        { name: "series", data: [3, 3, 4, 3], type: "INT32" },
        { name: "value", data: [1, null, 2, 4], type: "INT32" },
        { name: "entity", data: [10n, 11n, null, 9007199254740993n], type: "INT64" },
      ]),
    );
    const { calls, report } = await record(path, [
      { name: "3", entity: true },
      { name: "4", entity: true },
    ]);
    expect(report.seriesRows).toEqual({ "3": 3, "4": 1 });
    expect(calls).toEqual([
      { series: 0, time: 0, value: 1, entity: "10", line: 1 },
      { series: 0, time: 2, value: NaN, entity: "11", line: 2 },
      { series: 1, time: 5, value: 2, entity: undefined, line: 3 },
      // an INT64 id beyond 2^53 keeps every digit
      { series: 0, time: 7, value: 4, entity: "9007199254740993", line: 4 },
    ]);
  });

  it("reads a file without a value column, and maps other column names through `columns`", async () => {
    const path = folder.file("mapped.parquet", parquetFile([
      { name: "t", data: [1, 2], type: "DOUBLE" },
      { name: "kind", data: ["sold", "sold"], type: "STRING" },
    ]));
    const columns = { time: "t", series: "kind", value: "v", entity: "id" };
    const { calls } = await record(path, [{ name: "sold", entity: false }], { columns });
    expect(calls.map((c) => [c.time, c.value])).toEqual([[1, NaN], [2, NaN]]);
  });
});

describe("readRun on a bad .parquet file: file, row and column named", () => {
  const good = eventsParquet([[0, "queue", 1, null], [1, "queue", 2, null]]);
  const SOME = ["queue", "wait"].map((name) => ({ name, entity: false }));
  const read = (name: string, content: Buffer) => rejection(record(folder.file(name, content), SOME, { display: `runs/${name}` }));

  it("a file that is not Parquet", async () => {
    const e = await read("text.parquet", Buffer.from(csv(rows.slice(0, 3))));
    expect(e.message).toBe(ingestMessages.notParquet("runs/text.parquet", 99).message);
  });

  it("an empty file", async () => {
    expect((await read("empty.parquet", Buffer.alloc(0))).message).toBe(ingestMessages.notParquet("runs/empty.parquet", 0).message);
  });

  it("a file cut short (its footer missing)", async () => {
    const cut = good.subarray(0, good.length - 30);
    const e = await read("cut.parquet", cut);
    expect(e.message).toBe(ingestMessages.truncatedParquet("runs/cut.parquet", cut.length, "it does not end with the 4 bytes `PAR1`").message);
  });

  it("a missing column", async () => {
    const path = parquetFile([
      { name: "time", data: [0], type: "DOUBLE" },
      { name: "kind", data: ["q"], type: "STRING" },
    ]);
    const e = await read("nocol.parquet", path);
    expect(e.message).toBe(ingestMessages.parquetMissingColumns("runs/nocol.parquet", [{ role: "series", name: "series" }], ["time", "kind"]).message);
  });

  it("a text in the time column: row and column", async () => {
    const e = await read("texttime.parquet", parquetFile([
      { name: "time", data: [null, "1.5"], type: "STRING" },
      { name: "series", data: ["q", "q"], type: "STRING" },
    ]));
    // the first row's time is null, the second's a text
    expect(e.message).toBe(ingestMessages.parquetNullTime("runs/texttime.parquet", 1, "time").message);
    const e2 = await read("texttime2.parquet", parquetFile([
      { name: "time", data: ["0", "1.5"], type: "STRING" },
      { name: "series", data: ["q", "q"], type: "STRING" },
    ]));
    expect(e2.message).toBe(ingestMessages.parquetTextNotNumber("runs/texttime2.parquet", 1, "time", "time", "0").message);
  });

  it("a column of an unusable type says the type", async () => {
    const e = await read("bool.parquet", parquetFile([
      { name: "time", data: [0, 1], type: "DOUBLE" },
      { name: "series", data: ["q", "q"], type: "STRING" },
      { name: "value", data: [null, true], type: "BOOLEAN" },
    ]));
    expect(e.message).toBe(ingestMessages.parquetUnusableType("runs/bool.parquet", 2, "value", "value", "BOOLEAN", "numbers (a double, float, integer or decimal column)").message);
    const stamps = await read("stamp.parquet", parquetFile([
      { name: "time", data: [new Date(0)], type: "TIMESTAMP" },
      { name: "series", data: ["q"], type: "STRING" },
    ]));
    expect(stamps.message).toContain("row 1, column `time` (the time): the column's Parquet type is INT64 (TIMESTAMP_MILLIS)");
  });

  it("a NaN value, an empty series and a time that goes back name their row", async () => {
    const nan = await read("nan.parquet", eventsParquet([[0, "queue", 1], [1, "queue", NaN]]));
    expect(nan.message).toBe(ingestMessages.parquetNotFinite("runs/nan.parquet", 2, "value", "value", NaN).message);
    const empty = await read("noseries.parquet", eventsParquet([[0, "queue", 1], [1, "", 1]]));
    expect(empty.message).toBe(ingestMessages.parquetEmptySeries("runs/noseries.parquet", 2, "series").message);
    const back = await read("back.parquet", eventsParquet([[0, "queue", 1], [3, "wait", 1], [2, "queue", 1], [1, "queue", 1]]));
    expect(back.message).toBe(ingestMessages.parquetTimeDecreased("runs/back.parquet", 4, "time", "queue", 2, 1, 3).message);
  });

  it("a compression with no decompressor", async () => {
    const e = await read("lzo.parquet", eventsParquet([[0, "queue", 1]], { codec: "LZO" }));
    expect(e.message).toContain("column `time` of this Parquet file is compressed with LZO");
  });

  it("damaged page data names the row group and its rows", async () => {
    const many: EventRow[] = Array.from({ length: 400 }, (_, i) => [i, "queue", i]);
    const bytes = Buffer.from(eventsParquet(many, { codec: "GZIP", rowGroupSize: 200 }));
    // overwrite bytes in the middle of the second row group's data (the footer stays intact)
    const at = Math.floor(bytes.length * 0.6);
    bytes.fill(0xff, at, at + 40);
    const e = await read("damaged.parquet", bytes);
    expect(e.message).toMatch(/^runs\/damaged\.parquet:201: the data of row group 2 \(rows 201 to 400\) of this Parquet file cannot be decoded: /);
  });
});

describe("readParquetRows: the plain row source a layout step reads", () => {
  it("gives the header in file order and each row's cells as number | string | null with its position", async () => {
    const path = folder.file("plain.parquet", parquetFile(
      [
        { name: "id", data: [1, 2, 3], type: "INT32" },
        { name: "arrived", data: [0.5, 0.9, null], type: "DOUBLE" },
        { name: "server", data: ["a", null, "b"], type: "STRING" },
        { name: "vip", data: [true, false, null], type: "BOOLEAN" },
      ],
      { rowGroupSize: 2 },
    ));
    const seen: [Cell[], number][] = [];
    let header: readonly string[] = [];
    const report = await readParquetRows({ path, display: "plain.parquet", onHeader: (h) => void (header = h), onRow: (cells, row) => seen.push([[...cells], row]) });
    expect(header).toEqual(["id", "arrived", "server", "vip"]);
    expect(seen).toEqual([
      [[1, 0.5, "a", "true"], 1],
      [[2, 0.9, null, "false"], 2],
      [[3, null, "b", null], 3],
    ]);
    expect(report).toMatchObject({ rows: 3, header: ["id", "arrived", "server", "vip"], sha256: sha(path) });
  });

  it("decodes only the columns onHeader asks for; the others stay null", async () => {
    const path = folder.file("some.parquet", parquetFile([
      { name: "id", data: [1, 2], type: "INT32" },
      { name: "note", data: [{ a: 1 }, { a: 2 }], type: "JSON" },
    ]));
    const seen: Cell[][] = [];
    await readParquetRows({ path, display: "some.parquet", onHeader: () => ["id"], onRow: (cells) => seen.push([...cells]) });
    expect(seen).toEqual([[1, null], [2, null]]);
    // asked for, a JSON column (decoded to objects) is an input error naming the row and the column
    const e = await rejection(readParquetRows({ path, display: "some.parquet", onRow: () => {} }));
    expect(e.message).toContain("some.parquet:1: row 1, column `note`: the column's Parquet type is BYTE_ARRAY (JSON)");
  });
});
