import type { DemoRow } from "./queue.js";
import { Random } from "./random.js";

/** A value that holds from `from` until the next step's `from` (the first step starts at 0). */
export interface Step {
  from: number;
  value: number;
}

export interface CounterModel {
  /** Arrivals per time unit, changing over the run (a non-stationary Poisson process). */
  arrivals: Step[];
  /** Staff on shift over the run. */
  staff: Step[];
  /** Services per time unit per member of staff (exponential service). */
  serviceRate: number;
  /** Arrivals stop and the run ends at this time. */
  horizon: number;
  seed: number;
  /** Round times to this many decimals (default 3); every derived value uses the rounded times. */
  decimals?: number;
  /** Series names. `staff`: write the staff level (omit when staff is constant and not logged). */
  names: { enter: string; leave: string; queue: string; busy: string; staff?: string };
  /** An observation written at each departure: the service time, or an amount drawn per customer. */
  observation?: { series: string; of: "service" | "amount" };
  /** Entity id prefix (`c` gives c1, c2, ...). */
  prefix?: string;
}

/** The value of a step function at time t. */
export function stepAt(steps: readonly Step[], t: number): number {
  let v = steps[0].value;
  for (const s of steps) if (s.from <= t) v = s.value;
  return v;
}

/**
 * A first-come-first-served counter whose arrival rate and staffing change over the run, simulated
 * event by event with a seeded generator. Invented demo data: it writes the rows a model would log
 * (contract section 1):
 *
 * - `names.staff` (level, optional): staff on shift. A clerk whose shift ends while serving
 *   finishes the customer first, so the busy level never exceeds it;
 * - `names.busy` (level): staff serving; `names.queue` (level): customers waiting;
 * - `names.enter`, `names.leave` (entity events): each customer's arrival and departure;
 * - `observation` (optional): one value per departing customer.
 *
 * Arrivals use one random stream and each customer's service and amount are drawn at arrival
 * from another, so one seed gives the same customers under any staffing (common random numbers).
 */
export function* simulateCounter(model: CounterModel): Generator<DemoRow> {
  const arrivals = new Random(model.seed);
  const draws = new Random((model.seed * 2654435761) ^ 0x27d4eb2f);
  const f = 10 ** (model.decimals ?? 3);
  const round = (t: number) => Math.round(t * f) / f;
  const n = model.names;
  const prefix = model.prefix ?? "c";
  const peak = Math.max(...model.arrivals.map((s) => s.value));
  const changes = model.staff.filter((s) => s.from > 0).map((s) => s.from);

  const nextArrivalAfter = (t: number): number => {
    // Thinning (Lewis and Shedler, 1979): candidates at the peak rate, kept with probability rate(t) / peak.
    for (;;) {
      t += arrivals.exponential(peak);
      if (arrivals.next() * peak < stepAt(model.arrivals, t)) return round(t);
    }
  };

  type Customer = { id: number; arrived: number; service: number; amount: number };
  const waiting: Customer[] = [];
  const serving: { start: number; done: number; customer: Customer }[] = [];
  let staff = stepAt(model.staff, 0);
  let target = staff;
  let id = 0;
  let nextArrival = nextArrivalAfter(0);
  let nextChange = 0;

  if (n.staff !== undefined) yield { time: 0, series: n.staff, value: staff, entity: null };
  yield { time: 0, series: n.queue, value: 0, entity: null };
  yield { time: 0, series: n.busy, value: 0, entity: null };

  function* startServices(now: number): Generator<DemoRow> {
    let started = false;
    while (waiting.length > 0 && serving.length < staff) {
      const c = waiting.shift()!;
      serving.push({ start: now, done: round(now + c.service), customer: c });
      yield { time: now, series: n.queue, value: waiting.length, entity: null };
      started = true;
    }
    if (started) yield { time: now, series: n.busy, value: serving.length, entity: null };
  }

  for (;;) {
    let soonest = -1;
    for (let i = 0; i < serving.length; i++) if (soonest < 0 || serving[i].done < serving[soonest].done) soonest = i;
    const done = soonest < 0 ? Infinity : serving[soonest].done;
    const change = nextChange < changes.length ? changes[nextChange] : Infinity;
    const now = Math.min(nextArrival, done, change);
    if (now > model.horizon) return;
    if (change === now) {
      nextChange++;
      target = stepAt(model.staff, now);
      if (target > staff) {
        staff = target;
        if (n.staff !== undefined) yield { time: now, series: n.staff, value: staff, entity: null };
        yield* startServices(now);
      } else if (target < staff) {
        // Idle staff leave now; the others when they finish.
        const leaving = Math.min(staff - target, staff - serving.length);
        if (leaving > 0) {
          staff -= leaving;
          if (n.staff !== undefined) yield { time: now, series: n.staff, value: staff, entity: null };
        }
      }
    } else if (done === now) {
      const { customer, start } = serving.splice(soonest, 1)[0];
      yield { time: now, series: n.leave, value: null, entity: `${prefix}${customer.id}` };
      if (model.observation !== undefined) {
        const value = model.observation.of === "service" ? round(now - start) : customer.amount;
        yield { time: now, series: model.observation.series, value, entity: `${prefix}${customer.id}` };
      }
      if (staff > target) {
        yield { time: now, series: n.busy, value: serving.length, entity: null };
        staff--;
        if (n.staff !== undefined) yield { time: now, series: n.staff, value: staff, entity: null };
      } else if (waiting.length > 0) {
        const c = waiting.shift()!;
        serving.push({ start: now, done: round(now + c.service), customer: c });
        yield { time: now, series: n.queue, value: waiting.length, entity: null };
      } else {
        yield { time: now, series: n.busy, value: serving.length, entity: null };
      }
    } else {
      const c: Customer = { id: ++id, arrived: now, service: draws.exponential(model.serviceRate), amount: Math.round((2.5 + 14 * draws.next() ** 2) * 100) / 100 };
      yield { time: now, series: n.enter, value: null, entity: `${prefix}${c.id}` };
      if (serving.length < staff) {
        serving.push({ start: now, done: round(now + c.service), customer: c });
        yield { time: now, series: n.busy, value: serving.length, entity: null };
      } else {
        waiting.push(c);
        yield { time: now, series: n.queue, value: waiting.length, entity: null };
      }
      nextArrival = nextArrivalAfter(now);
    }
  }
}
