/**
 * An entity table far larger than the external sort's limit (SOJOURN_SORT_EVENTS) against the same
 * model's events written as an event table: the sort spills to files and merges them, and the
 * figures and calculation tables come out the same, exactly (the identity of contract section 9:
 * a layout only says how a file's rows become event rows; common practice). The model is the
 * seeded queue of test/helpers/layoutModel.ts, in departure order (the order a model that records
 * each customer when it leaves writes).
 */
import { describe, expect, it } from "vitest";
import { departureOrder, entityCsv, entityMeasures, eventAndLevelCsv, simulate, type ModelOptions } from "../helpers/layoutModel.js";
import { ENTITY_NAMES, layoutManifest, numbersOf } from "../helpers/layoutNumbers.js";
import { studyOf } from "../helpers/runStudyFrom.js";

const LIMIT = 1000;

describe("an entity table larger than the sort's limit", () => {
  for (const decimals of [null, 1]) {
    it(`gives the figures and tables of the same events as an event table (times ${decimals === null ? "in full" : "to 1 decimal, with ties"})`, async () => {
      const o: ModelOptions = { arrivalRate: 1, serviceRate: 0.55, servers: 2, horizon: 3000, seed: 1414 + (decimals ?? 0), drain: false, decimals };
      const customers = departureOrder(simulate(o));
      const { events } = eventAndLevelCsv(customers, 2);
      const files = { "events/r.csv": events, "entities/r.csv": entityCsv(customers) };
      const m = entityMeasures(2);
      const fromEvents = await studyOf(layoutManifest("events", o.horizon, ["events/r.csv"], m), files);
      process.env.SOJOURN_SORT_EVENTS = String(LIMIT);
      let fromEntities: Awaited<ReturnType<typeof studyOf>>;
      try {
        fromEntities = await studyOf(layoutManifest("entities", o.horizon, ["entities/r.csv"], m, "columns: {entity: id}\n"), files);
      } finally {
        delete process.env.SOJOURN_SORT_EVENTS;
      }
      // The file's events fill the sort's memory many times over: it must spill and merge.
      expect(customers.length).toBeGreaterThan(2500);
      expect(fromEntities.outcome.results.scenarios[0].runs[0].rows).toBeGreaterThan(7 * LIMIT);
      const a = numbersOf(fromEntities, ENTITY_NAMES);
      expect(a.tables.length).toBeGreaterThanOrEqual(ENTITY_NAMES.length); // every measure's table is compared
      expect(a).toEqual(numbersOf(fromEvents, ENTITY_NAMES));
    }, 120_000);
  }
});
