/**
 * Messages of the report phase (HTML and PDF output).
 */
import { UserError } from "./error.js";

/** No Chromium-family browser was found for the PDF. */
export function noBrowser(tried: string[]): UserError {
  return new UserError(
    `Cannot write the PDF: no Chromium or Chrome browser was found (looked at: ${tried.join(", ")}).\n` +
      "  What to do: install one (Debian/Ubuntu: `apt-get install chromium`), or name it with `--chrome PATH` " +
      "or the environment variable SOJOURN_CHROME. The HTML report does not need a browser.",
  );
}

/** The browser named with --chrome or SOJOURN_CHROME does not exist. */
export function browserMissing(path: string, from: "--chrome" | "SOJOURN_CHROME"): UserError {
  return new UserError(
    `Cannot write the PDF: the browser named by ${from} does not exist: ${path}\n` +
      "  What to do: give the full path of a Chromium or Chrome executable (for example /usr/bin/chromium), " +
      "or install one (Debian/Ubuntu: `apt-get install chromium`).",
  );
}

/** The browser started but failed to lay out or print the report. */
export function browserFailed(path: string, detail: string): UserError {
  return new UserError(
    `Cannot write the PDF: the browser at ${path} failed: ${detail}\n` +
      "  What to do: check that the browser starts on its own (`" + path + " --headless --version`), " +
      "or name another one with `--chrome PATH`. The HTML report was not affected.",
  );
}

/** The report templates are missing from the installation. */
export function templatesMissing(folder: string, detail: string): UserError {
  return new UserError(
    `Cannot write the report: its templates are missing or unreadable in ${folder} (${detail}).\n` +
      "  What to do: reinstall Sojourn; the templates folder ships with it.",
  );
}
