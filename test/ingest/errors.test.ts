import { chmodSync, mkdirSync } from "node:fs";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import type { UserError } from "../../src/messages/error.js";
import * as messages from "../../src/messages/ingest.js";
import { RUN_EXTENSIONS } from "../../src/ingest/runFile.js";
import type { SeriesRequest } from "../../src/ingest/readRun.js";
import { gzip, record, rejection, scratch } from "./helpers.js";

const dir = scratch();
afterAll(() => dir.remove());
const D = "runs/rep-01";
const HEADER = "time,series,value,entity\n";
const QUEUE: SeriesRequest[] = [{ name: "queue", entity: false }];

interface Case {
  title: string;
  file: string;
  content: string | Buffer;
  series?: SeriesRequest[];
  expected: () => UserError;
  line?: number;
}

const jsonError = (text: string): string => {
  try {
    JSON.parse(text);
  } catch (e) {
    return (e as Error).message;
  }
  throw new Error("valid JSON");
};

// Sources: CONTRACT.md sections 1 and 5 (what is an input error), RFC 4180 (quoting), the reader's brief
// (which line a message names); line numbers computed by hand from each content.
const CASES: Case[] = [
  { title: "0 bytes", file: "empty.csv", content: "", expected: () => messages.emptyFile(D, "csv") },
  { title: "blank lines only", file: "blank.csv", content: "\n\r\n\n", expected: () => messages.emptyFile(D, "csv") },
  { title: "JSON Lines with no object", file: "empty.jsonl", content: "\n \n", expected: () => messages.emptyFile(D, "jsonl") },
  { title: "0-byte gzip", file: "empty.csv.gz", content: "", expected: () => messages.emptyFile(D, "csv") },
  {
    title: "no time column",
    file: "notime.csv",
    content: "clock,series\n1,queue\n",
    expected: () => messages.missingColumns(D, [{ role: "time", name: "time" }], ["clock", "series"]),
    line: 1,
  },
  {
    title: "no time and no series column",
    file: "none.csv",
    content: " t , kind ,value\n",
    expected: () =>
      messages.missingColumns(
        D,
        [
          { role: "time", name: "time" },
          { role: "series", name: "series" },
        ],
        ["t", "kind", "value"],
      ),
    line: 1,
  },
  {
    title: "no entity column for an entity series",
    file: "noentity.csv",
    content: "time,series\n1,arrive\n",
    series: [{ name: "arrive", entity: true }],
    expected: () => messages.missingEntityColumn(D, "entity", ["time", "series"], ["arrive"]),
    line: 1,
  },
  {
    title: "a row with too few fields",
    file: "short.csv",
    content: `${HEADER}1,queue,2\n3\n`,
    expected: () => messages.tooFewFields(D, 3, 1, 2),
    line: 3,
  },
  {
    title: "an unterminated quote (line where it opened)",
    file: "open.csv",
    content: `${HEADER}1,queue,2\n2,queue,3,"never\nclosed\n`,
    expected: () => messages.unterminatedQuote(D, 3),
    line: 3,
  },
  {
    title: "text after a closing quote",
    file: "after.csv",
    content: `${HEADER}1,"queue"x,2\n`,
    expected: () => messages.textAfterQuote(D, 2),
    line: 2,
  },
  {
    title: "an empty time",
    file: "notime2.csv",
    content: `${HEADER}1,queue,2\n,queue,3\n`,
    expected: () => messages.missingTime(D, 3),
    line: 3,
  },
  {
    title: "a time that is text",
    file: "texttime.csv",
    content: `${HEADER}noon,queue,2\n`,
    expected: () => messages.notANumber(D, 2, "time", "noon"),
    line: 2,
  },
  {
    title: "a hex time",
    file: "hex.csv",
    content: `${HEADER}0x10,queue,2\n`,
    expected: () => messages.notANumber(D, 2, "time", "0x10"),
    line: 2,
  },
  {
    title: "a quoted time that is Infinity",
    file: "inf.csv",
    content: `${HEADER}"Infinity",queue,2\n`,
    expected: () => messages.notANumber(D, 2, "time", "Infinity"),
    line: 2,
  },
  {
    title: "a value that is text",
    file: "textvalue.csv",
    content: `${HEADER}1,queue,2\n2,queue,many\n`,
    expected: () => messages.notANumber(D, 3, "value", "many"),
    line: 3,
  },
  {
    title: "a value that is NaN (unrequested series too)",
    file: "nan.csv",
    content: `${HEADER}1,oven,NaN\n`,
    expected: () => messages.notANumber(D, 2, "value", "NaN"),
    line: 2,
  },
  {
    title: "a value that overflows (1e400)",
    file: "big.csv",
    content: `${HEADER}1,queue,1e400\n`,
    expected: () => messages.notANumber(D, 2, "value", "1e400"),
    line: 2,
  },
  {
    title: "an empty series",
    file: "noseries.csv",
    content: `${HEADER}1,,2\n`,
    expected: () => messages.emptySeries(D, 2),
    line: 2,
  },
  {
    title: "time going backwards in a requested series",
    file: "back.csv",
    content: `${HEADER}1,queue,2\n5,queue,3\n4,oven,1\n3,queue,1\n`,
    expected: () => messages.timeDecreased(D, 5, "queue", 5, 3, 3),
    line: 5,
  },
  {
    title: "time going backwards in an unrequested series",
    file: "back2.csv",
    content: `${HEADER}2,oven,2\n\n1.5,oven,3\n`,
    expected: () => messages.timeDecreased(D, 4, "oven", 2, 1.5, 2),
    line: 4,
  },
  {
    title: "a truncated JSON line",
    file: "cut.jsonl",
    content: '{"time":1,"series":"queue"}\n{"time":2,"ser',
    expected: () => messages.badJson(D, 2, jsonError('{"time":2,"ser')),
    line: 2,
  },
  {
    title: "a JSON line that is an array",
    file: "array.jsonl",
    content: '[1,"queue",2]\n',
    expected: () => messages.notAnObject(D, 1, "an array"),
    line: 1,
  },
  {
    title: "a JSON line without time",
    file: "nokey.jsonl",
    content: '{"series":"queue"}\n',
    expected: () => messages.missingKey(D, 1, "time", "time"),
    line: 1,
  },
  {
    title: "a JSON time that is a non-numeric string",
    file: "strtime.jsonl",
    content: '\n{"time":"soon","series":"queue"}\n',
    expected: () => messages.notANumber(D, 2, "time", "soon"),
    line: 2,
  },
  {
    title: "a JSON series that is not a string",
    file: "boolseries.jsonl",
    content: '{"time":1,"series":true}\n',
    expected: () => messages.wrongType(D, 1, "series", "series", "a string", "the value true"),
    line: 1,
  },
  {
    title: "a JSON value that is an object",
    file: "objvalue.jsonl",
    content: '{"time":1,"series":"queue","value":{"n":1}}\n',
    expected: () => messages.wrongType(D, 1, "value", "value", "a number or null", "an object"),
    line: 1,
  },
  {
    title: "time going backwards in JSON Lines",
    file: "back.jsonl",
    content: '{"time":3,"series":"queue"}\n{"time":2.5,"series":"queue"}\n',
    expected: () => messages.timeDecreased(D, 2, "queue", 3, 2.5, 1),
    line: 2,
  },
  {
    title: "a gzip file that is not gzip",
    file: "fake.csv.gz",
    content: `${HEADER}1,queue,2\n`,
    expected: () => messages.corruptGzip(D, "incorrect header check"),
  },
  {
    title: "a truncated gzip file",
    file: "cut.csv.gz",
    content: gzip(`${HEADER}${"1,queue,2\n".repeat(200)}`).subarray(0, 40),
    expected: () => messages.corruptGzip(D, "unexpected end of file"),
  },
  {
    title: "an unknown extension",
    file: "run.txt",
    content: HEADER,
    expected: () => messages.unsupportedExtension(D, RUN_EXTENSIONS),
  },
];

