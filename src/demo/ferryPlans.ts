/**
 * The invented five-plan variant of the ferry check-in demo (examples/ferry-booth-plans/): the
 * same terminal and arrivals, five plans that differ in the number of open booths and in how fast
 * a booth checks a vehicle in (a faster scanner), ten runs each. Run k uses seed 2000 + k in
 * every plan (common random numbers).
 *
 * The study selects the plan with the shortest time in the terminal among the four plans that keep
 * up with the arrivals (manifest `select:`, paired by run id, δ = 0.1 min, P* = 0.95). Its two
 * stages: the ten runs of every plan are the first stage; from them `sojourn more-runs` says that
 * each of the four needs 16 runs in all, so those four plans get runs 11 to 16 as well (seeds 2011
 * to 2016), the second stage. The two-booth plan, which does not keep up, is left out of the
 * selection and keeps its ten runs.
 */
export const FERRY_PLANS = {
  arrivalRate: 0.9, // vehicles per minute
  horizon: 480, // minutes (an eight-hour shift)
  replications: 10,
  /** The plans of the selection and the runs each has in all: first stage and second stage. */
  selection: { plans: ["three-booths", "four-booths", "two-fast-booths", "three-fast-booths"], runs: 16 },
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
