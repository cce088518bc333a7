/**
 * The invented five-plan variant of the ferry check-in demo (examples/ferry-booth-plans/): the
 * same terminal and arrivals, five plans that differ in the number of open booths and in how fast
 * a booth checks a vehicle in (a faster scanner), ten runs each. Run k uses seed 2000 + k in
 * every plan (common random numbers).
 */
export const FERRY_PLANS = {
  arrivalRate: 0.9, // vehicles per minute
  horizon: 480, // minutes (an eight-hour shift)
  replications: 10,
  plans: [
    { name: "two-booths", booths: 2, serviceRate: 0.5 },
    { name: "three-booths", booths: 3, serviceRate: 0.5 },
    { name: "four-booths", booths: 4, serviceRate: 0.5 },
    { name: "two-fast-booths", booths: 2, serviceRate: 0.65 },
    { name: "three-fast-booths", booths: 3, serviceRate: 0.65 },
  ],
} as const;

/** The seed of run k (1-based) of every plan. */
export function planSeed(k: number): number {
  return 2000 + k;
}
