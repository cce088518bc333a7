/**
 * The report as one self-contained HTML file: handlebars templates from `templates/`, inline CSS,
 * and every chart rendered at build time to static SVG (vega-lite spec -> vega spec -> SVG).
 * The page needs no script and no network; its Content-Security-Policy forbids both.
 *
 * The templates only place the strings of the view model; handlebars escapes every one of them.
 * Chart SVG is inserted raw: vega escapes text and attribute values when it serialises SVG.
 */
import { readFile, readdir } from "node:fs/promises";
import { fileURLToPath } from "node:url";
import Handlebars from "handlebars";
import { compile } from "vega-lite";
import { parse, View } from "vega";
import type { TopLevelSpec } from "vega-lite";
import { reportMessages } from "../messages/index.js";
import type { Chart, ReportModel } from "./model.js";

/** The templates folder: `templates/` at the package root, from `src/report/` and `dist/report/` alike. */
export const TEMPLATES_DIR = new URL("../../templates/", import.meta.url);

/** Renders one vega-lite spec to an SVG string (no browser, no canvas). */
export async function renderChartSvg(spec: TopLevelSpec): Promise<string> {
  const view = new View(parse(compile(spec).spec), { renderer: "none" });
  try {
    return await view.toSVG();
  } finally {
    view.finalize();
  }
}

interface Templates {
  page: Handlebars.TemplateDelegate;
  css: string;
}

async function loadTemplates(): Promise<Templates> {
  const folder = fileURLToPath(TEMPLATES_DIR);
  try {
    const hb = Handlebars.create();
    const partialsDir = new URL("partials/", TEMPLATES_DIR);
    for (const name of (await readdir(partialsDir)).filter((n) => n.endsWith(".hbs")).sort()) {
      hb.registerPartial(name.slice(0, -4), await readFile(new URL(name, partialsDir), "utf8"));
    }
    const page = hb.compile(await readFile(new URL("report.hbs", TEMPLATES_DIR), "utf8"), { strict: false });
    const css = await readFile(new URL("report.css", TEMPLATES_DIR), "utf8");
    return { page, css };
  } catch (err) {
    throw reportMessages.templatesMissing(folder, (err as Error).message);
  }
}

/** Renders the report's HTML from its view model. */
export async function renderHtml(model: ReportModel): Promise<string> {
  const { page, css } = await loadTemplates();
  const withSvg = async <C extends Chart>(c: C) => ({ ...c, svg: await renderChartSvg(c.spec) });
  const measures = await Promise.all(
    model.measures.map(async (m) => ({ ...m, charts: await Promise.all(m.charts.map(withSvg)) })),
  );
  const warmup = model.warmup === null ? null : {
    ...model.warmup,
    scenarios: await Promise.all(model.warmup.scenarios.map(async (w) => ({ ...w, chart: w.chart === null ? null : await withSvg(w.chart) }))),
  };
  return page({ ...model, warmup, measures, css });
}
