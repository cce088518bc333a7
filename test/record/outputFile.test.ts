/**
 * `table --out` and `summarize-run --out` write over their own earlier output only
 * (src/record/outputFile.ts): how a file is recognised, and that a refusal or a failure leaves
 * every existing file as it was. The study is invented; its rows are hand-made.
 */
import { mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, symlinkSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterEach, describe, expect, it } from "vitest";
import { loadStudy } from "../../src/manifest/loadStudy.js";
import type { Study } from "../../src/manifest/types.js";
import { UserError } from "../../src/messages/index.js";
import * as msg from "../../src/messages/output.js";
import { faultyFs, nodeFs } from "../../src/fileSystem.js";
import { notOwnSummary, notOwnTable, TABLE_HEADERS, writeOwnFiles } from "../../src/record/outputFile.js";
import { studyInputs } from "../../src/record/ownership.js";
import { fullTable } from "../../src/study/fullTable.js";
import { summarizeRun } from "../../src/study/runSummary.js";

const folders: string[] = [];
afterEach(() => {
  while (folders.length > 0) rmSync(folders.pop() as string, { recursive: true, force: true });
});

/** Every measure kind and every extra table: level (at_least, time at value), utilization against a number and a series, observation (quantiles, within), entity time, count. */
const MANIFEST = `title: Repair shop
scenarios:
  - {name: week, end: 10, runs: runs/*.csv}
measures:
  - {name: queue, kind: level, series: queue, at_least: [1]}
  - {name: bench, kind: utilization, series: busy, capacity: 2}
  - {name: staffed, kind: utilization, series: busy, capacity: staff}
  - {name: fix, kind: observation, series: fix, quantiles: [0.5], within: [2]}
  - {name: stay, kind: observation, from: {start: arrive, end: leave}}
  - {name: done, kind: count, series: leave}
`;
const RUN = `time,series,value,entity
0,staff,2,
0,queue,1,
0,busy,1,
1,arrive,,"bike, red"
2,fix,1.5,
3,queue,2,
4,leave,,"bike, red"
5,busy,2,
6,fix,3,
`;

function study(): { dir: string; load: () => Promise<Study> } {
  const dir = mkdtempSync(join(tmpdir(), "sojourn-outfile-"));
  folders.push(dir);
  mkdirSync(join(dir, "runs"));
  writeFileSync(join(dir, "runs", "day-1.csv"), RUN);
  writeFileSync(join(dir, "study.yaml"), MANIFEST);
  return { dir, load: () => loadStudy(join(dir, "study.yaml")) };
}

function thrown(f: () => void): UserError {
  try {
    f();
  } catch (e) {
    expect(e).toBeInstanceOf(UserError);
    return e as UserError;
  }
  throw new Error("expected a UserError");
}

describe("notOwnTable", () => {
  it("notOwnTable takes every table `sojourn table` writes, of every measure kind and extra table, as Sojourn's", async () => {
    const s = await study().load();
    const headers = new Set<string>();
    for (const measure of s.measureNames) {
      for (const t of await fullTable(s, { scenario: "week", run: "day-1", measure })) {
        expect(notOwnTable(t.csv), `${measure} ${t.suffix}`).toBeNull();
        headers.add(t.csv.slice(0, t.csv.indexOf("\n")));
      }
    }
    // 9 kinds of table met here: level, time_at_least, time_at_value, utilization (number, series), observation, quantiles, within, entity time, count
    expect(headers.size).toBeGreaterThanOrEqual(9);
    for (const h of headers) expect(TABLE_HEADERS.has(h)).toBe(true);
  });

  it("notOwnTable refuses a file with another first line, a line with a cell too many or too few, an open quote, no final line feed", () => {
    const header = "index,time,running_count,line";
    expect(notOwnTable(`${header}\n1,0.5,1,2\n`)).toBeNull();
    expect(notOwnTable(`${header}\n1,"a, b",1,2\n`)).toBeNull(); // a quoted comma is inside one cell (RFC 4180)
    expect(notOwnTable("time,series,value\n0,queue,1\n")).toBe("its first line is not the header of a calculation table");
    expect(notOwnTable(`${header}\n1,0.5,1,2,my note\n`)).toBe("line 2 has 5 cells, the header 4");
    expect(notOwnTable(`${header}\n1,0.5\n`)).toBe("line 2 has 2 cells, the header 4");
    expect(notOwnTable(`${header}\n1,"0.5,1,2\n`)).toBe("a quoted cell is not closed");
    expect(notOwnTable(`${header}\n1,0.5,1,2`)).toBe("its last line is not ended");
    expect(notOwnTable("")).toBe("its first line is not the header of a calculation table");
  });
});

