/**
 * Print and layout of the report for the invented example studies (examples/bakery,
 * examples/ferry-check-in), in both editions:
 *
 * - the HTML: no table reaches past the page's content box, on screen at an 800 px viewport (a
 *   wide table scrolls inside its own box) and in print media at the width of an A4 page less its
 *   margins (a table wraps to fit, so no column is cut);
 * - the PDF (built command line, `npm run build` first): bookmarks, a contents list whose page
 *   numbers are the pages its headings are printed on, no heading alone at a page's foot, a last
 *   page that holds more than the colophon.
 *
 * Needs a Chromium-family browser and poppler's pdftotext; skips, saying so, without them.
 */
import { mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import puppeteer, { type Browser } from "puppeteer-core";
import { loadStudy } from "../../src/manifest/loadStudy.js";
import { runStudy } from "../../src/study/runStudy.js";
import { buildReportModel } from "../../src/report/model/index.js";
import { renderHtml } from "../../src/report/html.js";
import { CHROME_FLAGS, findChrome } from "../../src/report/pdf.js";
import { EDITIONS } from "../../src/report/edition.js";
import { sojourn } from "../helpers/cli.js";
import { type ExampleName, writeExample } from "../helpers/exampleStudy.js";
import { contentsEntries, havePdftotext, headingOf, headings, headingsAtFoot, pageBodies, printedContents, squash } from "../helpers/printLayout.js";

const chrome = findChrome();
const pdftotext = havePdftotext();
if (chrome === null) console.warn("print layout tests skipped: no Chromium found (install chromium or set SOJOURN_CHROME)");
else if (!pdftotext) console.warn("PDF layout tests skipped: pdftotext not found (install poppler-utils)");

const META = { toolVersion: "0.1.0-test", generatedAt: "2026-05-28T20:26:40.000Z" };
/** A4 less the report's 14 mm side margins, in CSS pixels (96 per inch): (210 - 28) / 25.4 * 96. */
const A4_CONTENT_PX = Math.floor(((210 - 28) / 25.4) * 96);

const folders: string[] = [];
const temp = (prefix: string) => {
  const d = mkdtempSync(join(tmpdir(), prefix));
  folders.push(d);
  return d;
};
afterAll(() => {
  for (const d of folders) rmSync(d, { recursive: true, force: true });
});

/**
 * In the page: tables whose right edge (or, inside a box that scrolls sideways, that box's right
 * edge) lies past the right edge of the body's content box, and the document's scroll width.
 */
const OVERFLOW = `(() => {
  const body = document.body.getBoundingClientRect();
  const right = body.right - parseFloat(getComputedStyle(document.body).paddingRight);
  const over = [];
  for (const t of document.querySelectorAll("table")) {
    let box = t.parentElement, scroller = null;
    for (; box !== null && box !== document.body; box = box.parentElement) {
      const o = getComputedStyle(box).overflowX;
      if (o === "auto" || o === "scroll") { scroller = box; break; }
    }
    const edge = (scroller ?? t).getBoundingClientRect().right;
    if (edge > right + 0.5) over.push((t.closest("[id]")?.id ?? "?") + " by " + Math.round(edge - right) + " px");
  }
  return { over, scrollWidth: document.documentElement.scrollWidth, viewport: window.innerWidth };
})()`;

describe.skipIf(chrome === null)("report tables fit the page (examples, both editions)", () => {
  let browser: Browser;
  const pages = new Map<string, string>();
  beforeAll(async () => {
    for (const name of ["bakery", "ferry-check-in"] as ExampleName[]) {
      const study = await loadStudy(await writeExample(name, temp("sojourn-print-html-")));
      const { outcome } = await runStudy(study, { workers: 1 });
      const model = buildReportModel(study, outcome, META);
      for (const e of EDITIONS) pages.set(`${name} ${e}`, await renderHtml(model, e));
    }
    browser = await puppeteer.launch({ executablePath: chrome as string, headless: true, args: [...CHROME_FLAGS, `--user-data-dir=${temp("sojourn-print-profile-")}`] });
  }, 240_000);
  afterAll(async () => {
    await browser?.close();
  });

  for (const name of ["bakery", "ferry-check-in"]) {
    for (const edition of EDITIONS) {
      it(`${name}, ${edition} edition: no table past the content box on screen at 800 px, nor in print at A4 width (${A4_CONTENT_PX} px)`, async () => {
        const page = await browser.newPage();
        try {
          await page.setContent(pages.get(`${name} ${edition}`) as string, { waitUntil: "load" });
          await page.setViewport({ width: 800, height: 1000 });
          await page.emulateMediaType("screen");
          const screen = (await page.evaluate(OVERFLOW)) as { over: string[]; scrollWidth: number; viewport: number };
          expect(screen.over).toEqual([]);
          expect(screen.scrollWidth).toBeLessThanOrEqual(screen.viewport);
          await page.setViewport({ width: A4_CONTENT_PX, height: 1000 });
          await page.emulateMediaType("print");
          const print = (await page.evaluate(OVERFLOW)) as { over: string[]; scrollWidth: number; viewport: number };
          expect(print.over).toEqual([]);
          expect(print.scrollWidth).toBeLessThanOrEqual(print.viewport);
        } finally {
          await page.close();
        }
      }, 60_000);
    }
  }
});

/** PDF outline titles (bookmarks): literal or UTF-16 hex strings after /Title. */
function outlineTitles(pdf: Buffer): string[] {
  const text = pdf.toString("latin1");
  return [...text.matchAll(/\/Title\s*(\((?:\\.|[^\\)])*\)|<[0-9A-Fa-f\s]*>)/g)].map(([, raw]) => {
    if (raw.startsWith("<")) {
      const bytes = Buffer.from(raw.slice(1, -1).replace(/\s/g, ""), "hex");
      if (bytes[0] === 0xfe && bytes[1] === 0xff) return bytes.subarray(2).swap16().toString("utf16le");
      return bytes.toString("latin1");
    }
    return raw.slice(1, -1).replace(/\\(.)/g, "$1");
  });
}

