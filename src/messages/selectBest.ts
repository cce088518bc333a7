/**
 * The words of a selection of the best scenario (docs/statistics.md, "Selecting the best"): what
 * is wrong with its input, and the sentence its result supports. User names are quoted as JSON
 * strings; whoever shows these texts escapes them (HTML, terminal, CSV).
 */

const q = (name: string) => JSON.stringify(name);

/** A number as the user wrote it (shortest round trip), or its kind when it is not finite. */
const num = (x: unknown) => (typeof x === "number" ? String(x) : JSON.stringify(x) ?? String(x));

/** "a", "a and b", "a, b and c". */
export function andList(items: readonly string[]): string {
  if (items.length <= 1) return items.join("");
  return `${items.slice(0, -1).join(", ")} and ${items[items.length - 1]}`;
}

/** The problems `selectionProblem` reports; each says what is wrong and what to do. */
export const problem = {
  tooFewScenarios: (k: number) =>
    `Selecting the best needs at least two scenarios to choose from, got ${k}: list two or more scenarios.`,
  better: (better: unknown) => `Which direction is better must be "larger" or "smaller", got ${num(better)}.`,
  method: (method: unknown) => `The selection method must be "independent" or "paired", got ${num(method)}.`,
  firstStage: (n0: unknown) =>
    `The first stage must be a whole number of runs of each scenario, at least 2 (two runs are the fewest that show a spread), got ${num(n0)}.`,
  delta: (delta: unknown) =>
    `The indifference amount must be a number greater than 0 (the smallest difference of means worth telling apart, in the measure's unit), got ${num(delta)}.`,
  pcs: (pcs: unknown, k: number) =>
    `The probability of correct selection must lie strictly between 1/${k} (a guess among ${k} scenarios) and 1, got ${num(pcs)}.`,
  duplicateScenario: (scenario: string) => `Scenario ${q(scenario)} is listed twice among the scenarios to select from: list each once.`,
  fewRuns: (scenario: string, runs: number, n0: number) =>
    `Scenario ${q(scenario)} has ${runs} run${runs === 1 ? "" : "s"}, fewer than the first stage of ${n0}: add runs of it or make the first stage smaller.`,
  notFinite: (scenario: string, run: string, value: unknown) =>
    `Run ${q(run)} of scenario ${q(scenario)} has the value ${num(value)}: every run in a selection needs a finite value.`,
  duplicateRun: (scenario: string, run: string) =>
    `Scenario ${q(scenario)} lists run ${q(run)} twice: paired runs are matched by id, so each id may appear once in a scenario.`,
  unpairedRun: (scenario: string, run: string, first: string, n0: number) =>
    `Scenario ${q(scenario)} has no run ${q(run)}, one of the first stage (the first ${n0} runs of ${q(first)}): paired runs are matched by id, so give ${q(scenario)} a run ${q(run)} with the same random numbers, or select with method "independent".`,
};

/** How the procedures are named in a sentence. */
const procedureName = { independent: "Rinott's two-stage procedure", paired: "Nelson and Matejcik's procedure, runs paired by id" };
const constantName = { independent: "Rinott's h", paired: "Nelson and Matejcik's g" };

/** The constant for a sentence: four significant digits. */
const short = (x: number) => String(Number(x.toPrecision(4)));

/**
 * The statement of a complete selection:
 * `"B" is the best or within 2 of the best with probability at least 0.9 (Rinott's two-stage procedure, 17 runs in all); "C" can be ruled out.`
 */
export function selected(method: "independent" | "paired", best: string, delta: number, pcs: number, totalRuns: number, ruledOut: readonly string[]): string {
  const out = ruledOut.length === 0 ? "no other scenario can be ruled out" : `${andList(ruledOut.map(q))} can be ruled out`;
  return `${q(best)} is the best or within ${delta} of the best with probability at least ${pcs} (${procedureName[method]}, ${totalRuns} runs in all); ${out}.`;
}

/**
 * The statement while runs are missing:
 * `Selecting the best at probability 0.9 within 2 needs 1 more run of "A" and 3 more of "C" (Rinott's h = 3.058).`
 */
export function needsRuns(method: "independent" | "paired", delta: number, pcs: number, constant: number, missing: readonly { scenario: string; runs: number }[]): string {
  const parts = missing.map((m, i) => (i === 0 ? `${m.runs} more run${m.runs === 1 ? "" : "s"} of ${q(m.scenario)}` : `${m.runs} more of ${q(m.scenario)}`));
  const name = constantName[method];
  const paired = method === "paired" ? ", runs paired by id" : "";
  return `Selecting the best at probability ${pcs} within ${delta} needs ${andList(parts)} (${name} = ${short(constant)}${paired}).`;
}

/** The sentence added when a scenario's runs needed reached the cap. */
export const capped = (scenarios: readonly string[], cap: number) =>
  ` The procedure asks for more than ${cap} runs of ${andList(scenarios.map(q))}; the runs needed stop at ${cap}, where the probability of correct selection is no longer guaranteed: a larger indifference amount asks for fewer runs.`;
