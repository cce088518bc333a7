/**
 * The layouts of contract section 9 at the reader: which event rows a file in each layout gives,
 * the `where` matching rules (docs/manifest.md "where"), and the external sort of the `entities`
 * layout in bounded memory. Expected rows are worked out by hand from the files below.
 */
import { afterAll, describe, expect, it } from "vitest";
import { readdirSync } from "node:fs";
import { tmpdir } from "node:os";
import { EventSorter } from "../../src/ingest/externalSort.js";
import { readRun, type SeriesRequest } from "../../src/ingest/readRun.js";
import type { LayoutOptions } from "../../src/ingest/readTypes.js";
import { cellMatches } from "../../src/ingest/where.js";
import type { ColumnMap } from "../../src/manifest/types.js";
import { ingestMessages } from "../../src/messages/index.js";
import { departureOrder, entityCsv, shuffled, simulate } from "../helpers/layoutModel.js";
import { type Call, COLUMNS, rejection, scratch } from "./helpers.js";
import { mulberry32 } from "../stats/random.js";

const folder = scratch();
afterAll(() => folder.remove());

async function rows(path: string, series: SeriesRequest[], layout: LayoutOptions, columns: ColumnMap = COLUMNS): Promise<{ calls: Call[]; rows: number; seriesRows: Record<string, number> }> {
  const calls: Call[] = [];
  const report = await readRun({ path, display: "runs/r.csv", columns, series, layout, onRow: (s, time, value, entity, line) => calls.push({ series: s, time, value, entity, line }) });
  return { calls, rows: report.rows, seriesRows: report.seriesRows };
}

const ID: ColumnMap = { ...COLUMNS, entity: "id" };
const ENTITIES: LayoutOptions = { layout: "entities", pairs: [["arrived", "left"]] };

describe("layout: entities", () => {
  const path = folder.file("ent.csv", "id,arrived,left,server\n7,2.5,4,1\n3,0.5,,0\n5,1,3,0\n");

  it("each non-empty time cell is an event row of its column's series, in time order, with the entity's id and line", async () => {
    const r = await rows(path, [{ name: "arrived", entity: true }, { name: "left", entity: true }], ENTITIES, ID);
    expect(r.calls).toEqual([
      { series: 0, time: 0.5, value: NaN, entity: "3", line: 3 },
      { series: 0, time: 1, value: NaN, entity: "5", line: 4 },
      { series: 0, time: 2.5, value: NaN, entity: "7", line: 2 },
      { series: 1, time: 3, value: NaN, entity: "5", line: 4 },
      { series: 1, time: 4, value: NaN, entity: "7", line: 2 },
    ]);
    expect(r.seriesRows).toEqual({ arrived: 3, left: 2 });
    expect(r.rows).toBe(5);
  });

  it("where: {server: 0} matches the cells 0 and keeps only those entities' events", async () => {
    const where = [{ column: "server", values: [0] }];
    const r = await rows(path, [{ name: "arrived", entity: true, where }], ENTITIES, ID);
    expect(r.calls.map((c) => c.entity)).toEqual(["3", "5"]);
  });

  it("the same entities as JSON Lines give the same rows", async () => {
    const json = folder.file("ent.jsonl", '{"id":7,"arrived":2.5,"left":4,"server":1}\n{"id":"3","arrived":"0.5","left":null,"server":0}\n{"id":5,"arrived":1,"left":3,"server":"0"}\n');
    const want = [{ name: "arrived", entity: true }, { name: "left", entity: true }];
    const a = await rows(path, want, ENTITIES, ID);
    const b = await rows(json, want, ENTITIES, ID);
    expect(b.calls.map(({ line: _l, ...c }) => c)).toEqual(a.calls.map(({ line: _l, ...c }) => c));
  });

  it("a row whose second event of a pair is earlier than the first is an input error naming the line and both columns", async () => {
    const bad = folder.file("back.csv", "id,arrived,left\n1,0.5,0.7\n2,0.9,0.8\n");
    const e = await rejection(rows(bad, [{ name: "arrived", entity: true }, { name: "left", entity: true }], ENTITIES, ID));
    expect(e.message).toBe(ingestMessages.eventsBackwards("runs/r.csv", 3, "arrived", 0.9, "left", 0.8).message);
  });

  it("columns that no measure pairs are not compared", async () => {
    const ok = folder.file("nopair.csv", "id,arrived,left\n2,0.9,0.8\n");
    const r = await rows(ok, [{ name: "arrived", entity: true }, { name: "left", entity: true }], { layout: "entities", pairs: [] }, ID);
    expect(r.calls.map((c) => c.time)).toEqual([0.8, 0.9]);
  });
});

describe("layout: levels", () => {
  it("each non-empty cell is a row of its column's series; an empty cell leaves the level as it was", async () => {
    const path = folder.file("lv.csv", "time,queue,busy,phase\n0,0,0,a\n1.5,2,,a\n2,,1,b\n");
    const r = await rows(path, [{ name: "queue", entity: false }, { name: "busy", entity: false }], { layout: "levels", pairs: [] });
    expect(r.calls).toEqual([
      { series: 0, time: 0, value: 0, entity: undefined, line: 2 },
      { series: 1, time: 0, value: 0, entity: undefined, line: 2 },
      { series: 0, time: 1.5, value: 2, entity: undefined, line: 3 },
      { series: 1, time: 2, value: 1, entity: undefined, line: 4 },
    ]);
    const filtered = await rows(path, [{ name: "queue", entity: false, where: [{ column: "phase", values: ["a"] }] }], { layout: "levels", pairs: [] });
    expect(filtered.calls.map((c) => c.line)).toEqual([2, 3]);
  });
});

