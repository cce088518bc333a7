/**
 * Hostile names on response curves (`factors:` on scenarios), through the command line: a factor
 * named with HTML and CSV specials and scenarios named with them appear as text in report.html
 * (prose, tables, chart labels and tooltips), quoted in the response-curve CSV, and escaped in
 * the terminal.
 *
 * Sources: common practice (OWASP XSS prevention: escape untrusted text for its HTML context);
 * RFC 4180 section 2 (a field holding a comma, a quote or a line break is enclosed in quotes, a
 * quote inside written twice); CONTRACT.md section 7 (report.html is self-contained).
 */
import { readdirSync, readFileSync, rmSync } from "node:fs";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { sojourn } from "../helpers/cli.js";
import { tempFolder } from "../helpers/tempStudy.js";

const FACTOR = `<b>"x"&,y`;
const SCENARIOS = [`<i>two</i>, "booths"`, `three & <u>more</u>`, "four\nlines"];
const runs = (base: number) => ["time,series,value", `0,queue,${base}`, `4,queue,${base + 1}`, `8,queue,${base + 2}`].join("\n") + "\n";

const dir = tempFolder({
  "study.yaml": `title: Booths
scenarios:
${SCENARIOS.map((s, i) => `  - {name: ${JSON.stringify(s)}, end: 10, runs: runs/s${i}/*.csv, factors: {${JSON.stringify(FACTOR)}: ${i + 2}}}`).join("\n")}
measures:
  - {name: queue, kind: level, series: queue}
`,
  ...Object.fromEntries(SCENARIOS.flatMap((_, i) => [[`runs/s${i}/r1.csv`, runs(i)], [`runs/s${i}/r2.csv`, runs(i + 1)]])),
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** HTML text escaping as an HTML parser undoes it. */
function decodeEntities(s: string): string {
  return s
    .replace(/&#x([0-9a-f]+);/gi, (_, h) => String.fromCodePoint(parseInt(h, 16)))
    .replace(/&#(\d+);/g, (_, d) => String.fromCodePoint(Number(d)))
    .replace(/&lt;/g, "<")
    .replace(/&gt;/g, ">")
    .replace(/&quot;/g, '"')
    .replace(/&apos;/g, "'")
    .replace(/&amp;/g, "&");
}

/** RFC 4180 fields of a CSV text (quoted fields may hold commas, doubled quotes and line breaks). */
function csvRows(text: string): string[][] {
  const rows: string[][] = [];
  let row: string[] = [];
  let cell = "";
  let quoted = false;
  const endCell = () => {
    row.push(cell);
    cell = "";
  };
  for (let i = 0; i < text.length; i++) {
    const c = text[i];
    if (quoted) {
      if (c === '"' && text[i + 1] === '"') {
        cell += '"';
        i++;
      } else if (c === '"') quoted = false;
      else cell += c;
    } else if (c === '"') quoted = true;
    else if (c === ",") endCell();
    else if (c === "\n") {
      endCell();
      rows.push(row);
      row = [];
    } else if (c !== "\r") cell += c;
  }
  if (cell !== "" || row.length > 0) {
    endCell();
    rows.push(row);
  }
  return rows;
}

describe("hostile factor and scenario names on response curves (sojourn report)", () => {
  const r = sojourn(["report", join(dir, "study.yaml"), "--out", join(dir, "out")]);
  const html = r.status === 0 ? readFileSync(join(dir, "out", "report.html"), "utf8") : "";

  it("the report is written", () => {
    expect(r.status, r.stderr).toBe(0);
  });

  it("report.html: the factor and scenario names appear as text, never as markup", () => {
    const text = decodeEntities(html.replace(/<[^>]*>/g, " "));
    expect(text).toContain(FACTOR);
    for (const s of SCENARIOS.slice(0, 2)) expect(text, s).toContain(s);
    for (const raw of ["<b>\"x\"", "<i>two</i>", "<u>more</u>"]) expect(html).not.toContain(raw);
  });

  it("the response-curve chart (in report.html and charts/): axis title, point labels and tooltips carry the names as text", () => {
    const file = readFileSync(join(dir, "out", "charts", "measures", "queue", "7-response-curve.svg"), "utf8");
    const inPage = html.match(/<svg[^>]*>(?:(?!<\/svg>)[\s\S])*curve_point_marks[\s\S]*?<\/svg>/)?.[0];
    expect(inPage, "the page holds the chart").toBeDefined();
    for (const svg of [file, inPage!]) {
      // No name survives as markup inside the chart.
      expect(svg).not.toMatch(/<\/?(b|i|u)>/);
      const labels = [...svg.matchAll(/aria-label="([^"]*)"/g)].map((m) => decodeEntities(m[1]));
      const texts = [...svg.matchAll(/<text[^>]*>([^<]*)<\/text>/g)].map((m) => decodeEntities(m[1]));
      expect(texts, "the x axis title").toContain(FACTOR);
      expect(labels.some((l) => l.includes(FACTOR)), "the axis and tick labels").toBe(true);
      for (const s of SCENARIOS) expect(labels.some((l) => l.startsWith(`${s} at `)), `the point of ${JSON.stringify(s)}`).toBe(true);
    }
  });

  it("the response-curve CSV quotes the names (RFC 4180) and they read back intact", () => {
    const folder = join(dir, "out", "tables", "response.curves");
    const files = readdirSync(folder);
    expect(files.length).toBe(1);
    const rows = csvRows(readFileSync(join(folder, files[0]), "utf8"));
    const cells = rows.flat();
    for (const s of SCENARIOS) expect(cells, s).toContain(s);
    const width = rows[0].length;
    for (const row of rows) expect(row.length).toBe(width);
  });

  it("the terminal output escapes the line break in a scenario name (as JSON writes it)", () => {
    const out = r.stdout + r.stderr;
    expect(out).not.toContain("four\nlines");
    expect(out).toContain("four\\u000alines");
    expect(out).toContain(SCENARIOS[0]);
  });
});
