/**
 * Property: for every valid generated study (studyGen.ts), `loadStudy` + `runStudy` give every
 * number of CONTRACT.md sections 2–4 equal to a slow reference written from the contract
 * (reference.ts), at 1e-9 relative with a small absolute floor scaled to the data (1e-12 times
 * the largest input magnitude that enters the figure; doubles carry about 1e-16 relative, so
 * the floor leaves room for rounding in sums of a few dozen terms and nothing more). Standard
 * deviations and half-widths are compared squared, with the floor squared (see closeSd).
 *
 * Seeded and bounded, so CI runs the same cases each time.
 */
import { afterAll, describe, expect, it } from "vitest";
import fc from "fast-check";
import { loadStudy } from "../../src/manifest/loadStudy.js";
import { runStudy } from "../../src/study/runStudy.js";
import { type ObservationRef, type SummaryRef, runRef, summaryRef } from "./reference.js";
import { type GenStudy, removeStudy, studyArb, writeStudy } from "./studyGen.js";

// Fixed for CI; SOJOURN_FUZZ_SEED and SOJOURN_FUZZ_RUNS explore further by hand.
const SEED = Number(process.env.SOJOURN_FUZZ_SEED ?? 20240611);
const RUNS = Number(process.env.SOJOURN_FUZZ_RUNS ?? 150);

const dirs: string[] = [];
afterAll(() => dirs.forEach(removeStudy));

/** |a - b| <= 1e-9 · max(|a|, |b|) + 1e-12 · scale; nulls must match exactly. */
function close(actual: unknown, expected: number | null, scale: number, what: string): void {
  if (expected === null) {
    expect(actual, what).toBeNull();
    return;
  }
  expect(typeof actual, `${what}: ${String(actual)} is not a number`).toBe("number");
  const a = actual as number;
  const tol = 1e-9 * Math.max(Math.abs(a), Math.abs(expected)) + 1e-12 * scale;
  if (!(Math.abs(a - expected) <= tol)) {
    expect.fail(`${what}: got ${a}, the reference gives ${expected} (difference ${Math.abs(a - expected)}, tolerance ${tol})`);
  }
}

/**
 * A standard deviation is compared through its square: rounding leaves an absolute error of
 * about 1e-16 · scale² in a variance, which a square root turns into about 1e-8 · scale in an sd
 * near 0 (true of any algorithm, the reference's too).
 */
function closeSd(actual: unknown, expected: number | null, scale: number, what: string): void {
  if (expected === null || typeof actual !== "number") return close(actual, expected, scale, what);
  close(actual * actual, expected * expected, scale * scale, `${what} (squared)`);
}

function compareObservation(got: Record<string, unknown>, ref: ObservationRef, timeScale: number, what: string): void {
  const scale = Math.max(ref.scale, timeScale);
  expect(got.n, `${what}.n`).toBe(ref.n);
  close(got.value, ref.mean, scale, `${what}.value`);
  close(got.mean, ref.mean, scale, `${what}.mean`);
  closeSd(got.sd, ref.sd, scale, `${what}.sd`);
  close(got.min, ref.min, scale, `${what}.min`);
  close(got.max, ref.max, scale, `${what}.max`);
  const q = got.quantiles as Record<string, number | null>;
  for (const [p, v] of Object.entries(ref.quantiles)) close(q[p], v, scale, `${what}.quantiles[${p}]`);
}

function compareSummary(got: Record<string, unknown>, ref: SummaryRef, what: string): void {
  expect(got.n, `${what}.n`).toBe(ref.n);
  close(got.mean, ref.mean, ref.scale, `${what}.mean`);
  closeSd(got.sd, ref.sd, ref.scale, `${what}.sd`);
  // the half-width is t · sd / √n: near 0 it carries the sd's error, so it is compared squared too
  const tOverRootN = ref.sd !== null && ref.half_width !== null && ref.sd > 0 ? ref.half_width / ref.sd : 1;
  closeSd(got.half_width, ref.half_width, ref.scale * tOverRootN, `${what}.half_width`);
  close(got.ci_low, ref.ci_low, ref.scale + Math.abs(ref.half_width ?? 0), `${what}.ci_low`);
  close(got.ci_high, ref.ci_high, ref.scale + Math.abs(ref.half_width ?? 0), `${what}.ci_high`);
}

