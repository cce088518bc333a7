import { mkdtempSync, rmSync, writeFileSync, chmodSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterEach, describe, expect, it } from "vitest";
import { countPdfPages, findChrome, renderPdf } from "../../src/report/pdf.js";
import { reportMessages, UserError } from "../../src/messages/index.js";

const saved = process.env.SOJOURN_CHROME;
afterEach(() => {
  if (saved === undefined) delete process.env.SOJOURN_CHROME;
  else process.env.SOJOURN_CHROME = saved;
});

describe("findChrome", () => {
  it("findChrome returns an explicit executable path, and null for an explicit path that does not exist", () => {
    const dir = mkdtempSync(join(tmpdir(), "sojourn-chrome-find-"));
    try {
      const fake = join(dir, "my-chrome");
      writeFileSync(fake, "#!/bin/sh\n");
      chmodSync(fake, 0o755);
      expect(findChrome(fake)).toBe(fake);
      expect(findChrome(join(dir, "missing"))).toBeNull();
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });

  it("findChrome uses SOJOURN_CHROME when no explicit path is given", () => {
    const dir = mkdtempSync(join(tmpdir(), "sojourn-chrome-env-"));
    try {
      const fake = join(dir, "env-chrome");
      writeFileSync(fake, "#!/bin/sh\n");
      chmodSync(fake, 0o755);
      process.env.SOJOURN_CHROME = fake;
      expect(findChrome()).toBe(fake);
      process.env.SOJOURN_CHROME = join(dir, "missing");
      expect(findChrome()).toBeNull();
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });
});

describe("renderPdf", () => {
  it("renderPdf with a --chrome path that does not exist throws the catalogue's UserError (exit 1) and writes nothing", async () => {
    const dir = mkdtempSync(join(tmpdir(), "sojourn-pdf-nochrome-"));
    try {
      const missing = join(dir, "no-such-chrome");
      const out = join(dir, "report.pdf");
      const err = await renderPdf("<p>x</p>", out, { chrome: missing, paper: "A4", title: "t" }).catch((e: unknown) => e);
      expect(err).toBeInstanceOf(UserError);
      expect((err as UserError).exitCode).toBe(1);
      expect((err as UserError).message).toBe(reportMessages.browserMissing(missing, "--chrome").message);
      // The message says how to get a browser (brief: apt-get install chromium, --chrome, SOJOURN_CHROME).
      expect((err as UserError).message).toContain("apt-get install chromium");
      expect(() => rmSync(out)).toThrow();
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });

  it("noBrowser names the install command, --chrome and SOJOURN_CHROME", () => {
    const m = reportMessages.noBrowser(["/usr/bin/chromium"]).message;
    expect(m).toContain("apt-get install chromium");
    expect(m).toContain("--chrome PATH");
    expect(m).toContain("SOJOURN_CHROME");
  });
});

describe("countPdfPages", () => {
  it("countPdfPages counts /Type /Page objects and not the /Pages tree", () => {
    // Hand-made PDF object text: one /Pages node with two /Page leaves (PDF 1.7, section 7.7.3).
    const pdf = Buffer.from("1 0 obj << /Type /Pages /Kids [2 0 R 3 0 R] >>\n2 0 obj << /Type /Page >>\n3 0 obj << /Type/Page /Parent 1 0 R >>", "latin1");
    expect(countPdfPages(pdf)).toBe(2);
  });
});
