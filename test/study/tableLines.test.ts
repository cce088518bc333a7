/**
 * Calculation tables point at their rows (CONTRACT.md section 11): every table row that comes from
 * a row of the run file carries that row's 1-based line, and the line it names really holds that
 * row, in CSV (with a byte-order mark and CRLF), JSON Lines and gzip alike. The check reads the
 * named line back from the file the test wrote and compares its time, series, value and entity
 * with the table row (the reference is the run file itself).
 */
import { describe, expect, it } from "vitest";
import { gzipSync } from "node:zlib";
import { studyOf } from "../helpers/runStudyFrom.js";
import { fullTable } from "../../src/study/fullTable.js";
import { uniform } from "../../src/demo/random.js";

interface Ev { time: number; series: string; value: number | null; entity: string | null }

/** A small queue, logged as events of several series interleaved in time order. */
function events(seed: number): Ev[] {
  const rand = uniform(seed);
  const out: Ev[] = [{ time: 0, series: "cap", value: 2, entity: null }];
  let t = 0;
  let q = 0;
  let busy = 0;
  const waiting: string[] = [];
  const inService: string[] = [];
  for (let i = 0; i < 120; i++) {
    t = Math.round((t + rand() * 3) * 100) / 100;
    if (rand() < 0.55) {
      const id = `c${i}`;
      out.push({ time: t, series: "arrive", value: null, entity: id });
      waiting.push(id);
      out.push({ time: t, series: "queue", value: ++q, entity: null });
    }
    if (waiting.length > 0 && busy < 2 && rand() < 0.7) {
      const id = waiting.shift()!;
      inService.push(id);
      out.push({ time: t, series: "queue", value: --q, entity: null });
      out.push({ time: t, series: "busy", value: ++busy, entity: null });
      out.push({ time: t, series: "start", value: null, entity: id });
    }
    if (inService.length > 0 && rand() < 0.5) {
      const id = inService.shift()!;
      out.push({ time: t, series: "busy", value: --busy, entity: null });
      out.push({ time: t, series: "depart", value: null, entity: id });
      out.push({ time: t, series: "wait", value: Math.round(rand() * 500) / 100, entity: id });
    }
    if (i === 60) out.push({ time: t, series: "cap", value: 3, entity: null });
  }
  return out;
}

const csvOf = (evs: Ev[], eol: string) => "\uFEFFtime,series,value,entity" + eol + evs.map((e) => `${e.time},${e.series},${e.value ?? ""},${e.entity ?? ""}`).join(eol) + eol;
const jsonlOf = (evs: Ev[]) => evs.map((e) => JSON.stringify({ time: e.time, series: e.series, ...(e.value !== null ? { value: e.value } : {}), ...(e.entity !== null ? { entity: e.entity } : {}) })).join("\n") + "\n";

const MEASURES = `measures:
  - {name: q, kind: level, series: queue}
  - {name: u, kind: utilization, series: busy, capacity: cap}
  - {name: u2, kind: utilization, series: busy, capacity: 2}
  - {name: w, kind: observation, series: wait}
  - {name: d, kind: count, series: depart}
  - {name: inside, kind: level, from: {enter: arrive, leave: depart}}
  - {name: sojourn_time, kind: observation, from: {start: arrive, end: depart}}
`;

function parse(csv: string): Record<string, string>[] {
  const [head, ...rows] = csv.trim().split("\n");
  const cols = head.split(",");
  return rows.map((r) => Object.fromEntries(r.split(",").map((c, i) => [cols[i], c])));
}

describe("calculation tables carry the run-file line of each row", () => {
  for (const [format, file, content, headerLines] of [
    ["CSV with BOM and CRLF", "runs/r1.csv", (e: Ev[]) => csvOf(e, "\r\n"), 1],
    ["JSON Lines", "runs/r1.jsonl", (e: Ev[]) => jsonlOf(e), 0],
    ["gzip CSV", "runs/r1.csv.gz", (e: Ev[]) => gzipSync(Buffer.from(csvOf(e, "\n"))), 1],
  ] as const) {
    it(`every kind's line names the row it came from (${format})`, async () => {
      for (const seed of [1, 2]) {
        const evs = events(seed);
        const manifest = `title: lines\nwarmup: 20\nscenarios:\n  - {name: s, end: 400, runs: [${file}]}\n${MEASURES}`;
        const { study } = await studyOf(manifest, { [file]: content(evs) as string | Buffer });
        const at = (line: string) => evs[Number(line) - 1 - headerLines];
        const table = async (measure: string) => parse((await fullTable(study, { scenario: "s", run: "r1", measure }))[0].csv);

        // Level: the row that set the interval's value; after the first interval its time is the interval's start.
        const q = await table("q");
        expect(q.length).toBeGreaterThan(20);
        for (const [i, r] of q.entries()) {
          const e = at(r.line);
          expect(e.series).toBe("queue");
          expect(e.value).toBe(Number(r.value));
          if (i > 0) expect(e.time).toBe(Number(r.from));
          else expect(e.time).toBeLessThanOrEqual(20);
        }
        // Utilization against a capacity series: the row of either series that started the interval.
        const u = await table("u");
        for (const [i, r] of u.entries()) {
          if (i === 0 && r.line === "") continue;
          const e = at(r.line);
          expect(e.series).toBe(r.changed);
          expect(e.value).toBe(Number(r.changed === "busy" ? r.value : r.capacity));
          if (i > 0) expect(e.time).toBe(Number(r.from));
        }
        expect(new Set(u.map((r) => r.changed))).toEqual(new Set(["busy", "cap"]));
        const u2 = await table("u2");
        for (const r of u2.slice(1)) expect(at(r.line).series).toBe("busy");
        // Observations and counts: the row itself.
        for (const r of await table("w")) {
          const e = at(r.line);
          expect([e.series, e.time, e.value]).toEqual(["wait", Number(r.time), Number(r.value)]);
        }
        for (const r of await table("d")) expect([at(r.line).series, at(r.line).time]).toEqual(["depart", Number(r.time)]);
        // Entity measures: the event rows.
        for (const r of (await table("inside")).slice(1)) expect(["arrive", "depart"]).toContain(at(r.line).series);
        for (const r of await table("sojourn_time")) {
          expect([at(r.line).series, at(r.line).entity, at(r.line).time]).toEqual(["depart", r.entity, Number(r.time)]);
          expect([at(r.start_line).series, at(r.start_line).entity, at(r.start_line).time]).toEqual(["arrive", r.entity, Number(r.start_time)]);
        }
      }
    });
  }
});
