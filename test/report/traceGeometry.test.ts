/**
 * The trace charts draw the data exactly: each chart is rendered by vega (the same compile as the
 * report's SVG) and its scenegraph is read back in pixels, then held against the run's full
 * calculation table (`sojourn table`): at many sampled times the step line and the shaded area
 * stand at the table's level, the running average at area so far over elapsed time, the warm-up
 * band spans [start, c], and on a long run a spike of one instant keeps its height.
 *
 * Reference values: the calculation table of the same run (contract section 4: value, from, to,
 * area, running_area), and the run rows the test itself wrote. Tolerance: one pixel (common
 * practice for a chart: what a reader can tell apart).
 */
import { describe, expect, it } from "vitest";
import { compile, type TopLevelSpec } from "vega-lite";
import { parse, View } from "vega";
import { studyOf } from "../helpers/runStudyFrom.js";
import { fullTable } from "../../src/study/fullTable.js";
import { traceChart, tracedAsBand } from "../../src/report/charts.js";
import type { LevelTrace } from "../../src/outcome/index.js";
import { uniform } from "../../src/demo/random.js";

const PIXEL = 1;

interface Item { x: number; y: number; x2?: number; y2?: number; width?: number; height?: number; interpolate?: string }
interface Scene { marktype?: string; name?: string; items?: (Scene & Item)[] }

async function render(spec: TopLevelSpec) {
  const view = new View(parse(compile(spec).spec), { renderer: "none" });
  await view.runAsync();
  const marks = new Map<string, Item[]>();
  const walk = (n: Scene) => {
    if (n.marktype !== undefined && n.name !== undefined && n.marktype !== "group") marks.set(n.name, (n.items ?? []) as Item[]);
    for (const c of n.items ?? []) walk(c);
  };
  walk((view.scenegraph() as unknown as { root: Scene }).root);
  const scales = Object.keys((view as unknown as { _runtime: { scales: Record<string, unknown> } })._runtime.scales);
  const scale = (name: string) => view.scale(name) as unknown as ((v: number) => number) & { invert(p: number): number };
  const yName = scales.find((s) => s.endsWith("y") && !s.startsWith("running_average"))!;
  const avgName = scales.find((s) => s.startsWith("running_average") && s.endsWith("y")) ?? yName;
  return { marks, x: scale("x"), y: scale(yName), yAvg: scale(avgName) };
}

/**
 * The y of a step-after line at pixel x: the last point at or left of x. The scenegraph holds the
 * line's points; the path between them follows the mark's interpolation, which must be step-after.
 */
function stepY(items: Item[], px: number): number {
  expect(items.every((it) => it.interpolate === "step-after")).toBe(true);
  let y = items[0].y;
  for (const it of items) {
    if (it.x <= px + 1e-9) y = it.y;
    else break;
  }
  return y;
}

/** The y of a straight-segment line at pixel x (linear between neighbouring points). */
function lineY(items: Item[], px: number): number {
  expect(items.every((it) => it.interpolate === undefined || it.interpolate === "linear")).toBe(true);
  for (let i = 1; i < items.length; i++) {
    const a = items[i - 1];
    const b = items[i];
    if (b.x >= px) return b.x === a.x ? b.y : a.y + ((b.y - a.y) * (px - a.x)) / (b.x - a.x);
  }
  return items[items.length - 1].y;
}

interface Row { value: number; from: number; to: number; area: number; running_area: number; capacity?: number; capacity_area?: number; running_capacity_area?: number }

function parseTable(csv: string): Row[] {
  const [head, ...lines] = csv.trim().split("\n");
  const cols = head.split(",");
  return lines.map((l) => Object.fromEntries(l.split(",").map((c, i) => [cols[i], Number(c)])) as unknown as Row);
}

/** The table row in effect at t (the last of zero-length ties): value holds on [from, to). */
function rowAt(rows: Row[], t: number): Row {
  let hit = rows[0];
  for (const r of rows) if (r.from <= t && (t < r.to || (t === r.to && r === rows[rows.length - 1]))) hit = r;
  return hit;
}

/** A random walk of a level: `n` changes with ties and gaps, times on a 0.01 grid. */
function walk(seed: number, n: number, end: number): { time: number; value: number }[] {
  const rand = uniform(seed);
  const out: { time: number; value: number }[] = [];
  let v = 3;
  for (let i = 0; i < n; i++) {
    const t = Math.round(rand() * end * 100) / 100;
    v = Math.max(0, v + (rand() < 0.5 ? -1 : 1));
    out.push({ time: t, value: v });
  }
  return out.sort((a, b) => a.time - b.time);
}

