/**
 * `max_row_bytes`: the row limit of the run files, at the top of the manifest or per scenario (a
 * scenario's replaces the study's), 1 MiB when absent, in 1 KiB .. 256 MiB; and the limit in force
 * is the one the run files are read with.
 *
 * Sources: docs/manifest.md (Row limit); the brief (default 1 MiB, changeable, a sane
 * range); row lengths computed by hand (a 2000-byte row is over a 1024-byte limit and under 4096).
 */
import { join } from "node:path";
import { afterEach, describe, expect, test } from "vitest";
import { ROW_LIMIT_MAX } from "../../src/ingest/feeder.js";
import { loadStudy } from "../../src/manifest/loadStudy.js";
import { ingestMessages, manifestMessages as m } from "../../src/messages/index.js";
import { runStudy } from "../../src/study/runStudy.js";
import { pos, removeFolder, studyFolder, userError } from "./helpers.js";

const folders: string[] = [];
afterEach(() => {
  while (folders.length > 0) removeFolder(folders.pop() as string);
});

const LONG_ROW = `1,queue,2,${"e".repeat(2000 - 10)}`;
const FILES = {
  "runs/a/rep-01.csv": `time,series,value,entity\n0,queue,1,\n${LONG_ROW}\n`,
  "runs/b/rep-01.csv": `time,series,value,entity\n0,queue,1,\n${LONG_ROW}\n`,
};
const MEASURES = "measures:\n  - {name: q, kind: level, series: queue}\n";

function folder(): string {
  const dir = studyFolder(FILES);
  folders.push(dir);
  return dir;
}

describe("loadStudy and runStudy with max_row_bytes", () => {
  test("loadStudy gives every scenario 1 MiB when absent, the study's value, or the scenario's own", async () => {
    const dir = folder();
    const none = await loadStudy(join(dir, "s.yaml"), { text: `scenarios:\n  - {name: a, end: 9, runs: runs/a/*.csv}\n${MEASURES}` });
    expect(none.scenarios[0].maxRowBytes).toBe(1048576);
    const text = `max_row_bytes: 1024\nscenarios:\n  - {name: a, end: 9, runs: runs/a/*.csv}\n  - {name: b, end: 9, runs: runs/b/*.csv, max_row_bytes: 4096}\n${MEASURES}`;
    const study = await loadStudy(join(dir, "s.yaml"), { text });
    expect(study.scenarios.map((s) => s.maxRowBytes)).toEqual([1024, 4096]);
  });

  test("runStudy reads each scenario's files with its own limit: over the study's 1024, under the scenario's 4096", async () => {
    const dir = folder();
    const file = join(dir, "s.yaml");
    const strict = await loadStudy(file, { text: `max_row_bytes: 1024\nscenarios:\n  - {name: a, end: 9, runs: runs/a/*.csv}\n${MEASURES}` });
    const error = await userError(runStudy(strict));
    expect(error.message).toBe(ingestMessages.rowTooLong("runs/a/rep-01.csv", 3, 1024, ROW_LIMIT_MAX).message);
    const relaxed = await loadStudy(file, { text: `max_row_bytes: 1024\nscenarios:\n  - {name: b, end: 9, runs: runs/b/*.csv, max_row_bytes: 4096}\n${MEASURES}` });
    const { results } = (await runStudy(relaxed)).outcome;
    expect(results.scenarios[0].runs[0].measures.q.value).toBe((1 * 1 + 2 * 8) / 9); // level 1 on [0, 1), 2 on [1, 9]
  });

  for (const [value, words] of [
    ["1023", "at least 1024"],
    ["268435457", `at most ${ROW_LIMIT_MAX}`],
  ] as const) {
    test(`loadStudy refuses max_row_bytes: ${value} (${words})`, async () => {
      const dir = folder();
      const file = join(dir, "s.yaml");
      const text = `max_row_bytes: ${value}\nscenarios:\n  - {name: a, end: 9, runs: runs/a/*.csv}\n${MEASURES}`;
      const error = await userError(loadStudy(file, { text }));
      const description = "the longest row of a run file in bytes, a whole number from 1024 (1 KiB) to 268435456 (256 MiB); default 1048576 (1 MiB)";
      expect(error.message).toBe(m.numberOutOfRange({ file, ...pos(text, value), path: "max_row_bytes" }, Number(value), words, description).message);
    });
  }

  test("loadStudy refuses a max_row_bytes that is not a whole number, in a scenario too", async () => {
    const dir = folder();
    const text = `scenarios:\n  - {name: a, end: 9, runs: runs/a/*.csv, max_row_bytes: 1500.5}\n${MEASURES}`;
    const error = await userError(loadStudy(join(dir, "s.yaml"), { text }));
    expect(error.message).toContain("(at scenarios[0].max_row_bytes)");
  });
});
