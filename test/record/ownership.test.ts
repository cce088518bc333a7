/**
 * What a report may replace (src/record/ownership.ts): a folder is Sojourn's only when its
 * record.json lists every entry with its digest; the inputs of a study are found by their real
 * location, links resolved. Every folder here is hand-made; digests are SHA-256 (FIPS 180-4, via
 * node:crypto in src/digest.ts) of the texts written.
 */
import { mkdirSync, mkdtempSync, rmSync, symlinkSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { dirname, join } from "node:path";
import { afterEach, describe, expect, it } from "vitest";
import { sha256 } from "../../src/digest.js";
import { firstForeign, inputInside, realLocation } from "../../src/record/ownership.js";

const folders: string[] = [];
afterEach(() => {
  while (folders.length > 0) rmSync(folders.pop() as string, { recursive: true, force: true });
});

function folder(files: Record<string, string> = {}): string {
  const dir = mkdtempSync(join(tmpdir(), "sojourn-own-"));
  folders.push(dir);
  for (const [rel, text] of Object.entries(files)) {
    mkdirSync(dirname(join(dir, rel)), { recursive: true });
    writeFileSync(join(dir, rel), text);
  }
  return dir;
}

const OUTPUTS: Record<string, string> = {
  "results.json": '{"format": "sojourn-results/1"}\n',
  "tables/s/runs/r/q.csv": "index,value\n1,2\n",
  "report.html": "<p>report</p>\n",
};

/** A report folder as Sojourn writes it: the outputs and a record listing them (and `extra` in the record). */
function report(extra: Record<string, unknown> = {}): string {
  const record = {
    format: "sojourn-record/1",
    outputs: Object.entries(OUTPUTS).map(([file, text]) => ({ file, sha256: sha256(text) })),
    ...extra,
  };
  return folder({ ...OUTPUTS, "record.json": JSON.stringify(record) });
}

describe("firstForeign", () => {
  it("firstForeign of an empty folder and of an untouched report folder is null", () => {
    expect(firstForeign(folder())).toBeNull();
    expect(firstForeign(report())).toBeNull();
  });

  it("firstForeign names a file the user added, the first in name order, at any depth", () => {
    const dir = report();
    writeFileSync(join(dir, "tables", "s", "runs", "r", "my-sums.csv"), "mine\n");
    expect(firstForeign(dir)).toEqual({ file: "tables/s/runs/r/my-sums.csv", why: "not-listed" });
    writeFileSync(join(dir, "notes.txt"), "mine\n");
    writeFileSync(join(dir, "a-notes.txt"), "mine\n");
    expect(firstForeign(dir)).toEqual({ file: "a-notes.txt", why: "not-listed" });
  });

  it("firstForeign names a folder of the user's, even an empty one, with a trailing slash", () => {
    const dir = report();
    mkdirSync(join(dir, "drafts"));
    expect(firstForeign(dir)).toEqual({ file: "drafts/", why: "not-listed" });
  });

  it("firstForeign names a listed file whose bytes changed since", () => {
    const dir = report();
    writeFileSync(join(dir, "report.html"), "<p>report</p>\n<p>my comment</p>\n");
    expect(firstForeign(dir)).toEqual({ file: "report.html", why: "changed" });
  });

  it("firstForeign names a link where the record lists a file, even to identical bytes", () => {
    const dir = report();
    const elsewhere = folder({ "copy.json": OUTPUTS["results.json"] });
    rmSync(join(dir, "results.json"));
    symlinkSync(join(elsewhere, "copy.json"), join(dir, "results.json"));
    expect(firstForeign(dir)).toEqual({ file: "results.json", why: "not-listed" });
  });

  it("firstForeign without record.json names the first entry; with a record.json that is not a study record, names record.json", () => {
    expect(firstForeign(folder({ "results.json": "{}", "b.txt": "x" }))).toEqual({ file: "b.txt", why: "no-record" });
    expect(firstForeign(folder({ "results.json": "{}", "record.json": '{"format": "my-own"}' }))).toEqual({ file: "record.json", why: "bad-record" });
    expect(firstForeign(folder({ "record.json": "not json" }))).toEqual({ file: "record.json", why: "bad-record" });
    const bad = { format: "sojourn-record/1", outputs: [{ file: "results.json", sha256: "short" }] };
    expect(firstForeign(folder({ "record.json": JSON.stringify(bad) }))).toEqual({ file: "record.json", why: "bad-record" });
  });

  it("firstForeign takes a listed PDF as Sojourn's and a PDF the record does not list as foreign", () => {
    const pdf = "%PDF-1.4 hand-made\n";
    const listed = report({ pdf: { file: "report.pdf", sha256: sha256(pdf) } });
    writeFileSync(join(listed, "report.pdf"), pdf);
    expect(firstForeign(listed)).toBeNull();
    const unlisted = report();
    writeFileSync(join(unlisted, "report.pdf"), pdf);
    expect(firstForeign(unlisted)).toEqual({ file: "report.pdf", why: "not-listed" });
  });

  it("firstForeign accepts a report whose record lists a file that is gone (nothing of the user's is in it)", () => {
    const dir = report();
    rmSync(join(dir, "report.html"));
    expect(firstForeign(dir)).toBeNull();
  });
});

describe("inputInside and realLocation", () => {
  it("inputInside finds an input in the folder, in a folder below it, and through a link to the folder", () => {
    const study = folder({ "study.yaml": "x", "runs/day-1.csv": "y" });
    const inputs = [
      { path: join(study, "study.yaml"), kind: "manifest" as const },
      { path: join(study, "runs", "day-1.csv"), kind: "run file" as const },
    ];
    expect(inputInside(realLocation(study), inputs)?.relative).toBe("study.yaml");
    expect(inputInside(realLocation(join(study, "runs")), inputs)?.relative).toBe("day-1.csv");
    expect(inputInside(realLocation(dirname(study)), inputs)?.input.kind).toBe("manifest");
    const link = join(folder(), "link");
    symlinkSync(study, link);
    expect(inputInside(realLocation(link), inputs)?.relative).toBe("study.yaml");
    expect(inputInside(realLocation(join(study, "report")), inputs)).toBeNull();
  });

  it("inputInside finds a run file reached through a link that points into the folder", () => {
    const out = folder({ "data/day-1.csv": "y" });
    const study = folder({ "study.yaml": "x" });
    symlinkSync(join(out, "data"), join(study, "runs"));
    const inputs = [{ path: join(study, "runs", "day-1.csv"), kind: "run file" as const }];
    expect(inputInside(realLocation(out), inputs)?.relative).toBe("data/day-1.csv");
  });

  it("inputInside does not take a folder whose name merely starts like the input's folder", () => {
    const base = folder({ "runs-old/x.csv": "y" });
    const inputs = [{ path: join(base, "runs-old", "x.csv"), kind: "run file" as const }];
    expect(inputInside(realLocation(join(base, "runs")), inputs)).toBeNull();
  });

  it("realLocation of a path that does not exist resolves its nearest existing ancestor", () => {
    const study = folder();
    const link = join(folder(), "link");
    symlinkSync(study, link);
    expect(realLocation(join(link, "new", "report"))).toBe(join(realLocation(study), "new", "report"));
  });
});
