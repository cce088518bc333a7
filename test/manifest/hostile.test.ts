/**
 * Manifests that are not text, nest without end or expand without end stop `loadStudy` with the
 * catalogue's message (src/messages/manifest.ts) at the right line and column, quickly, instead
 * of an internal error, a stack overflow or a hang. Positions are found in the test's own text.
 */
import { writeFileSync } from "node:fs";
import { join } from "node:path";
import { afterEach, describe, expect, it } from "vitest";
import { loadStudy } from "../../src/manifest/loadStudy.js";
import { ALL_ERRORS_UP_TO } from "../../src/manifest/checkSchema.js";
import { MANIFEST_LIMITS, firstInvalidUtf8 } from "../../src/manifest/manifestSource.js";
import { manifestMessages as m } from "../../src/messages/index.js";
import { RUN_FILES, pos, removeFolder, studyFolder, userError } from "./helpers.js";

const folders: string[] = [];
afterEach(() => {
  while (folders.length > 0) removeFolder(folders.pop() as string);
});

const GOOD = "scenarios:\n  - {name: two, end: 600, runs: runs/two/*.csv}\nmeasures:\n  - {name: q, kind: level, series: queue}\n";

async function failure(content: string | Buffer) {
  const dir = studyFolder(RUN_FILES);
  folders.push(dir);
  const file = join(dir, "study.yaml");
  writeFileSync(file, content);
  const started = Date.now();
  const error = await userError(loadStudy(file));
  return { error, file, ms: Date.now() - started };
}

async function loads(text: string) {
  const dir = studyFolder(RUN_FILES);
  folders.push(dir);
  writeFileSync(join(dir, "study.yaml"), text);
  return loadStudy(join(dir, "study.yaml"));
}

describe("loadStudy: a manifest that is not UTF-8 text", () => {
  it("names the line, the column and the byte offset of a Latin-1 byte", async () => {
    // "é" in Latin-1 is the single byte 0xE9, which UTF-8 never has alone
    const text = GOOD.replace("name: two", "name: caf\u00e9");
    const bytes = Buffer.from(text, "latin1");
    const { error, file } = await failure(bytes);
    const offset = bytes.indexOf(0xe9);
    expect(error.message).toBe(m.manifestNotUtf8({ file, ...pos(text, "\u00e9") }, 0xe9, offset).message);
    expect(error.message).toContain(":2:15:"); // "  - {name: caf" is 14 characters (counted by hand)
  });

  it("counts the column in characters after earlier UTF-8 text on the same line", async () => {
    const text = "title: \u00e9t\u00e9 \u00ff\n" + GOOD; // the ÿ alone is written as the byte 0xFF
    const bytes = Buffer.concat([Buffer.from("title: \u00e9t\u00e9 ", "utf8"), Buffer.from([0xff]), Buffer.from("\n" + GOOD, "utf8")]);
    const { error, file } = await failure(bytes);
    expect(error.message).toBe(m.manifestNotUtf8({ file, line: 1, column: 12 }, 0xff, 13).message);
    expect(text.indexOf("\u00ff") + 1).toBe(12); // the column as characters (the string search)
  });

  it("refuses UTF-16 with a byte-order mark", async () => {
    const bytes = Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from(GOOD, "utf16le")]);
    const { error, file } = await failure(bytes);
    expect(error.message).toBe(m.manifestWideEncoding(file, "UTF-16").message);
  });

  it("firstInvalidUtf8 accepts well-formed UTF-8 and finds the first bad byte (RFC 3629 table 3-7)", () => {
    const ok = Buffer.from("a é € 🚲 \u{10FFFF}", "utf8");
    expect(firstInvalidUtf8(ok)).toBe(-1);
    expect(firstInvalidUtf8(Buffer.from([0x61, 0xc0, 0xaf]))).toBe(1); // overlong "/"
    expect(firstInvalidUtf8(Buffer.from([0x61, 0xe0, 0x80, 0xaf]))).toBe(1); // overlong, three bytes
    expect(firstInvalidUtf8(Buffer.from([0xed, 0xa0, 0x80]))).toBe(0); // the surrogate U+D800
    expect(firstInvalidUtf8(Buffer.from([0xf4, 0x90, 0x80, 0x80]))).toBe(0); // above U+10FFFF
    expect(firstInvalidUtf8(Buffer.from([0x61, 0x62, 0xe2, 0x82]))).toBe(2); // cut at the end of the file
    expect(firstInvalidUtf8(Buffer.from([0x80]))).toBe(0); // a continuation byte alone
  });

  it("keeps a UTF-8 byte-order mark in the text the record keeps", async () => {
    const study = await loads("\uFEFF" + GOOD);
    expect(study.manifestText.startsWith("\uFEFF")).toBe(true);
    expect(study.scenarios[0].name).toBe("two");
  });
});

