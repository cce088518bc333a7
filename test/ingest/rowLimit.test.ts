/**
 * The row limit (`maxRowBytes`, manifest `max_row_bytes`): a row longer than the limit is an
 * input error naming its file and line, found before its bytes are all held; a row of exactly the
 * limit is read. An unterminated quote is named by the line it opened on and costs no more memory
 * than the limit, however long the file.
 *
 * Sources: the brief (1 MiB default; a 1 GB line, a gzip member that expands to one line,
 * an open quote must end in seconds in bounded memory); row lengths and lines computed by hand
 * from each text (the limit counts a row's bytes without its line break).
 */
import { createWriteStream, truncateSync, writeFileSync } from "node:fs";
import { once } from "node:events";
import { createGzip } from "node:zlib";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { DEFAULT_ROW_LIMIT, ROW_LIMIT_MAX } from "../../src/ingest/feeder.js";
import * as messages from "../../src/messages/ingest.js";
import { errorOf, plainAndGzip, record, rejection, scratch } from "./helpers.js";

const dir = scratch();
afterAll(() => dir.remove());
const D = "runs/rep-01";
const QUEUE = [{ name: "queue", entity: false }];
const LIMIT = 1024;
const CHUNKS = [1, 7, 100, 1000, 5000, 1 << 20];

/** A CSV row `1,queue,2,<padding>` of exactly `n` bytes (entity padding). */
const csvRow = (time: number, n: number): string => {
  const head = `${time},queue,2,`;
  return head + "e".repeat(n - head.length);
};
/** A JSON line of exactly `n` bytes. */
const jsonRow = (time: number, n: number): string => {
  const head = `{"time":${time},"series":"queue","value":2,"pad":"`;
  return head + "p".repeat(n - head.length - 2) + '"}';
};

/** Reads `content` as `name`, plain and gzip, at every chunk size; returns the errors (null when read). */
async function readAll(name: string, content: string): Promise<(string | null)[]> {
  const out: (string | null)[] = [];
  for (const [, path] of plainAndGzip(dir, name, content)) {
    for (const chunkSize of CHUNKS) out.push(await errorOf(record(path, QUEUE, { chunkSize, maxRowBytes: LIMIT })));
  }
  return out;
}

describe("readRun with a row limit", () => {
  it("readRun reads CSV rows of exactly the limit (LF and CRLF) and refuses one byte more, naming the line, at every chunk size", async () => {
    const header = "time,series,value,entity";
    for (const eol of ["\n", "\r\n"]) {
      const fits = [header, csvRow(1, LIMIT), csvRow(2, 20), csvRow(3, LIMIT)].join(eol) + eol;
      expect(await readAll("fits.csv", fits)).toEqual(Array(2 * CHUNKS.length).fill(null));
      // Line 4 is one byte too long; it is followed by more rows (a complete row in the chunk) or
      // ends the file (the row open at the end of the bytes at hand, at small chunk sizes).
      const tooLong = [header, csvRow(1, LIMIT), csvRow(2, 20), csvRow(3, LIMIT + 1), csvRow(4, 20)].join(eol) + eol;
      const expected = messages.rowTooLong(D, 4, LIMIT, ROW_LIMIT_MAX).message;
      expect(await readAll("long.csv", tooLong)).toEqual(Array(2 * CHUNKS.length).fill(expected));
      expect(await readAll("last.csv", [header, csvRow(1, 20), csvRow(3, 3 * LIMIT)].join(eol))).toEqual(
        Array(2 * CHUNKS.length).fill(messages.rowTooLong(D, 3, LIMIT, ROW_LIMIT_MAX).message),
      );
    }
  });

  it("readRun refuses a header longer than the limit as line 1", async () => {
    const header = "time,series,value," + Array.from({ length: 200 }, (_, i) => `extra_${i}`).join(",");
    expect(header.length).toBeGreaterThan(LIMIT);
    expect(await readAll("header.csv", `${header}\n1,queue,2\n`)).toEqual(Array(2 * CHUNKS.length).fill(messages.rowTooLong(D, 1, LIMIT, ROW_LIMIT_MAX).message));
  });

  it("readRun reads JSON lines of exactly the limit and refuses one byte more, naming the line", async () => {
    const fits = [jsonRow(1, LIMIT), "", jsonRow(2, LIMIT)].join("\r\n") + "\r\n";
    expect(await readAll("fits.jsonl", fits)).toEqual(Array(2 * CHUNKS.length).fill(null));
    const tooLong = [jsonRow(1, 60), "", jsonRow(2, LIMIT + 1), jsonRow(3, 60)].join("\n") + "\n";
    expect(await readAll("long.jsonl", tooLong)).toEqual(Array(2 * CHUNKS.length).fill(messages.rowTooLong(D, 3, LIMIT, ROW_LIMIT_MAX).message));
  });

  it("readRun counts a quoted record with line breaks as one row, and names it by where its limit-th byte lies", async () => {
    // Line 3 starts a record: its entity is quoted over lines 3-4, its note opens a quote on line
    // 4 that closes on line 6. Its 1024th byte (about 14 + 800) lies inside the note's quote.
    const cell = "q".repeat(400);
    const header = "time,series,value,entity,note";
    const inQuote = `2,queue,1,"a\nb","${cell}\n${cell}\n${cell}"`;
    const text = `${header}\n1,queue,2,,\n${inQuote}\n3,queue,4,,\n`;
    expect(await readAll("multi.csv", text)).toEqual(Array(2 * CHUNKS.length).fill(messages.quoteTooLong(D, 4, LIMIT, ROW_LIMIT_MAX).message));
    // The quoted field first, then a long unquoted one: the 1024th byte lies outside quotes.
    const afterQuote = `2,queue,1,"${cell}\n${cell}",${cell}${cell}`;
    const text2 = `${header}\n1,queue,2,,\n${afterQuote}\n3,queue,4,,\n`;
    expect(await readAll("multi2.csv", text2)).toEqual(Array(2 * CHUNKS.length).fill(messages.rowTooLong(D, 3, LIMIT, ROW_LIMIT_MAX).message));
  });

  it("readRun names the line an unterminated quote opened on, also when it opens on a later line of the record", async () => {
    const rest = Array.from({ length: 100 }, (_, i) => `${i + 5},queue,${i}`).join("\n");
    // The quote of line 2 closes on line 3; the quote opened on line 3 never closes.
    const text = `time,series,value,entity\n1,queue,2,"a\nb","never closed\n${rest}\n`;
    expect(await readAll("open.csv", text)).toEqual(Array(2 * CHUNKS.length).fill(messages.quoteTooLong(D, 3, LIMIT, ROW_LIMIT_MAX).message));
    // Shorter than the limit, the file ends inside the quotes: the message of before.
    expect(await readAll("short-open.csv", 'time,series,value,entity\n1,queue,2,"a\nb","never closed\n2,queue,3\n')).toEqual(
      Array(2 * CHUNKS.length).fill(messages.unterminatedQuote(D, 3).message),
    );
  });

  it("readRun without a limit given uses 1 MiB", async () => {
    expect(DEFAULT_ROW_LIMIT).toBe(1 << 20);
    const path = dir.file("mib.csv", `time,series,value,entity\n${csvRow(1, DEFAULT_ROW_LIMIT)}\n${csvRow(2, DEFAULT_ROW_LIMIT + 1)}\n`);
    const error = await rejection(record(path, QUEUE));
    expect(error.message).toBe(messages.rowTooLong(D, 3, DEFAULT_ROW_LIMIT, ROW_LIMIT_MAX).message);
  });
});

