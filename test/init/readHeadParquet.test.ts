/**
 * `sojourn init`'s bounded read of a Parquet run file: the series of the first rows, found by
 * row group, and, when the read stops early, the last time from the file's last row group. The
 * reference is the rows the test wrote.
 */
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { DEFAULT_COLUMNS } from "../../src/init/columns.js";
import { readHead } from "../../src/init/readHead.js";
import { type EventRow, eventsParquet } from "../helpers/parquet.js";

const dir = mkdtempSync(join(tmpdir(), "sojourn-init-parquet-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe("readHead on a .parquet file", () => {
  it("finds the series of the first rows, and the last time of a file read only in part", async () => {
    const rows: EventRow[] = Array.from({ length: 5000 }, (_, i) => [i / 4, ["queue", "wait", "depart"][i % 3], i % 3 === 2 ? null : i % 7, i % 3 === 2 ? `c${i}` : null]);
    const path = join(dir, "rep-01.parquet");
    writeFileSync(path, eventsParquet(rows, { rowGroupSize: 1000 }));
    const head = await readHead(path, "runs/rep-01.parquet", DEFAULT_COLUMNS, 100);
    expect(head.cut).toBe(true);
    expect(head.series.map((s) => s.name)).toEqual(["queue", "wait", "depart"]);
    // the last row's time: (5000 - 1) / 4
    expect(head.lastTime).toBe(1249.75);
    expect(head.series.find((s) => s.name === "depart")!.withEntity).toBeGreaterThan(0);
  });
});
