/**
 * No silent misreads of a row's cells: a CSV row with more cells than the header, a header that
 * names a column twice and a JSON object with a key twice are input errors naming the file and
 * the line; a decimal comma, the usual cause of extra cells, is named as such.
 *
 * Sources: RFC 4180 section 2.4 (each line should hold the same number of fields); the issue's
 * brief; expected cells, lines and columns counted by hand from each text.
 */
import { afterAll, describe, expect, it } from "vitest";
import type { SeriesRequest } from "../../src/ingest/readRun.js";
import * as messages from "../../src/messages/ingest.js";
import { errorOf, plainAndGzip, record, scratch } from "./helpers.js";

const dir = scratch();
afterAll(() => dir.remove());
const D = "runs/rep-01";
const QUEUE: SeriesRequest[] = [{ name: "queue", entity: false }];
const CHUNKS = [1, 3, 7, 64, 1 << 20];

/** The error message of reading `text` as `name`, the same at every chunk size and in gzip (null: read). */
async function outcome(name: string, text: string, series = QUEUE): Promise<string | null> {
  const seen = new Set<string | null>();
  for (const [, path] of plainAndGzip(dir, name, text)) {
    for (const chunkSize of CHUNKS) seen.add(await errorOf(record(path, series, { chunkSize })));
  }
  expect(seen.size, [...seen].join("\n---\n")).toBe(1);
  return [...seen][0];
}

const H3 = "time,series,value\n";
const H4 = "time,series,value,entity\n";

describe("readRun on rows with more cells than the header", () => {
  for (const [title, text, line, found, columns, comma] of [
    ["a value with a decimal comma", `${H3}0,queue,2\n1,queue,1,5\n`, 3, 4, 3, true],
    ["a value with a decimal comma before an entity column", `${H4}0,queue,1,5,c1\n`, 2, 5, 4, true],
    ["a time with a decimal comma (the cells shift: `queue` under value)", `${H3}1,5,queue,2\n`, 2, 4, 3, true],
    ["a time and a value with decimal commas", `${H3}2,5,queue,3,5\n`, 2, 5, 3, true],
    ["a quoted time with a decimal comma, then an unquoted value with one", `${H3}"2,5",queue,3,5\n`, 2, 4, 3, true],
    ["an extra text cell", `${H3}0,queue,1\n1,queue,1,abc\n`, 3, 4, 3, false],
    ["an extra cell after the entity", `${H4}0,queue,1,c1,extra\n`, 2, 5, 4, false],
    ["a trailing comma the header does not have", `${H3}0,queue,1,\n`, 2, 4, 3, false],
    ["an extra quoted cell", `${H3}0,"queue",1,"x"\n`, 2, 4, 3, false],
    ["an extra cell on a CRLF row", `time,series,value\r\n0,queue,1\r\n1,queue,2,x\r\n`, 3, 4, 3, false],
  ] as const) {
    it(`readRun refuses ${title}`, async () => {
      expect(await outcome("extra.csv", text)).toBe(messages.tooManyFields(D, line, found, columns, comma).message);
    });
  }

  it("readRun reads rows with fewer cells than the header, and commas inside quotes, as before", async () => {
    expect(await outcome("fewer.csv", `${H4}0,queue,1\n1,queue\n2,"queue",3,"a,b"\n`)).toBeNull();
    const { calls } = await record(dir.file("quoted.csv", `${H3}0,"queue,a",1\n1,queue,2\n`), [{ name: "queue,a", entity: false }]);
    expect(calls.map((c) => [c.time, c.value])).toEqual([[0, 1]]);
  });

  it("readRun names a quoted number with a decimal comma as such", async () => {
    expect(await outcome("quoted-comma.csv", `${H3}0,queue,"1,5"\n`)).toBe(messages.notANumber(D, 2, "value", "1,5").message);
    expect(messages.notANumber(D, 2, "value", "1,5").message).toContain("decimal comma");
    expect(messages.notANumber(D, 2, "value", "1.5x").message).not.toContain("decimal comma");
  });
});

describe("readRun on names given twice", () => {
  it("readRun refuses a CSV header that names a column twice, whatever the column", async () => {
    expect(await outcome("twice.csv", "time,series,value,time\n1,queue,2,3\n")).toBe(messages.duplicateColumn(D, 1, "time", 1, 4).message);
    expect(await outcome("twice2.csv", " value ,time,series,value\n1,2,queue,3\n")).toBe(messages.duplicateColumn(D, 1, "value", 1, 4).message);
    expect(await outcome("twice3.csv", 'time,series,note,"note"\n1,queue,a,b\n')).toBe(messages.duplicateColumn(D, 1, "note", 3, 4).message);
    // After blank lines the header is on line 3.
    expect(await outcome("twice4.csv", "\n\ntime,series,series\n1,queue,queue\n")).toBe(messages.duplicateColumn(D, 3, "series", 2, 3).message);
  });

  it("readRun allows several unnamed (empty) header cells", async () => {
    expect(await outcome("unnamed.csv", "time,series,value,,\n1,queue,2,,\n")).toBeNull();
  });

  it("readRun refuses a JSON object with a key twice, written alike or escaped", async () => {
    expect(await outcome("twice.jsonl", '{"time":1,"series":"queue"}\n{"time":2,"series":"queue","time":1}\n')).toBe(messages.duplicateKey(D, 2, "time").message);
    expect(await outcome("escaped.jsonl", '{"time":1, "series":"queue", "val\\u0075e": 1, "value" :2}\n')).toBe(messages.duplicateKey(D, 1, "value").message);
    expect(await outcome("spaced.jsonl", '{"time" : 1, "series" :"queue", "entity":"a:b", "entity"\t: "c"}\n')).toBe(messages.duplicateKey(D, 1, "entity").message);
    expect(await outcome("brace.jsonl", '{"time":1,"series":"{queue}","series":"x"}\n')).toBe(messages.duplicateKey(D, 1, "series").message);
    expect(await outcome("proto.jsonl", '{"time":1,"series":"queue","__proto__":1,"__proto__":2}\n')).toBe(messages.duplicateKey(D, 1, "__proto__").message);
  });

  it("readRun allows the same key in nested objects and key-like text inside strings", async () => {
    const text = '{"time":1,"series":"queue","meta":{"a":1,"a":2},"note":"\\"time\\": 3, \\\\","tags":["time","time"]}\n{"time":2,"series":"queue","value":1}\n';
    expect(await outcome("nested.jsonl", text)).toBeNull();
  });
});
