import { mkdirSync, mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join, resolve } from "node:path";
import { describe, expect, it } from "vitest";
import { simulateBakery, BAKERY } from "../../src/demo/bakery.js";
import { simulateBikeShop, BIKE_SHOP } from "../../src/demo/bikeShop.js";
import { FERRY, writeFerryStudy, writeRunCsv } from "../../src/demo/ferry.js";
import { simulateQueue } from "../../src/demo/queue.js";
import type { DemoRow } from "../../src/demo/queue.js";
import { initStudy } from "../../src/init/initStudy.js";
import { niceUp } from "../../src/init/starterManifest.js";
import { loadStudy } from "../../src/manifest/loadStudy.js";
import type { Measure, Study } from "../../src/manifest/types.js";
import { ingestMessages, initMessages } from "../../src/messages/index.js";
import { RUN_EXTENSIONS } from "../../src/ingest/runFile.js";
import { runStudy } from "../../src/study/runStudy.js";
import type { Results } from "../../src/outcome/index.js";
import { sojourn } from "../helpers/cli.js";

const EXAMPLES = join(import.meta.dirname, "..", "..", "examples");

/** Writes runs/<scenario>/<run>.csv under a fresh folder; returns the folder. */
async function writeRuns(runs: { scenario: string; id: string; rows: Iterable<DemoRow> }[]): Promise<string> {
  const dir = mkdtempSync(join(tmpdir(), "sojourn-init-"));
  for (const r of runs) {
    mkdirSync(join(dir, "runs", r.scenario), { recursive: true });
    await writeRunCsv(join(dir, "runs", r.scenario, `${r.id}.csv`), r.rows);
  }
  return dir;
}

/** A measure's identity: what it reads and how, whatever its name (capacity per scenario). */
function identity(m: Measure): string {
  switch (m.kind) {
    case "count":
      return `count ${m.series}`;
    case "utilization":
      return `utilization ${JSON.stringify(m.source)} / ${m.capacity.type === "constant" ? m.capacity.value : `series ${m.capacity.series}`}`;
    default:
      return m.source.type === "series" ? `${m.kind} ${m.source.series}` : `${m.kind} ${JSON.stringify(m.source)}`;
  }
}

/**
 * The example's measures that init guessed right (same kind, same series, same capacity) in every
 * scenario, each with the init measure's name.
 */
function matches(example: Study, guessed: Study): { example: string; guessed: string }[] {
  const out: { example: string; guessed: string }[] = [];
  for (const measure of example.measureNames) {
    let name: string | null = null;
    for (const [i, sc] of example.scenarios.entries()) {
      const own = sc.measures.find((x) => x.name === measure)!;
      const other = guessed.scenarios.find((s) => s.name === sc.name)!;
      const hit = other.measures.find((x) => identity(x) === identity(own));
      if (hit === undefined || (i > 0 && hit.name !== name)) {
        name = null;
        break;
      }
      name = hit.name;
    }
    if (name !== null) out.push({ example: measure, guessed: name });
  }
  return out;
}

/** Runs both studies and expects the matched measures' run values and summaries to be identical. */
async function expectSameNumbers(example: Study, guessed: Study, expected: string[]): Promise<void> {
  const pairs = matches(example, guessed);
  expect(pairs.map((p) => p.example).sort()).toEqual([...expected].sort());
  const a: Results = (await runStudy(example)).outcome.results;
  const b: Results = (await runStudy(guessed)).outcome.results;
  for (const sa of a.scenarios) {
    const sb = b.scenarios.find((s) => s.name === sa.name)!;
    for (const p of pairs) {
      // Same rows, same arithmetic: exactly the same doubles.
      expect(sb.runs.map((r) => r.measures[p.guessed].value), `${sa.name} / ${p.example}`).toEqual(sa.runs.map((r) => r.measures[p.example].value));
      const { mean, sd, half_width } = sa.summary[p.example];
      expect(sb.summary[p.guessed], `${sa.name} / ${p.example}`).toMatchObject({ mean, sd, half_width });
    }
  }
}

/** The example's manifest text, placed beside the generated runs, with the given edits. */
async function exampleStudy(dir: string, file: string, edits: [string, string][]): Promise<Study> {
  let text = readFileSync(join(EXAMPLES, file), "utf8");
  for (const [from, to] of edits) {
    expect(text).toContain(from);
    text = text.split(from).join(to);
  }
  writeFileSync(join(dir, "example.yaml"), text);
  return loadStudy(join(dir, "example.yaml"));
}

