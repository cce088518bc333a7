/**
 * The chart of the multiple comparisons with the best draws the data exactly: rendered by vega
 * (the same compile as the report's SVG), its scenegraph read back in pixels, and every bar, end
 * tick and the zero line held against the intervals it was given.
 *
 * Reference values: the intervals the test itself passes in. Tolerance: one pixel (common practice
 * for a chart: what a reader can tell apart).
 */
import { describe, expect, it } from "vitest";
import { compile, type TopLevelSpec } from "vega-lite";
import { parse, View } from "vega";
import { bestComparisonChart, type BestComparisonPoint } from "../../src/report/charts.js";

const PIXEL = 1;

interface Item { x: number; x2?: number; xc?: number; y: number; datum?: Record<string, unknown> }
interface Scene { marktype?: string; name?: string; items?: (Scene & Item)[] }

async function render(spec: TopLevelSpec) {
  const view = new View(parse(compile(spec).spec), { renderer: "none" });
  await view.runAsync();
  const marks = new Map<string, Item[]>();
  const walk = (n: Scene) => {
    if (n.marktype !== undefined && n.name !== undefined && n.marktype !== "group") marks.set(n.name.replace(/_marks$/, ""), [...(marks.get(n.name) ?? []), ...((n.items ?? []) as Item[])]);
    for (const c of n.items ?? []) walk(c);
  };
  walk((view.scenegraph() as unknown as { root: Scene }).root);
  const x = view.scale("x") as unknown as (v: number) => number;
  return { marks, x };
}

const point = (scenario: string, lower: number, upper: number): BestComparisonPoint => ({ scenario, lower, upper, label: `[${lower}, ${upper}]` });

describe("bestComparisonChart geometry", () => {
  it("puts each bar and its end ticks at the interval's ends, one row per scenario, and the zero line at 0", async () => {
    const points = [point("a", -0.8, 0), point("b", 0, 0.35), point("<b>\"x\"&", -1.4, 0), point("d", -0.2, 0.3)];
    const { marks, x } = await render(bestComparisonChart(points, "Wait, best minus others"));
    const near = (drawn: number, value: number) => expect(Math.abs(drawn - x(value))).toBeLessThanOrEqual(PIXEL);
    const bars = marks.get("best_interval")!;
    expect(bars.length).toBe(points.length);
    const rows = new Set<number>();
    for (const p of points) {
      const b = bars.find((it) => it.datum?.scenario === p.scenario)!;
      near(Math.min(b.x, b.x2!), p.lower);
      near(Math.max(b.x, b.x2!), p.upper);
      rows.add(Math.round(b.y));
      const low = marks.get("best_lower")!.find((it) => it.datum?.scenario === p.scenario)!;
      const high = marks.get("best_upper")!.find((it) => it.datum?.scenario === p.scenario)!;
      near(low.xc ?? low.x, p.lower); // a tick is a rect centred (xc) on its value
      near(high.xc ?? high.x, p.upper);
    }
    expect(rows.size).toBe(points.length); // each scenario on its own row
    const [zero] = marks.get("best_zero")!;
    near(zero.x, 0);
  });
});
