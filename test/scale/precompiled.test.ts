/**
 * `npm run build` compiles the manifest schema and the report templates ahead of time
 * (scripts/precompile.mjs) to save start-up time. These checks hold the built artefacts to the
 * same answers as compiling from the sources at run time: the same verdict and the same errors for
 * valid and broken manifests, the same HTML for one report model.
 */
import { createHash } from "node:crypto";
import { readdirSync, readFileSync } from "node:fs";
import { createRequire } from "node:module";
import { fileURLToPath } from "node:url";
import { Ajv, type ValidateFunction } from "ajv";
import { parse } from "yaml";
import { describe, expect, it } from "vitest";
import { AJV_OPTIONS } from "../../src/manifest/checkSchema.js";
import { buildReportModel } from "../../src/report/model/index.js";
import { renderHtml as renderFromSources, templatesDigest } from "../../src/report/html.js";
import { bakery } from "../report/fixtures/bakery.js";
import { seeded } from "../ingest/helpers.js";

const require = createRequire(import.meta.url);
const schemaText = readFileSync(new URL("../../docs/manifest.schema.json", import.meta.url), "utf8");

/** A copy of `data` with one value somewhere replaced, deleted, or a key added. */
function mutate(data: unknown, random: () => number): unknown {
  const copy = structuredClone(data) as Record<string, unknown>;
  const nodes: Record<string, unknown>[] = [];
  const walk = (x: unknown) => {
    if (x !== null && typeof x === "object") {
      nodes.push(x as Record<string, unknown>);
      for (const v of Object.values(x)) walk(v);
    }
  };
  walk(copy);
  const node = nodes[Math.floor(random() * nodes.length)];
  const keys = Object.keys(node);
  const key = keys[Math.floor(random() * keys.length)];
  const pick = random();
  const odd = [null, "x", -3, 0.5, [], {}, true, "", 7][Math.floor(random() * 9)];
  if (pick < 0.5 && key !== undefined) node[key] = odd;
  else if (pick < 0.8 && key !== undefined) delete node[key];
  else node[Array.isArray(node) ? node.length : "bogus_key"] = odd;
  return copy;
}

