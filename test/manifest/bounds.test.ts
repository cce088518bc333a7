/**
 * Sizes a manifest may ask for are bounded (docs/manifest.md, "Bounds"), each checked with the
 * catalogue's message at the key path that asks for too much. Limits from the schema
 * (docs/manifest.schema.json) and from buildStudy (MAX_SLICES); positions found by string search.
 */
import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { MAX_SLICES } from "../../src/manifest/buildStudy.js";
import { loadStudy } from "../../src/manifest/loadStudy.js";
import { manifestMessages as m } from "../../src/messages/index.js";
import { manifestWriter, pos, userError } from "./helpers.js";

interface SchemaNode {
  description?: string;
  properties?: Record<string, SchemaNode>;
  definitions?: Record<string, SchemaNode>;
}
const schema = JSON.parse(readFileSync(new URL("../../docs/manifest.schema.json", import.meta.url), "utf8")) as SchemaNode;
const defs = schema.definitions!;

const write = manifestWriter();

const failure = (text: string) => {
  const file = write(text);
  return userError(loadStudy(file)).then((error) => ({ error, file }));
};

const SCENARIO = "{name: two, end: 600, runs: runs/two/*.csv}";
const study = (measure: string, top = "", scenario = SCENARIO) => `${top}scenarios:\n  - ${scenario}\nmeasures:\n  - ${measure}\n`;
const numbers = (n: number, f: (i: number) => number) => `[${Array.from({ length: n }, (_, i) => f(i)).join(", ")}]`;

describe("manifest bounds: lists of figures", () => {
  for (const [key, kind, def, f] of [
    ["quantiles", "observation", "quantiles", (i: number) => i / 1000],
    ["within", "observation", "within", (i: number) => i],
    ["at_least", "level", "atLeast", (i: number) => i],
  ] as const) {
    it(`${key}: 100 numbers are read, 101 stop with the list's key path`, async () => {
      const ok = write(study(`{name: w, kind: ${kind}, series: queue, ${key}: ${numbers(100, f)}}`));
      const loaded = await loadStudy(ok);
      const measure = loaded.scenarios[0].measures[0] as unknown as Record<string, number[]>;
      expect(measure[key === "at_least" ? "atLeast" : key]).toHaveLength(100);

      const text = study(`{name: w, kind: ${kind}, series: queue, ${key}: ${numbers(101, f)}}`);
      const { error, file } = await failure(text);
      const place = { file, ...pos(text, "[0,"), path: `measures[0].${key}` };
      expect(error.message).toBe(m.wrongItemCount(place, 101, "at most 100 items", defs[def].description ?? null).message);
    });

    it(`${key}: a number listed twice (0 and -0 are one number) stops at the second`, async () => {
      const text = study(`{name: w, kind: ${kind}, series: queue, ${key}: [0, 0.5, -0]}`);
      const { error, file } = await failure(text);
      expect(error.message).toBe(m.listedTwice({ file, ...pos(text, "-0"), path: `measures[0].${key}[2]` }, key, -0, 0).message);
    });
  }

  it("a number listed twice in a scenario's override is named at the override's path", async () => {
    const text = study("{name: w, kind: observation, series: queue}", "", "{name: two, end: 600, runs: runs/two/*.csv, measures: {w: {within: [2, 3, 2]}}}");
    const { error, file } = await failure(text);
    expect(error.message).toBe(m.listedTwice({ file, ...pos(text, "2]"), path: "scenarios[0].measures.w.within[2]" }, "within", 2, 0).message);
  });
});

