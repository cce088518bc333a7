/**
 * Parquet run files with nested columns (a list, a struct): the flat columns a study reads give
 * the figures of the same table as CSV, and a nested column the study reads is refused before any
 * row, with a message naming the file and the column (exit status 1, no stack trace; contract
 * section 5). Parquet's nesting (groups, repeated fields) is that of the format's specification.
 */
import { afterAll, describe, expect, it } from "vitest";
import { ingestMessages } from "../../src/messages/index.js";
import { readParquet } from "../../src/ingest/parquetReader.js";
import { sojourn } from "../helpers/cli.js";
import { departureOrder, entityCsv, entityMeasures, simulate } from "../helpers/layoutModel.js";
import { ENTITY_NAMES, layoutManifest, numbersOf } from "../helpers/layoutNumbers.js";
import { parquetWithSchema, type SchemaNode } from "../helpers/parquet.js";
import { studyOf } from "../helpers/runStudyFrom.js";
import { tempFolder } from "../helpers/tempStudy.js";
import { COLUMNS, type Call, rejection, scratch } from "./helpers.js";

const folder = scratch();
afterAll(() => folder.remove());

const customers = departureOrder(simulate({ arrivalRate: 1, serviceRate: 0.6, servers: 2, horizon: 120, seed: 303, drain: false, decimals: null }));

/** `optional group NAME (LIST) { repeated group list { optional ELEMENT element } }` and a struct of an int and a text. */
const NESTED: SchemaNode[] = [
  { name: "visits", repetition_type: "OPTIONAL", converted_type: "LIST", num_children: 1 },
  { name: "list", repetition_type: "REPEATED", num_children: 1 },
  { name: "element", type: "BYTE_ARRAY", converted_type: "UTF8", repetition_type: "OPTIONAL" },
  { name: "detail", repetition_type: "OPTIONAL", num_children: 2 },
  { name: "k", type: "INT32", repetition_type: "OPTIONAL" },
  { name: "s", type: "BYTE_ARRAY", converted_type: "UTF8", repetition_type: "OPTIONAL" },
];
const nestedData = (n: number) => [
  { name: "visits", data: Array.from({ length: n }, (_, i) => (i % 3 === 0 ? [] : ["desk", `room-${i % 4}`])) },
  { name: "detail", data: Array.from({ length: n }, (_, i) => ({ k: i, s: `note ${i}` })) },
];

/** The entity table of `customers` as Parquet, with a list and a struct column between its flat ones. */
function entityParquet(): Buffer {
  const flat = (name: string, type: string, converted?: string): SchemaNode => ({ name, type, repetition_type: "OPTIONAL", ...(converted === undefined ? {} : { converted_type: converted }) }) as SchemaNode;
  const schema: SchemaNode[] = [
    { name: "root", num_children: 8 },
    flat("id", "BYTE_ARRAY", "UTF8"),
    flat("arrived", "DOUBLE"),
    ...NESTED.slice(0, 3),
    flat("started", "DOUBLE"),
    flat("left", "DOUBLE"),
    flat("server", "INT32"),
    ...NESTED.slice(3),
    flat("class", "BYTE_ARRAY", "UTF8"),
  ];
  const [visits, detail] = nestedData(customers.length);
  return parquetWithSchema(schema, [
    { name: "id", data: customers.map((c) => String(c.id)) },
    { name: "arrived", data: customers.map((c) => c.arrived) },
    visits,
    { name: "started", data: customers.map((c) => c.started) },
    { name: "left", data: customers.map((c) => c.left) },
    { name: "server", data: customers.map((c) => c.server) },
    detail,
    { name: "class", data: customers.map((c) => c.cls) },
  ]);
}

const ENTITIES = "columns: {entity: id}\n";

