import { type CounterModel, simulateCounter, type Step } from "./counter.js";
import type { DemoRow } from "./queue.js";

/**
 * The invented bakery example: a shop open for ten hours (time in minutes) with a morning rush
 * and a lunch peak, and counter staff on shifts. Two rotas: the regular one, and one with an
 * extra clerk over lunch.
 */
export const BAKERY = {
  horizon: 600,
  serviceRate: 0.45, // customers per minute per clerk
  replications: 10,
  arrivals: [
    { from: 0, value: 0.6 },
    { from: 60, value: 1.4 },
    { from: 180, value: 0.8 },
    { from: 300, value: 1.2 },
    { from: 420, value: 0.7 },
  ] as Step[],
  scenarios: [
    {
      name: "regular-rota",
      staff: [
        { from: 0, value: 2 },
        { from: 60, value: 4 },
        { from: 180, value: 2 },
        { from: 300, value: 3 },
        { from: 420, value: 2 },
      ] as Step[],
    },
    {
      name: "extra-lunch",
      staff: [
        { from: 0, value: 2 },
        { from: 60, value: 4 },
        { from: 180, value: 2 },
        { from: 300, value: 4 },
        { from: 420, value: 2 },
      ] as Step[],
    },
  ],
};

/** The model of one bakery run; replication k uses seed 2000 + k in every scenario. */
export function bakeryModel(scenario: number, replication: number, horizon: number = BAKERY.horizon): CounterModel {
  return {
    arrivals: BAKERY.arrivals,
    staff: BAKERY.scenarios[scenario].staff,
    serviceRate: BAKERY.serviceRate,
    horizon,
    seed: 2000 + replication,
    names: { enter: "enter", leave: "leave", queue: "queue", busy: "busy", staff: "staff" },
    observation: { series: "sale", of: "amount" },
    prefix: "k",
  };
}

/**
 * The rows of one bakery run: `staff` (clerks on shift, a level that is the counter's capacity),
 * `busy`, `queue` (levels), `enter`, `leave` (entity events) and `sale` (the amount each customer
 * spends, an observation).
 */
export function simulateBakery(scenario: number, replication: number, horizon?: number): Generator<DemoRow> {
  return simulateCounter(bakeryModel(scenario, replication, horizon));
}
