/**
 * The tests and the build read nothing outside the repository, so that `npm test` passes on a
 * clone anywhere (common practice: a checkout is self-contained). Every `new URL("…",
 * import.meta.url)` literal in the code, the tests, the build scripts and the bench must resolve
 * inside the repository, and no file may name the project folder beside it.
 */
import { readdirSync, readFileSync, statSync } from "node:fs";
import { dirname, join, relative, resolve, sep } from "node:path";
import { fileURLToPath } from "node:url";
import { describe, expect, it } from "vitest";

const ROOT = resolve(fileURLToPath(new URL("../..", import.meta.url)));
const FOLDERS = ["src", "test", "scripts", "bench", "examples"];
const CODE = /\.(ts|mts|js|mjs|cjs)$/;

function codeFiles(dir: string): string[] {
  const out: string[] = [];
  for (const name of readdirSync(dir)) {
    const p = join(dir, name);
    if (name === "node_modules" || name === "runs") continue;
    if (statSync(p).isDirectory()) out.push(...codeFiles(p));
    else if (CODE.test(name)) out.push(p);
  }
  return out;
}

const files = FOLDERS.flatMap((f) => codeFiles(join(ROOT, f)));

/** The relative paths given to `new URL(…, import.meta.url)` in a source text. */
export function urlLiterals(text: string): string[] {
  return [...text.matchAll(/new URL\(\s*["'`]([^"'`$]*)["'`]\s*,\s*import\.meta\.url\s*\)/g)].map((m) => m[1]!);
}

describe("the repository is self-contained", () => {
  it("finds the code it checks", () => {
    expect(files.length).toBeGreaterThan(50);
    expect(files.some((f) => f.endsWith(join("test", "helpers", "reference.ts")))).toBe(true);
  });

  it("urlLiterals finds a path that climbs out (the check can fail)", () => {
    expect(urlLiterals('const d = new URL("../../../shared/", import.meta.url);')).toEqual(["../../../shared/"]);
  });

  it("every new URL(…, import.meta.url) resolves inside the repository", () => {
    const outside: string[] = [];
    for (const f of files.filter((g) => g !== fileURLToPath(import.meta.url))) {
      for (const lit of urlLiterals(readFileSync(f, "utf8"))) {
        const target = resolve(dirname(f), lit);
        const rel = relative(ROOT, target);
        if (rel === ".." || rel.startsWith(".." + sep)) outside.push(`${relative(ROOT, f)}: ${lit}`);
      }
    }
    expect(outside).toEqual([]);
  });

  it("no file names the shared folder beside the checkout", () => {
    const naming = files.filter((f) => f !== fileURLToPath(import.meta.url) && /\.\.\/shared\b/.test(readFileSync(f, "utf8")));
    expect(naming.map((f) => relative(ROOT, f))).toEqual([]);
  });

  it("the reference data the tests use are in test/reference", () => {
    for (const p of ["t-quantiles.json", "nist-strd-univariate/certified.json", "README.md"]) {
      expect(statSync(join(ROOT, "test", "reference", p)).isFile()).toBe(true);
    }
  });
});
