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
import { safeName } from "../study/tables.js";
import { DEFAULT_EDITION, type Edition, editionView } from "./edition.js";

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

/**
 * `{{breakable text}}`: the text escaped, with a line-break opportunity (`<wbr>`) after each `_`,
 * so that a column named `running_time_average` may wrap in a narrow printed table instead of
 * widening it past the page.
 */
export function breakable(text: unknown): Handlebars.SafeString {
  return new Handlebars.SafeString(Handlebars.escapeExpression(String(text ?? "")).replace(/_/g, "_<wbr>"));
}

function registerHelpers(hb: typeof Handlebars): void {
  hb.registerHelper("breakable", breakable);
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
    registerHelpers(hb);
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

/** One chart as a file of the report folder: `charts/...svg` and its text. */
export interface ChartFile {
  file: string;
  svg: string;
}

/** The report's page in one edition and its charts as files. */
export interface RenderedReport {
  html: string;
  charts: ChartFile[];
}

/** What a chart belongs to: a measure's section, a scenario's warm-up, or the n-th selection (0-based) and its measure. */
export type ChartOwner = { measure: string } | { warmup: string } | { selection: number; measure: string };

/**
 * The file of a chart under the report folder, one to one with the charts of a report:
 *
 *   charts/measures/<measure>/<n>-<what>.svg   the n-th chart of a measure section (interval, runs, trace, ...)
 *   charts/warm-up/<scenario>.svg              a scenario's warm-up plot
 *   charts/selections/<n>-<measure>.svg        the n-th selection's comparisons with the best
 *
 * Names are written with the calculation tables' rule (`safeName`, src/study/tables.ts), which is
 * injective; `<n>` is the chart's running number within its measure, so two traces of one measure
 * never share a file.
 */
export function chartFile(chart: Chart, owner: ChartOwner): string {
  if ("warmup" in owner) return `charts/warm-up/${safeName(owner.warmup)}.svg`;
  if ("selection" in owner) return `charts/selections/${owner.selection + 1}-${safeName(owner.measure)}.svg`;
  const m = /-chart-(\d+)-([a-z-]+)$/.exec(chart.id);
  const tail = m === null ? safeName(chart.id) : `${m[1]}-${m[2]}`;
  return `charts/measures/${safeName(owner.measure)}/${tail}.svg`;
}

/**
 * A chart's SVG as a file of its own: the XML declaration, and the caption as the SVG's title
 * (escaped), so a slide tool shows what it is. vega's SVG carries its namespace and loads nothing.
 */
export function standaloneSvg(svg: string, caption: string): string {
  const title = `<title>${escapeXml(caption)}</title>`;
  const body = svg.replace(/^(<svg\b[^>]*>)/, `$1${title}`);
  return `<?xml version="1.0" encoding="UTF-8"?>\n${body}\n`;
}

function escapeXml(s: string): string {
  return s.replace(/[&<>"']/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&apos;" })[c] as string);
}

/** Renders the report's page in one edition and every chart as a file, from its view model. */
export async function renderReport(model: ReportModel, edition: Edition = DEFAULT_EDITION): Promise<RenderedReport> {
  const { page, css } = await loadTemplates();
  const charts: ChartFile[] = [];
  const withSvg = async <C extends Chart>(c: C, owner: ChartOwner) => {
    const svg = await renderChartSvg(c.spec);
    charts.push({ file: chartFile(c, owner), svg: standaloneSvg(svg, c.caption) });
    return { ...c, svg };
  };
  const measures = [];
  for (const m of model.measures) {
    const drawn = [];
    for (const c of m.charts) drawn.push(await withSvg(c, { measure: m.key }));
    measures.push({ ...m, charts: drawn });
  }
  let warmup = null;
  if (model.warmup !== null) {
    const scenarios = [];
    for (const w of model.warmup.scenarios) scenarios.push({ ...w, chart: w.chart === null ? null : await withSvg(w.chart, { warmup: w.scenario }) });
    warmup = { ...model.warmup, scenarios };
  }
  let selections = null;
  if (model.selections !== null) {
    const items = [];
    for (const [i, s] of model.selections.items.entries()) items.push({ ...s, chart: s.chart === null ? null : await withSvg(s.chart, { selection: i, measure: s.key }) });
    selections = { ...model.selections, items };
  }
  const view = editionView({ ...model, warmup, measures, selections } as ReportModel, edition);
  return { html: page({ ...view, css }), charts };
}

/** Renders the report's HTML from its view model (the audit edition unless another is named). */
export async function renderHtml(model: ReportModel, edition: Edition = DEFAULT_EDITION): Promise<string> {
  return (await renderReport(model, edition)).html;
}
