import { writeFileSync } from "node:fs";
import { join } from "node:path";
import { afterEach, describe, expect, test } from "vitest";
import { loadStudy } from "../../src/manifest/loadStudy.js";
import type { LevelMeasure, ObservationMeasure, UtilizationMeasure } from "../../src/manifest/types.js";
import { RUN_FILES, removeFolder, studyFolder } from "./helpers.js";

const folders: string[] = [];
function folder(files: Record<string, string> = RUN_FILES): string {
  const dir = studyFolder(files);
  folders.push(dir);
  return dir;
}
afterEach(() => {
  while (folders.length > 0) removeFolder(folders.pop() as string);
});

/** The example manifest of CONTRACT.md section 6, with the run folders renamed to this test's. */
const CONTRACT_EXAMPLE = `version: 1
title: Ferry check-in, two booths against three
time_unit: min
confidence: 0.95
warmup: 30
scenarios:
  - name: two-booths
    end: 600
    runs: runs/two/*.csv     # a glob, a list of paths, or a list of {path, end, start}
  - name: three-booths
    end: 600
    runs: runs/three/*.csv
measures:
  - {name: lane_queue, kind: level, series: queue}
  - {name: booth_use, kind: utilization, series: busy, capacity: 2}
  - {name: check_wait, kind: observation, series: wait}
  - {name: vehicles_done, kind: count, series: depart}
  - {name: in_terminal, kind: level, from: {enter: arrive, leave: depart}}
  - {name: time_in_terminal, kind: observation, from: {start: arrive, end: depart}}
`;