describe("manifest bounds: batches and tables", () => {
  it("batches: 10000 are read, 10001 stop at analysis.batches", async () => {
    const ok = await loadStudy(write(study("{name: q, kind: level, series: queue}", "analysis: {method: batch-means, batches: 10000}\n")));
    expect(ok.scenarios[0].analysis).toEqual({ type: "batch-means", batches: 10000 });
    const text = study("{name: q, kind: level, series: queue}", "analysis: {method: batch-means, batches: 10001}\n");
    const { error, file } = await failure(text);
    const description = defs.analysis.properties!.batches.description ?? null;
    expect(error.message).toBe(m.numberOutOfRange({ file, ...pos(text, "10001"), path: "analysis.batches" }, 10001, "at most 10000", description).message);
  });

  it("tables.max_rows above 1000000 and edge_rows above 100000 stop at their key", async () => {
    const rows = study("{name: q, kind: level, series: queue}", "tables: {max_rows: 1000001}\n");
    const a = await failure(rows);
    expect(a.error.message).toBe(
      m.numberOutOfRange({ file: a.file, ...pos(rows, "1000001"), path: "tables.max_rows" }, 1000001, "at most 1000000", defs.tables.properties!.max_rows.description ?? null).message,
    );
    const edge = study("{name: q, kind: level, series: queue}", "tables: {max_rows: 1000000, edge_rows: 100001}\n");
    const b = await failure(edge);
    expect(b.error.message).toBe(
      m.numberOutOfRange({ file: b.file, ...pos(edge, "100001"), path: "tables.edge_rows" }, 100001, "at most 100000", defs.tables.properties!.edge_rows.description ?? null).message,
    );
  });

  it("tables.edge_rows as written must be less than half of max_rows; the default gives way", async () => {
    const text = study("{name: q, kind: level, series: queue}", "tables: {max_rows: 100, edge_rows: 50}\n");
    const { error, file } = await failure(text);
    expect(error.message).toBe(m.edgeRowsTooMany({ file, ...pos(text, "50}"), path: "tables.edge_rows" }, 50, 100).message);
    const written = await loadStudy(write(study("{name: q, kind: level, series: queue}", "tables: {max_rows: 100, edge_rows: 49}\n")));
    expect(written.tables).toEqual({ maxRows: 100, edgeRows: 49 });
    const defaulted = await loadStudy(write(study("{name: q, kind: level, series: queue}", "tables: {max_rows: 100}\n")));
    expect(defaulted.tables).toEqual({ maxRows: 100, edgeRows: 500 }); // TableBuilder keeps a quarter, 25
  });
});

describe("manifest bounds: MSER-5 slices of a run window", () => {
  it(`a slice that cuts a window into more than ${MAX_SLICES} slices stops at warmup.slice, naming the run`, async () => {
    // window [0, 600]: slice 0.0061 gives 98360 slices, 0.005 gives 120000 (computed by hand)
    const ok = await loadStudy(write(study("{name: q, kind: level, series: queue}", "warmup: {method: mser-5, measure: q, slice: 0.0061}\n")));
    expect(ok.scenarios[0].warmup).toEqual({ type: "mser-5", measure: "q", slice: 0.0061 });
    const text = study("{name: q, kind: level, series: queue}", "warmup: {method: mser-5, measure: q, slice: 0.005}\n");
    const { error, file } = await failure(text);
    const place = { file, ...pos(text, "0.005"), path: "warmup.slice" };
    expect(error.message).toBe(m.tooManySlices(place, "two", "rep-01", 0.005, 0, 600, 120000, MAX_SLICES).message);
    expect(error.message).toContain("into 120,000 slices");
    expect(error.message).toContain("Use a slice of at least 0.006 ");
  });

  it("checks each run's own window, and a scenario's own warm-up at its own path", async () => {
    const scenario = "{name: two, end: 600, warmup: {method: mser-5, measure: q, slice: 1}, runs: [runs/two/rep-01.csv, {path: runs/two/rep-02.csv, end: 1e9}]}";
    const text = study("{name: q, kind: level, series: queue}", "", scenario);
    const { error, file } = await failure(text);
    const place = { file, ...pos(text, "slice: 1") , path: "scenarios[0].warmup.slice" };
    expect(error.message).toBe(m.tooManySlices({ ...place, column: place.column + 7 }, "two", "rep-02", 1, 0, 1e9, 1e9, MAX_SLICES).message);
  });

  it("does not bound the slice of an observation measure (MSER-5 there uses the observations, not slices)", async () => {
    const loaded = await loadStudy(write(study("{name: w, kind: observation, series: wait}", "warmup: {method: mser-5, measure: w, slice: 1e-9}\n")));
    expect(loaded.scenarios[0].warmup).toEqual({ type: "mser-5", measure: "w", slice: 1e-9 });
  });
});
