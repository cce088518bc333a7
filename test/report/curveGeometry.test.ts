/**
 * The response-curve chart draws the data exactly: the chart is rendered by vega (the same compile
 * as the report's SVG), its scenegraph read back in pixels, and every dot, interval bar, end tick
 * and joining line held against the points it was given (each scenario's mean and interval).
 *
 * Reference values: the points the test itself passes in. Tolerance: one pixel (common practice for
 * a chart: what a reader can tell apart).
 */
import { describe, expect, it } from "vitest";
import { compile, type TopLevelSpec } from "vega-lite";
import { parse, View } from "vega";
import { type CurveChartPoint, responseCurveChart } from "../../src/report/charts.js";

const PIXEL = 1;

interface Item { x: number; y: number; y2?: number; yc?: number; datum?: Record<string, unknown> }
interface Scene { marktype?: string; name?: string; items?: (Scene & Item)[] }

/** Every mark's items by mark name, panels in drawing order (a faceted chart repeats each name). */
async function render(spec: TopLevelSpec) {
  const view = new View(parse(compile(spec).spec), { renderer: "none" });
  await view.runAsync();
  const marks = new Map<string, Item[]>();
  const walk = (n: Scene) => {
    if (n.marktype !== undefined && n.name !== undefined && n.marktype !== "group") marks.set(n.name, [...(marks.get(n.name) ?? []), ...((n.items ?? []) as Item[])]);
    for (const c of n.items ?? []) walk(c);
  };
  walk((view.scenegraph() as unknown as { root: Scene }).root);
  const scale = (name: string) => view.scale(name) as unknown as { invert(p: number): number };
  // vega-lite names a layer's mark NAME_marks
  const named = new Map([...marks].map(([k, v]) => [k.replace(/_marks$/, ""), v]));
  return { marks: named, x: scale("x"), y: scale("y") };
}

const point = (scenario: string, value: number, mean: number, low: number | null, high: number | null): CurveChartPoint => ({ scenario, value, mean, low, high, label: String(mean) });

function expectNear(pixelOf: (v: number) => number, drawn: number, value: number): void {
  expect(Math.abs(drawn - pixelOf(value))).toBeLessThanOrEqual(PIXEL);
}

describe("response-curve chart geometry", () => {
  it("puts each dot at (factor value, mean), each bar from ci_low to ci_high, and joins the dots in factor order", async () => {
    const points = [point("two", 2, 5.22, 3.5, 6.9), point("three", 3, 0.54, 0.45, 0.63), point("four", 4, 0.11, 0.02, 0.2), point("six", 6, 0.01, null, null)];
    const { marks, x, y } = await render(responseCurveChart({ groups: [{ label: "", points }], factorTitle: "booths", valueTitle: "queue" }));
    const px = (v: number) => (x as unknown as (v: number) => number)(v);
    const py = (v: number) => (y as unknown as (v: number) => number)(v);
    const dots = marks.get("curve_point")!;
    expect(dots.length).toBe(points.length);
    for (const p of points) {
      const d = dots.find((it) => it.datum?.scenario === p.scenario)!;
      expectNear(px, d.x, p.value);
      expectNear(py, d.y, p.mean);
    }
    // A point without an interval (one run) gets no bar and no ticks.
    const bars = marks.get("curve_interval")!;
    expect(bars.length).toBe(3);
    for (const p of points.filter((q) => q.low !== null)) {
      const b = bars.find((it) => it.datum?.scenario === p.scenario)!;
      expectNear(px, b.x, p.value);
      expectNear(py, Math.max(b.y, b.y2!), p.low!);
      expectNear(py, Math.min(b.y, b.y2!), p.high!);
      const low = marks.get("curve_low")!.find((it) => it.datum?.scenario === p.scenario)!;
      const high = marks.get("curve_high")!.find((it) => it.datum?.scenario === p.scenario)!;
      expectNear(py, low.yc!, p.low!); // an end tick is a rect centred (yc) on its value
      expectNear(py, high.yc!, p.high!);
    }
    const line = marks.get("curve_line")!;
    expect(line.map((it) => it.datum?.scenario)).toEqual(["two", "three", "four", "six"]);
    line.forEach((it, i) => { expectNear(px, it.x, points[i].value); expectNear(py, it.y, points[i].mean); });
  });

  it("draws one panel per group, each with its own points on shared axes", async () => {
    const groups = [
      { label: "rate = 0.5", points: [point("a", 2, 5, 4, 6), point("b", 3, 1, 0.5, 1.5)] },
      { label: "rate = 0.65", points: [point("c", 2, 2, 1, 3), point("d", 3, 0.2, 0.1, 0.3)] },
    ];
    const { marks, x, y } = await render(responseCurveChart({ groups, factorTitle: "booths", valueTitle: "queue" }));
    const px = (v: number) => (x as unknown as (v: number) => number)(v);
    const py = (v: number) => (y as unknown as (v: number) => number)(v);
    const dots = marks.get("curve_point")!;
    expect(dots.map((d) => d.datum?.scenario)).toEqual(["a", "b", "c", "d"]);
    for (const p of groups.flatMap((g) => g.points)) {
      const d = dots.find((it) => it.datum?.scenario === p.scenario)!;
      expectNear(px, d.x, p.value);
      expectNear(py, d.y, p.mean);
    }
    expect(marks.get("curve_line")!.length).toBe(4);
  });
});
