/**
 * The bad-input catalogue (`docs/bad-input.md`), one test per entry, through the built command
 * line (`npm run build` first).
 *
 * Each entry (test/badInput/cases.ts) must, per CONTRACT.md section 5: exit with status 1 (usage
 * errors 2); print the catalogue's message (src/messages/*.ts), which starts with the file and the
 * line (or the manifest key path) and says "What to do:"; show no stack trace; and show one with
 * `--debug` (common practice: the stack is for the developer, on request). Entries that are not
 * errors exit 0 and print what they report.
 *
 * The doc's examples are the real output of these runs: the last test renders the page from them
 * and compares it with docs/bad-input.md (`SOJOURN_WRITE_DOCS=1 npx vitest run test/badInput`
 * rewrites it).
 */
import { existsSync, readFileSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { rm } from "node:fs/promises";
import { fileURLToPath } from "node:url";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { type BadInputCase, CASES } from "./cases.js";
import { type CliResult, NOBODY, pooled, runCli, studyFolder } from "./runCli.js";
import { renderCatalogue } from "./renderDoc.js";

const DOC = fileURLToPath(new URL("../../docs/bad-input.md", import.meta.url));
const asRoot = process.getuid?.() === 0;

interface Outcome {
  dir: string;
  plain: CliResult;
  debug: CliResult | null;
}
const outcomes = new Map<string, Outcome>();

/** Output with the temporary study folder written as `<study folder>`, as the doc shows it. */
export function portable(text: string, dir: string): string {
  return text.split(dir).join("<study folder>");
}

async function runCase(c: BadInputCase): Promise<Outcome> {
  const dir = studyFolder(c.files);
  c.setup?.(dir);
  const uid = c.unprivileged && asRoot ? NOBODY : undefined;
  const plain = await runCli(c.args, { cwd: dir, env: c.env, uid });
  const debug = c.debug === true ? await runCli([...c.args, "--debug"], { cwd: dir, env: c.env, uid }) : null;
  return { dir, plain, debug };
}

beforeAll(async () => {
  const results = await pooled(CASES.map((c) => () => runCase(c)), 4);
  CASES.forEach((c, i) => outcomes.set(c.id, results[i]));
}, 120_000);

afterAll(async () => {
  await Promise.all([...outcomes.values()].map((o) => rm(o.dir, { recursive: true, force: true })));
});

describe("docs/bad-input.md: every entry through the command line (CONTRACT.md section 5)", () => {
  it("has unique entry ids", () => {
    expect(new Set(CASES.map((c) => c.id)).size).toBe(CASES.length);
  });

  for (const c of CASES) {
    it(`${c.args[0]}: ${c.title} -> exit ${c.status}`, () => {
      const o = outcomes.get(c.id)!;
      const { status, stdout, stderr } = o.plain;
      const both = portable(stdout + stderr, o.dir);
      expect(status, both).toBe(c.status);
      for (const text of c.contains ?? []) expect(both).toContain(text);
      expect(both).not.toMatch(/\n\s+at /); // no stack trace without --debug
      expect(both).not.toContain("internal error");
      for (const [file, content] of Object.entries(c.afterwards ?? {})) {
        if (content === null) expect(existsSync(join(o.dir, file)), file).toBe(false);
        else expect(readFileSync(join(o.dir, file), "utf8"), file).toBe(content);
      }
      if (c.status !== 1) return;

      // CONTRACT.md section 5: where (file, line or key path), what, what to do; nothing else.
      const err = portable(stderr, o.dir);
      expect(err.startsWith("sojourn: ")).toBe(true);
      expect(err).toContain("\n  What to do: ");
      if (c.message !== undefined) expect(err).toBe(`sojourn: ${c.message().message}\n`);
      if (c.startsWith !== undefined) expect(err.startsWith(`sojourn: ${c.startsWith()}`), err).toBe(true);
      if (c.place !== undefined) expect(err.startsWith(`sojourn: ${c.place}`), err).toBe(true);
      expect(stdout).toBe("");

      // common practice: --debug adds the stack trace, after the same message.
      if (o.debug === null) return;
      const d = o.debug;
      expect(d.status).toBe(1);
      expect(portable(d.stderr, o.dir).startsWith(err), d.stderr).toBe(true);
      expect(d.stderr).toMatch(/\n {4}at /);
    });
  }

  it("a PDF that cannot be written still leaves the complete HTML report", () => {
    // CONTRACT.md section 7 and src/record/publish.ts: the PDF comes last, after the folder is in place.
    const o = outcomes.get("pdf-no-browser")!;
    expect(existsSync(join(o.dir, "report", "report.html"))).toBe(true);
    expect(existsSync(join(o.dir, "report", "results.json"))).toBe(true);
  });

  it("--debug is tried on one entry of each message catalogue", () => {
    const kinds = new Set(CASES.filter((c) => c.debug === true).map((c) => c.id));
    expect(kinds.size).toBeGreaterThanOrEqual(6);
    for (const id of kinds) expect(outcomes.get(id)!.debug?.stderr ?? "").toMatch(/\n {4}at /);
  });

  it("the unreadable-file case really ran without read permission", () => {
    // A guard for the entry above: as root the command runs as user `nobody`, else as the user.
    const c = CASES.find((x) => x.id === "run-file-unreadable")!;
    expect(c.unprivileged).toBe(true);
    expect(outcomes.get(c.id)!.plain.stderr).toContain("permission denied");
  });

  it("docs/bad-input.md shows exactly the output of these runs", () => {
    const page = renderCatalogue(CASES, (c) => {
      const o = outcomes.get(c.id)!;
      return { status: o.plain.status, output: portable(o.plain.stdout + o.plain.stderr, o.dir) };
    });
    if (process.env.SOJOURN_WRITE_DOCS === "1") writeFileSync(DOC, page);
    expect(readFileSync(DOC, "utf8")).toBe(page);
  });
});