describe("readRun input errors", () => {
  it.each(CASES.map((c) => [c.title, c] as const))("readRun on %s throws the catalogue's UserError", async (_t, c) => {
    const path = dir.file(c.file, c.content);
    for (const chunkSize of [undefined, 3]) {
      const error = await rejection(record(path, c.series ?? QUEUE, { display: D, chunkSize }));
      expect(error.message).toBe(c.expected().message);
      expect(error.message).toContain(D);
      if (c.line !== undefined) expect(error.message).toContain(`${D}:${c.line}:`);
      expect(error.exitCode).toBe(1); // CONTRACT.md section 5: input errors exit with status 1
    }
  });

  it("readRun on a missing file says 'file not found' with the path, not a stack trace", async () => {
    const error = await rejection(record(join(dir.dir, "gone.csv"), QUEUE, { display: D }));
    // CONTRACT.md section 5; the reader's brief: ENOENT -> "file not found"
    expect(error.message).toBe(messages.unreadableFile(D, "ENOENT").message);
    expect(error.message).toContain("file not found");
    expect(error.message).not.toContain("    at ");
  });

  it("readRun on a folder named like a run file says it is a folder", async () => {
    const path = join(dir.dir, "folder.csv");
    mkdirSync(path);
    const error = await rejection(record(path, QUEUE, { display: D }));
    // common practice: reading a directory fails with EISDIR
    expect(error.message).toBe(messages.unreadableFile(D, "EISDIR").message);
  });

  const asRoot = process.getuid?.() === 0;
  if (asRoot) console.log("skipped: the permission-denied test, because this runs as root, whom file permissions do not stop from reading");
  it.skipIf(asRoot)("readRun on an unreadable file says 'permission denied'", async () => {
    const path = dir.file("locked.csv", `${HEADER}1,queue,2\n`);
    chmodSync(path, 0o000);
    const error = await rejection(record(path, QUEUE, { display: D }));
    // the reader's brief: EACCES -> "permission denied"
    expect(error.message).toBe(messages.unreadableFile(D, "EACCES").message);
    expect(error.message).toContain("permission denied");
  });

  it("readRun passes an error thrown by the sink through unchanged", async () => {
    const path = dir.file("ok.csv", `${HEADER}1,queue,2\n`);
    const mine = new Error("sink failed");
    // common practice: a callback's own error is not relabelled as an input error
    await expect(
      (async () => {
        const { readRun } = await import("../../src/ingest/readRun.js");
        await readRun({
          path,
          display: D,
          columns: { time: "time", series: "series", value: "value", entity: "entity" },
          series: QUEUE,
          onRow: () => {
            throw mine;
          },
        });
      })(),
    ).rejects.toBe(mine);
  });
});
