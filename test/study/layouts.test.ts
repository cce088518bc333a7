/**
 * Layouts (contract section 9): the same model output written as an event table, an entity
 * table and a wide levels table gives the same figures and the same calculation tables (the
 * `line` column apart, which points at each file's own rows).
 */
import { describe, expect, it } from "vitest";
import { departureOrder, entityCsv, entityMeasures, eventAndLevelCsv, LEVEL_MEASURES, shuffled, simulate, type ModelOptions } from "../helpers/layoutModel.js";
import { studyOf } from "../helpers/runStudyFrom.js";
import { parquetFile } from "../helpers/parquet.js";
import { ENTITY_NAMES, layoutManifest as manifest, LEVEL_NAMES, numbersOf } from "../helpers/layoutNumbers.js";

describe("layouts give the same numbers (property over seeded models; identity of contract section 9, common practice)", () => {
  for (let k = 0; k < 12; k++) {
    it(`model ${k}: events = entities (departure order) for entity measures, events = levels for level measures`, async () => {
      const servers = 2 + (k % 2);
      const o: ModelOptions = { arrivalRate: 0.8 + 0.1 * k, serviceRate: 0.5, servers, horizon: 30 + 5 * k, seed: 7000 + k, drain: k % 3 === 0, decimals: k % 2 === 0 ? 1 : null };
      const customers = departureOrder(simulate(o));
      const end = o.horizon + (o.drain ? 400 : 0);
      const { events, levels } = eventAndLevelCsv(customers, servers);
      const files = { "events/r.csv": events, "entities/r.csv": entityCsv(customers), "levels/r.csv": levels };
      const fromEvents = await studyOf(manifest("events", end, ["events/r.csv"], entityMeasures(servers) + LEVEL_MEASURES.replace("measures:\n", "")), files);
      const fromEntities = await studyOf(manifest("entities", end, ["entities/r.csv"], entityMeasures(servers), "columns: {entity: id}\n"), files);
      const fromLevels = await studyOf(manifest("levels", end, ["levels/r.csv"], LEVEL_MEASURES), files);
      const entityNumbers = numbersOf(fromEntities, ENTITY_NAMES);
      expect(entityNumbers.tables.length).toBeGreaterThanOrEqual(ENTITY_NAMES.length); // every measure's table is compared
      expect(numbersOf(fromLevels, LEVEL_NAMES).tables.length).toBeGreaterThanOrEqual(LEVEL_NAMES.length);
      expect(entityNumbers).toEqual(numbersOf(fromEvents, ENTITY_NAMES));
      expect(numbersOf(fromLevels, LEVEL_NAMES)).toEqual(numbersOf(fromEvents, LEVEL_NAMES));
      // The where filters pick a part: fewer gold observations than all of them.
      const run = fromEntities.outcome.results.scenarios[0].runs[0].measures as Record<string, { n?: number }>;
      expect(run.gold_done.n!).toBeLessThan(run.served.n!);
    }, 60_000);
  }

  it("an entity table in random row order gives the same figures as in departure order", async () => {
    const o: ModelOptions = { arrivalRate: 1.1, serviceRate: 0.6, servers: 2, horizon: 200, seed: 4242, drain: false, decimals: null };
    const cs = simulate(o);
    const files = { "runs/a.csv": entityCsv(departureOrder(cs)), "runs/b.csv": entityCsv(shuffled(cs, 99)) };
    const m = entityMeasures(2);
    const a = await studyOf(manifest("entities", 200, ["runs/a.csv"], m, "columns: {entity: id}\n"), files);
    const b = await studyOf(manifest("entities", 200, ["runs/b.csv"], m, "columns: {entity: id}\n"), files);
    const runA = a.outcome.results.scenarios[0].runs[0].measures;
    const runB = b.outcome.results.scenarios[0].runs[0].measures;
    expect(runB).toEqual(runA);
  }, 60_000);
});

describe("an entity table as Parquet (contract section 9: Parquet files in any layout)", () => {
  it("gives the figures and tables of the same table as CSV (the line column apart)", async () => {
    const o: ModelOptions = { arrivalRate: 1, serviceRate: 0.6, servers: 2, horizon: 150, seed: 21, drain: false, decimals: null };
    const cs = departureOrder(simulate(o));
    const opt = (x: number | null) => x;
    const pq = parquetFile(
      [
        { name: "id", data: cs.map((c) => String(c.id)), type: "STRING" },
        { name: "arrived", data: cs.map((c) => c.arrived), type: "DOUBLE" },
        { name: "started", data: cs.map((c) => opt(c.started)), type: "DOUBLE" },
        { name: "left", data: cs.map((c) => opt(c.left)), type: "DOUBLE" },
        { name: "server", data: cs.map((c) => opt(c.server)), type: "INT32" },
        { name: "class", data: cs.map((c) => c.cls), type: "STRING" },
      ],
      { rowGroupSize: 40 },
    );
    const m = entityMeasures(2);
    const fromCsv = await studyOf(manifest("entities", 150, ["csv/r.csv"], m, "columns: {entity: id}\n"), { "csv/r.csv": entityCsv(cs) });
    const fromParquet = await studyOf(manifest("entities", 150, ["pq/r.parquet"], m, "columns: {entity: id}\n"), { "pq/r.parquet": pq });
    const a = numbersOf(fromCsv, ENTITY_NAMES);
    expect(a.tables.length).toBeGreaterThanOrEqual(ENTITY_NAMES.length);
    expect(numbersOf(fromParquet, ENTITY_NAMES)).toEqual(a);
  }, 60_000);
});

