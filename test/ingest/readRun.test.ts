import { createHash } from "node:crypto";
import { readFileSync, statSync } from "node:fs";
import { afterAll, describe, expect, it } from "vitest";
import type { SeriesRequest } from "../../src/ingest/readRun.js";
import { gzip, record, scratch, seeded, type Call } from "./helpers.js";

/** A bakery counter's run: [time, series, value, entity] as written in the file. */
const RUN: [string, string, string, string][] = [
  ["0", "queue", "0", ""],
  ["0.5", "arrive", "", "c1"],
  ["0.5", "queue", "1", ""],
  ["1.25", "arrive", "", "c2"],
  ["1.25", "queue", "2", ""],
  ["2", "oven_temp", "180.5", ""],
  ["2.75", "depart", "", "c1"],
  ["2.75", "wait", "2.25", ""],
  ["3", "queue", "1", ""],
  ["1.5e1", "wait", "-0.125", ""],
  ["15", "depart", "", "c2"],
  ["16", "oven_temp", "1e2", ""],
];
const REQUESTS: SeriesRequest[] = [
  { name: "queue", entity: false },
  { name: "wait", entity: false },
  { name: "arrive", entity: true },
  { name: "depart", entity: true },
];

/** The calls CONTRACT.md section 1 asks for, derived from RUN: requested series only, in file order. */
function expectedCalls(firstLine: number): Call[] {
  const calls: Call[] = [];
  RUN.forEach(([t, s, v, e], i) => {
    const series = REQUESTS.findIndex((r) => r.name === s);
    if (series < 0) return;
    const entity = REQUESTS[series].entity && e !== "" ? e : undefined;
    calls.push({ series, time: Number(t), value: v === "" ? NaN : Number(v), entity, line: firstLine + i });
  });
  return calls;
}

const quote = (s: string): string => `"${s.replaceAll('"', '""')}"`;
const csv = RUN.map((r) => r.join(",")).join("\n");
const LAYOUTS: Record<string, string | Buffer> = {
  "plain.csv": `time,series,value,entity\n${csv}\n`,
  "bom-crlf.csv": `\uFEFFtime,series,value,entity\r\n${RUN.map((r) => r.join(",")).join("\r\n")}\r\n`,
  "quoted.csv": `"time","series","value","entity"\n${RUN.map((r) => r.map(quote).join(",")).join("\n")}`,
  "lines.jsonl": `${RUN.map(([t, s, v, e], i) => {
    const o: Record<string, unknown> = { time: i % 3 === 0 ? t : JSON.parse(t), series: s };
    if (v !== "") o.value = i % 2 === 0 ? JSON.parse(v) : v;
    else if (i % 2 === 0) o.value = null;
    if (e !== "") o.entity = e;
    return JSON.stringify(o);
  }).join("\n")}\n`,
};

const dir = scratch();
afterAll(() => dir.remove());
const paths: string[] = [];
for (const [name, text] of Object.entries(LAYOUTS)) {
  paths.push(dir.file(name, text));
  paths.push(dir.file(`${name}.gz`, gzip(text)));
}

const withoutLines = (calls: Call[]) => calls.map(({ line: _line, ...rest }) => rest);

describe("readRun on one run in several layouts", () => {
  it.each(paths.map((p) => [p.slice(dir.dir.length + 1), p]))(
    "readRun(%s) gives the sink calls and seriesRows of the run",
    async (_name, path) => {
      const { calls, report } = await record(path, REQUESTS);
      // CONTRACT.md section 1: same run in CSV, JSON Lines or gzip, same rows
      expect(withoutLines(calls)).toEqual(withoutLines(expectedCalls(2)));
      // computed by hand from RUN: counts per series in order of first appearance
      expect(report.seriesRows).toEqual({ queue: 4, arrive: 2, oven_temp: 2, depart: 2, wait: 2 });
      expect(Object.keys(report.seriesRows)).toEqual(["queue", "arrive", "oven_temp", "depart", "wait"]);
      expect(report.rows).toBe(RUN.length);
    },
  );

  it("readRun on plain CSV and on JSON Lines gives physical line numbers (header is line 1)", async () => {
    // CONTRACT.md section 1 and the reader's brief: 1-based physical lines; JSON Lines has no header
    expect((await record(paths[0], REQUESTS)).calls).toEqual(expectedCalls(2));
    expect((await record(paths[6], REQUESTS)).calls).toEqual(expectedCalls(1));
  });

  it.each(paths.map((p) => [p.slice(dir.dir.length + 1), p]))(
    "readRun(%s) with chunkSize 1..7 gives the same calls, line numbers included",
    async (_name, path) => {
      const whole = await record(path, REQUESTS);
      for (let chunkSize = 1; chunkSize <= 7; chunkSize++) {
        const split = await record(path, REQUESTS, { chunkSize });
        // common practice: a streaming parser's output does not depend on where chunks end
        expect(split.calls, `chunkSize ${chunkSize}`).toEqual(whole.calls);
        expect(split.report).toEqual(whole.report);
      }
    },
  );

  it.each(paths.map((p) => [p.slice(dir.dir.length + 1), p]))(
    "readRun(%s) reports the file's size and SHA-256 as stored on disk",
    async (_name, path) => {
      const { report } = await record(path, REQUESTS, { chunkSize: 5 });
      // common practice: digest of the stored bytes, by node:crypto in one go
      expect(report.sha256).toBe(createHash("sha256").update(readFileSync(path)).digest("hex"));
      expect(report.bytes).toBe(statSync(path).size);
    },
  );
});

