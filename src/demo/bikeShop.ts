import { type CounterModel, simulateCounter } from "./counter.js";
import type { DemoRow } from "./queue.js";

/**
 * The invented bike repair shop example: bikes are dropped off around the clock (time in hours)
 * and repaired first come, first served by two or by three mechanics. The shop starts empty and
 * idle, so the start of each run is not typical of the long run: one long run per scenario,
 * analysed with an MSER-5 warm-up and batch means.
 */
export const BIKE_SHOP = {
  horizon: 20000,
  arrivalRate: 1.2, // bikes per hour
  serviceRate: 0.8, // repairs per hour per mechanic
  scenarios: [
    { name: "two-mechanics", mechanics: 2 },
    { name: "three-mechanics", mechanics: 3 },
  ],
  seed: 3001,
};

/** The model of the bike shop's run in one scenario (the same seed in both: common random numbers). */
export function bikeShopModel(scenario: number, horizon: number = BIKE_SHOP.horizon): CounterModel {
  return {
    arrivals: [{ from: 0, value: BIKE_SHOP.arrivalRate }],
    staff: [{ from: 0, value: BIKE_SHOP.scenarios[scenario].mechanics }],
    serviceRate: BIKE_SHOP.serviceRate,
    horizon,
    seed: BIKE_SHOP.seed,
    decimals: 4,
    names: { enter: "drop_off", leave: "pick_up", queue: "bench", busy: "mechanics_busy" },
    observation: { series: "repair", of: "service" },
    prefix: "b",
  };
}

/**
 * The rows of the bike shop's run: `bench` (bikes waiting) and `mechanics_busy` (levels),
 * `drop_off` and `pick_up` (entity events), `repair` (each repair's duration, an observation).
 */
export function simulateBikeShop(scenario: number, horizon?: number): Generator<DemoRow> {
  return simulateCounter(bikeShopModel(scenario, horizon));
}
