/**
 * The observation values of one scenario and measure kept for the report's histogram and
 * distribution chart, in memory that does not grow with the number of runs:
 *
 *   run 1 values ─┐
 *   run 2 values ─┼─ in run order ─▶ keep every s-th value (s = 1, 2, 4, ...) ─▶ at most `limit`
 *   ...          ─┘                  s doubles, and every other kept value goes, when full
 *
 * With at most `limit` values in all, every value is kept, in run order. Beyond, the values kept
 * are those whose position in the concatenation of the runs is a multiple of s, the smallest
 * power of two that leaves at most `limit` (so between limit / 2 and limit of them): an even
 * sample that depends only on the values and the order of the runs.
 */
export class EvenSample {
  private readonly kept: number[] = [];
  private stride = 1;
  /** Values offered so far (the position of the next one). */
  private offered = 0;

  constructor(private readonly limit: number) {}

  /** Offers the next values, in order. */
  add(values: ArrayLike<number>): void {
    for (let j = 0; j < values.length; j++, this.offered++) {
      if (this.offered % this.stride !== 0) continue;
      if (this.kept.length === this.limit) {
        this.stride *= 2;
        // Kept positions are multiples of the old stride: every other one is a multiple of the new.
        let w = 0;
        for (let r = 0; r < this.kept.length; r += 2) this.kept[w++] = this.kept[r];
        this.kept.length = w;
        if (this.offered % this.stride !== 0) continue;
      }
      this.kept.push(values[j]);
    }
  }

  values(): number[] {
    return this.kept.slice();
  }
}

/**
 * A run's values thinned before they wait for earlier runs (see `runStudy`): all of them when at
 * most `limit`, else every k-th with k = ceil(n / limit). Copied, so that the run's own array can
 * be freed.
 */
export function thinned(values: Float64Array, limit: number): Float64Array {
  if (values.length <= limit) return values.slice();
  const k = Math.ceil(values.length / limit);
  const out = new Float64Array(Math.ceil(values.length / k));
  for (let i = 0, j = 0; i < values.length; i += k, j++) out[j] = values[i];
  return out;
}
