/**
 * Every manifest problem stops `loadStudy` with a `UserError` whose message is the catalogue's
 * (src/messages/manifest.ts) for the right file, line, column and key path. Positions are found in
 * the test's own manifest text by string search, independently of the code under test.
 */
import { mkdirSync, readFileSync, writeFileSync } from "node:fs";
import { join, relative } from "node:path";
import { LineCounter, parseDocument } from "yaml";
import { afterEach, describe, expect, test } from "vitest";
import { RUN_EXTENSIONS } from "../../src/ingest/runFile.js";
import { loadStudy } from "../../src/manifest/loadStudy.js";
import { manifestMessages as m, type Place, type UserError } from "../../src/messages/index.js";
import { RUN_FILES, pos, removeFolder, studyFolder, userError } from "./helpers.js";

interface SchemaNode {
  description?: string;
  properties?: Record<string, SchemaNode>;
  definitions?: Record<string, SchemaNode>;
}
const schema = JSON.parse(readFileSync(new URL("../../docs/manifest.schema.json", import.meta.url), "utf8")) as SchemaNode;
const definition = (name: string): string | null => schema.definitions?.[name]?.description ?? null;

const folders: string[] = [];
afterEach(() => {
  while (folders.length > 0) removeFolder(folders.pop() as string);
});

/** Writes `text` as a manifest beside the standard run files and returns the error it gives. */
async function failure(text: string, name = "study.yaml"): Promise<{ error: UserError; file: string; dir: string }> {
  const dir = studyFolder(RUN_FILES);
  folders.push(dir);
  const file = join(dir, name);
  writeFileSync(file, text);
  return { error: await userError(loadStudy(file)), file, dir };
}

/** The place of the `nth` occurrence of `needle` in `text`, with a key path. */
function at(file: string, text: string, needle: string, path: string, nth = 0): Place {
  return { file, ...pos(text, needle, nth), path };
}

const MEASURES = `measures:
  - {name: lane_queue, kind: level, series: queue}
  - {name: booth_use, kind: utilization, series: busy, capacity: 2}
  - {name: check_wait, kind: observation, series: wait}
  - {name: vehicles_done, kind: count, series: depart}
`;
const MEASURE_NAMES = ["lane_queue", "booth_use", "check_wait", "vehicles_done"];
const SCENARIOS = `scenarios:
  - name: two-booths
    end: 600
    runs: runs/two/*.csv
  - name: three-booths
    end: 600
    runs: runs/three/*.csv
`;
const SCENARIO_NAMES = ["two-booths", "three-booths"];
const TOP_KEYS = ["version", "title", "time_unit", "confidence", "warmup", "columns", "layout", "analysis", "tables", "max_row_bytes", "scenarios", "measures", "compare", "select"];
const SCENARIO_KEYS = ["name", "start", "end", "warmup", "columns", "layout", "analysis", "max_row_bytes", "factors", "runs", "measures"];
const OVERRIDABLE = ["capacity", "capacity_initial", "initial", "quantiles", "within", "at_least", "target"];

describe("loadStudy: reading and YAML syntax", () => {
  test("loadStudy on a missing manifest names the path as given", async () => {
    const dir = studyFolder({});
    folders.push(dir);
    const given = relative(process.cwd(), join(dir, "missing.yaml"));
    const error = await userError(loadStudy(given));
    expect(error.message).toBe(m.manifestNotFound(given).message); // brief: missing manifest, in words; shown as given
  });

  test("loadStudy on a folder says it is a folder", async () => {
    const dir = studyFolder({});
    folders.push(dir);
    const error = await userError(loadStudy(dir));
    expect(error.message).toBe(m.manifestIsFolder(dir).message); // brief: unreadable manifest, in words
  });

  test("loadStudy on invalid YAML gives the parser's reason at its line and column", async () => {
    const text = "scenarios:\n  - name: a\n    runs: [runs/two/rep-01.csv\nmeasures: []\n";
    const { error, file } = await failure(text);
    // The reference position and reason come from the yaml package itself (common practice: trust the parser's diagnosis).
    const lineCounter = new LineCounter();
    const parsed = parseDocument(text, { lineCounter, prettyErrors: false }).errors[0];
    const { line, col } = lineCounter.linePos(parsed.pos[0]);
    expect(error.message).toBe(m.yamlSyntax({ file, line, column: col }, parsed.code, parsed.message).message);
    expect(line).toBeGreaterThan(2); // the problem is after the opening bracket on line 3
  });

  test("loadStudy on tab indentation says so in plain words", async () => {
    const text = "scenarios:\n\t- name: a\n";
    const { error, file } = await failure(text);
    expect(error.message.startsWith(`${file}:2:1: the manifest is not valid YAML: a tab is used for indentation`)).toBe(true); // YAML 1.2 section 6.1: tabs never indent
  });

  test("loadStudy on a key written twice names the key and the second place", async () => {
    const text = `title: Ferry\n${SCENARIOS}title: Ferry again\n${MEASURES}`;
    const { error, file } = await failure(text);
    expect(error.message).toBe(m.duplicateKey({ file, ...pos(text, "title", 1) }, "title").message); // brief: duplicate keys are errors
  });

  test("loadStudy on an empty manifest says it is empty", async () => {
    const { error, file } = await failure("# nothing yet\n");
    expect(error.message).toBe(m.manifestEmpty(file).message); // common practice
  });

  test("loadStudy on a manifest that is a list says the top level must be a mapping", async () => {
    const { error, file } = await failure("- a\n- b\n");
    expect(error.message).toBe(m.notAMapping({ file, line: 1, column: 1, path: "" }, "a list").message); // CONTRACT.md section 6
  });
});

