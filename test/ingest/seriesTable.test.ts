/**
 * The series table under many distinct names: every row costs the same however many series a run
 * holds, and names are told apart exactly on both of its paths (few names compared in place, many
 * names looked up by hash).
 *
 * Sources: the bound (200 000 distinct names in one run read in seconds; before the
 * change, 50 000 took 50 s and 200 000 more than five minutes on the development machine, so
 * the generous bound below fails on the old code); expected counts computed by hand from the
 * seeded generator (each name i appears `1 + (i % 3)` times).
 */
import { afterAll, describe, expect, it } from "vitest";
import type { SeriesRequest } from "../../src/ingest/readRun.js";
import { gzip, record, scratch } from "./helpers.js";

const dir = scratch();
afterAll(() => dir.remove());

/** `n` names `s0000000`.. that all share their first byte, name i on `1 + (i % 3)` rows. */
function manyNames(n: number): string {
  const rows = ["time,series,value,entity"];
  let t = 0;
  for (let i = 0; i < n; i++) {
    const name = `s${String(i).padStart(7, "0")}`;
    for (let k = 0; k <= i % 3; k++) rows.push(`${t++},${name},${k},`);
  }
  return rows.join("\n") + "\n";
}

describe("SeriesTable with many distinct series", () => {
  it("readRun reads 200 000 distinct series names in one run in well under a minute, counting each exactly", async () => {
    const n = 200_000;
    const path = dir.file("many.csv", manyNames(n));
    const wanted: SeriesRequest[] = [
      { name: "s0000007", entity: false },
      { name: "s0199999", entity: false },
    ];
    const started = Date.now();
    const { calls, report } = await record(path, wanted);
    const seconds = (Date.now() - started) / 1000;
    expect(seconds).toBeLessThan(45); // generous: about 3 s here; the old lookup took minutes
    const counts = report.seriesRows;
    const names = Object.keys(counts);
    expect(names.length).toBe(n);
    expect(names[0]).toBe("s0000000");
    expect(names[n - 1]).toBe("s0199999");
    expect(counts.s0000000).toBe(1);
    expect(counts.s0000001).toBe(2);
    expect(counts.s0123458).toBe(1 + (123458 % 3));
    // Sum of 1 + i % 3 over i < 200 000: 200 000 + 66 666 * (0 + 1 + 2) + 0 + 1 (computed by hand).
    expect(report.rows).toBe(399_999);
    // s0000007: 7 % 3 = 1, two rows with values 0 and 1; s0199999: 199999 % 3 = 1, two rows.
    expect(calls.map((c) => [c.series, c.value])).toEqual([
      [0, 0],
      [0, 1],
      [1, 0],
      [1, 1],
    ]);
  }, 120_000);

  it("readRun tells apart names that share a first byte beyond the few compared in place, quoted or not, in every chunk size", async () => {
    // 20 names starting with `q`, each a prefix or an extension of others, read in rows that
    // interleave them; the quoted spelling of a name is the same series as the unquoted one.
    const names = Array.from({ length: 20 }, (_, i) => "q" + "u".repeat(i % 5) + (i < 10 ? "" : `x${i}`));
    const rows = ["time,series,value"];
    names.forEach((name, i) => rows.push(`${i},${name},${i}`));
    names.forEach((name, i) => rows.push(`${20 + i},"${name}",${100 + i}`));
    names.forEach((name, i) => rows.push(`${40 + i},${name} ,${200 + i}`));
    const text = rows.join("\n") + "\n";
    const wanted: SeriesRequest[] = names.map((name) => ({ name, entity: false }));
    for (const [file, content] of [
      ["prefix.csv", text],
      ["prefix.csv.gz", gzip(text)],
    ] as const) {
      const path = dir.file(file, content);
      for (const chunkSize of [1, 7, 64, 1 << 20]) {
        const { calls, report } = await record(path, wanted, { chunkSize });
        // Names 0-4 and 5-9 repeat (i % 5), so each of them is met 2 * 3 times; the x names 3 times.
        const expected = names.map((_, i) => names.flatMap((m, j) => (m === names[i] ? [j, 100 + j, 200 + j] : [])).sort((a, b) => a - b));
        const got = names.map((_, i) =>
          calls
            .filter((c) => c.series === names.indexOf(names[i]))
            .map((c) => c.value)
            .sort((a, b) => a - b),
        );
        expect(got, `${file} at chunk size ${chunkSize}`).toEqual(expected);
        expect(Object.keys(report.seriesRows).length).toBe(15); // 5 + 10 distinct names
      }
    }
  });

  it("readRun does not read the unquoted cells `a,b` as the series named `a,b` seen quoted before", async () => {
    // Computed by hand: line 3 has the series `a` and the value `b`, which is not a number.
    const path = dir.file("comma.csv", 'time,series,value\n1,"a,b",2\n2,a,b\n');
    await expect(record(path, [{ name: "a,b", entity: false }])).rejects.toThrow(/:3: the value `b` is not a finite decimal number/);
  });

  it("readRun counts a series named __proto__ as its own key", async () => {
    const path = dir.file("proto.csv", "time,series,value\n1,__proto__,2\n2,__proto__,3\n");
    const { report } = await record(path, []);
    expect(Object.hasOwn(report.seriesRows, "__proto__")).toBe(true);
    expect(report.seriesRows["__proto__"]).toBe(2);
  });
});