describe("the layout readers of test/helpers/printLayout.ts", () => {
  it("headingsAtFoot finds a heading that ends a page, also when it wraps over two lines, and not one followed by text or on the last page", () => {
    const heads = ["Input files", "lane_queue — time average — two-booths"];
    const bodies = [
      ["some text", "Input files"],
      ["more text", "lane_queue — time average —", "two-booths"],
      ["Input files", "a table under it"],
      ["last page", "Input files"],
    ];
    expect(headingsAtFoot(bodies, heads)).toEqual([
      { page: 1, heading: "Input files" },
      { page: 2, heading: "lane_queue — time average — two-booths" },
    ]);
  });

  it("printedContents reads label and page from the page holding CONTENTS; headingOf gives an anchor's first heading", () => {
    const bodies = [["cover"], ["CONTENTS", "Summary 2", "Method notes 15", "Audit appendix 18"]];
    expect(printedContents(bodies, [{ label: "Summary" }, { label: "Method notes" }, { label: "Missing" }])).toEqual(new Map([["Summary", 2], ["Method notes", 15]]));
    expect(headingOf('<section id="s"><p>x</p><h2>Every &amp; one</h2></section>', "s")).toBe("Every & one");
    expect(headingOf("<p>none</p>", "s")).toBeNull();
  });
});

describe.skipIf(chrome === null || !pdftotext)("the printed report (examples)", () => {
  const cases: { name: ExampleName; edition: "audit" | "client" }[] = [
    { name: "ferry-check-in", edition: "audit" },
    { name: "bakery", edition: "client" },
  ];
  interface Printed {
    html: string;
    pdf: string;
    record: { report: { edition: string }; pdf: { pages: number } };
  }
  const out = new Map<string, Printed>();

  for (const c of cases) {
    const key = `${c.name} ${c.edition}`;
    describe(`${c.name}, ${c.edition} edition`, () => {
      beforeAll(async () => {
        const dir = temp("sojourn-print-pdf-");
        const manifest = await writeExample(c.name, dir);
        const r = sojourn(["report", manifest, "--out", join(dir, "report"), "--pdf", "--edition", c.edition, "--quiet"], dir);
        expect(r.status, r.stderr).toBe(0);
        out.set(key, {
          html: readFileSync(join(dir, "report", "report.html"), "utf8"),
          pdf: join(dir, "report", "report.pdf"),
          record: JSON.parse(readFileSync(join(dir, "report", "record.json"), "utf8")),
        });
      }, 400_000);

      it("report --pdf records the edition; the PDF has bookmarks, one for each section heading", () => {
        const { html, pdf, record } = out.get(key) as Printed;
        expect(record.report.edition).toBe(c.edition);
        const titles = outlineTitles(readFileSync(pdf)).map(squash);
        const sectionHeadings = [...html.matchAll(/<section class="sheet[^"]*" id="[^"]+">\s*<p class="kicker">[^<]*<\/p>\s*<h2>([^<]*)<\/h2>/g)].map((m) => squash(m[1].replace(/&amp;/g, "&")));
        expect(sectionHeadings.length).toBeGreaterThan(5);
        for (const h of sectionHeadings) expect(titles, h).toContain(h);
      });

      it("the contents list gives each entry's page, and that page holds the entry's heading", () => {
        const { html, pdf } = out.get(key) as Printed;
        const bodies = pageBodies(pdf);
        const entries = contentsEntries(html);
        expect(entries.length).toBeGreaterThan(5);
        const printed = printedContents(bodies, entries);
        for (const e of entries) {
          const page = printed.get(e.label);
          expect(page, `contents entry ${e.label}`).toBeDefined();
          const heading = headingOf(html, e.id);
          expect(heading, e.id).not.toBeNull();
          // the heading as a line of its own on that page (a measure's name also appears inside other headings)
          expect(bodies[(page as number) - 1], `page ${page} should hold the heading "${heading}"`).toContain(heading);
        }
      });

      it("no page ends with a heading, the last page holds more than the colophon, and the cover holds the colophon's facts", () => {
        const { html, pdf } = out.get(key) as Printed;
        const bodies = pageBodies(pdf);
        expect(headingsAtFoot(bodies, headings(html))).toEqual([]);
        const last = bodies[bodies.length - 1].join(" ");
        const colophon = last.indexOf("Made by Sojourn");
        expect((colophon < 0 ? last : last.slice(0, colophon)).trim().length).toBeGreaterThan(40);
        // the colophon's facts on paper: tool and version, the edition, the rounding rule
        const cover = bodies[0].join(" ");
        expect(cover).toContain("Sojourn 0.1.0");
        expect(cover.replace(/\s/g, "")).toContain(`${c.edition}edition`.toUpperCase());
        expect(cover).toContain("significant digits");
      });
    });
  }
});