describe("loadStudy: structure", () => {
  test("loadStudy on a misspelt top-level key (mesures) suggests the right key and lists the allowed ones", async () => {
    const text = `${SCENARIOS}${MEASURES.replace("measures:", "mesures:")}`;
    const { error, file } = await failure(text);
    // brief: unknown keys list the allowed keys with a did-you-mean; the missing "measures" is not reported first.
    expect(error.message).toBe(m.unknownKey(at(file, text, "mesures", "mesures"), "mesures", "the manifest", TOP_KEYS, "measures").message);
    expect(error.message).toContain('Did you mean "measures"?');
  });

  test("loadStudy on an unknown key in a scenario gives its key path and a suggestion", async () => {
    const text = `${SCENARIOS.replace("    end: 600\n    runs: runs/three", "    edn: 600\n    runs: runs/three")}${MEASURES}`;
    const { error, file } = await failure(text);
    expect(error.message).toBe(m.unknownKey(at(file, text, "edn", "scenarios[1].edn"), "edn", "a scenario", SCENARIO_KEYS, "end").message); // brief
  });

  test("loadStudy on a key of another measure kind lists that kind's keys", async () => {
    const text = `${SCENARIOS}measures:\n  - {name: lane_queue, kind: level, series: queue, quantiles: [0.5]}\n`;
    const { error, file } = await failure(text);
    const levelKeys = ["name", "kind", "series", "from", "initial", "at_least", "target", "scenarios", "may_be_absent", "label", "unit", "where"];
    expect(error.message).toBe(m.unknownKey(at(file, text, "quantiles", "measures[0].quantiles"), "quantiles", "a level measure", levelKeys, null).message); // brief: level accepts at_least, not quantiles
  });

  test("loadStudy on a wrong type says the expected type and what was found", async () => {
    const text = `confidence: high\n${SCENARIOS}${MEASURES}`;
    const { error, file } = await failure(text);
    const description = schema.properties?.confidence?.description ?? null;
    expect(error.message).toBe(m.wrongType(at(file, text, "high", "confidence"), "a number", 'a text ("high")', description, false).message); // brief: wrong types say the expected type
  });

  test("loadStudy on a name that YAML reads as a number suggests quotes", async () => {
    const text = `${SCENARIOS.replace("name: two-booths", "name: 2024")}${MEASURES}`;
    const { error, file } = await failure(text);
    expect(error.message).toBe(m.wrongType(at(file, text, "2024", "scenarios[0].name"), "a text", "a whole number (2024)", definition("name"), true).message); // YAML 1.2 core schema: 2024 is an integer
  });

  test("loadStudy rejects numbers that are not finite", async () => {
    const text = `${SCENARIOS.replace("end: 600", "end: .inf")}${MEASURES}`;
    const { error, file } = await failure(text);
    expect(error.message).toBe(m.wrongType(at(file, text, ".inf", "scenarios[0].end"), "a number", "Infinity, which is not a finite number", definition("time"), false).message); // brief: numbers must be finite
  });

  test("loadStudy on an unknown measure kind suggests the closest kind", async () => {
    const text = `${SCENARIOS}measures:\n  - {name: lane_queue, kind: levle, series: queue}\n`;
    const { error, file } = await failure(text);
    expect(error.message).toBe(m.notAllowedValue(at(file, text, "levle", "measures[0].kind"), "levle", ["level", "utilization", "observation", "count"], "level").message); // CONTRACT.md section 2
  });

  test("loadStudy on a scenario without runs names the missing key at the scenario", async () => {
    const text = `scenarios:\n  - name: two-booths\n    end: 600\n${MEASURES}`;
    const { error, file } = await failure(text);
    expect(error.message).toBe(m.missingKey(at(file, text, "name: two-booths", "scenarios[0].runs"), "runs", "a scenario", definition("runs")).message); // CONTRACT.md section 6
  });

  test("loadStudy on a negative warm-up says the allowed range", async () => {
    const text = `warmup: -5\n${SCENARIOS}${MEASURES}`;
    const { error, file } = await failure(text);
    expect(error.message).toBe(m.numberOutOfRange(at(file, text, "-5", "warmup"), -5, "at least 0", definition("warmup")).message); // CONTRACT.md section 3: a warm-up is a time
  });

  test("loadStudy on a comparison of one scenario says it needs exactly two", async () => {
    const text = `${SCENARIOS}${MEASURES}compare:\n  - {measure: check_wait, scenarios: [two-booths]}\n`;
    const { error, file } = await failure(text);
    const description = schema.definitions?.comparison?.properties?.scenarios?.description ?? null;
    expect(error.message).toBe(m.wrongItemCount(at(file, text, "[two-booths]", "compare[0].scenarios"), 1, "exactly 2 items", description).message); // brief
  });

  test("loadStudy on a target with both half_width and relative says to keep one", async () => {
    const text = `${SCENARIOS}measures:\n  - {name: w, kind: observation, series: wait, target: {half_width: 1, relative: 0.1}}\n`;
    const { error, file } = await failure(text);
    expect(error.message).toBe(m.targetNeedsOneKey(at(file, text, "{half_width", "measures[0].target"), 2).message); // brief: target is one of two forms
  });

  test("loadStudy on version 2 says only 1 is allowed", async () => {
    const text = `version: 2\n${SCENARIOS}${MEASURES}`;
    const { error, file } = await failure(text);
    expect(error.message).toBe(m.notAllowedValue(at(file, text, "2", "version"), 2, [1], null).message); // brief: if present must be 1
  });

  test("loadStudy locates problems in a JSON manifest by line and column too", async () => {
    const text = '{\n  "scenarios": [{"name": "s", "end": 10, "runs": "runs/two/*.csv"}],\n  "measures": [{"name": "q", "kind": "level", "seris": "queue"}]\n}\n';
    const { error, file } = await failure(text, "study.json");
    const levelKeys = ["name", "kind", "series", "from", "initial", "at_least", "target", "scenarios", "may_be_absent", "label", "unit", "where"];
    expect(error.message).toBe(m.unknownKey(at(file, text, '"seris"', "measures[0].seris"), "seris", "a level measure", levelKeys, "series").message); // CONTRACT.md section 6: YAML or JSON
  });
});

