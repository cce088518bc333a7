import { Random } from "./random.js";

/** One row of a generated run file. */
export interface DemoRow {
  time: number;
  series: string;
  value: number | null;
  entity: string | null;
}

export interface QueueModel {
  /** Arrivals per time unit (Poisson arrivals). */
  arrivalRate: number;
  /** Services per time unit per server (exponential service). */
  serviceRate: number;
  servers: number;
  /** Arrivals stop at this time; the run then empties (when `drain`) or stops. */
  horizon: number;
  seed: number;
  /** Keep serving after the horizon until the system is empty. */
  drain?: boolean;
  /**
   * Round times to this many decimals in the output (the simulation itself is exact); default 4,
   * null for no rounding (times printed in full, up to 17 significant digits).
   */
  decimals?: number | null;
}

/**
 * A first-come-first-served queue with `servers` identical servers (an M/M/c queue), simulated
 * event by event with a seeded generator. Invented demo data: it writes the rows a model would
 * log (contract section 1):
 *
 * - `queue` (level): number waiting, at every change;
 * - `busy` (level): busy servers, at every change;
 * - `wait` (observation): each customer's wait, at the start of service;
 * - `arrive`, `depart` (entity events, entity = customer id).
 *
 * Times are rounded to `decimals` before they are emitted, and every derived value is computed
 * from the rounded times, so the file is exactly consistent with itself.
 */
export function* simulateQueue(model: QueueModel): Generator<DemoRow> {
  // Separate streams for arrivals and services, and each customer's service drawn at arrival:
  // the same seed gives the same customers in every scenario (common random numbers).
  const arrivals = new Random(model.seed);
  const services = new Random((model.seed * 2654435761) ^ 0x5bd1e995);
  const f = model.decimals === null ? null : 10 ** (model.decimals ?? 4);
  const round = (t: number) => (f === null ? t : Math.round(t * f) / f);
  const waiting: { id: number; arrived: number; service: number }[] = [];
  // Departure times of busy servers (unsorted; c is small).
  const departures: { time: number; id: number }[] = [];
  let nextArrival = round(arrivals.exponential(model.arrivalRate));
  let id = 0;
  let queueHead = 0;
  yield { time: 0, series: "queue", value: 0, entity: null };
  yield { time: 0, series: "busy", value: 0, entity: null };
  for (;;) {
    let soonest = -1;
    for (let i = 0; i < departures.length; i++) if (soonest < 0 || departures[i].time < departures[soonest].time) soonest = i;
    const arrivalOpen = nextArrival <= model.horizon;
    if (!arrivalOpen && soonest < 0) return;
    if (!arrivalOpen && !model.drain) return;
    if (arrivalOpen && (soonest < 0 || nextArrival < departures[soonest].time)) {
      const now = nextArrival;
      const customer = { id: ++id, arrived: now, service: services.exponential(model.serviceRate) };
      yield { time: now, series: "arrive", value: null, entity: `c${customer.id}` };
      if (departures.length < model.servers) {
        yield { time: now, series: "wait", value: 0, entity: `c${customer.id}` };
        departures.push({ time: round(now + customer.service), id: customer.id });
        yield { time: now, series: "busy", value: departures.length, entity: null };
      } else {
        waiting.push(customer);
        yield { time: now, series: "queue", value: waiting.length - queueHead, entity: null };
      }
      nextArrival = round(now + arrivals.exponential(model.arrivalRate));
    } else {
      const done = departures[soonest];
      if (!model.drain && done.time > model.horizon) return;
      const now = done.time;
      departures.splice(soonest, 1);
      yield { time: now, series: "depart", value: null, entity: `c${done.id}` };
      if (queueHead < waiting.length) {
        const next = waiting[queueHead++];
        if (queueHead > 4096 && queueHead * 2 > waiting.length) {
          waiting.splice(0, queueHead);
          queueHead = 0;
        }
        yield { time: now, series: "queue", value: waiting.length - queueHead, entity: null };
        yield { time: now, series: "wait", value: round(now - next.arrived), entity: `c${next.id}` };
        departures.push({ time: round(now + next.service), id: next.id });
      } else {
        yield { time: now, series: "busy", value: departures.length, entity: null };
      }
    }
  }
}
