/**
 * On which page of a PDF each named destination lies: what the PDF step needs to write page
 * numbers into the contents list (Chromium has no CSS page counters for that, so the report is
 * printed once, the pages of the anchors are read from that PDF, and it is printed again with
 * the numbers; src/report/pdf.ts).
 *
 * Chromium writes an anchor that a link points at as a named destination (`/Dests` of the
 * document catalog, each `/name [page 0 R /XYZ x y z]`). This reader follows the PDF file
 * structure (ISO 32000-1, 7.5 "File structure" and 7.7.2 "Document catalog", 12.3.2.3 "Named
 * destinations"): the cross-reference table at `startxref`, the trailer's `/Root`, the page tree
 * from `/Pages` by `/Kids` in order, and the `/Dests` dictionary. It handles what Chromium writes
 * (a classic cross-reference table, destinations as a dictionary); anything else gives null, and
 * the caller prints without page numbers rather than guess.
 */

/** Named destination -> 1-based page number; null when the file's structure is not one this reader follows. */
export function destinationPages(pdf: Uint8Array): Map<string, number> | null {
  const text = Buffer.from(pdf.buffer, pdf.byteOffset, pdf.byteLength).toString("latin1");
  const offsets = crossReference(text);
  if (offsets === null) return null;
  const body = (n: number): string | null => {
    const at = offsets.get(n);
    if (at === undefined) return null;
    const head = /^\s*\d+\s+\d+\s+obj\s*/.exec(text.slice(at, at + 40));
    if (head === null) return null;
    return objectValue(text, at + head[0].length);
  };
  const trailer = /trailer\s*<<([\s\S]*?)>>\s*startxref/.exec(text.slice(text.lastIndexOf("trailer")));
  const root = trailer === null ? null : ref(trailer[1], "Root");
  const catalog = root === null ? null : body(root);
  if (catalog === null) return null;
  const pagesRoot = ref(catalog, "Pages");
  const destsRef = ref(catalog, "Dests");
  if (pagesRoot === null || destsRef === null) return null;

  // The page tree, depth first in /Kids order: page object number -> page number.
  const pageNo = new Map<number, number>();
  const walk = (n: number, depth: number): boolean => {
    const node = body(n);
    if (node === null || depth > 64) return false;
    if (/\/Type\s*\/Pages\b/.test(node)) {
      const kids = /\/Kids\s*\[([^\]]*)\]/.exec(node);
      if (kids === null) return false;
      for (const m of kids[1].matchAll(/(\d+)\s+\d+\s+R/g)) if (!walk(Number(m[1]), depth + 1)) return false;
      return true;
    }
    if (/\/Type\s*\/Page\b/.test(node)) {
      pageNo.set(n, pageNo.size + 1);
      return true;
    }
    return false;
  };
  if (!walk(pagesRoot, 0)) return null;

  const dests = body(destsRef);
  if (dests === null) return null;
  const out = new Map<string, number>();
  // Each entry: a name, then an array [page 0 R ...] or a reference to one.
  for (const m of dests.matchAll(/\/([^\s/[\]<>()%{}]+)\s*(?:\[\s*(\d+)\s+\d+\s+R|(\d+)\s+\d+\s+R)/g)) {
    let page = m[2] !== undefined ? Number(m[2]) : null;
    if (page === null) {
      const target = body(Number(m[3]));
      const arr = target === null ? null : /\[\s*(\d+)\s+\d+\s+R/.exec(target);
      if (arr === null) continue;
      page = Number(arr[1]);
    }
    const no = pageNo.get(page);
    if (no !== undefined) out.set(pdfName(m[1]), no);
  }
  return out;
}

/** Object number -> byte offset, from the classic cross-reference table that `startxref` points at. */
function crossReference(text: string): Map<number, number> | null {
  const sx = /startxref\s+(\d+)\s+%%EOF\s*$/.exec(text.slice(-64));
  if (sx === null) return null;
  let at = Number(sx[1]);
  if (text.slice(at, at + 4) !== "xref") return null;
  at += 4;
  const offsets = new Map<number, number>();
  const section = /\s*(\d+)\s+(\d+)\s*?\r?\n/y;
  for (;;) {
    section.lastIndex = at;
    const s = section.exec(text);
    if (s === null) break;
    const first = Number(s[1]);
    const count = Number(s[2]);
    at = section.lastIndex;
    for (let i = 0; i < count; i++) {
      const entry = text.slice(at, at + 20);
      const e = /^(\d{10}) (\d{5}) ([nf])/.exec(entry);
      if (e === null) return null;
      if (e[3] === "n") offsets.set(first + i, Number(e[1]));
      at += 20;
    }
  }
  return offsets.size > 0 ? offsets : null;
}

/** The text of the value that starts at `at`: a dictionary (to its matching `>>`), else up to `endobj`. */
function objectValue(text: string, at: number): string {
  if (text.startsWith("<<", at)) {
    let depth = 0;
    for (let i = at; i < text.length - 1; i++) {
      if (text[i] === "(") {
        // a literal string: skip it, with its escapes and balanced parentheses
        let d = 0;
        for (; i < text.length; i++) {
          if (text[i] === "\\") i++;
          else if (text[i] === "(") d++;
          else if (text[i] === ")" && --d === 0) break;
        }
      } else if (text[i] === "<" && text[i + 1] === "<") {
        depth++;
        i++;
      } else if (text[i] === ">" && text[i + 1] === ">") {
        depth--;
        i++;
        if (depth === 0) return text.slice(at, i + 1);
      }
    }
    return text.slice(at);
  }
  const end = text.indexOf("endobj", at);
  return text.slice(at, end < 0 ? undefined : end);
}

/** `/Key N 0 R` in a dictionary's text: N, or null. */
function ref(dict: string, key: string): number | null {
  const m = new RegExp(`/${key}\\s+(\\d+)\\s+\\d+\\s+R`).exec(dict);
  return m === null ? null : Number(m[1]);
}

/** A PDF name's characters (ISO 32000-1, 7.3.5: `#XX` is the byte XX), read as UTF-8. */
function pdfName(raw: string): string {
  const bytes: number[] = [];
  for (let i = 0; i < raw.length; i++) {
    if (raw[i] === "#" && /^[0-9A-Fa-f]{2}$/.test(raw.slice(i + 1, i + 3))) {
      bytes.push(parseInt(raw.slice(i + 1, i + 3), 16));
      i += 2;
    } else bytes.push(raw.charCodeAt(i) & 0xff);
  }
  return Buffer.from(bytes).toString("utf8");
}
