/**
 * `sojourn init` on the three layouts of CONTRACT.md section 9: the layout and columns it
 * recognises from CSV and Parquet, attributes against times, files it cannot place, and the
 * ferry example's entity and level tables giving the same numbers as the hand-written layout
 * manifests (examples/ferry-check-in/layouts/).
 */
import { mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { FERRY } from "../../src/demo/ferry.js";
import { queueAsEntities, queueAsLevels } from "../../src/demo/layouts.js";
import { simulateQueue } from "../../src/demo/queue.js";
import { initStudy } from "../../src/init/initStudy.js";
import { ColumnProfile, guessLayout } from "../../src/init/layoutGuess.js";
import { mostAtOnce } from "../../src/init/readLayoutHead.js";
import { loadStudy } from "../../src/manifest/loadStudy.js";
import { initMessages } from "../../src/messages/index.js";
import { runStudy } from "../../src/study/runStudy.js";
import { sojourn } from "../helpers/cli.js";
import { parquetFile } from "../helpers/parquet.js";

const EXAMPLES = join(import.meta.dirname, "..", "..", "examples");
const made: string[] = [];
afterAll(() => made.forEach((d) => rmSync(d, { recursive: true, force: true })));

function folder(): string {
  const dir = mkdtempSync(join(tmpdir(), "sojourn-init-layouts-"));
  made.push(dir);
  return dir;
}

/** Simple CSV text (no quotes) as a Parquet file: number columns DOUBLE, others STRING, empty cells null. */
function csvAsParquet(text: string): Buffer {
  const [head, ...lines] = text.trim().split("\n");
  const names = head.split(",");
  const rows = lines.map((l) => l.split(","));
  return parquetFile(
    names.map((name, k) => {
      const cells = rows.map((r) => (r[k] === undefined || r[k] === "" ? null : r[k]));
      const numeric = cells.every((c) => c === null || Number.isFinite(Number(c)));
      return numeric ? { name, data: cells.map((c) => (c === null ? null : Number(c))), type: "DOUBLE" as const } : { name, data: cells, type: "STRING" as const };
    }),
  );
}

/** The ferry runs (3 per scenario, 120 min) in one layout, under DIR/runs-<layout>/<scenario>/rep-0k.csv. */
function ferryRuns(dir: string, layout: "entities" | "levels"): void {
  for (const sc of FERRY.scenarios) {
    mkdirSync(join(dir, `runs-${layout}`, sc.name), { recursive: true });
    for (const k of [1, 2, 3]) {
      const rows = [...simulateQueue({ arrivalRate: FERRY.arrivalRate, serviceRate: FERRY.serviceRate, servers: sc.servers, horizon: 120, seed: 1000 + k, decimals: 3 })];
      writeFileSync(join(dir, `runs-${layout}`, sc.name, `rep-0${k}.csv`), layout === "entities" ? queueAsEntities(rows) : queueAsLevels(rows));
    }
  }
}

/** Runs both manifests and expects each pair of measures (example name, init name) to give the same run values and summaries. */
async function sameNumbers(example: string, guessed: string, pairs: [string, string][]): Promise<void> {
  const a = (await runStudy(await loadStudy(example))).outcome.results;
  const b = (await runStudy(await loadStudy(guessed))).outcome.results;
  for (const sa of a.scenarios) {
    const sb = b.scenarios.find((s) => s.name === sa.name)!;
    for (const [x, y] of pairs) {
      const va = sa.runs.map((r) => r.measures[x].value as number);
      const vb = sa.runs.map((r) => sb.runs.find((q) => q.id === r.id)!.measures[y].value as number);
      // Same rows read the same way: equal to 1e-12 (in fact the same doubles).
      vb.forEach((v, i) => expect(Math.abs(v - va[i]), `${sa.name} ${x} / ${y} run ${i}`).toBeLessThanOrEqual(1e-12));
      expect(Math.abs((sb.summary[y].mean ?? NaN) - (sa.summary[x].mean ?? NaN))).toBeLessThanOrEqual(1e-12);
      expect(Math.abs((sb.summary[y].half_width ?? NaN) - (sa.summary[x].half_width ?? NaN))).toBeLessThanOrEqual(1e-12);
    }
  }
}

/** The example's layout manifest beside the generated runs: end 120, no fixed warm-up (init guesses none). */
function exampleManifest(dir: string, file: string): string {
  let text = readFileSync(join(EXAMPLES, "ferry-check-in", "layouts", file), "utf8");
  for (const [from, to] of [["end: 480", "end: 120"], ["warmup: 30\n", ""]]) {
    expect(text).toContain(from);
    text = text.split(from).join(to);
  }
  writeFileSync(join(dir, file), text);
  return join(dir, file);
}

describe("initStudy on the ferry example's other layouts", () => {
  it("entity table: layout entities, id column, the event pairs, a count of the last event and the booths' utilization; same numbers as ferry-entities.yaml", async () => {
    const dir = folder();
    ferryRuns(dir, "entities");
    const r = await initStudy(join(dir, "runs-entities"), { out: join(dir, "guessed.yaml") });
    expect(r.text).toContain("layout: entities");
    expect(r.text).toContain("columns: {entity: id}");
    expect(r.text).toContain('# times: "arrive" <= "start" <= "depart" on every row read');
    // The most vehicles in service at once is the number of booths once the queue has formed (2 and 3, CONTRACT.md section 9 example).
    expect(r.text).toContain("start_to_depart_use: {capacity: 2}");
    expect(r.text).not.toContain("series: arrive}"); // only the last event column is counted
    await sameNumbers(exampleManifest(dir, "ferry-entities.yaml"), r.manifest, [
      ["lane_queue", "n_arrive_to_start"],
      ["check_wait", "time_arrive_to_start"],
      ["vehicles_done", "depart_count"],
      ["in_terminal", "n_arrive_to_depart"],
      ["time_in_terminal", "time_arrive_to_depart"],
      ["booth_use", "start_to_depart_use"],
    ]);
    const report = sojourn(["report", r.manifest, "--out", join(dir, "report")]);
    expect(report.status, report.stderr).toBe(0); // CONTRACT.md section 7: report on the written manifest runs
  });

  it("table of levels: layout levels, the time column, a level per column and the busy booths' utilization; same numbers as ferry-levels.yaml", async () => {
    const dir = folder();
    ferryRuns(dir, "levels");
    const r = await initStudy(join(dir, "runs-levels"), { out: join(dir, "guessed.yaml") });
    expect(r.text).toContain("layout: levels");
    expect(r.text).toContain("columns: {time: time}");
    await sameNumbers(exampleManifest(dir, "ferry-levels.yaml"), r.manifest, [
      ["lane_queue", "queue"],
      ["booth_use", "busy_use"],
    ]);
  });
});

// Computed by hand for each table below.
const renamed = "t,kind,amount,who\n0,queue,0,\n1,arrive,,c1\n1,queue,1,\n2,queue,2,\n2.5,arrive,,c2\n3,depart,,c1\n3,queue,1,\n4.5,depart,,c2\n4.5,queue,0,\n";
const entities = "id,arrived,started,left,server\n1,0.53,0.53,1.20,0\n2,0.90,1.20,2.04,1\n3,1.10,2.04,2.50,0\n4,1.70,2.50,3.10,1\n5,2.20,3.10,,0\n";
const levels = "clock,queue,busy\n0,0,0\n0.5,1,\n0.7,,1\n1.2,2,\n1.9,1,\n2.4,,0\n3.0,0,\n";

describe("initStudy recognises each layout from CSV and from Parquet", () => {
  for (const format of ["csv", "parquet"] as const) {
    const write = (path: string, text: string) => writeFileSync(path, format === "csv" ? text : csvAsParquet(text));

    it(`${format}: an event table under other names gets a columns mapping (t, kind, amount, who)`, async () => {
      const dir = folder();
      mkdirSync(join(dir, "runs"));
      // Two runs, so that init guesses no warm-up (one run gets MSER-5 and batch means).
      for (const id of ["rep-1", "rep-2"]) write(join(dir, "runs", `${id}.${format}`), renamed);
      const r = await initStudy(join(dir, "runs"));
      expect(r.scan.layout.layout).toBe("events");
      expect(r.text).toContain("columns: {time: t, series: kind, value: amount, entity: who}   # GUESS");
      const study = await loadStudy(r.manifest);
      expect(study.scenarios[0].columns).toEqual({ time: "t", series: "kind", value: "amount", entity: "who" });
      expect(r.text).toContain("from: {enter: arrive, leave: depart}");
      const report = sojourn(["report", r.manifest, "--out", join(dir, "report")]);
      expect(report.status, report.stderr).toBe(0);
      // end: the last row, 4.5 (already round). queue 0,1,2,1 over [0,1),[1,2),[2,3),[3,4.5): area 0+1+2+1.5 = 4.5 over 4.5 -> 1
      expect(r.text).toContain("end: 4.5   # CHECK");
      const results = JSON.parse(readFileSync(join(dir, "report", "results.json"), "utf8"));
      expect(results.scenarios[0].runs[0].measures.queue.mean).toBeCloseTo(1, 12);
    });

    it(`${format}: an entity table: id, event columns in per-row order, and a column of few values as an attribute with a where suggestion`, async () => {
      const dir = folder();
      mkdirSync(join(dir, "runs"));
      write(join(dir, "runs", `rep-1.${format}`), entities);
      const r = await initStudy(join(dir, "runs"));
      const g = r.scan.layout;
      expect(g.layout).toBe("entities");
      if (g.layout !== "entities") return;
      expect(g.entity).toBe("id");
      expect(g.events).toEqual(["arrived", "started", "left"]);
      expect(g.attributes.map((a) => a.name)).toEqual(["server"]);
      expect(r.text).toContain("#   where: {server:");
      // Customer 5 started at 3.10 and never left: censored, yet the rows are in order on every row read.
      expect(r.text).toContain('# times: "arrived" <= "started" <= "left" on every row read');
      const report = sojourn(["report", r.manifest, "--out", join(dir, "report")]);
      expect(report.status, report.stderr).toBe(0);
    });

    it(`${format}: a table of levels whose time column is not called time`, async () => {
      const dir = folder();
      mkdirSync(join(dir, "runs"));
      write(join(dir, "runs", `rep-1.${format}`), levels);
      const r = await initStudy(join(dir, "runs"));
      const g = r.scan.layout;
      expect(g.layout).toBe("levels");
      if (g.layout !== "levels") return;
      expect(g.time).toBe("clock");
      expect(g.levels).toEqual(["queue", "busy"]);
      expect(r.text).toContain("columns: {time: clock}");
      expect(r.text).toContain("- {name: busy_use, kind: utilization, series: busy, capacity: 1}");
      const report = sojourn(["report", r.manifest, "--out", join(dir, "report")]);
      expect(report.status, report.stderr).toBe(0);
    });
  }
});

describe("guessLayout: attributes, times and what it cannot tell", () => {
  const profile = (text: string): ColumnProfile => {
    const [head, ...lines] = text.trim().split("\n");
    const p = new ColumnProfile();
    lines.forEach((l, i) => p.add(head.split(","), l.split(",").map((c) => (c === "" ? null : c)), i + 2));
    return p;
  };

  it("a text column of few repeating values beside an id and times is an attribute, not a series", () => {
    const g = guessLayout(profile("id,arrived,left,class\na,1,2,gold\nb,1.5,3,basic\nc,2.5,4,gold\nd,3.2,5.5,basic\n"));
    expect(g.layout).toBe("entities");
    expect(g.layout === "entities" && g.attributes).toEqual([{ name: "class", values: ["gold", "basic"] }]);
  });

  it("two time columns not ordered on every row are no entity table (rule 1 of layoutGuess.ts)", () => {
    // Row 3: left (1.0) before arrived (1.5). "arrived" never decreases, so rule 3 reads a table of levels.
    const g = guessLayout(profile("id,arrived,left\na,1,2\nb,1.5,1.0\nc,2.5,4\n"));
    expect(g.layout).toBe("levels");
    const ordered = guessLayout(profile("id,arrived,left\na,1,2\nb,1.5,1.6\nc,2.5,4\n"));
    expect(ordered.layout).toBe("entities");
  });

  it("a table with no column that works as a time is not recognised, and says why", () => {
    const g = guessLayout(profile("name,colour\na,red\nb,blue\n"));
    expect(g).toEqual({ layout: null, why: "no column holds only numbers, so there is no time" });
  });

  it("mostAtOnce: a leave and an enter at the same time do not overlap (computed by hand)", () => {
    expect(mostAtOnce([0, 1, 2], [2, 3])).toBe(2);
    expect(mostAtOnce([0, 0, 0], [])).toBe(3);
  });
});

describe("sojourn init on files it cannot place", () => {
  it("files of different layouts in one folder: exit 1 naming both files and layouts, no manifest written", () => {
    const dir = folder();
    mkdirSync(join(dir, "runs"));
    writeFileSync(join(dir, "runs", "a.csv"), entities);
    writeFileSync(join(dir, "runs", "b.csv"), levels);
    const out = join(dir, "study.yaml");
    const r = sojourn(["init", join(dir, "runs"), "--out", out]);
    expect(r.status).toBe(1); // CONTRACT.md section 5: an input error exits 1, no stack trace
    expect(r.stderr).toContain("looks like a table of levels");
    expect(r.stderr).toContain("looks like one row per entity");
    expect(r.stderr).not.toMatch(/\n\s+at /);
    expect(() => readFileSync(out)).toThrow();
  });

  it("a file of no recognised layout is skipped with the reason; with nothing left, exit 1", () => {
    const dir = folder();
    writeFileSync(join(dir, "names.csv"), "name,colour\na,red\nb,blue\n");
    const r = sojourn(["init", dir, "--out", join(dir, "s.yaml")]);
    expect(r.status).toBe(1);
    expect(r.stderr).toContain(initMessages.skipNoLayout("no column holds only numbers, so there is no time"));
    expect(r.stderr).toContain(initMessages.noRunFiles(dir, 1).message);
  });
});