async function checkStudy(study: GenStudy): Promise<void> {
  const { dir, manifest } = writeStudy(study);
  dirs.push(dir);
  const loaded = await loadStudy(manifest);
  const { outcome } = await runStudy(loaded);
  const results = outcome.results;
  expect(results.confidence).toBe(study.confidence);
  const N = study.names;
  study.scenarios.forEach((sc, s) => {
    const got = results.scenarios[s];
    expect(got.name).toBe(sc.name);
    const refs = sc.runs.map((run) => runRef(study, s, run));
    sc.runs.forEach((run, i) => {
      const r = refs[i];
      const m = got.runs[i].measures as unknown as Record<string, Record<string, unknown>>;
      const where = `${sc.name}/${run.id}`;
      expect(got.runs[i].id).toBe(run.id);
      const input = outcome.inputs.find((x) => x.scenario === sc.name && x.run === run.id)!;
      expect(input.left_out.after_end, `${where} rows after end`).toBe(r.afterEnd);

      // level from a series (CONTRACT.md sections 2-4)
      const L = m[N.level];
      close(L.value, r.level.mean, r.level.vmax, `${where} level.value`);
      close(L.mean, r.level.mean, r.level.vmax, `${where} level.mean`);
      close(L.area, r.level.area, r.level.scale, `${where} level.area`);
      close(L.duration, r.T, r.tmax, `${where} level.duration`);
      closeSd(L.sd, r.level.sd, r.level.vmax, `${where} level.sd`);
      close(L.min, r.level.min, 0, `${where} level.min`);
      close(L.max, r.level.max, 0, `${where} level.max`);
      close(L.final, r.level.final, 0, `${where} level.final`);

      // utilization with a constant capacity
      const U = m[N.util];
      close(U.value, r.util.value, r.util.vmax / study.capacity, `${where} utilization.value`);
      close(U.area, r.util.area, r.util.scale, `${where} utilization.area`);
      close(U.capacity_area, r.util.capacityArea, study.capacity * r.tmax, `${where} utilization.capacity_area`);

      // observations and counts
      compareObservation(m[N.obs], r.obs, 0, `${where} observation`);
      const C = m[N.count];
      expect(C.n, `${where} count.n`).toBe(r.count.n);
      expect(C.value, `${where} count.value`).toBe(r.count.n);
      close(C.rate, r.count.rate, 0, `${where} count.rate`);

      // entity-derived level and durations, with censoring
      const I = m[N.inside];
      close(I.mean, r.inside.mean, r.inside.vmax, `${where} inside.mean`);
      close(I.area, r.inside.area, r.inside.scale, `${where} inside.area`);
      closeSd(I.sd, r.inside.sd, r.inside.vmax, `${where} inside.sd`);
      close(I.min, r.inside.min, 0, `${where} inside.min`);
      close(I.max, r.inside.max, 0, `${where} inside.max`);
      close(I.final, r.inside.final, 0, `${where} inside.final`);
      expect([I.entered, I.left, I.inside_at_end], `${where} inside entered/left/inside_at_end`).toEqual([r.inside.entered, r.inside.left, r.inside.insideAtEnd]);
      const D = m[N.stay];
      compareObservation(D, r.stay, r.tmax, `${where} stay`);
      expect(D.censored, `${where} stay.censored`).toBe(r.stay.censored);
    });

    // across runs (CONTRACT.md section 4)
    const summary = got.summary as unknown as Record<string, Record<string, unknown>>;
    compareSummary(summary[N.level], summaryRef(refs.map((r) => r.level.mean), study.confidence), `${sc.name} summary level`);
    compareSummary(summary[N.util], summaryRef(refs.map((r) => r.util.value), study.confidence), `${sc.name} summary utilization`);
    compareSummary(summary[N.obs], summaryRef(refs.map((r) => r.obs.mean), study.confidence), `${sc.name} summary observation`);
    compareSummary(summary[N.count], summaryRef(refs.map((r) => r.count.n), study.confidence), `${sc.name} summary count`);
    compareSummary(summary[N.inside], summaryRef(refs.map((r) => r.inside.mean), study.confidence), `${sc.name} summary inside`);
    compareSummary(summary[N.stay], summaryRef(refs.map((r) => r.stay.mean), study.confidence), `${sc.name} summary stay`);
  });
}

describe("fuzz: valid generated studies agree with the contract's reference (CONTRACT.md sections 2-4)", () => {
  it(`loadStudy + runStudy match the reference on ${RUNS} seeded random studies`, async () => {
    await fc.assert(
      fc.asyncProperty(studyArb, async (study) => {
        await checkStudy(study);
      }),
      { seed: SEED, numRuns: RUNS },
    );
  });
});
