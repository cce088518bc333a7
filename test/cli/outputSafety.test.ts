/**
 * Nothing of the user's is lost through `--out` (issue 12, class 1), through the built command
 * line: a folder is replaced only when Sojourn can show it wrote every file in it; the manifest
 * and the inputs of a study are never removed or written over, whatever the folder and whatever
 * the flags (links included); and a command that cannot write says why instead of hanging.
 * Every study is invented.
 */
import { spawn, spawnSync } from "node:child_process";
import { existsSync, readdirSync, readFileSync, realpathSync, symlinkSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { describe, expect, it } from "vitest";
import * as msg from "../../src/messages/output.js";
import { sojourn } from "../helpers/cli.js";
import { folderSnapshot, tempFolder } from "../helpers/tempStudy.js";

const MAIN = fileURLToPath(new URL("../../dist/cli/main.js", import.meta.url));
const MANIFEST = "title: Bakery counter\nscenarios:\n  - {name: morning, end: 10, runs: runs/*.csv}\nmeasures:\n  - {name: queue, kind: level, series: queue}\n";
const RUN = "time,series,value\n0,queue,2\n3,queue,5\n";

/** A study folder with the manifest, one run file and `extra` files. */
function bakery(extra: Record<string, string> = {}): string {
  return tempFolder({ "study.yaml": MANIFEST, "runs/day-1.csv": RUN, ...extra });
}


/** Runs the command line in `cwd`. */
function run(args: string[], cwd: string) {
  return sojourn(args, cwd);
}

const err = (e: { message: string }) => `sojourn: ${e.message}\n`;

describe("report --out never loses a file of the user's", () => {
  it("report --out . in a study folder that holds the user's results.json removes nothing, with or without --force", () => {
    const dir = bakery({ "results.json": '{"my": "own results"}\n' });
    const before = folderSnapshot(dir);
    const r = run(["report", "study.yaml", "--out", ".", "--quiet"], dir);
    expect(r.status).toBe(1);
    expect(r.stderr).toBe(err(msg.outHoldsInput(".", "study.yaml", "manifest")));
    expect(run(["report", "study.yaml", "--out", ".", "--force", "--quiet"], dir).status).toBe(1);
    expect(folderSnapshot(dir)).toEqual(before);
  });

  it("report --force into a parent of the study, or a link to the study's folder, is refused and removes nothing", () => {
    const top = tempFolder({ "study/study.yaml": MANIFEST, "study/runs/day-1.csv": RUN, "todo.txt": "call the bakery\n" });
    const before = folderSnapshot(top);
    const parent = run(["report", "study/study.yaml", "--out", ".", "--force", "--quiet"], top);
    expect(parent.stderr).toBe(err(msg.outHoldsInput(".", "study/study.yaml", "manifest")));
    symlinkSync(join(top, "study"), join(top, "shortcut"));
    const link = run(["report", "study/study.yaml", "--out", "shortcut", "--force", "--quiet"], top);
    expect(link.status).toBe(1);
    expect(link.stderr).toBe(err(msg.outHoldsInput("shortcut", "study.yaml", "manifest")));
    expect(folderSnapshot(join(top, "study"))).toEqual(Object.fromEntries(Object.entries(before).filter(([k]) => k.startsWith("study/")).map(([k, v]) => [k.slice(6), v])));
    expect(readFileSync(join(top, "todo.txt"), "utf8")).toBe("call the bakery\n");
  });

  it("report --force into a folder that holds the run files behind a link of the study is refused", () => {
    const top = tempFolder({ "study/study.yaml": MANIFEST, "store/data/day-1.csv": RUN });
    symlinkSync(join(top, "store", "data"), join(top, "study", "runs"));
    const r = run(["report", "study/study.yaml", "--out", "store", "--force", "--quiet"], top);
    expect(r.status).toBe(1);
    expect(r.stderr).toBe(err(msg.outHoldsInput("store", "data/day-1.csv", "run file")));
    expect(readFileSync(join(top, "store", "data", "day-1.csv"), "utf8")).toBe(RUN);
  });

  it("report --from-summaries --force into a folder that holds the summaries is refused", () => {
    const dir = bakery();
    expect(run(["summarize-run", "study.yaml", "--scenario", "morning", "--run", "day-1", "--out", "work/summaries/morning/day-1.json"], dir).status).toBe(0);
    const summary = readFileSync(join(dir, "work", "summaries", "morning", "day-1.json"), "utf8");
    const r = run(["report", "study.yaml", "--from-summaries", "work/summaries", "--out", "work", "--force", "--quiet"], dir);
    expect(r.stderr).toBe(err(msg.outHoldsInput("work", "summaries/morning/day-1.json", "run summary")));
    expect(readFileSync(join(dir, "work", "summaries", "morning", "day-1.json"), "utf8")).toBe(summary);
  });

  it("a file the user put into an earlier report folder stops the next report; --force then replaces the folder", () => {
    const dir = bakery();
    expect(run(["report", "study.yaml", "--out", "report", "--quiet"], dir).status).toBe(0);
    expect(run(["report", "study.yaml", "--out", "report", "--quiet"], dir).status).toBe(0); // its own folder: replaced without --force
    writeFileSync(join(dir, "report", "tables", "notes.md"), "check day 1\n");
    const before = folderSnapshot(join(dir, "report"));
    const r = run(["report", "study.yaml", "--out", "report", "--quiet"], dir);
    expect(r.stderr).toBe(err(msg.outHoldsForeign("report", "tables/notes.md", "not-listed")));
    expect(folderSnapshot(join(dir, "report"))).toEqual(before);
    expect(run(["report", "study.yaml", "--out", "report", "--force", "--quiet"], dir).status).toBe(0);
    expect(existsSync(join(dir, "report", "tables", "notes.md"))).toBe(false);
    expect(folderSnapshot(dir)["study.yaml"]).toBe(MANIFEST);
  });

  it("report into an earlier report whose measure was removed replaces it without --force (the old table was Sojourn's)", () => {
    const dir = bakery();
    writeFileSync(join(dir, "two.yaml"), MANIFEST + "  - {name: changes, kind: count, series: queue}\n");
    expect(run(["report", "two.yaml", "--out", "report", "--quiet"], dir).status).toBe(0);
    expect(existsSync(join(dir, "report", "tables", "morning", "runs", "day-1", "changes.csv"))).toBe(true);
    expect(run(["report", "study.yaml", "--out", "report", "--quiet"], dir).status).toBe(0);
    expect(existsSync(join(dir, "report", "tables", "morning", "runs", "day-1", "changes.csv"))).toBe(false);
  });
});

describe("table --out and summarize-run --out never write over a file of the user's or an input", () => {
  const table = (out: string, ...more: string[]) => ["table", "study.yaml", "--scenario", "morning", "--run", "day-1", "--measure", "queue", "--out", out, ...more];
  const summary = (out: string, ...more: string[]) => ["summarize-run", "study.yaml", "--scenario", "morning", "--run", "day-1", "--out", out, ...more];

  it("table --out writes over its own earlier tables without --force, over a user's file only with --force", () => {
    const dir = bakery({ "mine.csv": "time,series,value\n0,queue,9\n" });
    expect(run(table("queue.csv"), dir).status).toBe(0);
    const first = readFileSync(join(dir, "queue.csv"), "utf8");
    expect(run(table("queue.csv"), dir).status).toBe(0);
    expect(readFileSync(join(dir, "queue.csv"), "utf8")).toBe(first);
    const r = run(table("mine.csv"), dir);
    expect(r.stderr).toBe(err(msg.outFileNotOurs("mine.csv", "calculation table", "its first line is not the header of a calculation table")));
    expect(readFileSync(join(dir, "mine.csv"), "utf8")).toBe("time,series,value\n0,queue,9\n");
    expect(run(table("mine.csv", "--force"), dir).status).toBe(0);
    expect(readFileSync(join(dir, "mine.csv"), "utf8")).toBe(first);
  });

  it("table --out and summarize-run --out refuse the manifest and a run file even with --force, also through a link", () => {
    const dir = bakery();
    symlinkSync(join(dir, "runs", "day-1.csv"), join(dir, "latest.csv"));
    for (const [args, shown, kind] of [
      [table("study.yaml", "--force"), "study.yaml", "manifest"],
      [table("latest.csv", "--force"), "latest.csv", "run file"],
      [summary("runs/day-1.csv", "--force"), "runs/day-1.csv", "run file"],
    ] as const) {
      const r = run([...args], dir);
      expect(r.status).toBe(1);
      expect(r.stderr).toBe(err(msg.outFileIsInput(shown, kind)));
    }
    expect(readFileSync(join(dir, "study.yaml"), "utf8")).toBe(MANIFEST);
    expect(readFileSync(join(dir, "runs", "day-1.csv"), "utf8")).toBe(RUN);
  });

  it("summarize-run --out writes over its own earlier summary, and refuses other JSON without --force", () => {
    const dir = bakery({ "notes.json": '{"todo": 1}\n' });
    expect(run(summary("s/morning/day-1.json"), dir).status).toBe(0);
    expect(run(summary("s/morning/day-1.json"), dir).status).toBe(0);
    const r = run(summary("notes.json"), dir);
    expect(r.stderr).toBe(err(msg.outFileNotOurs("notes.json", "run summary", 'its "format" is not "sojourn-run-summary/1"')));
    expect(readFileSync(join(dir, "notes.json"), "utf8")).toBe('{"todo": 1}\n');
  });
});

describe("init --out never writes over a run file", () => {
  it("init --out naming one of the run files it reads is refused, also with --force", () => {
    const dir = tempFolder({ "runs/morning/day-1.csv": RUN });
    const r = run(["init", "runs", "--out", "runs/morning/day-1.csv", "--force"], dir);
    expect(r.status).toBe(1);
    expect(r.stderr).toBe(err(msg.outFileIsInput("runs/morning/day-1.csv", "run file")));
    expect(readFileSync(join(dir, "runs", "morning", "day-1.csv"), "utf8")).toBe(RUN);
    expect(run(["init", "runs", "--out", "study.yaml"], dir).status).toBe(0);
  });
});

describe("report --out in places the system refuses", () => {
  it.skipIf(!existsSync("/proc/self"))("report --out in /proc ends at once with a message (node's recursive mkdir never returns there)", () => {
    const dir = bakery();
    const started = Date.now();
    const r = spawnSync(process.execPath, [MAIN, "report", "study.yaml", "--out", "/proc/sojourn-report", "--quiet"], { cwd: dir, encoding: "utf8", timeout: 20_000 });
    expect(r.signal).toBeNull(); // not killed by the timeout
    expect(r.status).toBe(1);
    expect(r.stderr).toBe(err(msg.cannotWrite("/proc/sojourn-report", `${msg.writeReason("ENOENT")}, ENOENT`)));
    expect(Date.now() - started).toBeLessThan(20_000);
  });

  it("report with a measure name too long for a table file name says which file, never an internal error", () => {
    const name = "m".repeat(300);
    const dir = tempFolder({ "study.yaml": MANIFEST.replace("name: queue", `name: ${name}`), "runs/day-1.csv": RUN });
    const r = run(["report", "study.yaml", "--out", "report", "--quiet"], dir);
    // Table names made from long names may be shortened (then the report is written); if not,
    // the file system refuses the name and the message says which file.
    if (r.status === 0) expect(existsSync(join(dir, "report", "results.json"))).toBe(true);
    else {
      const rel = `tables/morning/runs/day-1/${name}.csv`;
      expect(r.stderr).toBe(err(msg.reportFileNameTooLong("report", rel, Buffer.byteLength(join(realpathSync(dir), "report", rel)))));
      expect(existsSync(join(dir, "report"))).toBe(false);
    }
    expect(readdirSync(dir).filter((n) => n.includes(".sojourn-"))).toEqual([]);
  });

  it("report --out below a file names the file; --out too long names the limit", () => {
    const dir = bakery({ "notes.txt": "x\n" });
    expect(run(["report", "study.yaml", "--out", "notes.txt/a/b", "--quiet"], dir).stderr).toBe(err(msg.outPathBlocked("notes.txt/a/b", "notes.txt")));
    const long = "n".repeat(256);
    expect(run(["report", "study.yaml", "--out", long, "--quiet"], dir).stderr).toBe(err(msg.outNameTooLong(long)));
    expect(readdirSync(dir).sort()).toEqual(["notes.txt", "runs", "study.yaml"]);
  });
});

describe("demo DIR keeps what is not its own, and says why it cannot write", () => {
  it("demo into a folder below a file, or in /proc, ends with a message instead of an internal error or a hang", () => {
    const dir = tempFolder({ "notes.txt": "x\n" });
    expect(run(["demo", "notes.txt/demo", "--quiet"], dir).stderr).toBe(err(msg.outPathBlocked("notes.txt/demo", "notes.txt")));
    if (existsSync("/proc/self")) {
      const r = spawnSync(process.execPath, [MAIN, "demo", "/proc/sojourn-demo", "--quiet"], { encoding: "utf8", timeout: 20_000 });
      expect(r.signal).toBeNull();
      expect(r.status).toBe(1);
      expect(r.stderr).not.toContain("internal error");
    }
  });

  it("demo again after the user put a file into DIR/report stops and keeps the file", () => {
    const dir = tempFolder({});
    expect(run(["demo", "ferry", "--quiet"], dir).status).toBe(0);
    writeFileSync(join(dir, "ferry", "report", "remarks.txt"), "two booths are enough\n");
    const r = run(["demo", "ferry", "--quiet"], dir);
    expect(r.stderr).toBe(err(msg.outHoldsForeign(join("ferry", "report"), "remarks.txt", "not-listed")));
    expect(readFileSync(join(dir, "ferry", "report", "remarks.txt"), "utf8")).toBe("two booths are enough\n");
  }, 60_000);
});

describe("output into a pipe that closes early", () => {
  it("table to standard output read by a reader that stops after the first piece ends with status 0 and no stack trace", async () => {
    let csv = "time,series,value\n";
    for (let i = 0; i < 100_000; i++) csv += `${i},queue,${i % 7}\n`;
    const dir = tempFolder({ "study.yaml": MANIFEST.replace("end: 10", "end: 100000"), "runs/day-1.csv": csv });
    const child = spawn(process.execPath, [MAIN, "table", "study.yaml", "--scenario", "morning", "--run", "day-1", "--measure", "queue"], { cwd: dir });
    let stderr = "";
    child.stderr.setEncoding("utf8").on("data", (t: string) => (stderr += t));
    child.stdout.once("data", () => child.stdout.destroy());
    const status = await new Promise<number | null>((r) => child.on("close", (code) => r(code)));
    expect(stderr).toBe("");
    expect(status).toBe(0);
  }, 60_000);
});