describe("loadStudy: nesting and aliases that never end", () => {
  it("stops nesting deeper than the limit in flow style, at the first bracket too deep", async () => {
    const text = "title: " + "[".repeat(5000) + "]".repeat(5000) + "\n" + GOOD;
    const { error, file, ms } = await failure(text);
    // the root mapping is level 1, so the bracket at level depth + 1 is bracket number `depth`
    expect(error.message).toBe(m.manifestTooDeep({ file, line: 1, column: 8 + MANIFEST_LIMITS.depth - 1 }, MANIFEST_LIMITS.depth).message);
    expect(ms).toBeLessThan(5000);
  });

  it("stops nesting deeper than the limit in block style (a list in a list in a list ...)", async () => {
    const lines = ["title:"];
    for (let i = 1; i <= 3000; i++) lines.push(`${"  ".repeat(i)}- `);
    const text = lines.join("\n") + "\n";
    const { error, file } = await failure(text);
    // list number k starts on line k + 1 at column 2k + 1; list number 64 is level 65
    const k = MANIFEST_LIMITS.depth;
    expect(error.message).toBe(m.manifestTooDeep({ file, line: k + 1, column: 2 * k + 1 }, MANIFEST_LIMITS.depth).message);
  });

  it("accepts nesting up to the limit (the message is about depth, not about YAML)", async () => {
    const inner = "[".repeat(MANIFEST_LIMITS.depth - 1) + "]".repeat(MANIFEST_LIMITS.depth - 1);
    const { error } = await failure(`title: ${inner}\n${GOOD}`);
    // as deep as allowed: the schema check runs and finds a title that is a list
    expect(error.message).toContain("(at title): expected a text, found a list");
  });

  it("stops a billion-laughs manifest quickly, at the alias where the count passes the limit", async () => {
    const lines = ["a0: &a0 [x, x, x, x, x, x, x, x, x, x]"];
    for (let i = 1; i <= 9; i++) lines.push(`a${i}: &a${i} [${Array.from({ length: 10 }, () => `*a${i - 1}`).join(", ")}]`);
    const text = lines.join("\n") + "\n" + GOOD.replace("measures:", "measures_: *a9\nmeasures:");
    const { error, ms } = await failure(text);
    expect(error.message).toContain("with its aliases (*name) written out, the manifest would hold more than 1,000,000 values");
    // Counted by hand in text order (each mapping, list, key and scalar is one value): a0's list
    // holds 11, a_k's 10·a_(k-1) + 1 = 111, 1111, ...; before a5's first alias the count is
    // 1 (root) + 5 keys + 11 + 111 + 1111 + 11111 + 111111 + key a5 + its list = 123463, and
    // 123463 + 8 · 111111 = 1012351 passes 10⁶ at the 8th alias, a5[7], which starts at column
    // 10 + 5 · 7 = 45 ("a5: &a5 [" is 9 characters, each "*a4, " 5).
    expect(error.message).toMatch(/study\.yaml:6:45 \(at a5\[7\]\):/);
    expect(ms).toBeLessThan(5000);
  });

  it("names an alias with no anchor before it", async () => {
    const text = GOOD.replace("end: 600", "end: *stop");
    const { error, file } = await failure(text);
    expect(error.message).toBe(m.aliasWithoutAnchor({ file, ...pos(text, "*stop"), path: "scenarios[0].end" }, "stop").message);
  });

  it("names an alias inside the value of its own anchor", async () => {
    const text = GOOD.replace("runs: runs/two/*.csv", "runs: &loop [runs/two/*.csv, *loop]");
    const { error, file } = await failure(text);
    expect(error.message).toBe(m.aliasInsideItself({ file, ...pos(text, "*loop"), path: "scenarios[0].runs[1]" }, "loop").message);
  });

  it("names a mapping key written as a list", async () => {
    const text = "? [a, b]\n: 1\n" + GOOD;
    const { error, file } = await failure(text);
    expect(error.message).toBe(m.keyNotText({ file, line: 1, column: 3, path: "" }, "a list").message);
  });

  it("still refuses a second YAML document after the first (the document is built from the checked tokens)", async () => {
    const text = GOOD + "---\n" + GOOD;
    const { error, file } = await failure(text);
    expect(error.message).toBe(m.yamlSyntax({ file, ...pos(text, "---") }, "MULTIPLE_DOCS", "Source contains multiple documents").message);
  });

  it(`stops at the alias past ${MANIFEST_LIMITS.anchors} anchors and aliases, quickly (yaml resolves each alias by a walk over all of them)`, async () => {
    const text = GOOD + `x: &x 1\ny: [${Array.from({ length: 40000 }, () => "*x").join(", ")}]\n`;
    const { error, file, ms } = await failure(text);
    // the anchor &x is the first mark, so the 1000th alias, y[999], is mark number 1001
    const column = "y: [".length + 1 + 4 * (MANIFEST_LIMITS.anchors - 1);
    expect(error.message).toBe(m.tooManyAnchors({ file, line: 6, column, path: `y[${MANIFEST_LIMITS.anchors - 1}]` }, MANIFEST_LIMITS.anchors).message);
    expect(ms).toBeLessThan(10000); // resolving all 40000 aliases took about 75 s on this machine
  });

  it("finds a key written twice in linear time, also when the data would merge 1 and \"1\"", async () => {
    const keys = Array.from({ length: 20000 }, (_, i) => `  k${i}: 1`).join("\n");
    const text = GOOD + `x:\n${keys}\n  k7: 2\n`;
    const { error, file, ms } = await failure(text);
    expect(error.message).toBe(m.duplicateKey({ file, line: 5 + 20000 + 1, column: 3 }, "k7").message);
    expect(ms).toBeLessThan(10000); // yaml's own check took about 20 s for these 20000 keys on this machine
    const merged = GOOD + 'x: {1: a, "1": b}\n';
    const second = await failure(merged);
    expect(second.error.message).toBe(m.duplicateKey({ file: second.file, ...pos(merged, '"1"') }, "1").message);
  });

  it(`checks a manifest of more than ${ALL_ERRORS_UP_TO} values to its first structural problem, in linear time`, async () => {
    // 60000 scenarios without runs: collecting every one of their errors took 34 s for 40000 on
    // this machine (growing as the square); the first wrong scenario is named instead.
    const lines = Array.from({ length: 60000 }, (_, i) => `  - {name: s${i}, end: 10}`);
    const text = "measures:\n  - {name: q, kind: level, series: queue}\nscenarios:\n" + lines.join("\n") + "\n";
    const { error, file, ms } = await failure(text);
    expect(error.message).toBe(m.missingKey({ file, ...pos(text, "{name: s0,"), path: "scenarios[0].runs" }, "runs", "a scenario", "a glob such as runs/*.csv, or a list of paths, globs or {path, start, end} mappings").message);
    expect(ms).toBeLessThan(30000);
  });

  it("refuses a tag that gives something JSON has not (a date, bytes, a set) or that does not resolve, and reads !!str", async () => {
    for (const [value, tag, column] of [["!foo x", "!foo", 8], ["!!float 1", "!!float", 8], ["!!binary aGVsbG8=", "!!binary", 17], ["!!timestamp 2001-12-14", "!!timestamp", 20], ["!!set {a, b}", "!!set", 14]] as const) {
      const text = `title: ${value}\n${GOOD}`;
      const { error, file } = await failure(text);
      // an unresolved tag is named where the tag is written; a resolved one where its value starts
      const path = column === 8 ? undefined : "title";
      expect(error.message, value).toBe(m.tagNotAllowed({ file, line: 1, column, ...(path ? { path } : {}) }, tag).message);
    }
    const study = await loads(`title: !!str 2024\n${GOOD}`);
    expect(study.title).toBe("2024");
  });

  it("refuses a %YAML 1.1 directive (010 would be 8, n false) and reads %YAML 1.2", async () => {
    const text = `%YAML 1.1\n---\n${GOOD.replace("end: 600", "end: 010")}`;
    const { error, file } = await failure(text);
    expect(error.message).toBe(m.yamlVersion({ file, line: 1, column: 1 }, "1.1").message);
    const study = await loads(`%YAML 1.2\n---\n${GOOD.replace("end: 600", "end: 010")}`);
    expect(study.scenarios[0].runs[0].end).toBe(10); // YAML 1.2: a decimal 10
  });

  it("still reads aliases that repeat a value a few times", async () => {
    const text = "scenarios:\n  - {name: a, end: &end 600, runs: &runs runs/two/*.csv}\n  - {name: b, end: *end, runs: *runs}\nmeasures:\n  - {name: q, kind: level, series: queue}\n";
    const study = await loads(text);
    expect(study.scenarios.map((s) => [s.name, s.runs.length, s.runs[0].end])).toEqual([["a", 2, 600], ["b", 2, 600]]);
  });
});
