import { describe, expect, it } from "vitest";
import { compile, type TopLevelSpec } from "vega-lite";
import { parse, View } from "vega";
import { axisTitle, histogramChart } from "../../src/report/charts.js";
import { buildReportModel } from "../../src/report/model/index.js";
import { renderHtml } from "../../src/report/html.js";
import { csv } from "../helpers/tempStudy.js";
import { studyOf } from "../helpers/runStudyFrom.js";

// Names that are also properties of every JavaScript object: a chart library that looks names up
// in a plain object breaks on them (found by fuzzing; common practice: user names are data).
const NAMES = ["constructor", "toString", "__proto__", "hasOwnProperty", "valueOf", "isPrototypeOf"];
/** The same study with plain names of the same lengths ("x" repeated), so text is as wide. */
const plain = (name: string) => "x".repeat(name.length);
const META = { toolVersion: "test", generatedAt: "2026-01-01T00:00:00Z" };

/** Every scenario, run, series and measure named from `name`. */
async function namedStudy(name: (n: string) => string) {
  const file = (k: number) =>
    csv([[0, name("valueOf"), k], [2, name("valueOf"), k + 2], [3, name("toString"), k], [4, name("toString"), 2 * k], [5, name("toString"), k + 1], [6, name("valueOf"), 1]]);
  const scenarios = NAMES.map((n) => `  - {name: "${name(n)}", end: 10, runs: ["${n}/*.csv"]}`).join("\n");
  const files: Record<string, string> = {};
  NAMES.forEach((n, i) => {
    files[`${n}/${name("constructor")}.csv`] = file(i + 1);
    files[`${n}/${name("__proto__")}.csv`] = file(i + 3);
  });
  return studyOf(
    `title: names\nscenarios:\n${scenarios}\nmeasures:\n` +
      `  - {name: "${name("constructor")}", kind: level, series: "${name("valueOf")}", at_least: [2]}\n` +
      `  - {name: "${name("__proto__")}", kind: observation, series: "${name("toString")}", within: [3]}\n`,
    files,
  );
}

interface Scene {
  marktype?: string;
  role?: string;
  text?: unknown;
  x?: number;
  y?: number;
  width?: number;
  height?: number;
  items?: Scene[];
}

/** What vega draws for a spec: every mark item's geometry, and every text shown. */
async function drawn(spec: TopLevelSpec): Promise<{ shapes: string[]; texts: string[] }> {
  const view = new View(parse(compile(spec).spec), { renderer: "none" });
  await view.runAsync();
  const shapes: string[] = [];
  const texts: string[] = [];
  const walk = (n: Scene, depth: number) => {
    if (n.text !== undefined) texts.push(String(n.text));
    else if (n.marktype === undefined && (n.x !== undefined || n.y !== undefined)) {
      shapes.push(`${depth} ${[n.x, n.y, n.width, n.height].map((v) => (v === undefined ? "-" : v.toFixed(3))).join(" ")}`);
    }
    for (const c of n.items ?? []) walk(c, depth + 1);
  };
  walk((view.scenegraph() as unknown as { root: Scene }).root, 0);
  return { shapes, texts };
}

describe("report with scenario, measure, series and run names like object properties", () => {
  it("renders every chart and shows every name", async () => {
    const { study, outcome } = await namedStudy((n) => n);
    const html = await renderHtml(buildReportModel(study, outcome, META));
    for (const n of NAMES) expect(html).toContain(n);
    // every chart became an inline SVG (none failed to render)
    expect((html.match(/<svg/g) ?? []).length).toBeGreaterThan(6);
  });

  it("draws every chart exactly as for plain names of the same lengths: the same marks at the same places, the names in the labels", async () => {
    const named = await namedStudy((n) => n);
    const control = await namedStudy(plain);
    const a = buildReportModel(named.study, named.outcome, META);
    const b = buildReportModel(control.study, control.outcome, META);
    const chartsA = a.measures.flatMap((m) => m.charts);
    const chartsB = b.measures.flatMap((m) => m.charts);
    expect(chartsA.map((c) => c.id.replace(/-[a-z_]+-chart/, "-chart"))).toEqual(chartsB.map((c) => c.id.replace(/-[a-z_]+-chart/, "-chart")));
    // the faceted charts (histogram, time at value) must be among them
    expect(chartsA.some((c) => c.id.endsWith("-histogram"))).toBe(true);
    expect(chartsA.some((c) => c.id.endsWith("-time-at-value"))).toBe(true);
    for (const [i, chart] of chartsA.entries()) {
      const got = await drawn(chart.spec);
      const want = await drawn(chartsB[i].spec);
      expect(got.shapes, chart.id).toEqual(want.shapes);
      const rename = (t: string) => NAMES.reduce((s, n) => s.split(n).join(plain(n)), t);
      expect(got.texts.map(rename), chart.id).toEqual(want.texts);
      // the names themselves are shown, never a key standing for them
      expect(got.texts.join("\n"), chart.id).not.toContain("n:");
    }
    const faceted = chartsA.find((c) => c.id.endsWith("-histogram"))!;
    const texts = (await drawn(faceted.spec)).texts;
    for (const n of NAMES) expect(texts, `facet header ${n}`).toContain(n);
  });

  it("draws an axis title that is exactly an object member's name (vega took it for a reference and drew nothing)", async () => {
    for (const name of [...NAMES, "propertyIsEnumerable", "toLocaleString", "__defineGetter__"]) {
      const spec = histogramChart([{ scenario: "a", value: 1 }, { scenario: "a", value: 2 }], ["a"], name, name);
      const { texts } = await drawn(spec);
      expect(texts.filter((t) => t.trim() === name), name).toHaveLength(2);
    }
    expect(axisTitle("constructor")).toBe("constructor ");
    expect(axisTitle("wait")).toBe("wait");
    expect(axisTitle(null)).toBeNull();
  });
});
