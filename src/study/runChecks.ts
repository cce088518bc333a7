/**
 * Checks of one run's times that end as warnings on the run (and, for a short run, on its
 * scenario's summary rows): durations that keep few digits because the clock values are large,
 * and a run whose rows stop long before the window's end.
 */
import type { MeasureOutput } from "../measures/accumulator.js";
import { ulp } from "../stats/ulp.js";

/**
 * Fewer significant digits than this in the shortest duration is warned about. Our choice: two
 * digits more than the report shows (4), so that the rounding of a duration cannot reach the
 * shown digits of a figure built from a few of them.
 */
export const DURATION_DIGITS_WARNING = 6;

/**
 * A run is warned about when its latest row is earlier than `end − LATE_FRACTION · (end − start)`:
 * more than a tenth of its window has no row of any series the measures read. Our choice: a run
 * with 100 or more events spread over its window leaves such a gap by chance with probability
 * e^−10 or less (Poisson events); a sparser run may be warned about without cause, and the
 * warning says what to check.
 */
export const LATE_FRACTION = 0.1;

/** results.json `time_resolution` of a run. */
export interface TimeResolution {
  /** The largest |time| of an interval or entity event, and ulp of it. */
  largest_time: number;
  ulp: number;
  /** The shortest positive duration any measure formed. */
  smallest_duration: number;
  /** log10(smallest_duration / ulp): the significant digits that duration keeps. */
  digits: number;
}

/**
 * The digits the run's durations keep: a time t read as a double is within ulp(t)/2 of the number
 * written, so a duration d between two times up to T is within ulp(T) of the true one, a relative
 * error of ulp(T)/d, about log10(d / ulp(T)) significant digits. Null when no measure formed a
 * positive duration.
 *
 * Example: times up to 1e9 (ulp 2^−23 ≈ 1.19e-7) and a shortest duration of 1e-3 give
 * log10(1e-3 / 2^−23) = 3.92 digits.
 */
export function timeResolution(outputs: Iterable<MeasureOutput>): TimeResolution | null {
  let largest = 0;
  let smallest = Infinity;
  for (const out of outputs) {
    const r = out.resolution;
    if (r === undefined || r.smallestDuration === Infinity) continue;
    if (r.largestTime > largest) largest = r.largestTime;
    if (r.smallestDuration < smallest) smallest = r.smallestDuration;
  }
  if (smallest === Infinity) return null;
  const u = ulp(largest);
  return { largest_time: largest, ulp: u, smallest_duration: smallest, digits: Math.log10(smallest / u) };
}

/**
 * True when the run's latest row is more than LATE_FRACTION of [start, end] before end. A run with
 * no row of any series read (null) is not called short: each of its measures already warns that
 * its series never appears.
 */
export function endsEarly(lastRow: number | null, start: number, end: number): boolean {
  return lastRow !== null && end - lastRow > LATE_FRACTION * (end - start);
}