describe("loadStudy: normalization", () => {
  test("loadStudy normalizes the contract's example manifest with every default filled", async () => {
    const dir = folder();
    const path = join(dir, "ferry.yaml");
    writeFileSync(path, CONTRACT_EXAMPLE);
    const study = await loadStudy(path);

    // CONTRACT.md section 6: the keys as written.
    expect(study.title).toBe("Ferry check-in, two booths against three");
    expect(study.timeUnit).toBe("min");
    expect(study.confidence).toBe(0.95);
    expect(study.warmup).toEqual({ type: "fixed", time: 30 });
    expect(study.manifestPath).toBe(path);
    expect(study.manifestText).toBe(CONTRACT_EXAMPLE);
    expect(study.measureNames).toEqual(["lane_queue", "booth_use", "check_wait", "vehicles_done", "in_terminal", "time_in_terminal"]);
    expect(study.comparisons).toEqual([]);
    expect(study.tables).toEqual({ maxRows: 5000, edgeRows: 500 }); // brief: table defaults
    expect(study.scenarios.map((s) => s.name)).toEqual(["two-booths", "three-booths"]);

    const two = study.scenarios[0];
    // CONTRACT.md section 1: run id = file name without extensions; section 6: paths relative to the manifest's folder.
    expect(two.runs).toEqual([
      { id: "rep-01", path: join(dir, "runs/two/rep-01.csv"), file: "runs/two/rep-01.csv", start: 0, end: 600 },
      { id: "rep-02", path: join(dir, "runs/two/rep-02.csv"), file: "runs/two/rep-02.csv", start: 0, end: 600 },
    ]);
    expect(two.warmup).toEqual({ type: "fixed", time: 30 }); // the study's warm-up applies to each scenario
    expect(two.analysis).toEqual({ type: "replications" }); // brief: default analysis
    expect(two.columns).toEqual({ time: "time", series: "series", value: "value", entity: "entity" }); // CONTRACT.md section 1
    // CONTRACT.md section 2 and the brief's defaults (initial 0, quantiles [0.5, 0.9, 0.95], target null; label the name, unit by kind).
    expect(two.measures).toEqual([
      { kind: "level", name: "lane_queue", target: null, label: "lane_queue", unit: null, where: null, source: { type: "series", series: "queue" }, initial: 0, atLeast: [] },
      { kind: "utilization", name: "booth_use", target: null, label: "booth_use", unit: "fraction", where: null, source: { type: "series", series: "busy" }, initial: 0, capacity: { type: "constant", value: 2 }, atLeast: [] },
      { kind: "observation", name: "check_wait", target: null, label: "check_wait", unit: null, where: null, source: { type: "series", series: "wait" }, quantiles: [0.5, 0.9, 0.95], within: [] },
      { kind: "count", name: "vehicles_done", target: null, label: "vehicles_done", unit: null, where: null, series: "depart" },
      { kind: "level", name: "in_terminal", target: null, label: "in_terminal", unit: null, where: null, source: { type: "entities", enter: "arrive", leave: "depart" }, initial: 0, atLeast: [] },
      {
        kind: "observation",
        name: "time_in_terminal",
        target: null,
        label: "time_in_terminal",
        unit: "min", // a duration: the study's time unit (docs/manifest.md, label and unit)
        where: null,
        source: { type: "entities", start: "arrive", end: "depart" },
        quantiles: [0.5, 0.9, 0.95],
        within: [],
      },
    ]);
  });

  test("loadStudy fills the defaults of a minimal manifest (title from the file name, time unit, confidence, no warm-up)", async () => {
    const dir = folder();
    const path = join(dir, "bakery.v2.yml");
    writeFileSync(path, "scenarios:\n  - {name: s, runs: runs/two/rep-01.csv}\nmeasures:\n  - {name: loaves, kind: count, series: sold}\n");
    const study = await loadStudy(path);
    expect(study.title).toBe("bakery.v2"); // brief: file name without its extension
    expect(study.timeUnit).toBe("time"); // brief
    expect(study.confidence).toBe(0.95); // CONTRACT.md section 4
    expect(study.warmup).toEqual({ type: "none" }); // brief
    // CONTRACT.md section 3: start defaults to 0; a count measure needs no end (its rate becomes null).
    expect(study.scenarios[0].runs[0]).toMatchObject({ start: 0, end: null });
  });

  test("loadStudy reads the optional study keys: columns merge key by key, analysis, tables, warm-up by MSER-5", async () => {
    const dir = folder();
    const text = `title: Bike repair
columns: {time: t, series: kind}
analysis: {method: batch-means, batches: 20}
tables: {max_rows: 100, edge_rows: 10}
warmup: {method: mser-5, measure: bench_queue, slice: 5}
scenarios:
  - name: one-mechanic
    end: 480
    columns: {value: v}
    runs: runs/two/*.csv
  - name: two-mechanics
    end: 480
    warmup: 60
    analysis: {method: replications}
    runs: runs/three/*.csv
measures:
  - {name: bench_queue, kind: level, series: queue, initial: 2, at_least: [1, 3], target: {relative: 0.05}}
  - {name: repair_time, kind: observation, series: repair, quantiles: [0.25], within: [30], target: {half_width: 2}}
compare:
  - {measure: repair_time, scenarios: [one-mechanic, two-mechanics], method: paired}
  - {measure: bench_queue, scenarios: [two-mechanics, one-mechanic]}
`;
    const study = await loadStudy(join(dir, "bikes.yaml"), { text });
    const [one, two] = study.scenarios;
    expect(one.columns).toEqual({ time: "t", series: "kind", value: "v", entity: "entity" }); // brief: partial, scenario overrides
    expect(two.columns).toEqual({ time: "t", series: "kind", value: "value", entity: "entity" });
    expect(one.analysis).toEqual({ type: "batch-means", batches: 20 }); // brief: scenarios may override
    expect(two.analysis).toEqual({ type: "replications" });
    expect(study.tables).toEqual({ maxRows: 100, edgeRows: 10 });
    expect(study.warmup).toEqual({ type: "mser-5", measure: "bench_queue", slice: 5 });
    expect(one.warmup).toEqual({ type: "mser-5", measure: "bench_queue", slice: 5 });
    expect(two.warmup).toEqual({ type: "fixed", time: 60 });
    const queue = one.measures[0] as LevelMeasure;
    expect(queue).toMatchObject({ initial: 2, atLeast: [1, 3], target: { type: "relative", value: 0.05 } });
    const repair = one.measures[1] as ObservationMeasure;
    expect(repair).toMatchObject({ quantiles: [0.25], within: [30], target: { type: "half_width", value: 2 } });
    expect(study.comparisons).toEqual([
      { measure: "repair_time", a: "one-mechanic", b: "two-mechanics", method: "paired" },
      { measure: "bench_queue", a: "two-mechanics", b: "one-mechanic", method: "welch" }, // docs/manifest.md: welch is the default
    ]);
  });

  test("loadStudy applies both override forms, and the scenario's measures: entry wins key by key", async () => {
    const dir = folder();
    const text = `scenarios:
  - name: two-booths
    end: 600
    runs: runs/two/*.csv
    measures:
      booth_use: {capacity: 2}
  - name: three-booths
    end: 600
    runs: runs/three/*.csv
    measures:
      booth_use: {capacity_initial: 1}
  - name: open-booths
    end: 600
    runs: runs/odd/*.csv
measures:
  - name: booth_use
    kind: utilization
    series: busy
    capacity: 4
    target: {relative: 0.1}
    scenarios:
      two-booths: {capacity: 9, initial: 1}
      three-booths: {capacity: open_booths}
`;
    const study = await loadStudy(join(dir, "ferry.yaml"), { text });
    const use = study.scenarios.map((s) => s.measures[0] as UtilizationMeasure);
    // brief: the scenario's measures: entry wins over the measure's scenarios: entry (capacity 2, not 9); other keys still merge.
    expect(use[0]).toMatchObject({ capacity: { type: "constant", value: 2 }, initial: 1, target: { type: "relative", value: 0.1 } });
    // brief: capacity may be a series name; capacity_initial comes from the other override form.
    expect(use[1]).toMatchObject({ capacity: { type: "series", series: "open_booths", initial: 1 }, initial: 0 });
    // No override: the definition as written.
    expect(use[2]).toMatchObject({ capacity: { type: "constant", value: 4 }, initial: 0 });
  });

  test("loadStudy expands globs sorted by relative path in code-unit order, keeps list order, and lets a run override its window", async () => {
    const csv = "time,series,value\n";
    // Written in an order unlike the sorted one, so directory order cannot pass for sorting.
    const dir = folder({ "runs/b.csv": csv, "runs/sub/c.csv.gz": "", "runs/a.csv": csv, "runs/B.csv": csv, "extra/z-last.jsonl": "", "other/copy.csv": csv });
    const text = `scenarios:
  - name: s
    start: 5
    end: 100
    runs:
      - extra/z-last.jsonl
      - runs/**/*
      - {path: other/copy.csv, start: 10, end: 50}
measures:
  - {name: n, kind: count, series: arrive}
`;
    const study = await loadStudy(join(dir, "s.yaml"), { text });
    const runs = study.scenarios[0].runs;
    // brief: list order kept; within a glob, code-unit order ("B" < "a" < "b" < "sub/...").
    expect(runs.map((r) => r.file)).toEqual(["extra/z-last.jsonl", "runs/B.csv", "runs/a.csv", "runs/b.csv", "runs/sub/c.csv.gz", "other/copy.csv"]);
    expect(runs.map((r) => r.id)).toEqual(["z-last", "B", "a", "b", "c", "copy"]); // CONTRACT.md section 1
    expect(runs.every((r) => r.path === join(dir, r.file))).toBe(true); // brief: path absolute, file relative with "/"
    expect(runs[0]).toMatchObject({ start: 5, end: 100 }); // the scenario's window
    expect(runs[5]).toMatchObject({ start: 10, end: 50 }); // brief: a run's start/end override the scenario's
  });

  test("loadStudy reads a JSON manifest (JSON is YAML)", async () => {
    const dir = folder();
    const manifest = {
      title: "Ferry",
      scenarios: [{ name: "two-booths", end: 600, runs: ["runs/two/rep-01.csv", "runs/two/rep-02.csv"] }],
      measures: [{ name: "lane_queue", kind: "level", series: "queue" }],
    };
    const path = join(dir, "ferry.json");
    writeFileSync(path, JSON.stringify(manifest, null, "\t"));
    const study = await loadStudy(path);
    expect(study.title).toBe("Ferry"); // CONTRACT.md section 6: YAML or JSON
    expect(study.scenarios[0].runs.map((r) => r.id)).toEqual(["rep-01", "rep-02"]);
  });

  test("loadStudy with text and baseDir options reads no manifest file and resolves runs against baseDir", async () => {
    const dir = folder();
    const text = "scenarios:\n  - {name: s, end: 10, runs: two/*.csv}\nmeasures:\n  - {name: q, kind: level, series: queue}\n";
    // The manifest file does not exist: `text` stands in for it (brief).
    const study = await loadStudy(join(dir, "nowhere", "virtual.yaml"), { text, baseDir: join(dir, "runs") });
    expect(study.manifestText).toBe(text);
    expect(study.title).toBe("virtual");
    expect(study.scenarios[0].runs.map((r) => r.file)).toEqual(["two/rep-01.csv", "two/rep-02.csv"]); // relative to baseDir
    expect(study.scenarios[0].runs[0].path).toBe(join(dir, "runs", "two", "rep-01.csv"));
  });
});
