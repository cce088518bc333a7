import { describe, expect, test } from "vitest";
import { formatKeyPath, pointerToKeyPath } from "../../src/manifest/keyPath.js";

describe("formatKeyPath", () => {
  test("formatKeyPath writes list indexes in brackets and quotes keys with unusual characters", () => {
    expect(formatKeyPath(["scenarios", 1, "runs"])).toBe("scenarios[1].runs"); // the brief's example form
    expect(formatKeyPath(["measures", 0, "scenarios", "three-booths", "capacity"])).toBe("measures[0].scenarios.three-booths.capacity");
    expect(formatKeyPath(["scenarios", 0, "measures", "wait time"])).toBe('scenarios[0].measures["wait time"]'); // common practice (JS paths)
    expect(formatKeyPath([])).toBe("");
  });
});

describe("pointerToKeyPath", () => {
  test("pointerToKeyPath turns a JSON Pointer into keys and list indexes (RFC 6901 escapes)", () => {
    const data = { scenarios: [{ runs: "x" }, { runs: "y" }], "a/b": { "c~d": 1 }, "7": { x: 1 } };
    expect(pointerToKeyPath("/scenarios/1/runs", data)).toEqual(["scenarios", 1, "runs"]); // RFC 6901
    expect(pointerToKeyPath("/a~1b/c~0d", data)).toEqual(["a/b", "c~d"]); // RFC 6901 section 4
    expect(pointerToKeyPath("/7/x", data)).toEqual(["7", "x"]); // a mapping key that looks like a number stays a key
    expect(pointerToKeyPath("", data)).toEqual([]);
  });
});