describe("a Parquet file with nested columns", () => {
  it("an entity table: the flat columns the manifest reads give the figures and tables of the same table as CSV", async () => {
    const m = entityMeasures(2);
    const fromCsv = await studyOf(layoutManifest("entities", 120, ["r.csv"], m, ENTITIES), { "r.csv": entityCsv(customers) });
    const fromParquet = await studyOf(layoutManifest("entities", 120, ["r.parquet"], m, ENTITIES), { "r.parquet": entityParquet() });
    const a = numbersOf(fromCsv, ENTITY_NAMES);
    expect(a.tables.length).toBeGreaterThanOrEqual(ENTITY_NAMES.length);
    expect(numbersOf(fromParquet, ENTITY_NAMES)).toEqual(a);
  }, 60_000);

  it("an event table: readParquet reads time, series, value and entity past a list and a struct column", async () => {
    const rows: [number, string, number | null, string | null][] = [[0, "queue", 0, null], [1.5, "arrive", null, "a"], [1.5, "queue", 1, null], [4, "queue", 0, null]];
    const schema: SchemaNode[] = [
      { name: "root", num_children: 6 },
      ...NESTED.slice(3),
      { name: "time", type: "DOUBLE", repetition_type: "REQUIRED" },
      { name: "series", type: "BYTE_ARRAY", converted_type: "UTF8", repetition_type: "OPTIONAL" },
      ...NESTED.slice(0, 3),
      { name: "value", type: "DOUBLE", repetition_type: "OPTIONAL" },
      { name: "entity", type: "BYTE_ARRAY", converted_type: "UTF8", repetition_type: "OPTIONAL" },
    ];
    const [visits, detail] = nestedData(rows.length);
    const path = folder.file("events.parquet", parquetWithSchema(schema, [
      detail,
      { name: "time", data: rows.map((r) => r[0]) },
      { name: "series", data: rows.map((r) => r[1]) },
      visits,
      { name: "value", data: rows.map((r) => r[2]) },
      { name: "entity", data: rows.map((r) => r[3]) },
    ]));
    const calls: Call[] = [];
    await readParquet({ path, display: "runs/e.parquet", columns: COLUMNS, series: [{ name: "queue", entity: false }, { name: "arrive", entity: true }], onRow: (series, time, value, entity, line) => calls.push({ series, time, value, entity, line }) });
    // Expected rows: the table above, in file order, each with its 1-based row (contract section 11).
    expect(calls).toEqual([
      { series: 0, time: 0, value: 0, entity: undefined, line: 1 },
      { series: 1, time: 1.5, value: NaN, entity: "a", line: 2 },
      { series: 0, time: 1.5, value: 1, entity: undefined, line: 3 },
      { series: 0, time: 4, value: 0, entity: undefined, line: 4 },
    ]);
    // The same file with the entity column mapped onto the struct: refused before any row.
    const e = await rejection(readParquet({ path, display: "runs/e.parquet", columns: { ...COLUMNS, entity: "detail" }, series: [{ name: "arrive", entity: true }], onRow: () => {} }));
    expect(e.message).toBe(ingestMessages.parquetNestedColumn("runs/e.parquet", "detail", "a nested group").message);
  });

  it("a nested column the study reads (where, or a column of the layout) is refused naming the file and the column", async () => {
    const where = layoutManifest("entities", 120, ["runs/r.parquet"], "measures:\n  - {name: w, kind: observation, from: {start: arrived, end: started}, where: {visits: desk}}\n", ENTITIES);
    const asEvent = layoutManifest("entities", 120, ["runs/r.parquet"], "measures:\n  - {name: w, kind: observation, from: {start: arrived, end: detail}}\n", ENTITIES);
    const cases: [string, string][] = [[where, "visits"], [asEvent, "detail"]];
    for (const [text, column] of cases) {
      const s = tempFolder({ "runs/r.parquet": entityParquet(), "study.yaml": text });
      const e = await rejection(studyOf(text, { "runs/r.parquet": entityParquet() }));
      const type = column === "visits" ? "a nested group (LIST)" : "a nested group";
      expect(e.message).toBe(ingestMessages.parquetNestedColumn("runs/r.parquet", column, type).message);
      const r = sojourn(["check", `${s}/study.yaml`]);
      expect(r.status).toBe(1);
      expect(r.stderr).toContain(ingestMessages.parquetNestedColumn("runs/r.parquet", column, type).message);
      expect(r.stderr).not.toMatch(/\n\s+at /); // no stack trace
    }
  }, 60_000);
});
