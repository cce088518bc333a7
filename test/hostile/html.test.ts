/**
 * Hostile strings in the HTML report, through the command line (`sojourn report`): markup and
 * script in the title, a scenario name, a measure name and a series name appear as text, never
 * as markup; and the report carries a Content-Security-Policy that forbids script and network
 * loads, so even a slip in escaping could not run code or call out.
 *
 * Source: common practice (OWASP XSS prevention: escape untrusted text for its HTML context;
 * CSP as a second line of defence); CONTRACT.md section 7 (report.html opens from disk with no
 * network).
 */
import { readFileSync, rmSync } from "node:fs";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { sojourn } from "../helpers/cli.js";
import { tempFolder } from "../helpers/tempStudy.js";

const TITLE = `<script>alert("title")</script> & "quotes"`;
const SCENARIO = `<img src=x onerror=alert('scenario')>`;
const MEASURE = `</style><script>alert(1)</script>`;
const SERIES = `<svg onload=alert(2)>`;
const ENTITY_SERIES = `"><iframe src=https://example.invalid/>`;

/** CSV text with every cell quoted (RFC 4180: a quote inside is written twice). */
function csv(rows: (string | number | null)[][]): string {
  const cell = (x: string | number | null) => (x === null ? "" : `"${String(x).replace(/"/g, '""')}"`);
  return ["time,series,value,entity", ...rows.map((r) => r.map(cell).join(","))].join("\n") + "\n";
}

/** HTML text escaping as an HTML parser undoes it (to compare what the reader sees). */
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

/** Every start tag: its name and its attributes (name and raw value). */
function startTags(html: string): { name: string; attrs: { name: string; value: string }[] }[] {
  const tags: { name: string; attrs: { name: string; value: string }[] }[] = [];
  const tag = /<([a-zA-Z][\w:-]*)((?:\s+[^\s=>/"']+(?:\s*=\s*(?:"[^"]*"|'[^']*'|[^\s>"']+))?)*)\s*\/?>/g;
  const attr = /([^\s=>/"']+)(?:\s*=\s*("[^"]*"|'[^']*'|[^\s>"']+))?/g;
  for (const m of html.matchAll(tag)) {
    const attrs = [...m[2].matchAll(attr)].map((a) => ({ name: a[1].toLowerCase(), value: (a[2] ?? "").replace(/^["']|["']$/g, "") }));
    tags.push({ name: m[1].toLowerCase(), attrs });
  }
  return tags;
}

const dir = tempFolder({
  "study.yaml": `title: ${JSON.stringify(TITLE)}
scenarios:
  - {name: ${JSON.stringify(SCENARIO)}, end: 10, runs: runs/*.csv}
measures:
  - {name: ${JSON.stringify(MEASURE)}, kind: level, series: ${JSON.stringify(SERIES)}}
  - {name: stay, kind: observation, from: {start: ${JSON.stringify(ENTITY_SERIES)}, end: done}}
`,
  "runs/r1.csv": csv([[0, SERIES, 1], [2, ENTITY_SERIES, null, "<b>e1</b>"], [3, SERIES, 4], [5, "done", null, "<b>e1</b>"]]),
  "runs/r2.csv": csv([[0, SERIES, 2], [1, ENTITY_SERIES, null, "e2"], [6, SERIES, 0], [7, "done", null, "e2"]]),
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe("hostile names in report.html (sojourn report)", () => {
  const r = sojourn(["report", join(dir, "study.yaml"), "--out", join(dir, "out"), "--quiet"]);
  const html = r.status === 0 ? readFileSync(join(dir, "out", "report.html"), "utf8") : "";

  it("the report is written", () => {
    expect(r.stderr).toBe("");
    expect(r.status).toBe(0);
  });

  it("markup and script in the title, scenario, measure and series names appear as text", () => {
    const text = decodeEntities(html.replace(/<[^>]*>/g, " "));
    for (const name of [TITLE, SCENARIO, MEASURE, SERIES]) expect(text, name).toContain(name);
    // None of them survives as markup: the raw strings are not in the file at all.
    for (const raw of ["<script>alert", "<img src=x", "<svg onload", "<iframe", "</style><script>"]) expect(html).not.toContain(raw);
  });

  it("no tag runs script or loads from the network: no script, iframe, object or embed; no on* attribute; no remote URL", () => {
    const tags = startTags(html);
    expect(tags.length).toBeGreaterThan(50); // the parser found the report's tags
    const names = new Set(tags.map((t) => t.name));
    for (const bad of ["script", "iframe", "object", "embed", "base", "link", "form"]) expect(names.has(bad), bad).toBe(false);
    for (const t of tags) {
      for (const a of t.attrs) {
        expect(a.name.startsWith("on"), `<${t.name} ${a.name}>`).toBe(false);
        if (["src", "href", "xlink:href", "action", "formaction", "data"].includes(a.name)) {
          expect(decodeEntities(a.value), `<${t.name} ${a.name}="${a.value}">`).toMatch(/^(#|data:image\/)/);
        }
      }
    }
  });

  it("a Content-Security-Policy forbids script and network loads", () => {
    const metas = startTags(html).filter((t) => t.name === "meta" && t.attrs.some((a) => a.name === "http-equiv" && a.value.toLowerCase() === "content-security-policy"));
    expect(metas).toHaveLength(1);
    const policy = decodeEntities(metas[0].attrs.find((a) => a.name === "content")!.value);
    const directives = new Map(policy.split(";").map((d) => d.trim().split(/\s+/)).filter((d) => d[0] !== "").map((d) => [d[0], d.slice(1)]));
    // default-src 'none' covers script-src, connect-src, frame-src, font-src, ... that are not given
    expect(directives.get("default-src")).toEqual(["'none'"]);
    for (const fetch of ["script-src", "script-src-elem", "script-src-attr", "connect-src", "frame-src", "object-src", "font-src", "media-src", "worker-src"]) {
      const given = directives.get(fetch);
      if (given !== undefined) expect(given, fetch).toEqual(["'none'"]);
    }
    // what is allowed loads nothing from the network: inline styles, data: images
    for (const [name, sources] of directives) {
      for (const s of sources) expect(["'none'", "'unsafe-inline'", "data:", "'self'"], `${name} ${s}`).toContain(s);
      if (name.startsWith("script")) expect(sources).not.toContain("'unsafe-inline'");
    }
    // the policy is in the head, before any content it governs
    expect(html.indexOf("Content-Security-Policy")).toBeLessThan(html.indexOf("<body"));
  });
});
