/**
 * One seeded queueing model's output written in the three layouts of contract section 9, so that
 * tests can check that a layout only changes how rows are written, never a number.
 *
 * The model: a first-come-first-served queue with `servers` servers (a free customer takes the
 * lowest-numbered free server), Poisson arrivals, exponential services, two customer classes.
 * Invented test data, from `src/demo/random.ts`.
 *
 * - `entityCsv`: one row per customer: id, arrived, started, left, server, class (empty cells
 *   for events a customer never had before the horizon);
 * - `eventCsv`: the same events as an event table (time, series, value, entity, server, class), plus the
 *   level rows of `queue`, `busy` and `servers`, in the order Sojourn puts the entity rows in:
 *   (time, line of the customer's row, column: arrived, started, left);
 * - `levelsCsv`: the level rows as a wide table: time, queue, busy, servers, one row per change.
 */
import { Random } from "../../src/demo/random.js";

export interface Customer {
  id: number;
  arrived: number;
  started: number | null;
  left: number | null;
  server: number | null;
  cls: "gold" | "basic";
}

export interface ModelOptions {
  arrivalRate: number;
  serviceRate: number;
  servers: number;
  /** Arrivals after this time are not generated. */
  horizon: number;
  seed: number;
  /** Serve everyone who arrived (the run ends empty); else stop at `horizon`. */
  drain: boolean;
  /** Round times to this many decimals (ties then happen), or null. */
  decimals: number | null;
}

export function simulate(o: ModelOptions): Customer[] {
  const rng = new Random(o.seed);
  const f = o.decimals === null ? null : 10 ** o.decimals;
  const round = (t: number) => (f === null ? t : Math.round(t * f) / f);
  const arrivals: number[] = [];
  for (let t = round(rng.exponential(o.arrivalRate)); t <= o.horizon; t = round(t + rng.exponential(o.arrivalRate))) arrivals.push(t);
  const freeAt = new Array<number>(o.servers).fill(0);
  const customers: Customer[] = [];
  arrivals.forEach((arrived, i) => {
    const service = Math.max(round(rng.exponential(o.serviceRate)), f === null ? 0 : 1 / f);
    const cls = rng.next() < 0.3 ? "gold" : "basic";
    // FCFS: the customer starts when the first server is free (lowest number among ties).
    let s = 0;
    for (let k = 1; k < o.servers; k++) if (freeAt[k] < freeAt[s]) s = k;
    const started = Math.max(arrived, freeAt[s]);
    const left = round(started + service);
    freeAt[s] = left;
    const c: Customer = { id: i + 1, arrived, started, left, server: s, cls };
    if (!o.drain) {
      if (started > o.horizon) Object.assign(c, { started: null, left: null, server: null });
      else if (left > o.horizon) c.left = null;
    }
    customers.push(c);
  });
  return customers;
}

/** Customers in the order of their departure (ties and customers still inside by id, last). */
export function departureOrder(cs: readonly Customer[]): Customer[] {
  return [...cs].sort((a, b) => (a.left ?? Infinity) - (b.left ?? Infinity) || a.id - b.id);
}

/** Customers in a seeded random order. */
export function shuffled(cs: readonly Customer[], seed: number): Customer[] {
  const rng = new Random(seed);
  const out = [...cs];
  for (let i = out.length - 1; i > 0; i--) {
    const j = Math.floor(rng.next() * (i + 1));
    [out[i], out[j]] = [out[j], out[i]];
  }
  return out;
}

const cell = (x: number | null) => (x === null ? "" : String(x));

export function entityCsv(rows: readonly Customer[]): string {
  return "id,arrived,started,left,server,class\n" + rows.map((c) => `${c.id},${c.arrived},${cell(c.started)},${cell(c.left)},${cell(c.server)},${c.cls}`).join("\n") + "\n";
}

const EVENTS = ["arrived", "started", "left"] as const;

interface Written {
  events: string;
  levels: string;
}

/** The event table and the wide levels table of the customers as written in `rows` order (see the module comment). */
export function eventAndLevelCsv(rows: readonly Customer[], servers: number): Written {
  const list: { time: number; line: number; rank: number; c: Customer }[] = [];
  rows.forEach((c, i) => {
    EVENTS.forEach((e, rank) => {
      const t = c[e];
      if (t !== null) list.push({ time: t, line: i + 2, rank, c });
    });
  });
  list.sort((a, b) => a.time - b.time || a.line - b.line || a.rank - b.rank);
  const ev: string[] = ["time,series,value,entity,server,class", `0,queue,0,,,`, `0,busy,0,,,`, `0,servers,${servers},,,`];
  const lv: string[] = ["time,queue,busy,servers", `0,0,0,${servers}`];
  let queue = 0;
  let busy = 0;
  for (const { time, rank, c } of list) {
    ev.push(`${time},${EVENTS[rank]},,${c.id},${cell(c.server)},${c.cls}`);
    if (rank === 0) {
      queue++;
      ev.push(`${time},queue,${queue},,,`);
      lv.push(`${time},${queue},,`);
    } else if (rank === 1) {
      queue--;
      busy++;
      ev.push(`${time},queue,${queue},,,`, `${time},busy,${busy},,,`);
      lv.push(`${time},${queue},${busy},`);
    } else {
      busy--;
      ev.push(`${time},busy,${busy},,,`);
      lv.push(`${time},,${busy},`);
    }
  }
  return { events: ev.join("\n") + "\n", levels: lv.join("\n") + "\n" };
}

/** Measures over the customers' events (for the `events` and `entities` layouts). */
export function entityMeasures(servers: number): string {
  return `measures:
  - {name: in_queue, kind: level, from: {enter: arrived, leave: started}}
  - {name: in_system, kind: level, from: {enter: arrived, leave: left}}
  - {name: wait, kind: observation, from: {start: arrived, end: started}}
  - {name: sojourn, kind: observation, from: {start: arrived, end: left}}
  - {name: served, kind: count, series: left}
  - {name: use, kind: utilization, from: {enter: started, leave: left}, capacity: ${servers}}
  - {name: busy_server0, kind: level, from: {enter: started, leave: left}, where: {server: 0}}
  - {name: wait_server1, kind: observation, from: {start: arrived, end: started}, where: {server: 1}}
  - {name: gold_wait, kind: observation, from: {start: arrived, end: started}, where: {class: gold}}
  - {name: gold_done, kind: count, series: left, where: {class: [gold]}}
`;
}

/** Measures over the levels (for the `events` and `levels` layouts). */
export const LEVEL_MEASURES = `measures:
  - {name: queue, kind: level, series: queue}
  - {name: busy, kind: level, series: busy}
  - {name: busy_share, kind: utilization, series: busy, capacity: servers}
`;
