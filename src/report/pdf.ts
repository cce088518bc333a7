/**
 * The PDF: the same HTML printed by a system Chromium through puppeteer-core, with a running
 * header (the study title), page numbers, bookmarks (the PDF outline, from the headings) and a
 * contents list with the page of each entry. puppeteer-core is imported only here, and only
 * when a PDF is asked for.
 *
 *   report.html ──▶ contents entries get a page-number box ("000") ──▶ print, plain (no tags) ──▶
 *   pages of the entries' anchors (named destinations, src/report/pdfDestinations.ts) ──▶ numbers
 *   written in ──▶ print, tagged, with the outline ──▶ the anchors' pages read again: the same? done
 *   (else numbers again, at most three final prints)
 *
 * The numbers replace boxes of the same width, so the second print lays out as the first.
 */
import { accessSync, constants, mkdirSync, mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { onInterrupt } from "../interrupt.js";
import { reportMessages } from "../messages/index.js";
import { errorCode, nodeFs, type OutputFs } from "../fileSystem.js";
import { destinationPages } from "./pdfDestinations.js";

/** Where to look for a browser when neither `--chrome` nor SOJOURN_CHROME names one. */
export const CHROME_CANDIDATES = [
  "/usr/bin/chromium",
  "/usr/bin/chromium-browser",
  "/usr/bin/google-chrome",
  "/usr/bin/google-chrome-stable",
  "/snap/bin/chromium",
  "/opt/google/chrome/chrome",
  "/Applications/Chromium.app/Contents/MacOS/Chromium",
  "/Applications/Google Chrome.app/Contents/MacOS/Google Chrome",
  "C:\\Program Files\\Google\\Chrome\\Application\\chrome.exe",
];

/** Flags that let Chromium print headless as root, offline, without touching a profile. */
export const CHROME_FLAGS = [
  "--headless",
  "--no-sandbox",
  "--disable-gpu",
  "--disable-quic",
  "--no-first-run",
  "--disable-background-networking",
  "--disable-component-update",
  "--disable-sync",
];

function executable(path: string): boolean {
  try {
    accessSync(path, constants.X_OK);
    return true;
  } catch {
    return false;
  }
}

/**
 * The browser to print with: the explicit path (`--chrome`) if given, else SOJOURN_CHROME if
 * set, else the first executable of `CHROME_CANDIDATES`. A path that is named but missing gives
 * null rather than a silent fallback to another browser.
 */
export function findChrome(explicit?: string): string | null {
  if (explicit !== undefined && explicit !== "") return executable(explicit) ? explicit : null;
  const env = process.env.SOJOURN_CHROME;
  if (env !== undefined && env !== "") return executable(env) ? env : null;
  return CHROME_CANDIDATES.find(executable) ?? null;
}

/** The browser to use, or the user error that says how to get one. */
function chromeOrThrow(explicit?: string): string {
  const found = findChrome(explicit);
  if (found !== null) return found;
  if (explicit !== undefined && explicit !== "") throw reportMessages.browserMissing(explicit, "--chrome");
  const env = process.env.SOJOURN_CHROME;
  if (env !== undefined && env !== "") throw reportMessages.browserMissing(env, "SOJOURN_CHROME");
  throw reportMessages.noBrowser(CHROME_CANDIDATES);
}

/** Number of pages in a PDF, counted from its page objects (`/Type /Page`, not `/Pages`). */
export function countPdfPages(pdf: Uint8Array): number {
  const text = Buffer.from(pdf).toString("latin1");
  return (text.match(/\/Type\s*\/Page(?![a-zA-Z])/g) ?? []).length;
}

/**
 * The time one print may take: 60 s, and 60 s more for each MB of HTML (a 2.7 MB audit edition
 * printed in 12 s on an idle 2-core machine and took over 30 s with three other jobs running;
 * docs/performance.md).
 */
export function printBudgetMs(htmlLength: number): number {
  return 60_000 + Math.ceil((htmlLength / 1_000_000) * 60_000);
}

/** Most final prints made to settle the contents' page numbers. */
const MAX_FINAL_PRINTS = 3;

/**
 * In the page (browser JavaScript, so the node code needs no DOM types): each contents entry gets
 * a leader and a page-number box; the value is the entries' anchors, in order.
 */
const ADD_PAGE_BOXES = `(() => {
  const ids = [];
  for (const li of document.querySelectorAll("nav.contents li")) {
    const a = li.querySelector("a[href^='#']");
    if (a === null) continue;
    ids.push(decodeURIComponent(a.getAttribute("href").slice(1)));
    const leader = document.createElement("span");
    leader.className = "leader";
    const box = document.createElement("span");
    box.className = "page-no";
    box.textContent = "000";
    li.append(leader, box);
  }
  document.documentElement.classList.add("paged");
  return ids;
})()`;

/** In the page: the page numbers (a JSON array of strings) into the boxes, in the order of the entries. */
const fillPageBoxes = (numbers: string[]) => `(() => {
  const numbers = ${JSON.stringify(numbers)};
  document.querySelectorAll("nav.contents li .page-no").forEach((b, i) => { b.textContent = numbers[i] ?? ""; });
})()`;

function escapeHtml(s: string): string {
  return s.replace(/[&<>"']/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c] as string);
}

/**
 * Prints the report's HTML to `pdfPath` (written beside, then renamed into place).
 *
 * The browser runs with a fresh profile folder in the system's temporary folder, which also
 * takes the browser's own temporary files. It is removed
 * when printing ends, fails, or is interrupted: on SIGINT or SIGTERM the browser is killed, the
 * profile and the partial PDF are removed, and the process exits (src/interrupt.ts). Errors of
 * the file system (a full disk) are thrown as they are, for the caller to put in words.
 */
export async function renderPdf(
  html: string,
  pdfPath: string,
  options: { chrome?: string; paper: "A4" | "Letter"; title: string; onProgress?: (msg: string) => void; fs?: OutputFs },
): Promise<{ pages: number }> {
  const chrome = chromeOrThrow(options.chrome);
  const progress = options.onProgress ?? (() => {});
  const fs = options.fs ?? nodeFs;
  // The browser's profile and its own temporary files (TMPDIR) both live in one folder of ours,
  // so that removing it leaves nothing behind, even after the browser was killed.
  const profile = mkdtempSync(join(tmpdir(), "sojourn-chrome-"));
  mkdirSync(join(profile, "data"));
  mkdirSync(join(profile, "tmp"));
  const partial = `${pdfPath}.partial`;
  const budget = printBudgetMs(html.length);
  let browser: import("puppeteer-core").Browser | undefined;
  const release = onInterrupt(() => {
    browser?.process()?.kill("SIGKILL");
    rmSync(partial, { force: true });
    rmSync(profile, { recursive: true, force: true, maxRetries: 5, retryDelay: 20 });
  });
  try {
    progress(`starting the browser at ${chrome}`);
    const puppeteer = (await import("puppeteer-core")).default;
    try {
      browser = await puppeteer.launch({
        executablePath: chrome,
        headless: true,
        args: [...CHROME_FLAGS, `--user-data-dir=${join(profile, "data")}`],
        env: { ...process.env, TMPDIR: join(profile, "tmp") },
        // one print may take `budget`; the protocol must wait at least as long
        protocolTimeout: budget + 60_000,
        // Sojourn's own handler (above) stops the browser on a signal and removes its profile.
        handleSIGINT: false,
        handleSIGTERM: false,
        handleSIGHUP: false,
      });
    } catch (err) {
      throw reportMessages.browserFailed(chrome, (err as Error).message.split("\n")[0]);
    }
    const page = await browser.newPage();
    progress("laying out the report");
    page.setDefaultTimeout(budget);
    await page.setContent(html, { waitUntil: "load", timeout: budget });
    const title = escapeHtml(options.title);
    const small = "font: 8px 'Liberation Sans', Arial, sans-serif; color: #6b6357; width: 100%; padding: 0 14mm;";
    const print = (final: boolean) =>
      page.pdf({
        format: options.paper,
        printBackground: true,
        displayHeaderFooter: true,
        headerTemplate: `<div style="${small} display: flex; justify-content: space-between;"><span>${title}</span><span>Sojourn report</span></div>`,
        footerTemplate: `<div style="${small} text-align: right;">page <span class="pageNumber"></span> of <span class="totalPages"></span></div>`,
        margin: { top: "20mm", bottom: "18mm", left: "14mm", right: "14mm" },
        // The outline (bookmarks) is made from the tagged structure; the first print only finds pages.
        tagged: final,
        outline: final,
        timeout: budget,
      });
    const ids = (await page.evaluate(ADD_PAGE_BOXES)) as string[];
    progress(`finding the pages of the ${ids.length} contents entries (${options.paper} paper)`);
    let landed = destinationPages(await print(false));
    let pdf: Uint8Array;
    for (let n = 1; ; n++) {
      const numbers = ids.map((id) => String(landed?.get(id) ?? ""));
      await page.evaluate(fillPageBoxes(numbers));
      progress(n === 1 ? "printing with bookmarks and the contents' page numbers" : "printing again: an entry moved to another page");
      pdf = await print(true);
      const again = destinationPages(pdf);
      if (again === null || landed === null) {
        progress("the contents list is printed without page numbers: the PDF's destinations could not be read");
        break;
      }
      if (ids.every((id) => again.get(id) === landed?.get(id)) || n === MAX_FINAL_PRINTS) break;
      landed = again;
    }
    fs.writeFile(partial, pdf);
    fs.rename(partial, pdfPath);
    const pages = countPdfPages(readFileSync(pdfPath));
    progress(`printed ${pages} pages`);
    return { pages };
  } catch (err) {
    rmSync(partial, { force: true });
    if (err instanceof Error && err.name === "UserError") throw err;
    if (errorCode(err) !== null && (err as NodeJS.ErrnoException).syscall !== undefined) throw err;
    throw reportMessages.browserFailed(chrome, (err as Error).message.split("\n")[0]);
  } finally {
    await browser?.close().catch(() => {});
    rmSync(profile, { recursive: true, force: true, maxRetries: 5, retryDelay: 20 });
    release();
  }
}
