import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { Ajv } from "ajv";
import fc from "fast-check";
import { buildReportModel } from "../../src/report/model/index.js";
import { ecdfSteps, evenSample, welchMovingAverage, welchWindow } from "../../src/report/charts.js";
import { bakery } from "./fixtures/bakery.js";

const META = { toolVersion: "0.1.0-test", generatedAt: "2025-03-04T05:06:07.000Z" };

describe("chart specs", () => {
  it("every vega-lite spec of the report model validates against vega-lite's JSON schema", () => {
    // Source of truth: node_modules/vega-lite/build/vega-lite-schema.json (the schema vega-lite publishes).
    const schema = JSON.parse(readFileSync("node_modules/vega-lite/build/vega-lite-schema.json", "utf8"));
    const ajv = new Ajv({ strict: false, allErrors: false, logger: false });
    const validate = ajv.compile(schema);
    for (const opts of [{}, { hostile: true }, { plain: true }, { singleRunScenario: true }, { observationWarmup: true }, { hostile: true, observationWarmup: true }]) {
      const { study, outcome } = bakery(opts);
      const model = buildReportModel(study, outcome, META);
      const charts = [...model.measures.flatMap((m) => m.charts), ...(model.warmup?.scenarios ?? []).flatMap((w) => (w.chart ? [w.chart] : []))];
      expect(charts.length).toBeGreaterThan(0);
      for (const c of charts) {
        const ok = validate(c.spec);
        expect(ok, `${c.id}: ${ajv.errorsText(validate.errors)}`).toBe(true);
      }
    }
  });

  it("every chart of the bakery model names the time unit in its caption or a time axis", () => {
    const { study, outcome } = bakery();
    const model = buildReportModel(study, outcome, META);
    for (const m of model.measures) {
      for (const c of m.charts) expect(`${c.caption} ${JSON.stringify(c.spec)}`).toContain(study.timeUnit);
    }
    for (const w of model.warmup!.scenarios) expect(JSON.stringify(w.chart!.spec)).toContain(`time (${study.timeUnit})`);
  });

  it("the bakery model has the new chart kinds: warm-up plot, distribution and time at value", () => {
    const { study, outcome } = bakery();
    const model = buildReportModel(study, outcome, META);
    const ids = model.measures.flatMap((m) => m.charts.map((c) => c.id));
    expect(ids.filter((id) => id.endsWith("-distribution"))).toHaveLength(1);
    // shelf_stock (level) and oven_use (utilization) both have time_at_value in the fixture.
    expect(ids.filter((id) => id.endsWith("-time-at-value"))).toHaveLength(2);
    expect(model.warmup?.scenarios.filter((w) => w.chart !== null)).toHaveLength(1);
  });
});

describe("welchMovingAverage", () => {
  it("welchMovingAverage averages 2w + 1 centred values, fewer near the start, and stops w before the end", () => {
    // Computed by hand: j = 1 -> y1; j = 2 -> (1 + 2 + 3) / 3; j = 3 -> (2 + 3 + 4) / 3; j = 4 -> (3 + 4 + 5) / 3.
    expect(welchMovingAverage([1, 2, 3, 4, 5], 1)).toEqual([1, 2, 3, 4]);
    // w = 2 on 1, 4, 9, 16, 25, 36: j = 1 -> 1; j = 2 -> (1 + 4 + 9) / 3; j = 3 -> (1 + 4 + 9 + 16 + 25) / 5; j = 4 -> (4 + 9 + 16 + 25 + 36) / 5.
    expect(welchMovingAverage([1, 4, 9, 16, 25, 36], 2)).toEqual([1, 14 / 3, 11, 18]);
    expect(welchMovingAverage([1, 2], 1)).toEqual([]);
    expect(welchMovingAverage([1, 2, 3], 0)).toEqual([]);
  });

  it("welchMovingAverage of a constant sequence is that constant", () => {
    fc.assert(fc.property(fc.integer({ min: 3, max: 200 }), fc.integer({ min: -5, max: 5 }), (m, v) => {
      const w = welchWindow(m);
      for (const y of welchMovingAverage(Array.from({ length: m }, () => v), w)) expect(y).toBe(v);
    }), { numRuns: 40 });
  });

  it("welchWindow is m/20 rounded, at least 1 and at most m/4", () => {
    // By the documented rule.
    expect([welchWindow(3), welchWindow(4), welchWindow(12), welchWindow(96), welchWindow(1000)]).toEqual([0, 1, 1, 5, 50]);
  });
});

describe("ecdfSteps", () => {
  it("ecdfSteps starts at share 0 and gives the share of values at or below each distinct value", () => {
    // Computed by hand: 4 values, 2 appears twice.
    expect(ecdfSteps([3, 2, 1, 2])).toEqual([{ value: 1, share: 0 }, { value: 1, share: 0.25 }, { value: 2, share: 0.75 }, { value: 3, share: 1 }]);
    expect(ecdfSteps([])).toEqual([]);
  });

  it("ecdfSteps of many values keeps at most max + 1 points, ends at share 1 and never decreases", () => {
    fc.assert(fc.property(fc.array(fc.double({ min: -1e6, max: 1e6, noNaN: true }), { minLength: 1, maxLength: 3000 }), fc.integer({ min: 2, max: 300 }), (xs, max) => {
      const out = ecdfSteps(xs, max);
      expect(out.length).toBeLessThanOrEqual(max + 1);
      expect(out[out.length - 1].share).toBe(1);
      for (let i = 1; i < out.length; i++) {
        expect(out[i].share).toBeGreaterThanOrEqual(out[i - 1].share);
        expect(out[i].value).toBeGreaterThanOrEqual(out[i - 1].value);
      }
    }), { numRuns: 40 });
  });
});

describe("evenSample", () => {
  it("evenSample returns the input when short and max values including both ends when long", () => {
    const xs = Array.from({ length: 1001 }, (_, i) => i);
    expect(evenSample(xs, 2000)).toBe(xs);
    const s = evenSample(xs, 11);
    // Computed by hand: indices round(i * 1000 / 10).
    expect(s).toEqual([0, 100, 200, 300, 400, 500, 600, 700, 800, 900, 1000]);
  });
});
