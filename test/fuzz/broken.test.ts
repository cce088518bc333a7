/**
 * Property: whatever is done to a study's files — random bytes, truncation, shuffled or
 * duplicated lines, hostile numbers (huge, tiny, negative zero, NaN, hex, 400 digits), quotes
 * added or removed, a damaged manifest — `loadStudy` + `runStudy` either succeed with finite
 * numbers everywhere in the results, or reject with a `UserError`. Never another exception (a
 * TypeError, a RangeError: a bug), never NaN or Infinity in results.json (JSON would write them
 * as null, silently).
 *
 * Source: CONTRACT.md section 5 (an input error is a message, not a crash) and section 8
 * (numbers are JSON numbers). Seeded and bounded.
 */
import { gunzipSync, gzipSync } from "node:zlib";
import { afterAll, describe, expect, it } from "vitest";
import fc from "fast-check";
import { loadStudy } from "../../src/manifest/loadStudy.js";
import { UserError } from "../../src/messages/index.js";
import { runStudy } from "../../src/study/runStudy.js";
import { removeStudy, studyArb, studyFiles, writeFiles } from "./studyGen.js";

const SEED = Number(process.env.SOJOURN_FUZZ_SEED ?? 99173);
const RUNS = Number(process.env.SOJOURN_FUZZ_RUNS ?? 250);

const dirs: string[] = [];
afterAll(() => dirs.forEach(removeStudy));

/** Number texts a damaged or careless model writes. */
const HOSTILE_NUMBERS = [
  "1e309", "-1e400", "1.7976931348623157e308", "-1.7976931348623157e308", "1e308", "5e-324", "1e-400", "-0",
  "NaN", "nan", "Infinity", "-inf", "0x10", "1,5", "1e", ".", "+-1", "", " ", "٣", "1_000", "9".repeat(400),
  "0." + "0".repeat(330) + "1", "1e+308", "1E308", "2e307",
];

type Mutation =
  | { kind: "bytes"; at: number; bytes: Uint8Array }
  | { kind: "truncate"; at: number }
  | { kind: "swapLines"; a: number; b: number }
  | { kind: "duplicateLine"; a: number }
  | { kind: "deleteLine"; a: number }
  | { kind: "number"; nth: number; text: string }
  | { kind: "quote"; at: number }
  | { kind: "compressed"; at: number; byte: number };

const mutationArb: fc.Arbitrary<{ file: number; m: Mutation }> = fc.record({
  file: fc.nat(),
  m: fc.oneof(
    fc.record({ kind: fc.constant("bytes" as const), at: fc.double({ min: 0, max: 1, noNaN: true }), bytes: fc.uint8Array({ minLength: 1, maxLength: 6 }) }),
    fc.record({ kind: fc.constant("truncate" as const), at: fc.double({ min: 0, max: 1, noNaN: true }) }),
    fc.record({ kind: fc.constant("swapLines" as const), a: fc.nat(), b: fc.nat() }),
    fc.record({ kind: fc.constant("duplicateLine" as const), a: fc.nat() }),
    fc.record({ kind: fc.constant("deleteLine" as const), a: fc.nat() }),
    { arbitrary: fc.record({ kind: fc.constant("number" as const), nth: fc.nat(), text: fc.constantFrom(...HOSTILE_NUMBERS) }), weight: 4 },
    fc.record({ kind: fc.constant("quote" as const), at: fc.double({ min: 0, max: 1, noNaN: true }) }),
    fc.record({ kind: fc.constant("compressed" as const), at: fc.double({ min: 0, max: 1, noNaN: true }), byte: fc.integer({ min: 0, max: 255 }) }),
  ),
});