describe("notOwnSummary", () => {
  it("notOwnSummary takes a summary summarize-run wrote as Sojourn's, and refuses one changed by a byte, other JSON and other text", async () => {
    const s = await study().load();
    const { text } = await summarizeRun(s, "week", "day-1");
    expect(notOwnSummary(text)).toBeNull();
    const changed = text.replace('"run":"day-1"', '"run":"day-2"');
    expect(changed).not.toBe(text);
    expect(notOwnSummary(changed)).toBe("its contents do not match the digest written inside it");
    expect(notOwnSummary('{"format": "my-notes"}')).toBe('its "format" is not "sojourn-run-summary/1"');
    expect(notOwnSummary("[1, 2]")).toBe('its "format" is not "sojourn-run-summary/1"');
    expect(notOwnSummary("notes")).toBe("it is not JSON");
  });
});

describe("writeOwnFiles", () => {
  const TABLE = "index,time,running_count,line\n1,4,1,8\n";

  it("writeOwnFiles writes over its own earlier table, and refuses a user's file unless force", async () => {
    const { dir, load } = study();
    const inputs = studyInputs(await load());
    const out = join(dir, "done.csv");
    writeOwnFiles([{ path: out, text: TABLE }], { kind: "calculation table", force: false, inputs });
    writeOwnFiles([{ path: out, text: TABLE.replace("1,4", "1,5") }], { kind: "calculation table", force: false, inputs });
    expect(readFileSync(out, "utf8")).toBe(TABLE.replace("1,4", "1,5"));
    writeFileSync(out, "my sums\n");
    const e = thrown(() => writeOwnFiles([{ path: out, text: TABLE }], { kind: "calculation table", force: false, inputs }));
    expect(e.message).toBe(msg.outFileNotOurs(out, "calculation table", "its first line is not the header of a calculation table").message);
    expect(readFileSync(out, "utf8")).toBe("my sums\n");
    writeOwnFiles([{ path: out, text: TABLE }], { kind: "calculation table", force: true, inputs });
    expect(readFileSync(out, "utf8")).toBe(TABLE);
  });

  it("writeOwnFiles refused on its second file writes neither", async () => {
    const { dir, load } = study();
    const inputs = studyInputs(await load());
    writeFileSync(join(dir, "q.time_at_value.csv"), "mine\n");
    thrown(() =>
      writeOwnFiles(
        [
          { path: join(dir, "q.csv"), text: TABLE },
          { path: join(dir, "q.time_at_value.csv"), text: TABLE },
        ],
        { kind: "calculation table", force: false, inputs },
      ),
    );
    expect(readdirSync(dir).sort()).toEqual(["q.time_at_value.csv", "runs", "study.yaml"]);
  });

  it("writeOwnFiles never writes over the manifest or a run file, also through a link and with force", async () => {
    const { dir, load } = study();
    const inputs = studyInputs(await load());
    const run = join(dir, "runs", "day-1.csv");
    const e = thrown(() => writeOwnFiles([{ path: run, text: TABLE }], { kind: "calculation table", force: true, inputs }));
    expect(e.message).toBe(msg.outFileIsInput(run, "run file").message);
    symlinkSync(join(dir, "study.yaml"), join(dir, "alias.yaml"));
    const viaLink = thrown(() => writeOwnFiles([{ path: join(dir, "alias.yaml"), text: TABLE }], { kind: "run summary", force: true, inputs }));
    expect(viaLink.message).toBe(msg.outFileIsInput(join(dir, "alias.yaml"), "manifest").message);
    expect(readFileSync(run, "utf8")).toBe(RUN);
    expect(readFileSync(join(dir, "study.yaml"), "utf8")).toBe(MANIFEST);
  });

  it("writeOwnFiles on a full disk keeps the earlier file and leaves no temporary file", async () => {
    const { dir, load } = study();
    const inputs = studyInputs(await load());
    const out = join(dir, "done.csv");
    writeOwnFiles([{ path: out, text: TABLE }], { kind: "calculation table", force: false, inputs });
    const e = thrown(() =>
      writeOwnFiles([{ path: out, text: TABLE + "2,6,2,9\n" }], { kind: "calculation table", force: false, inputs, fs: faultyFs(nodeFs, "ENOSPC", "write", "done.csv") }),
    );
    expect(e.message).toBe(msg.outFileUnwritable(out, "ENOSPC", true).message);
    expect(readFileSync(out, "utf8")).toBe(TABLE);
    expect(readdirSync(dir).sort()).toEqual(["done.csv", "runs", "study.yaml"]);
  });
});
