/**
 * The report as one self-contained HTML file: handlebars templates from `templates/`, inline CSS,
 * and every chart rendered at build time to static SVG (vega-lite spec -> vega spec -> SVG).
 * The page needs no script and no network; its Content-Security-Policy forbids both.
 *
 * The templates only place the strings of the view model; handlebars escapes every one of them.
 * Chart SVG is inserted raw: vega escapes text and attribute values when it serialises SVG.
 */
import { createHash } from "node:crypto";
import { readFile, readdir } from "node:fs/promises";
import { fileURLToPath } from "node:url";
import Handlebars from "handlebars";
import { compile } from "vega-lite";
import { parse, View } from "vega";
import type { TopLevelSpec } from "vega-lite";
import { reportMessages } from "../messages/index.js";
import type { Chart, ReportModel } from "./model/index.js";
import { precompiled } from "../precompiled.js";

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

/** Handlebars options of the report's templates; `scripts/precompile.mjs` compiles with the same. */
export const TEMPLATE_OPTIONS = { strict: false } as const;

/** The digest that ties precompiled templates to their sources. */
export function templatesDigest(page: string, partials: readonly (readonly [string, string])[]): string {
  const hash = createHash("sha256").update(page);
  for (const [name, text] of partials) hash.update(`\0${name}\0${text}`);
  return hash.digest("hex");
}

interface PrecompiledTemplates {
  sourceSha256: string;
  page: Parameters<typeof Handlebars.template>[0];
  partials: Record<string, Parameters<typeof Handlebars.template>[0]>;
}

/**
 * The templates: precompiled by `npm run build` into `dist/report/templates.cjs` when that was made
 * from these very sources, else compiled here.
 */
async function loadTemplates(): Promise<Templates> {
  const folder = fileURLToPath(TEMPLATES_DIR);
  try {
    const hb = Handlebars.create();
    const partialsDir = new URL("partials/", TEMPLATES_DIR);
    const names = (await readdir(partialsDir)).filter((n) => n.endsWith(".hbs")).sort();
    const partials = await Promise.all(names.map(async (n) => [n.slice(0, -4), await readFile(new URL(n, partialsDir), "utf8")] as const));
    const pageText = await readFile(new URL("report.hbs", TEMPLATES_DIR), "utf8");
    const css = await readFile(new URL("report.css", TEMPLATES_DIR), "utf8");
    const built = precompiled<PrecompiledTemplates>(import.meta.url, "./templates.cjs");
    if (built !== null && built.sourceSha256 === templatesDigest(pageText, partials)) {
      for (const [name] of partials) hb.registerPartial(name, hb.template(built.partials[name]));
      return { page: hb.template(built.page), css };
    }
    for (const [name, text] of partials) hb.registerPartial(name, text);
    return { page: hb.compile(pageText, TEMPLATE_OPTIONS), css };
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
