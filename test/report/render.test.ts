/**
 * End-to-end rendering of the bakery fixture: the HTML in headless Chromium, then the PDF.
 * Artifacts (HTML, screenshot, PDF) go to test-artifacts/ for a reader to look at.
 */
import { execFileSync } from "node:child_process";
import { mkdirSync, writeFileSync } from "node:fs";
import { mkdtemp, rm } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join, resolve } from "node:path";
import { pathToFileURL } from "node:url";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import puppeteer, { type Browser } from "puppeteer-core";
import { buildReportModel } from "../../src/report/model/index.js";
import { renderHtml } from "../../src/report/html.js";
import { CHROME_FLAGS, findChrome, renderPdf } from "../../src/report/pdf.js";
import { bakery } from "./fixtures/bakery.js";

const chrome = findChrome();
if (chrome === null) console.warn("report browser tests skipped: no Chromium found (install chromium or set SOJOURN_CHROME)");
const ARTIFACTS = resolve("test-artifacts");
const META = { toolVersion: "0.1.0-test", generatedAt: "2025-03-04T05:06:07.000Z" };

describe.skipIf(chrome === null)("report in a browser", () => {
  const { study, outcome } = bakery();
  const model = buildReportModel(study, outcome, META);
  let html = "";
  let dir = "";
  let browser: Browser;

  beforeAll(async () => {
    html = await renderHtml(model);
    dir = await mkdtemp(join(tmpdir(), "sojourn-report-test-"));
    mkdirSync(ARTIFACTS, { recursive: true });
    writeFileSync(join(ARTIFACTS, "report.html"), html);
    browser = await puppeteer.launch({ executablePath: chrome as string, headless: true, args: [...CHROME_FLAGS, `--user-data-dir=${join(dir, "profile")}`] });
  });
  afterAll(async () => {
    await browser?.close();
    await rm(dir, { recursive: true, force: true });
  });

  it("renderHtml output opens from file:// with no console error, no request but the file, and every chart drawn", async () => {
    const file = join(dir, "report.html");
    writeFileSync(file, html);
    const url = pathToFileURL(file).href;
    const page = await browser.newPage();
    const errors: string[] = [];
    const requests: string[] = [];
    page.on("console", (m) => { if (m.type() === "error") errors.push(m.text()); });
    page.on("pageerror", (e) => errors.push(String(e)));
    page.on("request", (r) => requests.push(r.url()));
    await page.setViewport({ width: 1100, height: 900 });
    await page.goto(url, { waitUntil: "load" });
    // Self-contained (brief: no network): the only request is the file itself.
    expect(requests).toEqual([url]);
    expect(errors).toEqual([]);
    // Every chart of the model is an <svg> of non-zero size in its figure (model.measures[].charts).
    const ids = [...model.measures.flatMap((m) => m.charts.map((c) => c.id)), ...(model.warmup?.scenarios ?? []).flatMap((w) => (w.chart ? [w.chart.id] : []))];
    expect(ids.some((id) => id.startsWith("warmup-"))).toBe(true);
    const sizes = (await page.evaluate(`(${JSON.stringify(ids)}).map((id) => {
      const svg = document.getElementById(id)?.querySelector("svg");
      if (!svg) return null;
      const r = svg.getBoundingClientRect();
      return [r.width, r.height];
    })`)) as ([number, number] | null)[];
    expect(sizes).toHaveLength(ids.length);
    for (const s of sizes) {
      expect(s).not.toBeNull();
      expect(s![0]).toBeGreaterThan(0);
      expect(s![1]).toBeGreaterThan(0);
    }
    // No horizontal scrollbar on the page: wide tables scroll inside their own container.
    expect(await page.evaluate("document.documentElement.scrollWidth <= document.documentElement.clientWidth")).toBe(true);
    // No script element at all (brief: no script needed to read it).
    expect(await page.evaluate("document.scripts.length")).toBe(0);
    await page.screenshot({ path: join(ARTIFACTS, "report.png"), fullPage: true });
    await page.close();
  });

  it("renderHtml output with script and markup in the names shows them as text in the browser and runs nothing", async () => {
    const hostile = bakery({ hostile: true });
    const hm = buildReportModel(hostile.study, hostile.outcome, META);
    const file = join(dir, "hostile.html");
    writeFileSync(file, await renderHtml(hm));
    const page = await browser.newPage();
    const dialogs: string[] = [];
    page.on("dialog", async (d) => { dialogs.push(d.message()); await d.dismiss(); });
    await page.goto(pathToFileURL(file).href, { waitUntil: "load" });
    // No element was created from the names (brief: appear as text, never as markup).
    expect(await page.evaluate("document.querySelectorAll('script, img, b').length")).toBe(0);
    expect(await page.evaluate("document.querySelector('h1').textContent")).toBe(hostile.study.title);
    expect(await page.evaluate("document.title")).toBe(hostile.study.title);
    const bodyText = (await page.evaluate("document.body.innerText")) as string;
    for (const s of hostile.outcome.results.scenarios) expect(bodyText).toContain(s.name);
    expect(dialogs).toEqual([]);
    await page.screenshot({ path: join(ARTIFACTS, "report-hostile.png") });
    await page.close();
  });

  it("renderPdf writes more than one page whose text holds every scenario, measure and summary mean as shown", async () => {
    const pdfPath = join(dir, "report.pdf");
    const progress: string[] = [];
    const { pages } = await renderPdf(html, pdfPath, { paper: "A4", title: model.title, onProgress: (m) => progress.push(m) });
    execFileSync("cp", [pdfPath, join(ARTIFACTS, "report.pdf")]);
    expect(pages).toBeGreaterThan(1);
    // Page count cross-checked with poppler's pdfinfo.
    const info = execFileSync("pdfinfo", [pdfPath], { encoding: "utf8" });
    expect(Number(/Pages:\s+(\d+)/.exec(info)?.[1])).toBe(pages);
    const text = execFileSync("pdftotext", ["-layout", pdfPath, "-"], { encoding: "utf8" });
    // Strings as the HTML shows them: the model's scenario names, measure names and summary means.
    for (const s of outcome.results.scenarios) expect(text).toContain(s.name);
    for (const m of study.measureNames) expect(text).toContain(m);
    for (const r of model.summary.rows) expect(text).toContain(r.mean.text);
    expect(progress.length).toBeGreaterThan(0);
  });

  it("renderPdf on Letter paper gives a different page size than A4 (pdfinfo)", async () => {
    const pdfPath = join(dir, "letter.pdf");
    const { pages } = await renderPdf(html, pdfPath, { paper: "Letter", title: model.title });
    const info = execFileSync("pdfinfo", [pdfPath], { encoding: "utf8" });
    // Letter is 612 x 792 pt (ANSI), A4 is 595.28 x 841.89 pt (ISO 216).
    expect(info).toMatch(/Page size:\s+612 x 792 pts/);
    expect(Number(/Pages:\s+(\d+)/.exec(info)?.[1])).toBe(pages);
  });
});
