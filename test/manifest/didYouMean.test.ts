import { describe, expect, test } from "vitest";
import { closest, editDistance } from "../../src/manifest/didYouMean.js";

describe("editDistance", () => {
  test("editDistance counts insertions, deletions, substitutions and neighbour swaps", () => {
    expect(editDistance("mesures", "measures")).toBe(1); // one insertion, computed by hand
    expect(editDistance("levle", "level")).toBe(1); // one swap (Damerau 1964)
    expect(editDistance("kitten", "sitting")).toBe(3); // Levenshtein's textbook pair, common practice
    expect(editDistance("", "abc")).toBe(3); // three insertions, computed by hand
    expect(editDistance("same", "same")).toBe(0); // identity, definition
  });
});

describe("closest", () => {
  test("closest returns the nearest candidate within a third of the word's length, else null", () => {
    expect(closest("mesures", ["scenarios", "measures", "compare"])).toBe("measures"); // distance 1 <= 2
    expect(closest("time-unit", ["title", "time_unit"])).toBe("time_unit"); // distance 1 <= 3
    expect(closest("Capacity", ["capacity", "initial"])).toBe("capacity"); // case is ignored, common practice
    expect(closest("zzz", ["scenarios", "measures"])).toBeNull(); // nothing close, common practice
  });
});
