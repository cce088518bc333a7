/**
 * Reading a printed report back (poppler's pdftotext) to check its page layout: the contents'
 * page numbers, headings left alone at a page's foot, a last page holding only the colophon.
 * Headings are taken from report.html itself, so the checks follow the page as it is.
 */
import { spawnSync } from "node:child_process";

/** pdftotext is there (poppler-utils), or the print tests skip. */
export function havePdftotext(): boolean {
  return spawnSync("pdftotext", ["-v"], { encoding: "utf8" }).status === 0;
}

/** Whitespace collapsed to one space, trimmed: how a heading compares with pdftotext's lines. */
export const squash = (s: string) => s.replace(/\s+/g, " ").trim();

function unescapeHtml(s: string): string {
  return s
    .replace(/<[^>]*>/g, "")
    .replace(/&lt;/g, "<").replace(/&gt;/g, ">").replace(/&quot;/g, '"').replace(/&#x27;|&#39;/g, "'").replace(/&#x3D;/g, "=").replace(/&#x60;/g, "`").replace(/&amp;/g, "&");
}

/** Every h2, h3 and h4 of the page as text. */
export function headings(html: string): string[] {
  return [...html.matchAll(/<h([234])\b[^>]*>([\s\S]*?)<\/h\1>/g)].map((m) => squash(unescapeHtml(m[2])));
}

/** The heading that an anchor's element starts with (its first h2/h3/h4 after the id), or null. */
export function headingOf(html: string, id: string): string | null {
  const at = html.indexOf(` id="${id}"`);
  if (at < 0) return null;
  const m = /<h([234])\b[^>]*>([\s\S]*?)<\/h\1>/.exec(html.slice(at));
  return m === null ? null : squash(unescapeHtml(m[2]));
}

/** The contents entries of the page: label and anchor. */
export function contentsEntries(html: string): { label: string; id: string }[] {
  const nav = /<nav class="contents"[\s\S]*?<\/nav>/.exec(html);
  if (nav === null) return [];
  return [...nav[0].matchAll(/<a href="#([^"]+)">([\s\S]*?)<\/a>/g)].map((m) => ({ id: m[1], label: squash(unescapeHtml(m[2])) }));
}

/**
 * The text of each page without the running header (its first line) and the footer ("page N of
 * M"): the lines of the body, squashed, empty lines left out.
 */
export function pageBodies(pdfPath: string): string[][] {
  const r = spawnSync("pdftotext", ["-layout", pdfPath, "-"], { encoding: "utf8", maxBuffer: 1 << 28 });
  if (r.status !== 0) throw new Error(`pdftotext failed: ${r.stderr}`);
  const pages = r.stdout.split("\f");
  if (pages[pages.length - 1].trim() === "") pages.pop();
  return pages.map((p) => {
    const lines = p.split("\n").map(squash).filter((l) => l !== "");
    lines.shift(); // the running header
    if (lines.length > 0 && /^page \d+ of \d+$/.test(lines[lines.length - 1])) lines.pop();
    return lines;
  });
}

/**
 * Pages whose body ends with a heading (the heading's text is the last line, or the last lines
 * joined when it wraps), i.e. a heading printed at a page's foot with nothing of its own under it.
 * The last page is not counted (its final heading would have nothing after it anyway).
 */
export function headingsAtFoot(bodies: string[][], heads: string[]): { page: number; heading: string }[] {
  const set = new Set(heads);
  const found: { page: number; heading: string }[] = [];
  bodies.forEach((lines, i) => {
    if (i === bodies.length - 1 || lines.length === 0) return;
    for (let k = 1; k <= Math.min(3, lines.length); k++) {
      const tail = lines.slice(-k).join(" ");
      if (set.has(tail)) {
        found.push({ page: i + 1, heading: tail });
        return;
      }
    }
  });
  return found;
}

/** The page numbers the contents list prints, label -> page (read from the first page holding "CONTENTS"). */
export function printedContents(bodies: string[][], entries: { label: string }[]): Map<string, number> {
  const page = bodies.find((lines) => lines.some((l) => l === "CONTENTS" || l === "C O N T E N T S")) ?? [];
  const out = new Map<string, number>();
  for (const e of entries) {
    const line = page.find((l) => l.startsWith(`${e.label} `) && /\s\d+$/.test(l));
    if (line !== undefined) out.set(e.label, Number(/(\d+)$/.exec(line)?.[1]));
  }
  return out;
}