async function levelStudy(rows: { time: number; value: number; series?: string }[], manifestExtra: string, measures: string) {
  const csv = "time,series,value\n" + rows.map((r) => `${r.time},${r.series ?? "q"},${r.value}`).join("\n") + "\n";
  const manifest = `title: geometry\ntime_unit: min\n${manifestExtra}\nscenarios:\n  - {name: s, end: 500, runs: [runs/r1.csv, runs/r2.csv]}\nmeasures:\n${measures}\n`;
  return studyOf(manifest, { "runs/r1.csv": csv, "runs/r2.csv": csv });
}

function chartOf(tr: LevelTrace, utilization: boolean): TopLevelSpec {
  return traceChart({
    start: tr.start, from: tr.from, to: tr.to, warmup: tr.warmup, level: tr.level, capacity: tr.capacity,
    timeTitle: "time", valueTitle: "v", levelLabel: "level", capacityLabel: "capacity", averageLabel: "avg",
    averageTitle: utilization ? "running utilization" : null, warmupLabel: "warm-up",
  });
}

describe("trace chart geometry against the calculation table", () => {
  it("the step line and the shaded area stand at the table's level, the running average at area/elapsed, at hundreds of sampled times", async () => {
    for (const seed of [1, 2, 3]) {
      const rows = walk(seed, 150, 500);
      const { study, outcome } = await levelStudy(rows, "warmup: 40", "  - {name: q, kind: level, series: q}");
      const tr = outcome.traces[0];
      expect(tracedAsBand(tr)).toBe(false);
      const table = parseTable((await fullTable(study, { scenario: "s", run: "r1", measure: "q" }))[0].csv);
      const { marks, x, y, yAvg } = await render(chartOf(tr, false));
      const line = marks.get("level_line_marks")!;
      const area = marks.get("level_area_marks")!;
      const avg = marks.get("running_average_marks")!;
      expect(line.length).toBeGreaterThan(100);
      const rand = uniform(100 + seed);
      let checked = 0;
      for (let k = 0; k < 600; k++) {
        const t = 40 + rand() * 460;
        const px = x(t);
        // Skip the pixels next to a change point, where the step's vertical stroke stands.
        if (table.some((r) => Math.abs(x(r.from) - px) < 1.5)) continue;
        const r = rowAt(table, t);
        expect(Math.abs(stepY(line, px) - y(r.value))).toBeLessThanOrEqual(PIXEL);
        expect(Math.abs(stepY(area, px) - y(r.value))).toBeLessThanOrEqual(PIXEL);
        const running = (r.running_area - r.area + r.value * (t - r.from)) / (t - 40);
        expect(Math.abs(lineY(avg, px) - yAvg(running))).toBeLessThanOrEqual(PIXEL);
        checked++;
      }
      expect(checked).toBeGreaterThan(200);
      // The area is shaded down to zero.
      for (const it of area) expect(it.y2).toBeCloseTo(y(0), 6);
    }
  });

  it("the warm-up band spans [start, c] and the axis starts at the window start", async () => {
    for (const [start, warmup] of [[0, 40], [10, 125.5], [0, 300]] as const) {
      const rows = walk(7, 80, 500).filter((r) => r.time >= start);
      const { outcome } = await studyOf(
        `title: w\ntime_unit: min\nwarmup: ${warmup}\nscenarios:\n  - {name: s, start: ${start}, end: 500, runs: [runs/r1.csv]}\nmeasures:\n  - {name: q, kind: level, series: q}\n`,
        { "runs/r1.csv": "time,series,value\n" + rows.map((r) => `${r.time},q,${r.value}`).join("\n") + "\n" },
      );
      const tr = outcome.traces[0];
      const { marks, x } = await render(chartOf(tr, false));
      const band = marks.get("warmup_band_marks")!;
      expect(band).toHaveLength(1);
      expect(Math.abs(band[0].x - x(start))).toBeLessThanOrEqual(PIXEL);
      expect(Math.abs(band[0].x + band[0].width! - x(warmup))).toBeLessThanOrEqual(PIXEL);
      expect(x(start)).toBeCloseTo(0, 6);
      // The level during the warm-up is drawn too: the line starts at the window start.
      expect(marks.get("level_line_marks")![0].x).toBeCloseTo(x(start), 6);
    }
  });

  it("a spike of one instant in a long run keeps its height, and the axis covers the true minimum and maximum", async () => {
    for (const [spikeAt, spike] of [[313.37, 60], [2.5, 45], [499.99, 80]] as const) {
      // 6000 changes: more than a step line can draw one by one.
      const rows = walk(11, 6000, 500).map((r) => ({ ...r, value: Math.min(r.value, 12) }));
      const before = [...rows].reverse().find((r) => r.time <= spikeAt)?.value ?? 0;
      rows.push({ time: spikeAt, value: spike }, { time: spikeAt + 0.001, value: before });
      rows.sort((a, b) => a.time - b.time);
      const { outcome } = await levelStudy(rows, "", "  - {name: q, kind: level, series: q}");
      const tr = outcome.traces[0];
      expect(tracedAsBand(tr)).toBe(true);
      expect(tr.level.max).toBe(spike);
      const { marks, x, y } = await render(chartOf(tr, false));
      const band = marks.get("level_band_marks")!;
      const top = Math.min(...band.map((b) => b.y));
      expect(Math.abs(top - y(spike))).toBeLessThanOrEqual(PIXEL);
      const spikeRect = band.find((b) => Math.abs(b.y - y(spike)) <= PIXEL)!;
      expect(x(spikeAt)).toBeGreaterThanOrEqual(spikeRect.x - PIXEL);
      expect(x(spikeAt)).toBeLessThanOrEqual(spikeRect.x + spikeRect.width! + PIXEL);
      expect(y.invert(0) >= spike || y.invert(0) >= spike - 1e-9).toBe(true);
    }
  });

  it("a band's slices hold the lowest and highest level of the rows inside them", async () => {
    const rows = walk(5, 5000, 500);
    const { outcome } = await levelStudy(rows, "", "  - {name: q, kind: level, series: q}");
    const tr = outcome.traces[0];
    expect(tracedAsBand(tr)).toBe(true);
    // The level in effect on each stretch of positive length, from the rows (computed here).
    const pieces: { from: number; to: number; value: number }[] = [];
    let t = 0;
    let v = 0;
    for (const r of rows) {
      if (r.time > t) pieces.push({ from: t, to: r.time, value: v });
      t = Math.max(t, r.time);
      v = r.value;
    }
    if (500 > t) pieces.push({ from: t, to: 500, value: v });
    for (const s of tr.level.slices) {
      const inside = pieces.filter((p) => p.to > s.from && p.from < s.to && Math.min(p.to, s.to) > Math.max(p.from, s.from));
      expect(s.low).toBe(Math.min(...inside.map((p) => p.value)));
      expect(s.high).toBe(Math.max(...inside.map((p) => p.value)));
    }
  });

  it("a utilization chart draws the busy level against the capacity, and the running utilization is busy area over capacity area", async () => {
    const rand = uniform(21);
    const rows: { time: number; value: number; series: string }[] = [{ time: 0, value: 3, series: "cap" }];
    let busy = 0;
    for (let i = 0; i < 200; i++) {
      const time = Math.round(rand() * 50000) / 100;
      busy = Math.max(0, Math.min(3, busy + (rand() < 0.5 ? -1 : 1)));
      rows.push({ time, value: busy, series: "busy" });
      if (i % 40 === 0) rows.push({ time, value: 2 + (i % 80 === 0 ? 1 : 2), series: "cap" });
    }
    rows.sort((a, b) => a.time - b.time);
    const { study, outcome } = await levelStudy(rows, "warmup: 25", "  - {name: u, kind: utilization, series: busy, capacity: cap}");
    const tr = outcome.traces[0];
    expect(tr.capacity).not.toBeNull();
    const table = parseTable((await fullTable(study, { scenario: "s", run: "r1", measure: "u" }))[0].csv);
    const { marks, x, y, yAvg } = await render(chartOf(tr, true));
    const busyLine = marks.get("level_line_marks")!;
    const capLine = marks.get("capacity_line_marks")!;
    const avg = marks.get("running_average_marks")!;
    const r0 = uniform(22);
    let checked = 0;
    for (let k = 0; k < 300; k++) {
      const t = 25 + r0() * 475;
      const px = x(t);
      if (table.some((r) => Math.abs(x(r.from) - px) < 1.5)) continue;
      const r = rowAt(table, t);
      // Utilization table: value is the busy level, area the busy area.
      expect(Math.abs(stepY(busyLine, px) - y(r.value))).toBeLessThanOrEqual(PIXEL);
      expect(Math.abs(stepY(capLine, px) - y(r.capacity!))).toBeLessThanOrEqual(PIXEL);
      const runBusy = r.running_area - r.area + r.value * (t - r.from);
      const runCap = r.running_capacity_area! - r.capacity_area! + r.capacity! * (t - r.from);
      expect(Math.abs(lineY(avg, px) - yAvg(runBusy / runCap))).toBeLessThanOrEqual(PIXEL);
      checked++;
    }
    expect(checked).toBeGreaterThan(100);
    // The right axis reads the fraction from 0.
    expect(yAvg.invert(yAvg(0))).toBe(0);
  });
});
