import { describe, expect, it } from "vitest";
import { buildReportModel } from "../../src/report/model/index.js";
import { renderHtml, renderChartSvg } from "../../src/report/html.js";
import { HOSTILE, bakery } from "./fixtures/bakery.js";

const META = { toolVersion: "0.1.0-test", generatedAt: "2025-03-04T05:06:07.000Z" };

describe("renderHtml", () => {
  it("renderHtml writes a CSP that forbids scripts and network loads, and no script, link, iframe or remote URL", async () => {
    const { study, outcome } = bakery();
    const html = await renderHtml(buildReportModel(study, outcome, META));
    // Brief: default-src 'none'; style-src 'unsafe-inline'; img-src data:.
    expect(html).toMatch(/<meta http-equiv="Content-Security-Policy" content="default-src 'none'; style-src 'unsafe-inline'; img-src data:;/);
    expect(html).not.toMatch(/<script|<link|<iframe|<object|<embed/i);
    // No remote reference in any attribute (the SVG xmlns values are namespace names, not loads).
    expect(html.replace(/xmlns(:xlink)?="http:\/\/www\.w3\.org\/[^"]*"/g, "")).not.toMatch(/(src|href)="(https?:)?\/\//i);
  });

  it("renderHtml shows script and markup in the title, a scenario, a series and a measure name as text, never as markup", async () => {
    const { study, outcome } = bakery({ hostile: true });
    const html = await renderHtml(buildReportModel(study, outcome, META));
    // The two planted strings may never appear raw (that would be live markup) ...
    for (const bad of HOSTILE) expect(html).not.toContain(bad);
    expect(html).not.toMatch(/<img/i);
    expect(html).not.toMatch(/<b>/);
    // ... and do appear escaped: handlebars escapes < > " ' ` = and & (handlebars escapeExpression).
    expect(html).toContain("&lt;script&gt;alert(1)&lt;/script&gt;");
    expect(html).toMatch(/&quot;&gt;&lt;img src(=|&#x3D;)x onerror(=|&#x3D;)alert\(1\)&gt;/);
    // Inside the chart SVG too (vega escapes text content): the scenario name on an axis label.
    const svgs = html.match(/<svg[\s\S]*?<\/svg>/g) ?? [];
    expect(svgs.length).toBeGreaterThan(0);
    expect(svgs.join("")).toContain("&lt;script&gt;alert(1)&lt;/script&gt;");
  });

  it("renderHtml shows the warm-up section, consistency checks and batch values only when the results have them", async () => {
    const full = bakery();
    const html = await renderHtml(buildReportModel(full.study, full.outcome, META));
    for (const id of ["warmup", "checks", "batch-values"]) expect(html).toContain(`id="${id}"`);
    expect(html).toContain('href="#warmup"');
    const plain = bakery({ plain: true });
    for (const sr of plain.outcome.results.scenarios) delete sr.checks;
    const bare = await renderHtml(buildReportModel(plain.study, plain.outcome, META));
    for (const id of ["warmup", "checks", "batch-values"]) expect(bare).not.toContain(`id="${id}"`);
    expect(bare).not.toContain(`class="table-explain"`);
  });

  it("renderHtml escapes names inside the new charts and tables (distribution, time at value, warm-up, checks)", async () => {
    const { study, outcome } = bakery({ hostile: true });
    const model = buildReportModel(study, outcome, META);
    const html = await renderHtml(model);
    const figure = (suffix: string) => {
      const id = model.measures.flatMap((m) => m.charts).find((c) => c.id.endsWith(suffix))!.id;
      const at = html.indexOf(`id="${id}"`);
      return html.slice(at, html.indexOf("</figure>", at));
    };
    for (const part of [figure("-distribution"), figure("-time-at-value")]) {
      // Scenario names are the legend or facet labels of these charts; vega escapes them in the SVG.
      expect(part).toContain("&lt;script&gt;alert(1)&lt;/script&gt;");
      for (const bad of HOSTILE) expect(part).not.toContain(bad);
    }
    const warm = html.slice(html.indexOf('id="warmup"'), html.indexOf("</section>", html.indexOf('id="warmup"')));
    expect(warm).toContain("&lt;script&gt;alert(1)&lt;/script&gt;");
    const checks = html.slice(html.indexOf('id="checks"'), html.indexOf('id="derivations"'));
    expect(checks).toContain("&lt;img src");
    for (const bad of HOSTILE) expect(checks).not.toContain(bad);
  });

  it("renderHtml resolves every in-page link to exactly one element id", async () => {
    const { study, outcome } = bakery({ hostile: true });
    const html = await renderHtml(buildReportModel(study, outcome, META));
    const ids = [...html.matchAll(/\sid="([^"]+)"/g)].map((m) => m[1]);
    const counts = new Map<string, number>();
    for (const id of ids) counts.set(id, (counts.get(id) ?? 0) + 1);
    const hrefs = [...html.matchAll(/href="#([^"]+)"/g)].map((m) => m[1]);
    expect(hrefs.length).toBeGreaterThan(0);
    for (const h of hrefs) expect(counts.get(h), h).toBe(1);
  });

  it("renderHtml of 16 runs per scenario stays under 3 s on this machine", async () => {
    // Speed goal from the brief (16 runs × 6 measures under 3 s; the fixture has 4 measures × 2 scenarios).
    const { study, outcome } = bakery({ runs: 16 });
    const t0 = performance.now();
    const html = await renderHtml(buildReportModel(study, outcome, META));
    const ms = performance.now() - t0;
    expect(html.length).toBeGreaterThan(0);
    expect(ms).toBeLessThan(3000);
  });
});

describe("renderChartSvg", () => {
  it("renderChartSvg returns one static <svg> with a size and no script", async () => {
    const svg = await renderChartSvg({
      data: { values: [{ a: 1, b: 2 }] },
      mark: "point",
      encoding: { x: { field: "a", type: "quantitative" }, y: { field: "b", type: "quantitative" } },
    });
    expect(svg.startsWith("<svg")).toBe(true);
    expect(svg).toMatch(/width="\d+(\.\d+)?" height="\d+(\.\d+)?"/);
    expect(svg).not.toMatch(/<script/i);
  });
});
