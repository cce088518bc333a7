/**
 * Warnings of the measures and the study runner: what is doubtful in the data, never an error.
 * Each says where (run, measure, time or line), what, and what to check. They are listed in the
 * report's warnings section, and those about a scenario's runs also on its summary rows.
 */

/** Names of runs as shown in a warning: quoted, at most `shown` of them, then how many more. */
export function runList(runs: readonly string[], shown = 5): string {
  const named = runs.slice(0, shown).map((r) => `"${r}"`).join(", ");
  return runs.length > shown ? `${named} and ${runs.length - shown} more` : named;
}

/** Where the busy level first rose above the capacity (one interval of positive duration). */
export interface OverCapacity {
  /** Intervals of positive duration with busy > capacity, and their total time. */
  intervals: number;
  time: number;
  from: number;
  to: number;
  busy: number;
  capacity: number;
  /** The run-file line of the row that started the first such interval, or null (the window start). */
  line: number | null;
  /** The series of that row (busy or capacity), or null. */
  series: string | null;
}

/** A utilization whose busy level is above its capacity for part of the window. */
export const busyAboveCapacity = (measure: string, file: string, o: OverCapacity, utilization: number) => {
  const cause = o.line === null ? "from the window start" : `from line ${o.line} of ${file}${o.series === null ? "" : ` (series "${o.series}")`}`;
  return (
    `measure "${measure}": the busy level is above the capacity on ${o.intervals} interval(s) inside the window, ${o.time} time units in all; ` +
    `first from ${o.from} to ${o.to}: busy ${o.busy} against capacity ${o.capacity}, ${cause}. ` +
    `The utilization ${utilization} (busy area / capacity area) ${utilization > 1 ? "is above 1" : "hides it, because the areas are summed over the whole window"}. ` +
    "What to check: that the capacity series (or number) is the capacity of the same resource as the busy series, and that both are logged at every change."
  );
};

/** The durations of a run keep few significant digits because its clock values are large. */
export const durationDigits = (file: string, digits: number, largestTime: number, ulp: number, smallestDuration: number, threshold: number) =>
  `${file}: the run's times reach ${largestTime}, where one step of a double is ${ulp}, and its shortest duration is ${smallestDuration}: ` +
  `durations keep only about ${digits.toFixed(1)} significant digits (fewer than ${threshold}), so times and averages built from them carry that rounding. ` +
  "What to check: write the times relative to the run's start (subtract a fixed offset) or in a larger time unit, so that the clock values are smaller.";

/** A run's latest row is long before the window's end. */
export const runEndsEarly = (file: string, lastRow: number, end: number, start: number, fraction: number) =>
  `${file}: the run's latest row is at ${lastRow}, ${end - lastRow} before the window's end ${end} ` +
  `(more than ${fraction * 100}% of the window [${start}, ${end}]): levels hold their last value to the end and counts see no events there. ` +
  "What to check: that the run did not stop early or its file was not cut short, and that `end` is right for this run.";

/**
 * The flags of a summary row (src/report/model/summary.ts), each a link to its detail: short, so
 * that several fit under a scenario's name. Numbers come in already rounded by the report.
 */
export const rowFlag = {
  /** Across runs: more runs needed for the precision target than were made. */
  targetMissed: (needed: string, made: string) => `Target missed: ${needed} runs needed, ${made} made`,
  /** Batch means of one long run: the half-width is above the one the target aims at. */
  targetMissedHalfWidth: (halfWidth: string, aim: string) => `Target missed: half-width ${halfWidth}, aimed at ${aim}`,
  /** A target with no number of runs or half-width to judge it by (the runs-needed table says why). */
  targetNotJudged: "Target not judged (see why)",
  /** Runs that gave no value, left out of the interval. */
  leftOut: (runs: readonly string[]) => `${runList(runs, 3)} left out (no value)`,
  /** Runs whose rows stop well before the window's end. */
  endsEarly: (runs: readonly string[]) => `${runList(runs, 3)} ${runs.length === 1 ? "ends" : "end"} early`,
  /** The warnings about the row's scenario in its measure or in the whole run or scenario. */
  warnings: (count: number) => `${count} warning${count === 1 ? "" : "s"}`,
};

/** A measure's summary leaves out runs that gave no value (no observation inside the window). */
export const runsWithoutValue = (runs: readonly string[], used: number, total: number) =>
  `Over ${used} of ${total} runs: ${runList(runs)} ${runs.length === 1 ? "has" : "have"} no value (no observation inside the window), so the interval is over fewer runs.`;

/** Why a measure has no number of runs needed (results.json `runs_needed_reason`), in words. */
export const runsNeededWhy = (reason: string, n: number): string => {
  switch (reason) {
    case "no-runs":
      return "No run gave a value, so there is nothing to plan from.";
    case "one-run":
      return "Only one run gave a value: one value has no spread, and the number of runs is planned from the spread. Make at least two runs (a first batch of 5 to 10 gives a steadier estimate).";
    case "no-spread":
      return `All ${n} runs gave the same value (sd 0): the spread to plan from is unknown, not zero. If the runs should differ, check that each run uses its own random numbers; if the figure never varies, the ${n} runs already meet any target.`;
    case "mean-zero":
      return "The mean of the runs is 0, so a relative target asks for a half-width of 0, which no number of runs reaches. Give the target as `half_width` in the measure's unit instead.";
    case "beyond-limit":
      return "More than 10,000,000 runs would be needed at the current spread. Loosen the target, or lower the spread between runs (longer runs, common random numbers).";
    default:
      return `No number of runs (${reason}).`;
  }
};

/** A `select:` entry whose selection cannot be computed from the runs the study holds. */
export const selectionNotMade = (index: number, measure: string, problem: string) =>
  `select entry ${index + 1} (measure "${measure}"): no selection, because ${problem}. What to do: give every scenario of the entry at least its first-stage runs with a value of the measure.`;