/** Applies one mutation to a file's bytes (the decompressed text for `.gz`, except "compressed"). */
function mutate(content: Buffer, gz: boolean, m: Mutation): Buffer {
  if (m.kind === "compressed") {
    if (!gz || content.length === 0) return content;
    const out = Buffer.from(content);
    out[Math.floor(m.at * out.length) % out.length] = m.byte;
    return out;
  }
  let data = gz ? safeGunzip(content) : content;
  const pos = (x: number) => Math.floor(x * data.length);
  const lines = () => data.toString("latin1").split("\n");
  const fromLines = (ls: string[]) => Buffer.from(ls.join("\n"), "latin1");
  switch (m.kind) {
    case "bytes":
      data = Buffer.concat([data.subarray(0, pos(m.at)), Buffer.from(m.bytes), data.subarray(pos(m.at))]);
      break;
    case "truncate":
      data = data.subarray(0, pos(m.at));
      break;
    case "quote":
      data = Buffer.concat([data.subarray(0, pos(m.at)), Buffer.from('"'), data.subarray(pos(m.at))]);
      break;
    case "swapLines": {
      const ls = lines();
      const a = m.a % ls.length;
      const b = m.b % ls.length;
      [ls[a], ls[b]] = [ls[b], ls[a]];
      data = fromLines(ls);
      break;
    }
    case "duplicateLine": {
      const ls = lines();
      const a = m.a % ls.length;
      ls.splice(a, 0, ls[a]);
      data = fromLines(ls);
      break;
    }
    case "deleteLine": {
      const ls = lines();
      ls.splice(m.a % ls.length, 1);
      data = fromLines(ls);
      break;
    }
    case "number": {
      const text = data.toString("latin1");
      const spans = [...text.matchAll(/-?\d+(\.\d+)?(e[-+]?\d+)?/gi)];
      if (spans.length === 0) break;
      const hit = spans[m.nth % spans.length];
      data = Buffer.from(text.slice(0, hit.index) + m.text + text.slice((hit.index as number) + hit[0].length), "latin1");
      break;
    }
  }
  return gz ? gzipSync(data) : data;
}

function safeGunzip(b: Buffer): Buffer {
  try {
    return gunzipSync(b);
  } catch {
    return b;
  }
}

/** Every number reachable from `x`, with its path; fails on NaN and ±Infinity. */
function assertFinite(x: unknown, path: string): void {
  if (typeof x === "number") {
    if (!Number.isFinite(x)) expect.fail(`${path} is ${x}`);
  } else if (Array.isArray(x)) x.forEach((v, i) => assertFinite(v, `${path}[${i}]`));
  else if (x !== null && typeof x === "object") for (const [k, v] of Object.entries(x)) assertFinite(v, `${path}.${k}`);
}

/** Loads and runs; returns "ok" or the UserError; anything else propagates and fails the property. */
export async function loadAndRun(files: Record<string, string | Buffer>): Promise<"ok" | UserError> {
  const { dir, manifest } = writeFiles(files);
  dirs.push(dir);
  try {
    const study = await loadStudy(manifest);
    const { outcome } = await runStudy(study);
    assertFinite(outcome.results, "results");
    return "ok";
  } catch (e) {
    if (e instanceof UserError) {
      expect(e.message).toMatch(/\n {2}What to do: /); // CONTRACT.md section 5: says what to do
      return e;
    }
    throw e;
  }
}

describe("fuzz: broken inputs give a UserError or finite results, never a crash (CONTRACT.md section 5)", () => {
  it(`${RUNS} seeded random damages to random studies`, async () => {
    let failures = 0;
    await fc.assert(
      fc.asyncProperty(studyArb, fc.array(mutationArb, { minLength: 1, maxLength: 3 }), async (study, mutations) => {
        const files = studyFiles(study);
        const names = Object.keys(files);
        for (const { file, m } of mutations) {
          const name = names[file % names.length];
          const content = files[name];
          files[name] = mutate(Buffer.isBuffer(content) ? content : Buffer.from(content), name.endsWith(".gz"), m);
        }
        if ((await loadAndRun(files)) !== "ok") failures++;
      }),
      { seed: SEED, numRuns: RUNS },
    );
    // The damages must bite: most cases are refused (a test that never sees an error proves nothing).
    expect(failures).toBeGreaterThan(RUNS / 4);
  });
});
