/**
 * A measure's `label` and `unit` (issue 13): their defaults on the normalized Study, and a
 * catalogue message at the key path for every bad value (src/messages/manifest.ts). Positions are
 * found in the test's own manifest text by string search.
 */
import { readFileSync } from "node:fs";
import { describe, expect, test } from "vitest";
import { loadStudy } from "../../src/manifest/loadStudy.js";
import { planDigest, scenarioPlans } from "../../src/study/runSummary.js";
import { manifestMessages as m, type Place } from "../../src/messages/index.js";
import { manifestWriter, pos, userError } from "./helpers.js";

const schema = JSON.parse(readFileSync(new URL("../../docs/manifest.schema.json", import.meta.url), "utf8")) as {
  definitions: Record<string, { description?: string }>;
};

const write = manifestWriter();

const at = (file: string, text: string, needle: string, path: string): Place => ({ file, ...pos(text, needle), path });

const manifest = (measure: string, scenario = "") =>
  `time_unit: min\nscenarios:\n  - {name: two, end: 600, runs: runs/two/*.csv${scenario}}\nmeasures:\n  - ${measure}\n`;

describe("label and unit: defaults", () => {
  test("loadStudy gives the name as label and a unit by kind when none is written", async () => {
    const text =
      "time_unit: h\nscenarios:\n  - {name: two, end: 600, runs: runs/two/*.csv}\nmeasures:\n" +
      "  - {name: queue_len, kind: level, series: queue}\n" +
      "  - {name: busy_share, kind: utilization, series: busy, capacity: 2}\n" +
      "  - {name: wait, kind: observation, series: wait}\n" +
      "  - {name: stay, kind: observation, from: {start: arrive, end: depart}}\n" +
      "  - {name: done, kind: count, series: depart}\n";
    const study = await loadStudy(write(text));
    // docs/manifest.md, "label" and "unit": a duration takes the time unit, a utilization is a fraction, the rest none
    expect(study.scenarios[0].measures.map((x) => [x.name, x.label, x.unit])).toEqual([
      ["queue_len", "queue_len", null],
      ["busy_share", "busy_share", "fraction"],
      ["wait", "wait", null],
      ["stay", "stay", "h"],
      ["done", "done", null],
    ]);
  });

  test("loadStudy keeps a written label and unit as written, in every scenario", async () => {
    const text =
      'scenarios:\n  - {name: a, end: 9, runs: runs/two/*.csv}\n  - {name: b, end: 9, runs: runs/three/*.csv}\nmeasures:\n' +
      '  - {name: done, kind: count, series: depart, label: "Vehicles <b>checked</b> in", unit: vehicles}\n';
    const study = await loadStudy(write(text));
    for (const sc of study.scenarios) expect([sc.measures[0].label, sc.measures[0].unit]).toEqual(["Vehicles <b>checked</b> in", "vehicles"]);
  });
});

describe("label and unit: bad values get a message at the key path", () => {
  test("loadStudy on a label that is a number says it takes a text", async () => {
    const text = manifest("{name: q, kind: level, series: queue, label: 42}");
    const file = write(text);
    const error = await userError(loadStudy(file));
    expect(error.message).toBe(m.wrongType(at(file, text, "42", "measures[0].label"), "a text", "a whole number (42)", schema.definitions.label.description ?? null, true).message);
  });

  test("loadStudy on a unit that is a list says it takes a text", async () => {
    const text = manifest("{name: q, kind: level, series: queue, unit: [min]}");
    const file = write(text);
    const error = await userError(loadStudy(file));
    expect(error.message).toBe(m.wrongType(at(file, text, "[min]", "measures[0].unit"), "a text", "a list", schema.definitions.unit.description ?? null, false).message);
  });

  test("loadStudy on an empty label says it is empty", async () => {
    const text = manifest('{name: q, kind: level, series: queue, label: ""}');
    const file = write(text);
    const error = await userError(loadStudy(file));
    expect(error.message).toBe(m.emptyText(at(file, text, '""', "measures[0].label")).message);
  });

  test("loadStudy on a unit of only spaces says so", async () => {
    const text = manifest('{name: q, kind: level, series: queue, unit: "   "}');
    const file = write(text);
    const error = await userError(loadStudy(file));
    expect(error.message).toBe(m.blankText(at(file, text, '"   "', "measures[0].unit")).message);
  });

  test("loadStudy on a label of 201 characters says the limit; 200 are accepted", async () => {
    const long = "é".repeat(201); // characters, not bytes: 402 bytes of UTF-8
    const text = manifest(`{name: q, kind: level, series: queue, label: ${long}}`);
    const file = write(text);
    const error = await userError(loadStudy(file));
    expect(error.message).toBe(m.textTooLong(at(file, text, long, "measures[0].label"), 201, 200).message);
    const study = await loadStudy(write(manifest(`{name: q, kind: level, series: queue, label: ${"é".repeat(200)}}`)));
    expect(study.scenarios[0].measures[0].label).toBe("é".repeat(200));
  });

  test("loadStudy on control characters in a label or unit names the character and its position", async () => {
    const cases: [string, string, number, number][] = [
      ['"Queue\\tlength"', "label", 0x09, 6], // a tab
      ['"min\\nutes"', "unit", 0x0a, 4], // a line break
      ['"Wait \\u202Enim"', "label", 0x202e, 6], // a right-to-left override
      ['"x\\u0085"', "unit", 0x85, 2], // C1 next line
      ['"bell\\u0007"', "label", 0x07, 5],
    ];
    for (const [written, key, code, position] of cases) {
      const text = manifest(`{name: q, kind: level, series: queue, ${key}: ${written}}`);
      const file = write(text);
      const error = await userError(loadStudy(file));
      expect(error.message).toBe(m.controlCharacter(at(file, text, written, `measures[0].${key}`), code, position).message);
    }
  });

  test("loadStudy on a label in a scenario's measure overrides says it is the same in every scenario", async () => {
    const text = manifest("{name: q, kind: level, series: queue}", ", measures: {q: {label: Queue}}");
    const file = write(text);
    const error = await userError(loadStudy(file));
    expect(error.message).toBe(m.shownTheSameEverywhere({ file, ...pos(text, "label"), path: "scenarios[0].measures.q.label" }, "label").message);
  });

  test("loadStudy on a unit in a measure's scenarios: entry says it is the same in every scenario", async () => {
    const text = manifest("{name: q, kind: level, series: queue, scenarios: {two: {unit: cars}}}");
    const file = write(text);
    const error = await userError(loadStudy(file));
    expect(error.message).toBe(m.shownTheSameEverywhere({ file, ...pos(text, "unit: cars"), path: "measures[0].scenarios.two.unit" }, "unit").message);
  });
});

describe("label and unit change no computation", () => {
  test("planDigest (what a run summary is checked against) is the same with another label and unit", async () => {
    const plain = await loadStudy(write(manifest("{name: q, kind: level, series: queue}")));
    const captioned = await loadStudy(write(manifest("{name: q, kind: level, series: queue, label: Queue length, unit: vehicles}")));
    const other = await loadStudy(write(manifest("{name: q, kind: level, series: queue, initial: 1}")));
    const digest = (s: typeof plain) => planDigest(scenarioPlans(s, s.scenarios[0], null)[0]);
    expect(digest(captioned)).toBe(digest(plain));
    expect(digest(other)).not.toBe(digest(plain)); // the digest does see options that change figures
  });
});