describe("precompiled artefacts (dist/)", () => {
  it("the built manifest validator gives the same verdicts and errors as one compiled from the schema", () => {
    const built = require("../../dist/manifest/manifestValidator.cjs") as ValidateFunction & { sourceSha256: string };
    // it is the one the command line uses: made from this very schema text
    expect(built.sourceSha256).toBe(createHash("sha256").update(schemaText).digest("hex"));
    const fresh = new Ajv(AJV_OPTIONS).compile(JSON.parse(schemaText));
    const examples = ["bakery/bakery.yaml", "bike-repair/bike-repair.yaml", "ferry-check-in/ferry.yaml"].map((f) =>
      parse(readFileSync(new URL(`../../examples/${f}`, import.meta.url), "utf8")) as unknown,
    );
    const random = seeded(20261202);
    let rejected = 0;
    for (const example of examples) {
      expect(built(example)).toBe(true);
      for (let i = 0; i < 300; i++) {
        const data = mutate(example, random);
        const verdict = fresh(data);
        expect(built(data)).toBe(verdict);
        expect(built.errors ?? null).toEqual(fresh.errors ?? null);
        if (!verdict) rejected++;
      }
    }
    expect(rejected).toBeGreaterThan(300); // the mutations do break manifests
  });

  it("the built templates render the same HTML as templates compiled from templates/", async () => {
    const { study, outcome } = bakery();
    const model = buildReportModel(study, outcome, { toolVersion: "0.1.0-test", generatedAt: "2025-03-04T05:06:07.000Z" });
    const { renderHtml: renderBuilt } = (await import(new URL("../../dist/report/html.js", import.meta.url).href)) as typeof import("../../src/report/html.js");
    const built = require("../../dist/report/templates.cjs") as { page: unknown; sourceSha256: string };
    expect(typeof built.page).toBe("object");
    // it is the one the command line uses: made from these very sources
    const dir = new URL("../../templates/", import.meta.url);
    const names = readdirSync(new URL("partials/", dir)).filter((n) => n.endsWith(".hbs")).sort();
    const partials = names.map((n) => [n.slice(0, -4), readFileSync(new URL(`partials/${n}`, dir), "utf8")] as const);
    expect(built.sourceSha256).toBe(templatesDigest(readFileSync(new URL("report.hbs", dir), "utf8"), partials));
    const [a, b] = await Promise.all([renderBuilt(model), renderFromSources(model)]);
    expect(a.length).toBeGreaterThan(10_000);
    expect(a).toBe(b);
  });

  it("the bundled t quantile gives the very numbers of stdlib's package, and the built code uses it", async () => {
    const bundled = require("../../dist/stats/tQuantileBundle.cjs") as (p: number, df: number) => number;
    const stdlib = require("@stdlib/stats-base-dists-t-quantile") as (p: number, df: number) => number;
    let n = 0;
    for (const p of [1e-6, 0.0005, 0.025, 0.05, 0.1, 0.5, 0.8, 0.9, 0.95, 0.975, 0.99, 0.995, 0.9995]) {
      for (let df = 0.25; df < 400; df *= 1.17) {
        expect(Object.is(bundled(p, df), stdlib(p, df)), `p ${p}, df ${df}`).toBe(true);
        n++;
      }
    }
    expect(n).toBeGreaterThan(500);
    const built = (await import(new URL("../../dist/stats/tQuantile.js", import.meta.url).href)) as typeof import("../../src/stats/tQuantile.js");
    expect(built.loadTQuantile()).toBe(bundled);
    // (the published reference values are checked in test/stats/tQuantile.test.ts)
    expect(built.tQuantile(0.975, 10)).toBe(stdlib(0.975, 10));
  });

  it("the bundled yaml and tinyglobby give the packages' answers, and the built manifest reader uses them", async () => {
    type Yaml = typeof import("yaml");
    type Glob = typeof import("tinyglobby");
    const bundledYaml = require("../../dist/manifest/yamlBundle.cjs") as Yaml;
    const packageYaml = require("yaml") as Yaml;
    // the same documents, values, errors and error places, for good and broken texts (common practice)
    const texts = ["bakery/bakery.yaml", "bike-repair/bike-repair.yaml", "ferry-check-in/ferry.yaml"].map((f) => readFileSync(new URL(`../../examples/${f}`, import.meta.url), "utf8"));
    const broken = ["a: [1, 2", "a: 1\na: 2", "- a\nb: c", "x: &a 1\ny: *b", "k: 'open", "\tkey: v", "a:\n  - 1\n - 2", "---\na: 1\n---\nb: 2"];
    const seen = (y: Yaml, text: string) => {
      const doc = y.parseDocument(text, { uniqueKeys: false });
      let value: unknown;
      try {
        value = doc.toJS();
      } catch (e) {
        value = `thrown: ${(e as Error).message}`;
      }
      return JSON.stringify({ value, errors: doc.errors.map((e) => [e.code, e.pos, e.message]), warnings: doc.warnings.map((e) => [e.code, e.pos]) });
    };
    let errors = 0;
    for (const text of [...texts, ...broken]) {
      expect(seen(bundledYaml, text), text).toBe(seen(packageYaml, text));
      errors += packageYaml.parseDocument(text).errors.length;
    }
    expect(errors).toBeGreaterThan(5);
    const bundledGlob = require("../../dist/manifest/globBundle.cjs") as Glob;
    const packageGlob = require("tinyglobby") as Glob;
    const root = fileURLToPath(new URL("../../", import.meta.url));
    for (const pattern of ["examples/*/*.yaml", "examples/**/*.{md,mjs}", "src/{ingest,stats}/*.ts", "docs/[a-m]*.md", "plain/path.csv"]) {
      expect(bundledGlob.isDynamicPattern(pattern)).toBe(packageGlob.isDynamicPattern(pattern));
      const options = { cwd: root, onlyFiles: true, expandDirectories: false, absolute: true };
      expect(bundledGlob.globSync(pattern, options).sort(), pattern).toEqual(packageGlob.globSync(pattern, options).sort());
    }
    expect(packageGlob.globSync("examples/*/*.yaml", { cwd: root }).length).toBeGreaterThan(2);
    const built = (await import(new URL("../../dist/manifest/libraries.js", import.meta.url).href)) as typeof import("../../src/manifest/libraries.js");
    expect(built.yaml).toBe(bundledYaml);
    expect(built.tinyglobby).toBe(bundledGlob);
  });
});
