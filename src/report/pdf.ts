/**
 * The PDF: the same HTML printed by a system Chromium through puppeteer-core, with a running
 * header (the study title) and page numbers. puppeteer-core is imported only here, and only
 * when a PDF is asked for.
 */
import { accessSync, constants, mkdirSync, mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { onInterrupt } from "../interrupt.js";
import { reportMessages } from "../messages/index.js";
import { errorCode, nodeFs, type OutputFs } from "../fileSystem.js";

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
    await page.setContent(html, { waitUntil: "load" });
    const title = escapeHtml(options.title);
    const small = "font: 8px 'Liberation Sans', Arial, sans-serif; color: #6b6357; width: 100%; padding: 0 14mm;";
    progress(`printing on ${options.paper} paper`);
    const pdf = await page.pdf({
      format: options.paper,
      printBackground: true,
      displayHeaderFooter: true,
      headerTemplate: `<div style="${small} display: flex; justify-content: space-between;"><span>${title}</span><span>Sojourn report</span></div>`,
      footerTemplate: `<div style="${small} text-align: right;">page <span class="pageNumber"></span> of <span class="totalPages"></span></div>`,
      margin: { top: "20mm", bottom: "18mm", left: "14mm", right: "14mm" },
    });
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