describe("loadStudy: meaning", () => {
  test("loadStudy on two scenarios with one name points at the second and gives the first's line", async () => {
    const text = `${SCENARIOS.replace("three-booths", "two-booths")}${MEASURES}`;
    const { error, file } = await failure(text);
    const first = pos(text, "name: two-booths").line;
    expect(error.message).toBe(m.duplicateName(at(file, text, "two-booths", "scenarios[1].name", 1), "scenario", "two-booths", first).message); // brief
  });

  test("loadStudy on two measures with one name points at the second", async () => {
    const text = `${SCENARIOS}${MEASURES.replace("name: check_wait", "name: lane_queue")}`;
    const { error, file } = await failure(text);
    const first = pos(text, "{name: lane_queue").line;
    expect(error.message).toBe(m.duplicateName(at(file, text, "lane_queue", "measures[2].name", 1), "measure", "lane_queue", first).message); // brief
  });

  test("loadStudy on confidence outside (0, 1) says so, with a percentage hint for 95", async () => {
    for (const value of ["1", "0", "95"]) {
      const text = `confidence: ${value}\n${SCENARIOS}${MEASURES}`;
      const { error, file } = await failure(text);
      expect(error.message).toBe(m.confidenceOutOfRange(at(file, text, value, "confidence"), Number(value)).message); // CONTRACT.md section 4: a confidence level
    }
    expect(m.confidenceOutOfRange({ file: "f" }, 95).message).toContain("write 0.95"); // common practice: 95 means 95 %
  });

  test("loadStudy on a scenario whose end is not after its start names the scenario", async () => {
    const text = `${SCENARIOS.replace("    end: 600\n    runs: runs/two", "    start: 600\n    end: 600\n    runs: runs/two")}${MEASURES}`;
    const { error, file } = await failure(text);
    expect(error.message).toBe(m.endNotAfterStart(at(file, text, "600", "scenarios[0].end", 1), "two-booths", null, 600, 600).message); // CONTRACT.md section 3: window [start, end]
  });

  test("loadStudy on a run whose own end is before the scenario's start names the run", async () => {
    const text = `scenarios:\n  - name: s\n    start: 50\n    end: 600\n    runs: [{path: runs/two/rep-01.csv, end: 20}]\n${MEASURES}`;
    const { error, file } = await failure(text);
    expect(error.message).toBe(m.endNotAfterStart(at(file, text, "20}", "scenarios[0].runs[0].end"), "s", "rep-01", 50, 20).message); // brief: a run's end overrides the scenario's
  });

  test("loadStudy on a fixed warm-up at the end of a run names the scenario and the run", async () => {
    const text = `warmup: 600\n${SCENARIOS}${MEASURES}`;
    const { error, file } = await failure(text);
    expect(error.message).toBe(m.warmupPastEnd(at(file, text, "600", "warmup"), "two-booths", "rep-01", 600, 600).message); // CONTRACT.md section 3
  });

  test("loadStudy on a scenario's warm-up past one run's own end names that run", async () => {
    const text = `scenarios:\n  - name: s\n    end: 600\n    warmup: 100\n    runs: [runs/two/rep-01.csv, {path: runs/two/rep-02.csv, end: 90}]\n${MEASURES}`;
    const { error, file } = await failure(text);
    expect(error.message).toBe(m.warmupPastEnd(at(file, text, "100", "scenarios[0].warmup"), "s", "rep-02", 100, 90).message); // brief: any run
  });

  test("loadStudy on a capacity of 0 or less, in the definition or in an override, says it must be positive", async () => {
    const inDefinition = `${SCENARIOS}${MEASURES.replace("capacity: 2", "capacity: 0")}`;
    const first = await failure(inDefinition);
    expect(first.error.message).toBe(m.capacityNotPositive(at(first.file, inDefinition, "0}", "measures[1].capacity"), "booth_use", 0).message); // CONTRACT.md section 2
    const inOverride = `${SCENARIOS}    measures:\n      booth_use: {capacity: -1}\n${MEASURES}`;
    const second = await failure(inOverride);
    expect(second.error.message).toBe(m.capacityNotPositive(at(second.file, inOverride, "-1", "scenarios[1].measures.booth_use.capacity"), "booth_use", -1).message);
  });

  test("loadStudy on a level measure while a run has no end names the measure, scenario and run", async () => {
    const text = `scenarios:\n  - name: s\n    runs: runs/two/*.csv\n${MEASURES}`;
    const { error, file } = await failure(text);
    expect(error.message).toBe(m.needsEnd(at(file, text, "name: s", "scenarios[0]"), "lane_queue", "level", "s", "rep-01").message); // CONTRACT.md section 3: a level needs end
  });

  test("loadStudy on a utilization measure without end fails, while count and observation measures need none", async () => {
    const utilization = `scenarios:\n  - name: s\n    runs: runs/two/*.csv\nmeasures:\n  - {name: u, kind: utilization, series: busy, capacity: 1}\n`;
    const { error, file } = await failure(utilization);
    expect(error.message).toBe(m.needsEnd(at(file, utilization, "name: s", "scenarios[0]"), "u", "utilization", "s", "rep-01").message); // CONTRACT.md section 3
    const dir = studyFolder(RUN_FILES);
    folders.push(dir);
    const text = `scenarios:\n  - name: s\n    runs: runs/two/*.csv\nmeasures:\n  - {name: n, kind: count, series: depart}\n  - {name: w, kind: observation, series: wait}\n`;
    const study = await loadStudy(join(dir, "s.yaml"), { text });
    expect(study.scenarios[0].runs.map((r) => r.end)).toEqual([null, null]); // brief: count without end allowed (rate null)
  });

  test("loadStudy on a glob that matches nothing names the pattern and the folder searched", async () => {
    const text = `scenarios:\n  - {name: s, end: 9, runs: runs/four/*.csv}\n${MEASURES}`;
    const { error, file, dir } = await failure(text);
    expect(error.message).toBe(m.globMatchedNothing(at(file, text, "runs/four", "scenarios[0].runs"), "runs/four/*.csv", dir).message); // brief
  });

  test("loadStudy on a plain run path that does not exist names it", async () => {
    const text = `scenarios:\n  - {name: s, end: 9, runs: [runs/two/rep-01.csv, runs/two/rep-03.csv]}\n${MEASURES}`;
    const { error, file, dir } = await failure(text);
    expect(error.message).toBe(m.runFileMissing(at(file, text, "runs/two/rep-03.csv", "scenarios[0].runs[1]"), "runs/two/rep-03.csv", dir).message); // brief
  });

  test("loadStudy on a run path that is a folder says so", async () => {
    const text = `scenarios:\n  - {name: s, end: 9, runs: [runs/two]}\n${MEASURES}`;
    const { error, file } = await failure(text);
    expect(error.message).toBe(m.runPathIsFolder(at(file, text, "runs/two", "scenarios[0].runs[0]"), "runs/two").message); // common practice
  });

  test("loadStudy on a run file with an unsupported extension names the file and the extensions read", async () => {
    const text = `scenarios:\n  - {name: s, end: 9, runs: runs/mixed/*}\n${MEASURES}`;
    const { error, file } = await failure(text);
    expect(error.message).toBe(m.unsupportedRunFile(at(file, text, "runs/mixed", "scenarios[0].runs"), "runs/mixed/notes.txt", RUN_EXTENSIONS).message); // CONTRACT.md section 1: format by extension
  });

  test("loadStudy on two runs with one id in a scenario names both files", async () => {
    const text = `scenarios:\n  - {name: s, end: 9, runs: "runs/twins/**/*"}\n${MEASURES}`;
    const { error, file } = await failure(text);
    expect(error.message).toBe(
      m.duplicateRunId(at(file, text, '"runs/twins', "scenarios[0].runs"), "s", "rep-01", "runs/twins/x/rep-01.csv", "runs/twins/y/rep-01.jsonl.gz").message,
    ); // CONTRACT.md section 1: run id = file name without extensions
  });

  test("loadStudy on a scenario with an empty run list says it has no runs", async () => {
    const text = `scenarios:\n  - {name: s, end: 9, runs: []}\n${MEASURES}`;
    const { error, file } = await failure(text);
    expect(error.message).toBe(m.noRuns(at(file, text, "[]", "scenarios[0].runs"), "s").message); // brief
  });

  test("loadStudy on an override of an unknown measure suggests the closest name", async () => {
    const text = `${SCENARIOS}    measures:\n      booth_uses: {capacity: 3}\n${MEASURES}`;
    const { error, file } = await failure(text);
    expect(error.message).toBe(m.unknownMeasure(at(file, text, "booth_uses", "scenarios[1].measures.booth_uses"), "booth_uses", MEASURE_NAMES, "booth_use").message); // brief
  });

  test("loadStudy on a measure override for an unknown scenario suggests the closest name", async () => {
    const text = `${SCENARIOS}${MEASURES}  - {name: booth_use3, kind: utilization, series: busy, capacity: 2, scenarios: {three-booth: {capacity: 3}}}\n`;
    const { error, file } = await failure(text);
    expect(error.message).toBe(m.unknownScenario(at(file, text, "three-booth:", "measures[4].scenarios.three-booth"), "three-booth", SCENARIO_NAMES, "three-booths").message); // brief
  });

  test("loadStudy on an override of a key that cannot vary per scenario lists the overridable keys", async () => {
    const text = `${SCENARIOS}    measures:\n      booth_use: {series: busy2}\n${MEASURES}`;
    const { error, file } = await failure(text);
    expect(error.message).toBe(m.notOverridable(at(file, text, "series: busy2", "scenarios[1].measures.booth_use.series"), "series", OVERRIDABLE).message); // brief: overridable keys
  });

  test("loadStudy on an override key that does not fit the measure's kind names the kind's keys", async () => {
    const text = `${SCENARIOS}    measures:\n      lane_queue: {quantiles: [0.5]}\n${MEASURES}`;
    const { error, file } = await failure(text);
    expect(error.message).toBe(
      m.overrideNotForKind(at(file, text, "quantiles", "scenarios[1].measures.lane_queue.quantiles"), "quantiles", "lane_queue", "level", ["initial", "at_least", "target"]).message,
    ); // brief: level accepts at_least; observation accepts quantiles
  });

  test("loadStudy on a comparison of an unknown measure or scenario suggests the closest name", async () => {
    const badMeasure = `${SCENARIOS}${MEASURES}compare:\n  - {measure: check_wiat, scenarios: [two-booths, three-booths]}\n`;
    const first = await failure(badMeasure);
    expect(first.error.message).toBe(m.unknownMeasure(at(first.file, badMeasure, "check_wiat", "compare[0].measure"), "check_wiat", MEASURE_NAMES, "check_wait").message); // brief
    const badScenario = `${SCENARIOS}${MEASURES}compare:\n  - {measure: check_wait, scenarios: [two-booths, tree-booths]}\n`;
    const second = await failure(badScenario);
    expect(second.error.message).toBe(m.unknownScenario(at(second.file, badScenario, "tree-booths", "compare[0].scenarios[1]"), "tree-booths", SCENARIO_NAMES, "three-booths").message);
  });

  test("loadStudy on a comparison of a scenario with itself says so", async () => {
    const text = `${SCENARIOS}${MEASURES}compare:\n  - {measure: check_wait, scenarios: [two-booths, two-booths]}\n`;
    const { error, file } = await failure(text);
    expect(error.message).toBe(m.sameScenarioTwice(at(file, text, "two-booths]", "compare[0].scenarios[1]"), "two-booths").message); // brief
  });

  test("loadStudy on a paired comparison of scenarios with different run ids lists the ids each lacks", async () => {
    const text = `${SCENARIOS.replace("runs/three/*.csv", "runs/odd/*.csv")}${MEASURES}compare:\n  - {measure: check_wait, scenarios: [two-booths, three-booths], method: paired}\n`;
    const { error, file } = await failure(text);
    expect(error.message).toBe(m.pairedRunsDiffer(at(file, text, "{measure", "compare[0]"), "two-booths", "three-booths", ["rep-02"], ["rep-09"]).message); // common practice: pairs share run ids (common random numbers)
  });

  test("loadStudy accepts a paired comparison when both scenarios have the same run ids", async () => {
    const dir = studyFolder(RUN_FILES);
    folders.push(dir);
    const text = `${SCENARIOS}${MEASURES}compare:\n  - {measure: check_wait, scenarios: [two-booths, three-booths], method: paired}\n`;
    const study = await loadStudy(join(dir, "s.yaml"), { text });
    expect(study.comparisons).toEqual([{ measure: "check_wait", a: "two-booths", b: "three-booths", method: "paired" }]); // brief
  });

  // --- select: (docs/manifest.md, "Selecting the best") ---
  const ODD = `${SCENARIOS}  - name: odd\n    end: 600\n    runs: runs/odd/*.csv\n  - name: one\n    end: 600\n    runs: runs/mixed/*.csv\n`;

  test("loadStudy on a selection naming an unknown measure suggests the closest", async () => {
    const text = `${SCENARIOS}${MEASURES}select:\n  - {measure: check_wiat, better: smaller, indifference: 1}\n`;
    const { error, file } = await failure(text);
    expect(error.message).toBe(m.unknownMeasure(at(file, text, "check_wiat", "select[0].measure"), "check_wiat", MEASURE_NAMES, "check_wait").message); // brief: did-you-mean of the checker
  });

  test("loadStudy on a selection naming an unknown scenario, or one twice, points at the item", async () => {
    const unknown = `${SCENARIOS}${MEASURES}select:\n  - {measure: check_wait, better: smaller, indifference: 1, scenarios: [two-booths, three-booth]}\n`;
    const first = await failure(unknown);
    expect(first.error.message).toBe(m.unknownScenario(at(first.file, unknown, "three-booth]", "select[0].scenarios[1]"), "three-booth", SCENARIO_NAMES, "three-booths").message); // brief
    const twice = `${SCENARIOS}${MEASURES}select:\n  - {measure: check_wait, better: smaller, indifference: 1, scenarios: [two-booths, three-booths, two-booths]}\n`;
    const second = await failure(twice);
    expect(second.error.message).toBe(m.selectionScenarioTwice(at(second.file, twice, "two-booths]", "select[0].scenarios[2]"), "two-booths").message); // brief: no repeats
  });

  test("loadStudy on a selection in a study of one scenario says two are needed", async () => {
    const text = `scenarios:\n  - {name: two-booths, end: 600, runs: runs/two/*.csv}\n${MEASURES}select:\n  - {measure: check_wait, better: smaller, indifference: 1}\n`;
    const { error, file } = await failure(text);
    expect(error.message).toBe(m.selectionTooFewScenarios(at(file, text, "{measure", "select[0]"), 1).message); // brief: at least 2
  });

  test("loadStudy on a selection with one scenario listed is stopped by the schema", async () => {
    const text = `${SCENARIOS}${MEASURES}select:\n  - {measure: check_wait, better: smaller, indifference: 1, scenarios: [two-booths]}\n`;
    const { error } = await failure(text);
    expect(error.message).toContain("select[0].scenarios"); // brief: at least 2 (schema minItems)
  });

  test("loadStudy on a probability of correct selection at or below 1/k, or at 1, says the range", async () => {
    const low = `${SCENARIOS}${MEASURES}select:\n  - {measure: check_wait, better: smaller, indifference: 1, probability: 0.5}\n`;
    const first = await failure(low);
    expect(first.error.message).toBe(m.selectionProbabilityOutOfRange(at(first.file, low, "0.5}", "select[0].probability"), 0.5, 2).message); // Bechhofer (1954): P* > 1/k, else a blind pick does as well
    const one = `${SCENARIOS}${MEASURES}select:\n  - {measure: check_wait, better: smaller, indifference: 1, probability: 1}\n`;
    const second = await failure(one);
    expect(second.error.message).toBe(m.selectionProbabilityOutOfRange(at(second.file, one, "1}", "select[0].probability"), 1, 2).message); // P* = 1 needs infinitely many runs (common practice)
  });

  test("loadStudy on a selection of scenarios with different run counts and no first_stage asks for it", async () => {
    const text = `${ODD}${MEASURES}select:\n  - {measure: check_wait, better: smaller, indifference: 1, scenarios: [two-booths, one]}\n`;
    const { error, file } = await failure(text);
    expect(error.message).toBe(m.selectionFirstStageNeeded(at(file, text, "{measure", "select[0]"), [{ scenario: "two-booths", runs: 2 }, { scenario: "one", runs: 1 }]).message); // brief: first_stage optional only with equal run counts
  });

  test("loadStudy on a first stage larger than a scenario's runs names the scenario", async () => {
    const text = `${SCENARIOS}${MEASURES}select:\n  - {measure: check_wait, better: smaller, indifference: 1, first_stage: 3}\n`;
    const { error, file } = await failure(text);
    expect(error.message).toBe(m.selectionFirstStageTooMany(at(file, text, "3}", "select[0].first_stage"), "two-booths", 2, 3).message); // brief: the first stage must be there
  });

  test("loadStudy on a first stage below 2 is stopped by the schema", async () => {
    const text = `${SCENARIOS}${MEASURES}select:\n  - {measure: check_wait, better: smaller, indifference: 1, first_stage: 1}\n`;
    const { error } = await failure(text);
    expect(error.message).toContain("select[0].first_stage"); // a variance needs n0 >= 2 (common practice)
  });

  test("loadStudy on a paired selection whose first stages have different run ids lists both", async () => {
    const text = `${ODD}${MEASURES}select:\n  - {measure: check_wait, better: smaller, indifference: 1, method: paired, scenarios: [two-booths, odd]}\n`;
    const { error, file } = await failure(text);
    expect(error.message).toBe(m.selectionPairedRunsDiffer(at(file, text, "paired", "select[0].method"), "two-booths", "odd", ["rep-01", "rep-02"], ["rep-01", "rep-09"]).message); // brief: pairing by run id (common random numbers)
  });

  test("loadStudy fills a selection's defaults: all scenarios, the study's confidence, independent, n0 = the common run count", async () => {
    const dir = studyFolder(RUN_FILES);
    folders.push(dir);
    const text = `confidence: 0.9\n${SCENARIOS}${MEASURES}select:\n  - {measure: check_wait, better: smaller, indifference: 0.5}\n  - {measure: vehicles_done, better: larger, indifference: 2, probability: 0.99, method: paired, first_stage: 2, scenarios: [three-booths, two-booths]}\n`;
    const study = await loadStudy(join(dir, "s.yaml"), { text });
    expect(study.selections).toEqual([
      { measure: "check_wait", better: "smaller", delta: 0.5, pcs: 0.9, method: "independent", firstStage: 2, scenarios: ["two-booths", "three-booths"] }, // brief: the defaults
      { measure: "vehicles_done", better: "larger", delta: 2, pcs: 0.99, method: "paired", firstStage: 2, scenarios: ["three-booths", "two-booths"] },
    ]);
  });

  test("loadStudy on an MSER-5 warm-up naming an unknown or a count measure says so", async () => {
    const unknown = `warmup: {method: mser-5, measure: lane_queu, slice: 10}\n${SCENARIOS}${MEASURES}`;
    const first = await failure(unknown);
    expect(first.error.message).toBe(m.unknownMeasure(at(first.file, unknown, "lane_queu", "warmup.measure"), "lane_queu", MEASURE_NAMES, "lane_queue").message); // brief
    const count = `${SCENARIOS.replace("    runs: runs/three", "    warmup: {method: mser-5, measure: vehicles_done, slice: 10}\n    runs: runs/three")}${MEASURES}`;
    const second = await failure(count);
    expect(second.error.message).toBe(m.mserCountMeasure(at(second.file, count, "vehicles_done,", "scenarios[1].warmup.measure"), "vehicles_done").message); // brief
  });

  test("loadStudy on batch means with fewer than 2 batches says so", async () => {
    const text = `analysis: {method: batch-means, batches: 1}\n${SCENARIOS}${MEASURES}`;
    const { error, file } = await failure(text);
    expect(error.message).toBe(m.tooFewBatches(at(file, text, "1}", "analysis.batches"), 1).message); // common practice: a variance needs 2 batches
  });

  test("loadStudy on a quantile probability outside [0, 1] points at the item", async () => {
    const text = `${SCENARIOS}measures:\n  - {name: w, kind: observation, series: wait, quantiles: [0.5, 90]}\n`;
    const { error, file } = await failure(text);
    expect(error.message).toBe(m.quantileOutOfRange(at(file, text, "90", "measures[0].quantiles[1]"), 90).message); // definition of a quantile
  });

  test("loadStudy on a level with both series and from, or with neither, says which to keep or add", async () => {
    const both = `${SCENARIOS}measures:\n  - {name: q, kind: level, series: queue, from: {enter: a, leave: b}}\n`;
    const first = await failure(both);
    expect(first.error.message).toBe(m.seriesAndFrom(at(first.file, both, "{name: q", "measures[0]"), "q").message); // CONTRACT.md section 2
    const neither = `${SCENARIOS}measures:\n  - {name: w, kind: observation}\n`;
    const second = await failure(neither);
    expect(second.error.message).toBe(m.noSource(at(second.file, neither, "{name: w", "measures[0]"), "w", "observation", "{start: SERIES, end: SERIES}").message);
  });

  test("every manifest message starts with file:line:column (at key.path) and says what to do", async () => {
    const text = `${SCENARIOS}${MEASURES}compare:\n  - {measure: check_wait, scenarios: [two-booths, two-booths]}\n`;
    const { error, file } = await failure(text);
    const { line, column } = pos(text, "two-booths]");
    expect(error.message.startsWith(`${file}:${line}:${column} (at compare[0].scenarios[1]): `)).toBe(true); // CONTRACT.md section 5
    expect(error.message).toContain("\n  What to do: ");
    expect(error.exitCode).toBe(1); // CONTRACT.md section 5: input error exits 1
  });
});

// A folder named like a run file must not be taken for one.
test("loadStudy globs list files only, never folders", async () => {
  const dir = studyFolder({ "runs/a.csv": "" });
  folders.push(dir);
  mkdirSync(join(dir, "runs", "folder.csv"));
  const text = `scenarios:\n  - {name: s, runs: "runs/*.csv"}\nmeasures:\n  - {name: n, kind: count, series: x}\n`;
  const study = await loadStudy(join(dir, "s.yaml"), { text });
  expect(study.scenarios[0].runs.map((r) => r.file)).toEqual(["runs/a.csv"]); // brief: files only
});
