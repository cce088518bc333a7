/**
 * docs/tutorial.md and docs/auditing.md are run as written: every command of their ```sh blocks,
 * in order, in a fresh copy of the example they use, and every quoted output, file excerpt and
 * page excerpt compared with what the commands printed and wrote (the marking is explained in
 * runDoc.ts and at the top of each page). The commands need the built command line (`npm test`
 * builds first). No PDF is made: the pages only mention `--pdf` in a comment.
 */
import { chmodSync, cpSync, mkdirSync, mkdtempSync, readFileSync, rmSync, symlinkSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { delimiter, join } from "node:path";
import { fileURLToPath } from "node:url";
import { afterAll, describe, expect, it } from "vitest";
import { excerptProblem, pageProblem, pageText, parseDoc, runDoc } from "./runDoc.js";

const ROOT = fileURLToPath(new URL("../..", import.meta.url));
const MAIN = fileURLToPath(new URL("../../dist/cli/main.js", import.meta.url));

const made: string[] = [];
afterAll(() => {
  for (const dir of made) rmSync(dir, { recursive: true, force: true });
});

/**
 * A folder laid out like the repository for the pages' commands: the built `dist/` and
 * `node_modules/` linked, the bakery example copied without its runs, and `sojourn` on the PATH.
 */
function sandbox(): { dir: string; env: NodeJS.ProcessEnv } {
  const dir = mkdtempSync(join(tmpdir(), "sojourn-docs-"));
  made.push(dir);
  symlinkSync(join(ROOT, "dist"), join(dir, "dist"));
  symlinkSync(join(ROOT, "node_modules"), join(dir, "node_modules"));
  cpSync(join(ROOT, "examples", "bakery"), join(dir, "examples", "bakery"), { recursive: true, filter: (src) => !src.includes(join("bakery", "runs")) });
  const bin = join(dir, ".bin");
  mkdirSync(bin);
  writeFileSync(join(bin, "sojourn"), `#!/bin/sh\nexec "${process.execPath}" "${MAIN}" "$@"\n`);
  chmodSync(join(bin, "sojourn"), 0o755);
  return { dir, env: { ...process.env, PATH: bin + delimiter + (process.env.PATH ?? "") } };
}

function doc(name: string): string {
  return readFileSync(join(ROOT, "docs", name), "utf8");
}

describe("runDoc: the checker itself", () => {
  it("finds a stale figure, a command that fails, a quote out of order and an unchecked figure (the check can fail)", () => {
    const { dir, env } = sandbox();
    const page = [
      "```sh", "printf 'a 1\\nb 2\\nc 3\\n' > f.txt", "cat f.txt", "```",
      "```output", "a 1", "b 2", "```", // good
      "```output", "b 2", "a 1", "```", // out of order
      "```text file=f.txt", "…", "c 4", "```", // stale
      "```", "the total was 6", "```", // unchecked figure
      "```sh", "false", "```",
    ].join("\n");
    const r = runDoc("page.md", page, dir, env);
    expect(r.commands).toBe(3);
    expect(r.quotes).toBe(3);
    expect(r.problems.map((p) => p.split(":").slice(0, 2).join(":"))).toEqual(["page.md:9", "page.md:13", "page.md:17", "page.md:21"]);
    expect(r.problems[0]).toContain("not one after the other");
    expect(r.problems[1]).toContain('not found: "c 4"');
    expect(r.problems[2]).toContain("holds a figure");
    expect(r.problems[3]).toContain('"false" exited with status 1');
  });

  it("parseDoc reads a fenced block inside a list item, without its indentation", () => {
    const blocks = parseDoc(["1. The summary:", "", "   ```text page=report/report.html", "   regular-rota 0.7998", "   ```"].join("\n"));
    expect(blocks).toEqual([{ kind: "page", line: 3, path: "report/report.html", lines: ["regular-rota 0.7998"] }]);
  });

  it("excerptProblem takes … as any lines or any text, and nothing else as a wildcard", () => {
    const actual = ["Report written to /tmp/x/report in 2.1 s", "  one", "  two", "three"];
    expect(excerptProblem(["Report written to …/report in … s"], actual)).toBeNull();
    expect(excerptProblem(["  one", "…", "three"], actual)).toBeNull();
    expect(excerptProblem(["  one", "three"], actual)).not.toBeNull();
    expect(excerptProblem(["Report written to /tmp/x/report in 2.2 s"], actual)).not.toBeNull();
    expect(excerptProblem(["  two", "  one"], actual)).not.toBeNull();
  });

  it("pageText shows what a reader sees, and pageProblem finds quoted text in it", () => {
    const html = "<style>td{}</style><table><tr><td>regular&#x2D;rota</td><td><a href=\"#c\">0.7998</a>\n</td><td>[0.7675, 0.832]</td></tr></table><script>var x = '0.7998';</script>";
    expect(pageText(html).trim()).toBe("regular-rota 0.7998 [0.7675, 0.832]");
    expect(pageProblem(["regular-rota 0.7998", "[0.7675, 0.832]"], pageText(html))).toBeNull();
    expect(pageProblem(["regular-rota 0.7999"], pageText(html))).not.toBeNull();
  });
});

describe("the pages run as written", () => {
  // A page's commands depend on the ones before them, so each page is one test.
  for (const name of ["tutorial.md", "auditing.md"]) {
    it(`${name}: every command exits 0 and every quoted output, file and page excerpt matches`, { timeout: 180_000 }, () => {
      const text = doc(name);
      const { dir, env } = sandbox();
      const r = runDoc(`docs/${name}`, text, dir, env);
      expect(r.problems).toEqual([]);
      // the page was checked at all: it runs the report and quotes what it shows
      expect(r.commands).toBeGreaterThanOrEqual(4);
      expect(r.quotes).toBeGreaterThanOrEqual(6);
      expect(parseDoc(text).some((b) => b.kind === "page")).toBe(true);
    });
  }
});