describe("readRun on endless rows, in bounded time and memory", () => {
  /** Runs `read` and returns its error, the seconds it took and how far the heap and buffers grew. */
  async function measure(read: () => Promise<unknown>): Promise<{ message: string; seconds: number; grewMiB: number }> {
    globalThis.gc?.();
    const before = process.memoryUsage();
    let peak = 0;
    const sampler = setInterval(() => {
      const m = process.memoryUsage();
      peak = Math.max(peak, m.rss - before.rss, m.heapUsed + m.arrayBuffers - before.heapUsed - before.arrayBuffers);
    }, 5);
    const started = Date.now();
    const error = await rejection(read());
    clearInterval(sampler);
    const m = process.memoryUsage();
    peak = Math.max(peak, m.heapUsed + m.arrayBuffers - before.heapUsed - before.arrayBuffers);
    return { message: error.message, seconds: (Date.now() - started) / 1000, grewMiB: peak / 2 ** 20 };
  }

  it("readRun on a 1 GB file without a line break ends in seconds, in well under 200 MB", async () => {
    // A sparse file: a header, then 1 GB of zero bytes (no line feed), costing no disk.
    const path = dir.file("endless.csv", "time,series,value\n");
    truncateSync(path, 2 ** 30);
    const r = await measure(() => record(path, QUEUE));
    expect(r.message).toBe(messages.rowTooLong(D, 2, DEFAULT_ROW_LIMIT, ROW_LIMIT_MAX).message);
    expect(r.seconds).toBeLessThan(10);
    expect(r.grewMiB).toBeLessThan(200);
  }, 30_000);

  it("readRun on a small gzip file that expands to one 256 MiB line, and on a 256 MiB unterminated quote, ends in seconds, in well under 200 MB", async () => {
    const write = async (name: string, head: string, fill: number) => {
      const path = join(dir.dir, name);
      const z = createGzip({ level: 1 });
      const out = z.pipe(createWriteStream(path));
      z.write(head);
      const block = Buffer.alloc(1 << 20, fill);
      for (let i = 0; i < 256; i++) if (!z.write(block)) await once(z, "drain");
      z.end();
      await once(out, "close");
      return path;
    };
    const line = await write("bomb.jsonl.gz", '{"time":1,"series":"queue"}\n{"time":2,', 0x20);
    const r1 = await measure(() => record(line, QUEUE));
    expect(r1.message).toBe(messages.rowTooLong(D, 2, DEFAULT_ROW_LIMIT, ROW_LIMIT_MAX).message);
    const quote = await write("quote.csv.gz", 'time,series,value,entity\n1,queue,2,\n2,queue,3,"', 0x61);
    const r2 = await measure(() => record(quote, QUEUE));
    expect(r2.message).toBe(messages.quoteTooLong(D, 3, DEFAULT_ROW_LIMIT, ROW_LIMIT_MAX).message);
    for (const r of [r1, r2]) {
      expect(r.seconds).toBeLessThan(10);
      expect(r.grewMiB).toBeLessThan(200);
    }
    writeFileSync(line, ""); // free the disk early
  }, 60_000);
});
