/**
 * Line ends: a run file whose lines end in a carriage return alone reads as the same rows, on the
 * same line numbers, as the file with line feeds; the first line break of the file decides, so a
 * file with line feeds (or CRLF) reads as before.
 *
 * Sources: CONTRACT.md section 1 (LF or CRLF); the issue (a CR-only file used to read as one
 * header line with zero rows, and exit 0); expected rows and lines computed by hand.
 */
import { afterAll, describe, expect, it } from "vitest";
import type { SeriesRequest } from "../../src/ingest/readRun.js";
import * as messages from "../../src/messages/ingest.js";
import { type Call, plainAndGzip, record, rejection, scratch } from "./helpers.js";

const dir = scratch();
afterAll(() => dir.remove());
const WANTED: SeriesRequest[] = [
  { name: "queue", entity: false },
  { name: "arrive", entity: true },
];
const CHUNKS = [1, 2, 3, 5, 7, 64, 1 << 20];

const CSV_LINES = ["time,series,value,entity", "0,queue,2,", "", '1.5,arrive,,"c\r1"', "2,queue,3,", "3,arrive,,c2"];
const JSON_LINES = ['{"time":0,"series":"queue","value":2}', "", '{"time":1.5,"series":"arrive","entity":"c1"}', '{"time":2,"series":"queue","value":3}'];

/** Calls at every chunk size and in gzip; checks they agree and returns them. */
async function calls(name: string, text: string): Promise<Call[]> {
  let first: Call[] | null = null;
  for (const [file, path] of plainAndGzip(dir, name, text)) {
    for (const chunkSize of CHUNKS) {
      const got = (await record(path, WANTED, { chunkSize })).calls;
      if (first === null) first = got;
      else expect(got, `${file} at chunk size ${chunkSize}`).toEqual(first);
    }
  }
  return first!;
}

describe("readRun on carriage-return line ends", () => {
  it("readRun reads a CSV file with CR line ends as the LF file: same rows, same lines", async () => {
    const cr = await calls("cr.csv", CSV_LINES.join("\r"));
    // The quoted entity holds a CR: read as a line break in a CR file, as "c\n1".
    expect(cr).toEqual([
      { series: 0, time: 0, value: 2, entity: undefined, line: 2 },
      { series: 1, time: 1.5, value: NaN, entity: "c\n1", line: 4 },
      { series: 0, time: 2, value: 3, entity: undefined, line: 6 },
      { series: 1, time: 3, value: NaN, entity: "c2", line: 7 },
    ]);
    const lf = await calls("lf.csv", CSV_LINES.join("\n").replace("c\r1", "c\n1"));
    expect(cr).toEqual(lf);
    // With a byte-order mark and a CR after the last line.
    expect(await calls("crbom.csv", "\ufeff" + CSV_LINES.join("\r") + "\r")).toEqual(cr);
  });

  it("readRun reads a JSON Lines file with CR line ends as the LF file", async () => {
    const cr = await calls("cr.jsonl", JSON_LINES.join("\r") + "\r");
    expect(cr).toEqual([
      { series: 0, time: 0, value: 2, entity: undefined, line: 1 },
      { series: 1, time: 1.5, value: NaN, entity: "c1", line: 3 },
      { series: 0, time: 2, value: 3, entity: undefined, line: 4 },
    ]);
    expect(await calls("lf.jsonl", JSON_LINES.join("\n"))).toEqual(cr);
  });

  it("readRun on a file whose first line ends in CRLF keeps a later lone CR as data, as before", async () => {
    // The lone CR sits inside the value cell of line 3: `3\r4` is not a number.
    const path = dir.file("mixed.csv", "time,series,value\r\n0,queue,2\r\n1,queue,3\r4\r\n");
    const error = await rejection(record(path, [WANTED[0]]));
    expect(error.message).toBe(messages.notANumber("runs/rep-01", 3, "value", "3\r4").message);
    expect((await calls("crlf.csv", CSV_LINES.join("\r\n").replace("c\r1", "c1"))).map((c) => c.line)).toEqual([2, 4, 5, 6]);
  });

  it("readRun on a CR file never reads a header line with zero rows", async () => {
    const { calls: got, report } = await record(dir.file("rows.csv", "time,series,value\r0,queue,1\r5,queue,0\r"), [WANTED[0]]);
    expect(report.rows).toBe(2);
    expect(got.map((c) => [c.time, c.value, c.line])).toEqual([
      [0, 1, 2],
      [5, 0, 3],
    ]);
  });
});