describe("SOJOURN_SORT_EVENTS (the sort's limit, docs/manifest.md)", () => {
  it("a study read with a limit of 50 events gives the same results and tables as one read in memory", async () => {
    const o: ModelOptions = { arrivalRate: 1, serviceRate: 0.6, servers: 2, horizon: 300, seed: 77, drain: false, decimals: 2 };
    const files = { "runs/r.csv": entityCsv(shuffled(simulate(o), 5)) };
    const m = manifest("entities", 300, ["runs/r.csv"], entityMeasures(2), "columns: {entity: id}\n");
    const inMemory = await studyOf(m, files);
    process.env.SOJOURN_SORT_EVENTS = "50";
    try {
      const chunked = await studyOf(m, files);
      expect(chunked.outcome.results.scenarios[0].runs[0].rows).toBeGreaterThan(15 * 50); // many chunks of 50 events
      expect(chunked.outcome.results).toEqual(inMemory.outcome.results);
      expect(chunked.tableFiles.map((t) => t.csv)).toEqual(inMemory.tableFiles.map((t) => t.csv));
    } finally {
      delete process.env.SOJOURN_SORT_EVENTS;
    }
  }, 60_000);
});

describe("Little's law on an entity table that starts and ends empty (L = λW as a sample-path identity, Little 1961; common practice)", () => {
  it("the time average number in system over [0, T] equals the sum of sojourn times over T", async () => {
    const o: ModelOptions = { arrivalRate: 0.9, serviceRate: 0.5, servers: 2, horizon: 500, seed: 31, drain: true, decimals: null };
    const cs = departureOrder(simulate(o));
    const T = Math.ceil(Math.max(...cs.map((c) => c.left!))) + 1;
    const s = await studyOf(manifest("entities", T, ["runs/a.csv"], entityMeasures(2), "columns: {entity: id}\n"), { "runs/a.csv": entityCsv(cs) });
    const run = s.outcome.results.scenarios[0].runs[0].measures as Record<string, { mean: number; n: number }>;
    const sumW = run.sojourn.mean * run.sojourn.n;
    expect(run.sojourn.n).toBe(cs.length);
    // tolerance: 1e-9 relative, for the rounding of two different sums of the same durations
    expect(Math.abs(run.in_system.mean - sumW / T)).toBeLessThanOrEqual(1e-9 * (sumW / T));
  }, 60_000);
});

/** Erlang's C formula: the probability that an arrival waits in M/M/c with offered load a = λ/μ (Gross and Harris, Fundamentals of Queueing Theory; from memory). */
function erlangC(c: number, a: number): number {
  let term = 1;
  let sum = 0;
  for (let k = 0; k < c; k++) {
    sum += term;
    term *= a / (k + 1);
  }
  const last = term / (1 - a / c);
  return last / (sum + last);
}

describe("queue formulas against long seeded runs written as entity tables", () => {
  const cases = [
    // M/M/1: L_q = ρ²/(1−ρ) (Gross and Harris, Fundamentals of Queueing Theory; from memory)
    { name: "M/M/1", servers: 1, lambda: 0.6, mu: 1, truth: (0.6 * 0.6) / (1 - 0.6) },
    // M/M/c: L_q = C(c, a)·ρ/(1−ρ), ρ = a/c (Erlang C; Gross and Harris; from memory)
    { name: "M/M/2", servers: 2, lambda: 1.4, mu: 1, truth: erlangC(2, 1.4) * 0.7 / (1 - 0.7) },
  ];
  for (const c of cases) {
    it(`${c.name}: the mean number waiting (level from arrived to started) has the formula's value inside its 95 % interval`, async () => {
      const horizon = 20_000;
      const files: Record<string, string> = {};
      const runs: string[] = [];
      for (let r = 1; r <= 8; r++) {
        const cs = departureOrder(simulate({ arrivalRate: c.lambda, serviceRate: c.mu, servers: c.servers, horizon, seed: 900 + r, drain: false, decimals: null }));
        files[`runs/rep-${r}.csv`] = entityCsv(cs);
        runs.push(`runs/rep-${r}.csv`);
      }
      const m = "measures:\n  - {name: waiting, kind: level, from: {enter: arrived, leave: started}}\n";
      const s = await studyOf(manifest("entities", horizon, runs, m, "columns: {entity: id}\nwarmup: 500\n"), files);
      const w = s.outcome.results.scenarios[0].summary.waiting;
      expect(w.ci_low!).toBeLessThanOrEqual(c.truth);
      expect(w.ci_high!).toBeGreaterThanOrEqual(c.truth);
    }, 120_000);
  }
});
