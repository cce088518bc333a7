import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { Ajv } from "ajv";
import fc from "fast-check";
import { buildReportModel } from "../../src/report/model.js";
import { thinSteps, evenSample, type StepPoint } from "../../src/report/charts.js";
import { bakery } from "./fixtures/bakery.js";

const META = { toolVersion: "0.1.0-test", generatedAt: "2025-03-04T05:06:07.000Z" };

describe("chart specs", () => {
  it("every vega-lite spec of the report model validates against vega-lite's JSON schema", () => {
    // Source of truth: node_modules/vega-lite/build/vega-lite-schema.json (the schema vega-lite publishes).
    const schema = JSON.parse(readFileSync("node_modules/vega-lite/build/vega-lite-schema.json", "utf8"));
    const ajv = new Ajv({ strict: false, allErrors: false, logger: false });
    const validate = ajv.compile(schema);
    for (const opts of [{}, { hostile: true }, { plain: true }, { singleRunScenario: true }]) {
      const { study, outcome } = bakery(opts);
      const charts = buildReportModel(study, outcome, META).measures.flatMap((m) => m.charts);
      expect(charts.length).toBeGreaterThan(0);
      for (const c of charts) {
        const ok = validate(c.spec);
        expect(ok, `${c.id}: ${ajv.errorsText(validate.errors)}`).toBe(true);
      }
    }
  });

  it("every chart of the bakery model names the time unit in its caption or a time axis", () => {
    const { study, outcome } = bakery();
    for (const m of buildReportModel(study, outcome, META).measures) {
      for (const c of m.charts) expect(`${c.caption} ${JSON.stringify(c.spec)}`).toContain(study.timeUnit);
    }
  });
});

describe("thinSteps", () => {
  const trace = fc.array(fc.record({ dt: fc.double({ min: 0, max: 10, noNaN: true }), value: fc.integer({ min: -50, max: 50 }) }), { minLength: 1, maxLength: 3000 })
    .map((xs) => {
      let t = 0;
      return xs.map(({ dt, value }): StepPoint => ({ time: (t += dt), value, running_mean: 0 }));
    });

  it("thinSteps keeps at most about max points, in time order, with the first, last, lowest and highest level", () => {
    // Property of the thinning rule documented in charts.ts (4 points per bucket, max/4 buckets).
    fc.assert(
      fc.property(trace, fc.integer({ min: 8, max: 400 }), (pts, max) => {
        const out = thinSteps(pts, max);
        expect(out.length).toBeLessThanOrEqual(Math.max(pts.length <= max ? pts.length : 0, 4 * Math.floor(max / 4)));
        for (let i = 1; i < out.length; i++) expect(out[i].time).toBeGreaterThanOrEqual(out[i - 1].time);
        expect(out[0]).toBe(pts[0]);
        expect(out[out.length - 1]).toBe(pts[pts.length - 1]);
        const values = pts.map((p) => p.value);
        expect(Math.min(...out.map((p) => p.value))).toBe(Math.min(...values));
        expect(Math.max(...out.map((p) => p.value))).toBe(Math.max(...values));
      }),
      { numRuns: 60 },
    );
  });

  it("evenSample returns the input when short and max values including both ends when long", () => {
    const xs = Array.from({ length: 1001 }, (_, i) => i);
    expect(evenSample(xs, 2000)).toBe(xs);
    const s = evenSample(xs, 11);
    // Computed by hand: indices round(i * 1000 / 10).
    expect(s).toEqual([0, 100, 200, 300, 400, 500, 600, 700, 800, 900, 1000]);
  });
});
