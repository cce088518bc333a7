/**
 * `sojourn verify` as an audit that trusts nothing in the report folder (issue 12, class 5),
 * through the built command line (`npm run build` first): the page is made again from the recorded
 * inputs and compared byte for byte, record entries that lead outside the report folder or the
 * inputs' folder are not read, named pipes are never opened, and a damaged record.json gets a
 * catalogue message. Every run has a time limit: a verify that opened a pipe would wait for ever.
 *
 * The study is invented (a bike repair shop, hand-made rows); every expected text comes from the
 * message catalogue (src/messages/verify.ts).
 */
import { spawnSync } from "node:child_process";
import { createHash } from "node:crypto";
import { cpSync, mkdirSync, readFileSync, rmSync, symlinkSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { beforeAll, describe, expect, it } from "vitest";
import { csv, tempFolder } from "../helpers/tempStudy.js";
import * as msg from "../../src/messages/verify.js";
import { findChrome } from "../../src/report/pdf.js";

const MAIN = fileURLToPath(new URL("../../dist/cli/main.js", import.meta.url));

function sojourn(args: string[]): { status: number | null; stdout: string; stderr: string } {
  const r = spawnSync(process.execPath, [MAIN, ...args], { encoding: "utf8", timeout: 60_000, env: { ...process.env, SOURCE_DATE_EPOCH: "1780000000" } });
  return { status: r.status, stdout: r.stdout, stderr: r.stderr };
}

const MANIFEST = `title: Bike repair shop
time_unit: h
scenarios:
  - {name: weekday, end: 10, runs: "runs/*.csv"}
measures:
  - {name: queue, kind: level, series: waiting}
  - {name: fix_time, kind: observation, series: fix}
`;

let study: string;
const sha = (b: Buffer | string) => createHash("sha256").update(b).digest("hex");

/** A fresh copy of the study folder with its report in `report/`. */
function copy(): string {
  const dir = tempFolder({});
  cpSync(study, dir, { recursive: true });
  return dir;
}

function editRecord(dir: string, edit: (r: Record<string, unknown>) => unknown): void {
  const p = join(dir, "report", "record.json");
  const r = JSON.parse(readFileSync(p, "utf8")) as Record<string, unknown>;
  const out = edit(r);
  writeFileSync(p, JSON.stringify(out === undefined ? r : out, null, 2));
}

/** The verdict line of an item: [ok, detail]. */
function line(stdout: string, item: string): [boolean, string] | null {
  for (const l of stdout.split("\n")) {
    const m = /^(ok|FAILED)\s+(.*?): (.*)$/.exec(l);
    if (m !== null && m[2] === item) return [m[1] === "ok", m[3]];
  }
  return null;
}

beforeAll(() => {
  const files: Record<string, string> = { "study.yaml": MANIFEST };
  for (let k = 1; k <= 3; k++) {
    files[`runs/day-${k}.csv`] = csv([[0, "waiting", k], [1 + k / 10, "fix", 0.5 * k], [2, "waiting", k + 1], [4, "fix", 1 + k / 4], [5, "waiting", 0]]);
  }
  study = tempFolder(files);
  const r = sojourn(["report", join(study, "study.yaml"), "--out", join(study, "report"), "--quiet"]);
  expect(r.status, r.stderr).toBe(0);
}, 120_000);

describe("sojourn verify: the page is made again from the record", () => {
  it("an untouched report verifies, report.html made again byte for byte, and record.json holds the report's date", () => {
    const dir = copy();
    const r = sojourn(["verify", join(dir, "report")]);
    expect(r.status, r.stdout).toBe(0);
    expect(line(r.stdout, "report.html")).toEqual([true, "made again from the inputs byte for byte (audit edition)"]);
    const record = JSON.parse(readFileSync(join(dir, "report", "record.json"), "utf8"));
    // SOURCE_DATE_EPOCH 1780000000 is 2026-05-28T20:26:40Z (computed with `date -u -d @1780000000`)
    expect(record.report).toEqual({ generated_at: "2026-05-28T20:26:40.000Z", edition: "audit" });
  });

  it("a forged page fails when its digest in record.json is left as it was", () => {
    const dir = copy();
    const page = join(dir, "report", "report.html");
    writeFileSync(page, readFileSync(page, "utf8").replace("Bike repair shop", "Bike repair shop (approved)"));
    const r = sojourn(["verify", join(dir, "report")]);
    expect(r.status).toBe(1);
    expect(line(r.stdout, "report.html")).toEqual([false, msg.outputChanged()]);
  });

  it("a forged page fails when its digest in record.json was changed to match it", () => {
    const dir = copy();
    const page = join(dir, "report", "report.html");
    const forged = readFileSync(page, "utf8").replace("Bike repair shop", "Bike repair shop (approved)");
    writeFileSync(page, forged);
    editRecord(dir, (rec) => {
      for (const o of rec.outputs as { file: string; sha256: string }[]) if (o.file === "report.html") o.sha256 = sha(forged);
    });
    const r = sojourn(["verify", join(dir, "report")]);
    expect(r.status).toBe(1);
    expect(line(r.stdout, "report.html")).toEqual([false, msg.pageDiffers()]);
  });

  it("a page whose recorded date was changed no longer matches the page made again", () => {
    const dir = copy();
    editRecord(dir, (rec) => {
      rec.report = { ...(rec.report as object), generated_at: "2030-01-01T00:00:00.000Z" };
    });
    const r = sojourn(["verify", join(dir, "report")]);
    expect(r.status).toBe(1);
    expect(line(r.stdout, "report.html")).toEqual([false, msg.pageDiffers()]);
  });

  it("a record without the report's date (an earlier version's) says the page cannot be made again", () => {
    const dir = copy();
    editRecord(dir, (rec) => {
      delete rec.report;
    });
    const r = sojourn(["verify", join(dir, "report")]);
    expect(r.status).toBe(1);
    expect(line(r.stdout, "report.html")).toEqual([false, msg.pageUndatable()]);
  });

  it("a forged table with its digest changed to match fails against the table computed again", () => {
    const dir = copy();
    const file = "tables/weekday/runs/day-1/queue.csv";
    const p = join(dir, "report", file);
    const forged = readFileSync(p, "utf8").replace(/\n2,/, "\n2.5,");
    expect(forged).not.toBe(readFileSync(p, "utf8"));
    writeFileSync(p, forged);
    editRecord(dir, (rec) => {
      for (const o of rec.outputs as { file: string; sha256: string }[]) if (o.file === file) o.sha256 = sha(forged);
    });
    const r = sojourn(["verify", join(dir, "report")]);
    expect(r.status).toBe(1);
    expect(line(r.stdout, file)).toEqual([false, msg.tableDiffers()]);
  });

  it("the PDF's digest is checked: a matching one passes, a changed PDF fails, a PDF the record does not name fails", () => {
    const dir = copy();
    const pdf = join(dir, "report", "report.pdf");
    // Invented bytes stand in for a browser's PDF: verify checks only the digest of a PDF.
    writeFileSync(pdf, "%PDF-1.4 invented\n");
    let r = sojourn(["verify", join(dir, "report")]);
    expect(line(r.stdout, "report.pdf")).toEqual([false, msg.pdfNotRecorded()]);
    expect(r.status).toBe(1);
    editRecord(dir, (rec) => {
      rec.pdf = { file: "report.pdf", sha256: sha("%PDF-1.4 invented\n"), pages: 1 };
    });
    r = sojourn(["verify", join(dir, "report")]);
    expect(r.status, r.stdout).toBe(0);
    writeFileSync(pdf, "%PDF-1.4 forged\n");
    r = sojourn(["verify", join(dir, "report")]);
    expect(r.status).toBe(1);
    expect(line(r.stdout, "report.pdf")).toEqual([false, msg.outputChanged()]);
    rmSync(pdf);
    r = sojourn(["verify", join(dir, "report")]);
    expect(line(r.stdout, "report.pdf")).toEqual([false, msg.pdfMissing()]);
  });

  const chrome = findChrome();
  it.skipIf(chrome === null)("report --pdf records the PDF's digest after printing it, and verify checks it", () => {
    const dir = copy();
    const out = join(dir, "with-pdf");
    const made = sojourn(["report", join(dir, "study.yaml"), "--out", out, "--pdf", "--chrome", chrome!, "--quiet"]);
    expect(made.status, made.stderr).toBe(0);
    const record = JSON.parse(readFileSync(join(out, "record.json"), "utf8"));
    expect(record.pdf.file).toBe("report.pdf");
    expect(record.pdf.sha256).toBe(sha(readFileSync(join(out, "report.pdf"))));
    expect(record.pdf.pages).toBeGreaterThan(0);
    const r = sojourn(["verify", out]);
    expect(r.status, r.stdout).toBe(0);
    expect(line(r.stdout, "report.pdf")?.[0]).toBe(true);
  }, 180_000);

  it("a file in the report folder that the record does not name fails", () => {
    const dir = copy();
    writeFileSync(join(dir, "report", "tables", "weekday", "extra.csv"), "a,b\n1,2\n");
    const r = sojourn(["verify", join(dir, "report")]);
    expect(r.status).toBe(1);
    expect(line(r.stdout, "tables/weekday/extra.csv")).toEqual([false, msg.strayFile()]);
  });
});

describe("sojourn verify reads nothing outside the report folder and the inputs' folder", () => {
  // Each escaping entry leads to an exact copy of the genuine file: had verify read it, the digest
  // would match and the line would pass. It fails, so the file was not read.
  it("an input entry with `..` or an absolute path is not read", () => {
    const dir = copy();
    const outside = tempFolder({ "day-1.csv": readFileSync(join(dir, "runs", "day-1.csv"), "utf8") });
    const up = `../${"../".repeat(12)}${outside.slice(1)}/day-1.csv`;
    editRecord(dir, (rec) => {
      const inputs = rec.inputs as { file: string }[];
      inputs[0].file = up;
      inputs[1].file = join(outside, "day-1.csv");
    });
    const r = sojourn(["verify", join(dir, "report")]);
    expect(r.status).toBe(1);
    const detail = msg.outside("the inputs' folder", dir, "--inputs (or --root)");
    expect(line(r.stdout, `input ${up}`)).toEqual([false, detail]);
    expect(line(r.stdout, `input ${join(outside, "day-1.csv")}`)).toEqual([false, detail]);
    expect(line(r.stdout, "study")).toEqual([false, msg.notComputed()]);
  });

  it("a run file that is a symbolic link to a file outside the inputs' folder is not read", () => {
    const dir = copy();
    const outside = tempFolder({ "day-2.csv": readFileSync(join(dir, "runs", "day-2.csv"), "utf8") });
    rmSync(join(dir, "runs", "day-2.csv"));
    symlinkSync(join(outside, "day-2.csv"), join(dir, "runs", "day-2.csv"));
    const r = sojourn(["verify", join(dir, "report")]);
    expect(r.status).toBe(1);
    expect(line(r.stdout, "input runs/day-2.csv")).toEqual([false, msg.outside("the inputs' folder", dir, "--inputs (or --root)")]);
    // With the outside folder allowed (--root /), the same link is followed and matches.
    const allowed = sojourn(["verify", join(dir, "report"), "--root", "/"]);
    expect(line(allowed.stdout, "input runs/day-2.csv")).toEqual([true, "digest matches"]);
    expect(allowed.status, allowed.stdout).toBe(0);
  });

  it("an output entry with `..`, or a table that links outside the report folder, is not read", () => {
    const dir = copy();
    const table = "tables/weekday/runs/day-1/queue.csv";
    const outside = tempFolder({ "queue.csv": readFileSync(join(dir, "report", table), "utf8") });
    rmSync(join(dir, "report", table));
    symlinkSync(join(outside, "queue.csv"), join(dir, "report", table));
    editRecord(dir, (rec) => {
      const outputs = rec.outputs as { file: string }[];
      outputs.find((o) => o.file === "tables/weekday/runs/day-2/queue.csv")!.file = "../runs/day-1.csv";
    });
    const r = sojourn(["verify", join(dir, "report")]);
    expect(r.status).toBe(1);
    const detail = msg.outputOutside(join(dir, "report"));
    expect(line(r.stdout, table)).toEqual([false, detail]);
    expect(line(r.stdout, "../runs/day-1.csv")).toEqual([false, detail]);
  });

  it("a recorded manifest place far outside the report's folder is not followed", () => {
    const dir = copy();
    editRecord(dir, (rec) => {
      (rec.manifest as { path: string }).path = `${"../".repeat(30)}study.yaml`;
    });
    const r = sojourn(["verify", join(dir, "report")]);
    expect(r.status).toBe(1);
    expect(line(r.stdout, "inputs")).toEqual([false, msg.manifestOutside("/", dir)]);
  });

  it("named pipes in place of a run file, a table, the PDF or record.json are never opened", () => {
    const dir = copy();
    const mkfifo = (p: string) => {
      rmSync(p, { force: true });
      expect(spawnSync("mkfifo", [p]).status).toBe(0);
    };
    mkfifo(join(dir, "runs", "day-3.csv"));
    mkfifo(join(dir, "report", "tables", "weekday", "runs", "day-1", "fix_time.csv"));
    editRecord(dir, (rec) => {
      rec.pdf = { file: "report.pdf", sha256: sha("x"), pages: 1 };
    });
    mkfifo(join(dir, "report", "report.pdf"));
    let r = sojourn(["verify", join(dir, "report")]);
    expect(r.status, "verify finished within its time limit").toBe(1);
    expect(line(r.stdout, "input runs/day-3.csv")).toEqual([false, msg.notAFile("a named pipe (FIFO)")]);
    expect(line(r.stdout, "tables/weekday/runs/day-1/fix_time.csv")).toEqual([false, msg.notAFile("a named pipe (FIFO)")]);
    expect(line(r.stdout, "report.pdf")).toEqual([false, msg.notAFile("a named pipe (FIFO)")]);

    mkfifo(join(dir, "report", "record.json"));
    r = sojourn(["verify", join(dir, "report")]);
    expect(r.status).toBe(1);
    expect(r.stderr).toBe(`sojourn: ${msg.recordNotAFile(join(dir, "report"), "a named pipe (FIFO)").message}\n`);
  });

  it("a device named as a run file is not read", () => {
    const dir = copy();
    editRecord(dir, (rec) => {
      (rec.inputs as { file: string }[])[0].file = "runs/zero.csv";
    });
    symlinkSync("/dev/zero", join(dir, "runs", "zero.csv"));
    // /dev/zero is outside the inputs' folder; with everything allowed it is still not read.
    const r = sojourn(["verify", join(dir, "report"), "--root", "/"]);
    expect(r.status).toBe(1);
    expect(line(r.stdout, "input runs/zero.csv")).toEqual([false, msg.notAFile("a device")]);
  });
});

describe("sojourn verify: both editions and the chart files are made again", () => {
  let client: string;
  beforeAll(() => {
    client = copy();
    const r = sojourn(["report", join(client, "study.yaml"), "--out", join(client, "client"), "--edition", "client", "--quiet"]);
    expect(r.status, r.stderr).toBe(0);
  }, 120_000);
  const charts = (dir: string) => (JSON.parse(readFileSync(join(dir, "record.json"), "utf8")).outputs as { file: string }[]).map((o) => o.file).filter((f) => f.startsWith("charts/"));

  it("a client edition verifies: record.json names it, the page is made again in that edition, every chart file matches", () => {
    const dir = join(client, "client");
    const record = JSON.parse(readFileSync(join(dir, "record.json"), "utf8"));
    expect(record.report.edition).toBe("client");
    const html = readFileSync(join(dir, "report.html"), "utf8");
    expect(html).toContain('<meta name="sojourn-edition" content="client">');
    expect(html).toContain('id="audit-files"');
    expect(html).not.toContain('id="appendix"');
    const r = sojourn(["verify", dir]);
    expect(r.status, r.stdout).toBe(0);
    expect(line(r.stdout, "report.html")).toEqual([true, "made again from the inputs byte for byte (client edition)"]);
    expect(charts(dir).length).toBeGreaterThan(3);
    for (const f of charts(dir)) expect(line(r.stdout, f), f).toEqual([true, "drawn again byte for byte"]);
  });

  it("a client edition whose record was changed to say audit fails: verify makes the edition the record names", () => {
    const dir = copy();
    cpSync(join(client, "client"), join(dir, "client"), { recursive: true });
    const p = join(dir, "client", "record.json");
    const rec = JSON.parse(readFileSync(p, "utf8"));
    rec.report.edition = "audit";
    writeFileSync(p, JSON.stringify(rec, null, 2));
    const r = sojourn(["verify", join(dir, "client")]);
    expect(r.status).toBe(1);
    expect(line(r.stdout, "report.html")).toEqual([false, msg.pageDiffers()]);
  });

  it("a chart file changed with its digest, one deleted, and one the record does not list all fail", () => {
    const dir = copy();
    const [first, second] = charts(join(dir, "report"));
    const p = join(dir, "report", first);
    const forged = readFileSync(p, "utf8").replace("<svg", '<svg data-x="1"');
    writeFileSync(p, forged);
    editRecord(dir, (rec) => {
      for (const o of rec.outputs as { file: string; sha256: string }[]) if (o.file === first) o.sha256 = sha(forged);
    });
    rmSync(join(dir, "report", second));
    writeFileSync(join(dir, "report", "charts", "extra.svg"), "<svg/>");
    const r = sojourn(["verify", join(dir, "report")]);
    expect(r.status).toBe(1);
    expect(line(r.stdout, first)).toEqual([false, msg.chartDiffers()]);
    expect(line(r.stdout, second)).toEqual([false, msg.outputMissing()]);
    expect(line(r.stdout, "charts/extra.svg")).toEqual([false, msg.strayFile()]);
  });

  it("a record written before editions (no edition, no chart files) verifies as the audit edition", () => {
    const dir = copy();
    editRecord(dir, (rec) => {
      rec.report = { generated_at: (rec.report as { generated_at: string }).generated_at };
      rec.outputs = (rec.outputs as { file: string }[]).filter((o) => !o.file.startsWith("charts/"));
    });
    rmSync(join(dir, "report", "charts"), { recursive: true });
    const r = sojourn(["verify", join(dir, "report")]);
    expect(r.status, r.stdout).toBe(0);
    expect(line(r.stdout, "report.html")).toEqual([true, "made again from the inputs byte for byte"]);
  });
});

describe("sojourn verify: a damaged record.json gets a catalogue message (exit 1, no stack trace)", () => {
  const variants: [string, (r: Record<string, unknown>) => unknown, string][] = [
    ["inputs is not a list", (r) => void (r.inputs = 7), "at inputs: expected a list, found the number 7"],
    ["manifest is missing", (r) => void delete r.manifest, "at manifest: expected an object, found nothing (the key is missing)"],
    ["a digest is a number", (r) => void ((r.outputs as Record<string, unknown>[])[0].sha256 = 12), "at outputs[0].sha256: expected a SHA-256 digest (64 lower-case hex digits), found the number 12"],
    ["left_out is null", (r) => void ((r.inputs as Record<string, unknown>[])[0].left_out = null), "at inputs[0].left_out: expected an object, found null"],
    ["the manifest text is a number", (r) => void ((r.manifest as Record<string, unknown>).text = 5), "at manifest.text: expected a string, found the number 5"],
    ["a file name is missing", (r) => void delete (r.outputs as Record<string, unknown>[])[1].file, "at outputs[1].file: expected a string, found nothing (the key is missing)"],
    ["the report's date is a number", (r) => void (r.report = { generated_at: 1 }), "at report.generated_at: expected a string, found the number 1"],
    ["the edition is not one Sojourn writes", (r) => void (r.report = { generated_at: "2026-05-28T20:26:40.000Z", edition: "summary" }), 'at report.edition: expected "audit" or "client", found the string "summary"'],
    ["the whole record is a list", () => [1, 2], "the whole file: expected an object, found a list"],
    ["another format", (r) => void (r.format = "sojourn-record/9"), 'at format: expected "sojourn-record/1", found the string "sojourn-record/9"'],
  ];
  for (const [what, edit, why] of variants) {
    it(`${what}`, () => {
      const dir = copy();
      editRecord(dir, edit);
      const r = sojourn(["verify", join(dir, "report")]);
      expect(r.status).toBe(1);
      expect(r.stdout).toBe("");
      expect(r.stderr).toBe(`sojourn: ${msg.recordMalformed(join(dir, "report"), why).message}\n`);
    });
  }

  it("a record cut short, and one that is not JSON", () => {
    const dir = copy();
    const p = join(dir, "report", "record.json");
    writeFileSync(p, readFileSync(p, "utf8").slice(0, 200));
    let r = sojourn(["verify", join(dir, "report")]);
    expect(r.status).toBe(1);
    expect(r.stderr).toMatch(/^sojourn: .*record\.json: this is not a study record as `sojourn report` writes it: it is not JSON \(/);
    expect(r.stderr).not.toContain("internal error");
    writeFileSync(p, "");
    r = sojourn(["verify", join(dir, "report")]);
    expect(r.status).toBe(1);
    expect(r.stderr).toContain("it is not JSON");
  });

  it("a folder with no record, a missing folder, and record.json that is a folder", () => {
    const dir = copy();
    let r = sojourn(["verify", join(dir, "runs")]);
    expect(r.stderr).toBe(`sojourn: ${msg.reportDirMissing(join(dir, "runs"), "record.json is missing").message}\n`);
    r = sojourn(["verify", join(dir, "nowhere")]);
    expect(r.stderr).toBe(`sojourn: ${msg.reportDirMissing(join(dir, "nowhere"), "it does not exist").message}\n`);
    rmSync(join(dir, "report", "record.json"));
    mkdirSync(join(dir, "report", "record.json"));
    r = sojourn(["verify", join(dir, "report")]);
    expect(r.status).toBe(1);
    expect(r.stderr).toBe(`sojourn: ${msg.recordNotAFile(join(dir, "report"), "a folder").message}\n`);
  });
});