describe("readRun columns and series", () => {
  it("readRun maps renamed columns, ignores extra columns in any order, and counts unrequested series", async () => {
    const path = dir.file(
      "renamed.csv",
      [
        "note, ticket ,clock,kind,amount,shift",
        "first,,0.5,oven,3,a",
        "x,t9,1,sale,12.5,a",
        "y,,1,oven,4,b",
        "z,t10,2.5,sale,,b",
      ].join("\n"),
    );
    const columns = { time: "clock", series: "kind", value: "amount", entity: "ticket" };
    const { calls, report } = await record(path, [{ name: "sale", entity: true }], { columns });
    // computed by hand from the four rows above; CONTRACT.md section 1 (columns may be renamed)
    expect(calls).toEqual([
      { series: 0, time: 1, value: 12.5, entity: "t9", line: 3 },
      { series: 0, time: 2.5, value: NaN, entity: "t10", line: 5 },
    ]);
    expect(report.seriesRows).toEqual({ oven: 2, sale: 2 });
    expect(report.rows).toBe(4);
  });

  it("readRun leaves entity undefined unless the series asks for it, and value NaN without a value column", async () => {
    const path = dir.file("noval.csv", "time,series,entity\n1,arrive,c1\n2,arrive,\n3,leave,c1\n");
    const { calls } = await record(path, [
      { name: "arrive", entity: true },
      { name: "leave", entity: false },
    ]);
    // computed by hand; the reader's brief: empty entity cell -> undefined, no value column -> NaN
    expect(calls).toEqual([
      { series: 0, time: 1, value: NaN, entity: "c1", line: 2 },
      { series: 0, time: 2, value: NaN, entity: undefined, line: 3 },
      { series: 1, time: 3, value: NaN, entity: undefined, line: 4 },
    ]);
  });

  it("readRun reads RFC 4180 quoting: commas, doubled quotes and line breaks inside quotes, blank lines skipped", async () => {
    const text =
      'time,series,value,entity\n\n1,"tray, large",2,"bag ""A"""\n2,note,,"two\r\nlines"\n\n3,"tray, large", 4 ,x\n';
    const path = dir.file("rfc.csv", text);
    const { calls, report } = await record(path, [
      { name: "tray, large", entity: true },
      { name: "note", entity: true },
    ]);
    // RFC 4180 section 2 (rules 5-7); lines computed by hand: the quoted line break makes row 3 span lines 4-5
    expect(calls).toEqual([
      { series: 0, time: 1, value: 2, entity: 'bag "A"', line: 3 },
      { series: 1, time: 2, value: NaN, entity: "two\r\nlines", line: 4 },
      { series: 0, time: 3, value: 4, entity: "x", line: 7 },
    ]);
    expect(report.seriesRows).toEqual({ "tray, large": 2, note: 1 });
  });

  it("readRun reads quoted cells as they are: a quoted name keeps its spaces, an unquoted one is trimmed, at any chunk size", async () => {
    const text =
      'time,series,value,entity,note\r\n' +
      '1,"queue","2.5","c 1 ",plain\r\n' + // quoted number and entity: the entity keeps its spaces
      '2,queue,3,c2,"a,b"\r\n' + // unquoted name, quoted note with a comma
      '3," queue",4,,"x""y"\r\n' + // a quoted name with a space is another series; doubled quotes in the note
      '4, queue ,5,"",z\r\n' + // unquoted and trimmed: queue again; an empty quoted entity is no entity
      '5,"queue",6,"c3","two\nlines"\r\n' + // a line break inside the last quoted cell
      '6,"queue"," 7 ",c4,\r\n';
    const path = dir.file("quoted-cells.csv", text);
    const requests = [
      { name: "queue", entity: true },
      { name: " queue", entity: true },
    ];
    // RFC 4180 section 2 and CONTRACT.md section 1; lines computed by hand (row 6 spans lines 6-7)
    const expected = [
      { series: 0, time: 1, value: 2.5, entity: "c 1 ", line: 2 },
      { series: 0, time: 2, value: 3, entity: "c2", line: 3 },
      { series: 1, time: 3, value: 4, entity: undefined, line: 4 },
      { series: 0, time: 4, value: 5, entity: undefined, line: 5 },
      { series: 0, time: 5, value: 6, entity: "c3", line: 6 },
      { series: 0, time: 6, value: 7, entity: "c4", line: 8 },
    ];
    for (const chunkSize of [undefined, 1, 2, 3, 5, 8, 13]) {
      const { calls, report } = await record(path, requests, { chunkSize });
      expect(calls, `chunkSize ${chunkSize}`).toEqual(expected);
      expect(report.seriesRows).toEqual({ queue: 5, " queue": 1 });
    }
  });

  it("readRun reads each time cell right when neighbouring rows share a time or almost its bytes", async () => {
    const times = ["1", "1", "10", "10", "1.0", "1.00", " 1.5", "1.5", "1.5 ", "2e0", "2", "-0", "-0", "0", "0.1", "0.1"];
    const rows = times.map((t, i) => [t, i] as const);
    const text = "time,series,value\n" + rows.map(([t, i]) => `${t},s${i},${i}`).join("\n") + "\n";
    const path = dir.file("near-times.csv", text);
    const requests = times.map((_, i) => ({ name: `s${i}`, entity: false }));
    for (const chunkSize of [undefined, 3, 7]) {
      const { calls } = await record(path, requests, { chunkSize });
      // common practice: each cell is the number Number() reads from its text, whatever the row before
      expect(calls.map((c) => c.time), `chunkSize ${chunkSize}`).toEqual(times.map((t) => Number(t)));
      expect(Object.is(calls[11].time, -0)).toBe(true);
    }
  });

  it("readRun tells apart series names that share their first letters, prefixes of each other included", async () => {
    const names = ["q", "q_len", "q_wait", "qq", "q_len2", "r"];
    const rows = Array.from({ length: 60 }, (_, i) => [i, names[(i * 7) % names.length]] as const);
    const path = dir.file("prefixes.csv", "time,series,value\n" + rows.map(([t, n]) => `${t},${n},${t * 2}`).join("\n") + "\n");
    const requests = names.map((name) => ({ name, entity: false }));
    for (const chunkSize of [undefined, 4, 9]) {
      const { calls, report } = await record(path, requests, { chunkSize });
      // computed from the rows as written: each row's series is its name's index
      expect(calls.map((c) => [c.time, c.series]), `chunkSize ${chunkSize}`).toEqual(rows.map(([t, n]) => [t, names.indexOf(n)]));
      expect(Object.values(report.seriesRows)).toEqual(names.map(() => 10));
    }
  });

  it("readRun decodes UTF-8 series and entity names, split across chunks or not", async () => {
    const path = dir.file("utf8.csv", "time,series,entity\n1,café,Ωmega\n2,café,ß\n");
    for (const chunkSize of [1, 2, 3, undefined]) {
      const { calls, report } = await record(path, [{ name: "café", entity: true }], { chunkSize });
      // common practice: UTF-8 decoding of multi-byte characters
      expect(calls.map((c) => c.entity)).toEqual(["Ωmega", "ß"]);
      expect(report.seriesRows).toEqual({ café: 2 });
    }
  });

  it("readRun on JSON Lines converts numeric series and entity to strings", async () => {
    const path = dir.file("num.jsonl", '{"time":1,"series":7,"entity":42}\n{"time":2,"series":"7","entity":"b"}\n');
    const { calls, report } = await record(path, [{ name: "7", entity: true }]);
    // the reader's brief: a number is converted to its string
    expect(calls.map((c) => c.entity)).toEqual(["42", "b"]);
    expect(report.seriesRows).toEqual({ "7": 2 });
  });

  it("readRun allows equal times and reads seeded random values exactly as Number() does", async () => {
    const random = seeded(7);
    const values: string[] = [];
    for (let i = 0; i < 3000; i++) {
      const digits = String(Math.floor(random() * 1e12)).padStart(12, "0");
      const cut = Math.floor(random() * 13);
      values.push(`${random() < 0.5 ? "-" : ""}${digits.slice(0, cut)}.${digits.slice(cut)}e${Math.floor(random() * 40) - 20}`);
    }
    const path = dir.file("many.csv", `time,series,value\n${values.map((v, i) => `${Math.floor(i / 3)},m,${v}`).join("\n")}`);
    const { calls } = await record(path, [{ name: "m", entity: false }], { chunkSize: 4096 });
    // common practice: Number() of the same text is the correctly rounded double
    expect(calls.map((c) => c.value)).toEqual(values.map(Number));
    expect(calls.map((c) => c.time)).toEqual(values.map((_v, i) => Math.floor(i / 3)));
  });
});
