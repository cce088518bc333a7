/**
 * Every chart of the report also as an SVG file under the report folder (`renderReport`,
 * src/report/html.ts): one file per chart with injective names, the same drawing as the page's,
 * a well-formed SVG document with the chart's marks, that loads nothing. The study is the
 * invented bakery fixture (test/report/fixtures/bakery.ts).
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import puppeteer, { type Browser } from "puppeteer-core";
import { buildReportModel, type Chart } from "../../src/report/model/index.js";
import { chartFile, renderReport, standaloneSvg, type RenderedReport } from "../../src/report/html.js";
import { CHROME_FLAGS, findChrome } from "../../src/report/pdf.js";
import { bakery, HOSTILE } from "./fixtures/bakery.js";

const META = { toolVersion: "0.1.0-test", generatedAt: "2025-03-04T05:06:07.000Z" };
const chart = (id: string): Chart => ({ id, caption: "c", spec: { mark: "point", data: { values: [] } } });

describe("chart files", () => {
  const { study, outcome } = bakery({ runs: 4 });
  const model = buildReportModel(study, outcome, META);
  let audit: RenderedReport;
  let client: RenderedReport;
  beforeAll(async () => {
    audit = await renderReport(model, "audit");
    client = await renderReport(model, "client");
  });

  it("renderReport writes one file per chart of the page, under charts/, with distinct names, in both editions alike", () => {
    const inPage = model.measures.reduce((n, m) => n + m.charts.length, 0) + (model.warmup?.scenarios.filter((w) => w.chart !== null).length ?? 0);
    expect(audit.charts.length).toBe(inPage);
    expect(new Set(audit.charts.map((c) => c.file)).size).toBe(inPage);
    for (const c of audit.charts) expect(c.file).toMatch(/^charts\/(measures\/[^/]+\/\d+-[a-z-]+|warm-up\/[^/]+)\.svg$/);
    expect(client.charts).toEqual(audit.charts);
  });

  it("each chart file holds the very SVG the page shows, after an XML declaration and the escaped caption as its title", () => {
    for (const c of audit.charts) {
      const body = c.svg.replace(/^<\?xml version="1\.0" encoding="UTF-8"\?>\n/, "").replace(/<title>[^<]*<\/title>/, "").trimEnd();
      expect(audit.html, c.file).toContain(body);
    }
    expect(standaloneSvg('<svg xmlns="http://www.w3.org/2000/svg"><g/></svg>', 'a <b> & "c"')).toBe(
      '<?xml version="1.0" encoding="UTF-8"?>\n<svg xmlns="http://www.w3.org/2000/svg"><title>a &lt;b&gt; &amp; &quot;c&quot;</title><g/></svg>\n',
    );
  });

  it("chartFile names are one to one: names differing in case or by a dot get different files, a measure and a scenario never share one", () => {
    const files = [
      chartFile(chart("measure-1-wait-chart-1-interval"), { measure: "Wait" }),
      chartFile(chart("measure-2-wait-chart-1-interval"), { measure: "wait" }),
      chartFile(chart("measure-3-a-b-chart-1-interval"), { measure: "a.b" }),
      chartFile(chart("measure-4-a-b-chart-1-interval"), { measure: "a~2Eb" }),
      chartFile(chart("measure-1-wait-chart-2-trace"), { measure: "Wait" }),
      chartFile(chart("measure-1-wait-chart-3-trace"), { measure: "Wait" }),
      chartFile(chart("warmup-1-wait-chart"), { warmup: "Wait" }),
    ];
    expect(files).toEqual([
      "charts/measures/+wait/1-interval.svg",
      "charts/measures/wait/1-interval.svg",
      "charts/measures/a~2Eb/1-interval.svg",
      "charts/measures/a~7E2+eb/1-interval.svg",
      "charts/measures/+wait/2-trace.svg",
      "charts/measures/+wait/3-trace.svg",
      "charts/warm-up/+wait.svg",
    ]);
  });

  it("names with markup reach the chart files only escaped", async () => {
    const hostile = bakery({ hostile: true });
    const r = await renderReport(buildReportModel(hostile.study, hostile.outcome, META), "client");
    for (const c of r.charts) {
      for (const h of HOSTILE) expect(c.svg).not.toContain(h);
      expect(c.svg).not.toMatch(/<script/i);
    }
  });
});

const chrome = findChrome();
if (chrome === null) console.warn("chart file parsing test skipped: no Chromium found (install chromium or set SOJOURN_CHROME)");

describe.skipIf(chrome === null)("chart files in a strict XML parser", () => {
  let browser: Browser;
  const profile = mkdtempSync(join(tmpdir(), "sojourn-chartfiles-"));
  beforeAll(async () => {
    browser = await puppeteer.launch({ executablePath: chrome as string, headless: true, args: [...CHROME_FLAGS, `--user-data-dir=${profile}`] });
  });
  afterAll(async () => {
    await browser?.close();
    rmSync(profile, { recursive: true, force: true });
  });

  it("the runs chart's file parses as SVG with one dot per run, and no chart file refers to anything outside itself", async () => {
    const runs = 4;
    const { study, outcome } = bakery({ runs });
    const r = await renderReport(buildReportModel(study, outcome, META), "audit");
    const runsChart = r.charts.find((c) => /\/2-runs\.svg$/.test(c.file));
    expect(runsChart).toBeDefined();
    const page = await browser.newPage();
    try {
      const parsed = (await page.evaluate(`(() => {
        const doc = new DOMParser().parseFromString(${JSON.stringify(runsChart?.svg)}, "image/svg+xml");
        if (doc.getElementsByTagName("parsererror").length > 0) return { error: doc.documentElement.textContent };
        const root = doc.documentElement;
        const dots = root.querySelectorAll("g.mark-symbol.role-mark > path").length;
        return { root: root.localName, ns: root.namespaceURI, title: root.querySelector("title")?.textContent ?? null, dots };
      })()`)) as { error?: string; root?: string; ns?: string; title?: string | null; dots?: number };
      expect(parsed.error).toBeUndefined();
      expect(parsed.root).toBe("svg");
      expect(parsed.ns).toBe("http://www.w3.org/2000/svg");
      expect(parsed.title).toMatch(/each run/);
      // one dot per run of each of the fixture's two scenarios
      expect(parsed.dots).toBe(2 * runs);
    } finally {
      await page.close();
    }
    for (const c of r.charts) {
      const urls = [...c.svg.matchAll(/(?:href|src)\s*=\s*"([^"]*)"|url\(([^)]*)\)/g)].map((m) => m[1] ?? m[2]);
      expect(urls.filter((u) => !u.startsWith("#")), c.file).toEqual([]);
      expect(c.svg.match(/https?:\/\/[^"\s]+/g)?.filter((u) => !/^http:\/\/www\.w3\.org\//.test(u)) ?? [], c.file).toEqual([]);
    }
  });
});
