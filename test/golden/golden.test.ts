/**
 * Golden files of the examples: for every folder of examples/ (a manifest and a seeded
 * generate.mjs), test/golden/<example>/ holds
 *
 * - results.json: the exact bytes `sojourn report` writes for the example, and
 * - model.json: the report model (`buildReportModel`) of the same study, with the report's date
 *   fixed (GENERATED_AT) and the tool's version fixed (TOOL_VERSION), as JSON indented by two
 *   spaces with short arrays and objects on one line (golden.ts, `prettyJson`); chart data arrays
 *   and calculation-table previews longer than 2000 characters of JSON are stored as their
 *   SHA-256, length and number of characters (golden.ts, `abridgeModel`).
 *
 * Each case writes the example's run files into a temp folder with the example's own generator
 * (`node examples/<example>/generate.mjs FOLDER`, which needs `npm run build`), runs the study
 * on them in this process and compares. A difference fails with the example, the file and the
 * first differing JSON path with both values.
 *
 * To update every golden after an intended change (docs/testing.md):
 *
 *   npm run golden:update      # npm run build && SOJOURN_WRITE_GOLDEN=1 vitest run test/golden
 *
 * then review `git diff test/golden` and commit it with the change.
 */
import { spawnSync } from "node:child_process";
import { existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, statSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { afterAll, describe, expect, it } from "vitest";
import { loadStudy } from "../../src/manifest/loadStudy.js";
import { resultsJson } from "../../src/record/publish.js";
import { buildReportModel } from "../../src/report/model/index.js";
import { runStudy } from "../../src/study/runStudy.js";
import { sojourn } from "../helpers/cli.js";
import { abridgeModel, digestOf, firstDifference, goldenDifference, LARGE_ARRAY_CHARS, modelJson, prettyJson } from "./golden.js";

const ROOT = fileURLToPath(new URL("../..", import.meta.url));
const EXAMPLES = join(ROOT, "examples");
const GOLDEN = fileURLToPath(new URL(".", import.meta.url));
const DIST_DEMO = join(ROOT, "dist", "demo");
const WRITE = process.env.SOJOURN_WRITE_GOLDEN === "1";

/** The report's date and the tool's version the stored models are built with. */
const GENERATED_AT = "2026-01-01T00:00:00.000Z";
const TOOL_VERSION = "golden";

/** Every example: a folder of examples/ with a generate.mjs and one manifest (.yaml). */
function examples(): { name: string; manifest: string }[] {
  return readdirSync(EXAMPLES)
    .filter((name) => existsSync(join(EXAMPLES, name, "generate.mjs")))
    .sort()
    .map((name) => {
      const manifests = readdirSync(join(EXAMPLES, name)).filter((f) => f.endsWith(".yaml"));
      if (manifests.length !== 1) throw new Error(`examples/${name} should hold exactly one .yaml manifest, holds ${manifests.length}`);
      return { name, manifest: join(EXAMPLES, name, manifests[0]!) };
    });
}

const made: string[] = [];
afterAll(() => {
  for (const dir of made) rmSync(dir, { recursive: true, force: true });
});

/** Writes the example's run files into a fresh temp folder (FOLDER/runs/) with its generate.mjs. */
function generateRuns(name: string): string {
  if (!existsSync(DIST_DEMO)) throw new Error(`examples/${name}/generate.mjs imports dist/: run \`npm run build\` first`);
  const dir = mkdtempSync(join(tmpdir(), `sojourn-golden-${name}-`));
  made.push(dir);
  const r = spawnSync(process.execPath, [join(EXAMPLES, name, "generate.mjs"), dir], { encoding: "utf8" });
  if (r.status !== 0) throw new Error(`examples/${name}/generate.mjs failed (status ${r.status}):\n${r.stderr}`);
  return dir;
}

/**
 * Compares (or, with SOJOURN_WRITE_GOLDEN=1, first writes) test/golden/<example>/<file> for each
 * file; fails with what differs in every file that differs.
 */
function expectGolden(example: string, files: Record<string, string>) {
  const problems: string[] = [];
  for (const [file, fresh] of Object.entries(files)) {
    const path = join(GOLDEN, example, file);
    if (WRITE) {
      mkdirSync(join(GOLDEN, example), { recursive: true });
      writeFileSync(path, fresh);
    }
    const stored = existsSync(path) ? readFileSync(path, "utf8") : null;
    const why = goldenDifference(`example ${example}, test/golden/${example}/${file}`, stored, fresh);
    if (why !== null) problems.push(why);
  }
  if (problems.length > 0) expect.fail(problems.join("\n\n"));
}

describe("golden files of the examples", () => {
  it("finds the three examples and the built generators", () => {
    expect(examples().map((e) => e.name)).toEqual(expect.arrayContaining(["bakery", "bike-repair", "ferry-check-in"]));
    if (!existsSync(DIST_DEMO)) expect.fail("the examples' generators import dist/: run `npm run build` first");
  });

  it("has a golden folder for every example and none for an example that is gone", () => {
    const names = new Set(examples().map((e) => e.name));
    const folders = readdirSync(GOLDEN).filter((f) => statSync(join(GOLDEN, f)).isDirectory());
    const stale = folders.filter((f) => !names.has(f));
    if (stale.length > 0) expect.fail(`test/golden/${stale.join(", test/golden/")}: no example of that name in examples/; remove the folder by hand`);
    if (!WRITE) expect(folders.sort()).toEqual([...names].sort());
  });

  for (const { name, manifest } of examples()) {
    it(`${name}: results.json and the report model match test/golden/${name}/`, async () => {
      const dir = generateRuns(name);
      const study = await loadStudy(manifest, { baseDir: dir });
      const { outcome } = await runStudy(study, { workers: 1 });
      const model = buildReportModel(study, outcome, { toolVersion: TOOL_VERSION, generatedAt: GENERATED_AT });
      expectGolden(name, { "results.json": resultsJson(outcome), "model.json": modelJson(model) });
    });
  }

  it("ferry-check-in: the built command line writes the golden results.json byte for byte", () => {
    const dir = generateRuns("ferry-check-in");
    const manifest = examples().find((e) => e.name === "ferry-check-in")!.manifest;
    writeFileSync(join(dir, "ferry.yaml"), readFileSync(manifest));
    const r = sojourn(["report", join(dir, "ferry.yaml"), "--out", join(dir, "report")]);
    expect(r.status, r.stderr).toBe(0);
    const why = goldenDifference("example ferry-check-in, the command line's results.json against test/golden/ferry-check-in/results.json",
      readFileSync(join(GOLDEN, "ferry-check-in", "results.json"), "utf8"), readFileSync(join(dir, "report", "results.json"), "utf8"));
    if (why !== null) expect.fail(why);
  });
});

describe("the golden helpers (golden.ts)", () => {
  it("goldenDifference names the file, the first differing JSON path and both values", () => {
    const stored = JSON.stringify({ scenarios: [{ name: "a", runs: [{ mean: 1.5 }, { mean: 2 }] }] }, null, 2);
    const fresh = JSON.stringify({ scenarios: [{ name: "a", runs: [{ mean: 1.5 }, { mean: 2.25 }] }] }, null, 2);
    const why = goldenDifference("example x, results.json", stored, fresh)!;
    expect(why.split("\n").slice(0, 3)).toEqual(["example x, results.json: first difference at $.scenarios[0].runs[1].mean", "  stored: 2", "  now:    2.25"]);
    expect(goldenDifference("example x, results.json", stored, stored)).toBeNull();
  });

  it("goldenDifference reports a missing golden, a key on one side only, and equal values with different text", () => {
    expect(goldenDifference("f", null, "{}")).toMatch(/^f: no golden file yet\. If the change is intended, run `npm run golden:update`/);
    expect(goldenDifference("f", '{"a":1}', '{"a":1,"b [x]":true}')).toMatch(/^f: first difference at \$\["b \[x\]"\]\n {2}stored: \(absent\)\n {2}now: {4}true\n/);
    expect(goldenDifference("f", '{"a":1,"b":2}', '{"b":2,"a":1}')).toMatch(/^f: the same JSON values, but the text differs; first differing line 1\n/);
    expect(goldenDifference("f", "[1,2]", "[1,2,3]")).toMatch(/^f: first difference at \$\[2\]\n {2}stored: \(absent\)\n {2}now: {4}3\n/);
  });

  it("goldenDifference keeps a long value to one short line", () => {
    const why = goldenDifference("f", JSON.stringify({ a: "x".repeat(10_000) }), JSON.stringify({ a: "y".repeat(10_000) }))!;
    expect(why.length).toBeLessThan(600);
    expect(why).toContain("(10002 characters)");
  });

  it("prettyJson gives the same JSON values as JSON.stringify, short parts on one line", () => {
    const v = { a: [1, 2, { b: "x\n\"y\"" }], long: Array.from({ length: 40 }, (_, i) => ({ i, s: "<td>" })), none: undefined, empty: [], o: {} };
    const text = prettyJson(v);
    expect(JSON.parse(text)).toEqual(JSON.parse(JSON.stringify(v)));
    expect(text.split("\n").slice(0, 3)).toEqual(["{", '  "a": [1,2,{"b":"x\\n\\"y\\""}],', '  "long": [']);
    expect(text).not.toContain("none");
  });

  it("firstDifference takes the stored file's key order and tells a number from its text", () => {
    expect(firstDifference({ b: 1, a: 1 }, { a: 2, b: 2 })?.path).toBe("$.b");
    expect(firstDifference({ n: 1 }, { n: "1" })).toEqual({ path: "$.n", stored: 1, fresh: "1" });
    expect(firstDifference([{ x: null }], [{ x: null }])).toBeNull();
  });

  it("abridgeModel digests large chart data and calculation-table rows only, so a change in them still shows", () => {
    const big = Array.from({ length: 400 }, (_, i) => ({ t: i, v: i * 0.5 }));
    expect(JSON.stringify(big).length).toBeGreaterThan(LARGE_ARRAY_CHARS);
    const modelOf = (chartValues: { t: number; v: number }[]) => ({
      measures: [{ charts: [{ spec: { layer: [{ data: { values: chartValues } }, { data: { values: [{ t: 1 }] } }] } }], runs: { rows: big } }],
      appendix: { tables: [{ id: "t1", rows: big }], intervals: [{ rows: big }] },
    });
    const model = modelOf(big);
    const stored = abridgeModel(model) as typeof model;
    const layer = stored.measures[0]!.charts[0]!.spec.layer;
    expect(layer[0]!.data.values).toEqual(digestOf(big));
    expect(layer[1]!.data.values).toEqual([{ t: 1 }]);
    expect(stored.measures[0]!.runs.rows).toEqual(big);
    expect(stored.appendix.tables[0]!.rows).toEqual(digestOf(big));
    expect(stored.appendix.intervals[0]!.rows).toEqual(big);
    // The digest is the SHA-256 of the array's compact JSON text "[1,2]" (computed by hand with `printf '[1,2]' | sha256sum`).
    expect(digestOf([1, 2]).abridged_array).toEqual({ sha256: "49a64717d5d4cb19952e6eac2946415cf6879adacf9908e7d872332d32c6e684", length: 2, json_chars: 5 });
    const why = goldenDifference("m", modelJson(model), modelJson(modelOf(big.map((p, i) => (i === 399 ? { ...p, v: 0 } : p)))));
    expect(why).toMatch(/^m: first difference at \$\.measures\[0\]\.charts\[0\]\.spec\.layer\[0\]\.data\.values\.abridged_array\.sha256 \(an array stored by its digest/);
  });
});