describe("initStudy on the examples' runs", () => {
  it("ferry check-in: the manifest loads, `sojourn check` accepts it, and every example measure is guessed with the same numbers", async () => {
    const dir = await writeRuns(
      FERRY.scenarios.flatMap((sc) =>
        [1, 2, 3].map((k) => ({ scenario: sc.name, id: `rep-0${k}`, rows: simulateQueue({ arrivalRate: FERRY.arrivalRate, serviceRate: FERRY.serviceRate, servers: sc.servers, horizon: 120, seed: 1000 + k, decimals: 3 }) })),
      ),
    );
    const r = await initStudy(join(dir, "runs"));
    expect(resolve(r.manifest)).toBe(join(dir, "study.yaml"));
    // Computed by hand: the last rows lie in (110, 120], and 120 is the round number above them.
    expect(r.text).toMatch(/end: 120 {3}# CHECK/);
    const guessed = await loadStudy(r.manifest);
    // The example's fixed warm-up is the analyst's choice, which init does not guess: left out on both sides.
    const example = await exampleStudy(dir, "ferry-check-in/ferry.yaml", [["end: 480", "end: 120"], ["warmup: 30\n", ""]]);
    await expectSameNumbers(example, guessed, ["lane_queue", "booth_use", "check_wait", "vehicles_done", "in_terminal", "time_in_terminal"]);
    const check = sojourn(["check", r.manifest]);
    expect(check.status, check.stderr).toBe(0); // CONTRACT.md section 7: check validates without error
  });

  it("bakery: the capacity series and the enter/leave events are found; same numbers as the example", async () => {
    const dir = await writeRuns(BAKERY.scenarios.flatMap((sc, s) => [1, 2, 3].map((k) => ({ scenario: sc.name, id: `day-0${k}`, rows: simulateBakery(s, k) }))));
    const r = await initStudy(join(dir, "runs"));
    expect(r.text).toContain("capacity: staff"); // CONTRACT.md section 2: capacity as a series
    expect(r.text).toContain("from: {enter: enter, leave: leave}");
    const example = await exampleStudy(dir, "bakery/bakery.yaml", []);
    await expectSameNumbers(example, await loadStudy(r.manifest), ["counter_use", "clerks_on_shift", "queue", "in_shop", "time_in_shop", "basket", "customers"]);
  });

  it("bike repair: one run per scenario gives batch means and an MSER-5 warm-up; same numbers as the example", async () => {
    const dir = await writeRuns(BIKE_SHOP.scenarios.map((sc, s) => ({ scenario: sc.name, id: "long-run", rows: simulateBikeShop(s, 2000) })));
    const r = await initStudy(join(dir, "runs"));
    expect(r.text).toContain("analysis: {method: batch-means, batches: 20}");
    // Computed by hand: end 2000, slice = 2000 / 200 = 10.
    expect(r.text).toContain("warmup: {method: mser-5, measure: bench, slice: 10}");
    const example = await exampleStudy(dir, "bike-repair/bike-repair.yaml", [["end: 20000", "end: 2000"], ["slice: 100", "slice: 10"]]);
    await expectSameNumbers(example, await loadStudy(r.manifest), ["bench", "mechanic_use", "repair", "bikes_in_shop", "time_in_shop", "bikes_returned"]);
  });

  it("reads only the first rows of a long file: row counts are of the part read, and the end comes from the file's tail", async () => {
    const dir = await writeRuns([{ scenario: "only", id: "long", rows: simulateBikeShop(0, 2000) }]);
    const r = await initStudy(join(dir, "runs"), { headRows: 1000 });
    expect(r.scan.cut).toBe(true);
    expect(r.scan.series.reduce((n, s) => n + s.rows, 0)).toBe(1000);
    expect(r.text).toContain("end: 2000"); // common practice: the run's end is its last row, not the last row read
  });
});

describe("initStudy on mixed and broken files", () => {
  const good = "time,series,value,entity\n0,queue,0,\n1,queue,1,\n2,queue,2,\n2.5,arrive,,a1\n3,queue,1,\n4.5,depart,,a1\n";
  function mixedFolder(): string {
    const dir = mkdtempSync(join(tmpdir(), "sojourn-init-"));
    mkdirSync(join(dir, "runs"));
    writeFileSync(join(dir, "runs", "rep-1.csv"), good);
    writeFileSync(join(dir, "runs", "rep-2.csv"), good);
    writeFileSync(join(dir, "runs", "notes.txt"), "not a run\n");
    writeFileSync(join(dir, "runs", "no-time.csv"), "series,value\nqueue,1\n");
    writeFileSync(join(dir, "runs", "empty.csv"), "");
    return dir;
  }

  it("skips each bad file with the reason, lists them in the manifest, and the manifest still loads", async () => {
    const dir = mixedFolder();
    const seen: string[] = [];
    const r = await initStudy(join(dir, "runs"), { onSkip: (s) => seen.push(s.display) });
    const reason = (suffix: string) => r.scan.skipped.find((s) => s.display.endsWith(suffix));
    // CONTRACT.md section 1: the format is chosen by extension; a missing column or an empty file is an input error.
    expect(reason("notes.txt")?.reason).toBe(initMessages.skipExtension(RUN_EXTENSIONS));
    const noTime = reason("no-time.csv")!;
    // A file with no time column fits no layout of CONTRACT.md section 9: skipped with what was seen.
    expect(noTime.reason).toBe(initMessages.skipNoLayout('no column works as the time: "value" has no other number column beside it; and no text column of repeating values (a series) nor an id column with event times was found'));
    const empty = reason("empty.csv")!;
    expect(empty.reason).toBe(initMessages.skipUnreadable(empty.display, ingestMessages.emptyFile(empty.display, "csv").message));
    expect(seen.sort()).toEqual(r.scan.skipped.map((s) => s.display).sort());
    for (const s of r.scan.skipped) expect(r.text).toContain(`#   ${s.display}: ${s.reason}`);
    const study = await loadStudy(r.manifest);
    expect(study.scenarios[0].runs.map((x) => x.id)).toEqual(["rep-1", "rep-2"]);
    // Computed by hand: queue 0,1,2,1 changes by 1 each time (a level); arrive/depart one entity, in order.
    expect(study.scenarios[0].measures.map(identity)).toEqual(["level queue", "count arrive", "count depart", 'level {"type":"entities","enter":"arrive","leave":"depart"}', 'observation {"type":"entities","start":"arrive","end":"depart"}']);
  });

  it("the CLI prints what it skipped and why, and the next commands", async () => {
    const dir = mixedFolder();
    const out = join(dir, "mine.yaml");
    const r = sojourn(["init", join(dir, "runs"), "--out", out]);
    expect(r.status, r.stderr).toBe(0);
    expect(r.stderr).toContain(initMessages.skipExtension(RUN_EXTENSIONS));
    expect(r.stdout).toContain(`sojourn check ${out}`);
    expect(r.stdout).toContain(`sojourn report ${out} --out report`);
    expect(sojourn(["check", out]).status).toBe(0);
  });

  it("refuses to overwrite a manifest without --force (exit 1), and replaces it with --force", async () => {
    const dir = mixedFolder();
    const out = join(dir, "study.yaml");
    writeFileSync(out, "# mine\n");
    const refused = sojourn(["init", join(dir, "runs"), "--out", out]);
    // CONTRACT.md section 5: an input error exits 1 with a message, no stack trace.
    expect(refused.status).toBe(1);
    expect(refused.stderr).toBe(`sojourn: ${initMessages.manifestExists(out).message}\n`);
    expect(readFileSync(out, "utf8")).toBe("# mine\n");
    await expect(initStudy(join(dir, "runs"), { out })).rejects.toThrow(initMessages.manifestExists(out).message);
    expect(sojourn(["init", join(dir, "runs"), "--out", out, "--force"]).status).toBe(0);
    expect(readFileSync(out, "utf8")).toContain("kind: level");
  });

  it("a folder with no readable run file is an error naming the folder (exit 1)", () => {
    const dir = mkdtempSync(join(tmpdir(), "sojourn-init-"));
    writeFileSync(join(dir, "empty.csv"), "");
    const r = sojourn(["init", dir, "--out", join(dir, "s.yaml")]);
    expect(r.status).toBe(1); // CONTRACT.md section 5
    expect(r.stderr).toContain(initMessages.noRunFiles(dir, 1).message);
    expect(sojourn(["init", join(dir, "nowhere")]).stderr).toContain(initMessages.runsDirNotFound(join(dir, "nowhere")).message);
  });
});

describe("niceUp", () => {
  it("rounds up to two significant digits (computed by hand)", () => {
    expect([479.722, 600, 9987, 0.213, 19998.8257, 1201].map(niceUp)).toEqual([480, 600, 10000, 0.22, 20000, 1300]);
  });
});

describe("examples/ferry-check-in/ferry.yaml", () => {
  it("is the demo's manifest (common practice: an example is what it says it is)", async () => {
    const dir = mkdtempSync(join(tmpdir(), "sojourn-init-"));
    const demo = readFileSync(await writeFerryStudy(dir), "utf8");
    const example = readFileSync(join(EXAMPLES, "ferry-check-in", "ferry.yaml"), "utf8");
    const body = (t: string) => t.split("\n").filter((l) => !l.startsWith("#")).join("\n");
    expect(body(example)).toBe(body(demo));
  });
});