describe("layout: events with where", () => {
  it("the attribute columns are the file's extra columns", async () => {
    const path = folder.file("ev.csv", "time,series,value,entity,class\n0,wait,1,a,gold\n1,wait,2,b,basic\n2,wait,3,c, gold \n");
    const r = await rows(path, [{ name: "wait", entity: false, where: [{ column: "class", values: ["gold"] }] }], { layout: "events", pairs: [] });
    expect(r.calls.map((c) => c.value)).toEqual([1, 3]);
    expect(r.rows).toBe(3);
  });
});

describe("where on a column the layout reads itself", () => {
  it("a where on the entity column of an event table filters by that cell", async () => {
    const path = folder.file("ev2.csv", "time,series,value,entity\n0,wait,1,a\n1,wait,2,b\n");
    const r = await rows(path, [{ name: "wait", entity: false, where: [{ column: "entity", values: ["b"] }] }], { layout: "events", pairs: [] });
    expect(r.calls.map((c) => c.value)).toEqual([2]);
  });
});

describe("where matching (docs/manifest.md, where)", () => {
  it("a number matches cells that read as the same number; a text matches the same text only", () => {
    expect([cellMatches("0", 0), cellMatches("0.0", 0), cellMatches("00", 0), cellMatches(0, 0), cellMatches("1", 0)]).toEqual([true, true, true, true, false]);
    expect([cellMatches("07", "07"), cellMatches("7", "07"), cellMatches(7, "7"), cellMatches("Gold", "gold"), cellMatches(null, "gold")]).toEqual([true, false, true, false, false]);
    // Surrounding spaces are ignored on both sides (docs/manifest.md, "where"); inner ones are not.
    expect([cellMatches(" gold ", "gold"), cellMatches("gold", " gold"), cellMatches("go ld", "gold")]).toEqual([true, true, false]);
  });
});

describe("the external sort (bounded memory)", () => {
  it("holds at most its limit of events, spills and merges more than FAN files, and gives the same order as sorting in memory", () => {
    const rng = mulberry32(5);
    const events = Array.from({ length: 20_000 }, (_, i) => ({ time: Math.floor(rng() * 500) / 10, line: i + 2, rank: Math.floor(rng() * 3) }));
    const order = (limit: number) => {
      const s = new EventSorter(limit);
      for (const e of events) s.add(e.time, e.line, e.rank, e.rank, `id-${e.line}`);
      const out: string[] = [];
      const spilled = () => s.spilled;
      s.drain((time, line, route, id) => out.push(`${time}|${line}|${route}|${id}`));
      return { out, peak: s.peak, spilled: spilled() };
    };
    const small = order(100); // 200 spill files: more than FAN (64), so files are merged in passes
    const large = order(1 << 20);
    expect(small.peak).toBeLessThanOrEqual(100);
    expect(small.spilled).toBeGreaterThan(200);
    expect(large.spilled).toBe(0);
    expect(small.out).toEqual(large.out);
    const sorted = [...events].sort((a, b) => a.time - b.time || a.line - b.line || a.rank - b.rank).map((e) => `${e.time}|${e.line}|${e.rank}|id-${e.line}`);
    expect(small.out).toEqual(sorted);
  });

  it("an entity file much larger than the limit, in departure or random order, gives the same rows; spill files are removed", async () => {
    const cs = simulate({ arrivalRate: 1, serviceRate: 0.6, servers: 2, horizon: 3000, seed: 12, drain: false, decimals: null });
    const a = folder.file("dep.csv", entityCsv(departureOrder(cs)));
    const b = folder.file("rnd.csv", entityCsv(shuffled(cs, 3)));
    const want = [{ name: "arrived", entity: true }, { name: "started", entity: true }, { name: "left", entity: true }];
    const layout: LayoutOptions = { layout: "entities", pairs: [["arrived", "started"], ["started", "left"]], sortEvents: 500 };
    const before = readdirSync(tmpdir()).filter((n) => n.startsWith("sojourn-sort-")).length;
    const small = await rows(a, want, layout, ID);
    const inMemory = await rows(a, want, { ...layout, sortEvents: 1 << 20 }, ID);
    const random = await rows(b, want, layout, ID);
    expect(small.rows).toBeGreaterThan(10 * 500); // the file holds far more events than the limit
    expect(small.calls).toEqual(inMemory.calls);
    const key = (c: Call) => `${c.series}|${c.time}|${c.entity}`;
    expect(random.calls.map(key).sort()).toEqual(small.calls.map(key).sort());
    for (const r of [small, random]) for (let k = 1; k < r.calls.length; k++) if (r.calls[k].series === r.calls[k - 1].series) expect(r.calls[k].time).toBeGreaterThanOrEqual(r.calls[k - 1].time);
    expect(readdirSync(tmpdir()).filter((n) => n.startsWith("sojourn-sort-")).length).toBe(before);
  });
});
