/**
 * Property: calculation-table file names are one to one, also compared without case, for random
 * names (any Unicode, object member names, the layout's suffixes and separators, long names).
 * Seeded and bounded, so CI runs the same cases each time.
 */
import fc from "fast-check";
import { describe, it } from "vitest";
import { intervalTablePath, runTablePath, safeName } from "../../src/study/tables.js";
import { OBJECT_MEMBER_NAMES } from "./studyGen.js";

const SEED = Number(process.env.SOJOURN_FUZZ_SEED ?? 20240611);
const RUNS = Number(process.env.SOJOURN_FUZZ_RUNS ?? 150) * 20;

const piece = fc.oneof(
  fc.string({ unit: "grapheme", minLength: 1, maxLength: 6 }),
  fc.string({ unit: "binary", minLength: 1, maxLength: 6 }),
  fc.constantFrom(...OBJECT_MEMBER_NAMES, ".", "..", "~", "+", "-", "_", "/", "\\", "quantiles", "within", "time_at_least", "time_at_value", "csv", "CON", "nul", "~2E", "+a", "A", "a"),
);
/** A name made of a few pieces; now and then a long one (past the 100-character part). */
const nameArb = fc.oneof(
  { weight: 5, arbitrary: fc.array(piece, { minLength: 1, maxLength: 4 }).map((p) => p.join("")) },
  { weight: 1, arbitrary: fc.tuple(fc.string({ minLength: 90, maxLength: 120 }), piece).map(([a, b]) => a + b) },
);
const SUFFIXES = ["", "quantiles", "within", "time_at_least", "time_at_value"];

describe("fuzz: table file names", () => {
  it(`safeName, runTablePath and intervalTablePath never give two names one file, ignoring case (${RUNS} seeded pairs)`, () => {
    fc.assert(
      fc.property(nameArb, nameArb, fc.constantFrom(...SUFFIXES), fc.constantFrom(...SUFFIXES), (a, b, sa, sb) => {
        const partA = safeName(a);
        if (partA.length > 100 || partA.includes(".") || /[^a-z0-9_~+A-F-]/.test(partA)) return false;
        if (a === b) return safeName(b) === partA;
        if (partA.toLowerCase() === safeName(b).toLowerCase()) return false;
        if (runTablePath("s", "r", a, sa).toLowerCase() === runTablePath("s", "r", b, sb).toLowerCase()) return false;
        return intervalTablePath("s", a, "quantiles.0.5").toLowerCase() !== intervalTablePath("s", b, "value").toLowerCase();
      }),
      { seed: SEED, numRuns: RUNS },
    );
  });
});
