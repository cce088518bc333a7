import { Adder } from "./adder.js";

/** The result of the MSER truncation rule. */
export interface MserResult {
  /** Number of leading batches to drop (the chosen truncation point). */
  d: number;
  /** m = ⌊length / batchSize⌋ complete batches used; an incomplete last batch is dropped. */
  batches: number;
  /** Z_1 … Z_m, the means of the complete batches, oldest first. */
  batchMeans: number[];
  /** MSER(d) for d = 0 … ⌊m/2⌋; empty when m < 2. */
  statistics: number[];
  /** True when the chosen d is the largest allowed, ⌊m/2⌋: the warm-up may not be over yet. */
  atLimit: boolean;
  /** d · batchSize: the number of leading values dropped. */
  truncated: number;
}

/**
 * MSER-5 warm-up detection (the marginal standard error rule on batch means of 5).
 *
 * The sequence is cut into m = ⌊length / batchSize⌋ batches of `batchSize` consecutive values
 * (an incomplete last batch is dropped) with means Z_1 … Z_m. For each d = 0 … ⌊m/2⌋ (d batches
 * dropped, batches d+1 … m kept) the statistic is
 *   MSER(d) = Σ_{j=d+1..m} (Z_j − Z̄_d)² / (m − d)²,   Z̄_d = mean of Z_{d+1} … Z_m,
 * i.e. the squared standard error of the kept mean, up to a constant factor. The rule picks the d
 * that minimises it (ties go to the smallest d) and drops d·batchSize values. When the minimum is
 * at the limit ⌊m/2⌋ the rule has not found the end of the warm-up (`atLimit`); the run is
 * probably too short. With m < 2 there is nothing to compare: d = 0, `statistics` is empty and
 * `atLimit` is false.
 *
 * The kept mean and sum of squares are updated from the last batch backwards (Welford's update),
 * so all statistics cost O(m) and no cancellation-prone Σz² − (Σz)²/k is formed.
 *
 * References: K. P. White Jr. (1997), "An Effective Truncation Heuristic for Bias Reduction in
 * Simulation Output", Simulation 69(6), 323–334; K. P. White Jr., M. J. Cobb and S. C. Spratt
 * (2000), "A Comparison of Five Steady-State Truncation Heuristics for Simulation", Proceedings
 * of the 2000 Winter Simulation Conference, 755–760.
 *
 * Example: `mser([9, 9, 9, 9, 9, 1, 2, 3, 2, 1, 2, 1, 2, 3, 1, 1, 2, 1, 2, 3, 2, 1, 2], 5)` has
 * m = 4 batch means [9, 1.8, 1.8, 1.8] (the last 3 values dropped), statistics
 * [2.43, 0, 0] (2.43 = 38.88 / 4²) and gives d 1, truncated 5, atLimit false (the tie between
 * d = 1 and d = 2 goes to the smaller).
 */
export function mser(sequence: ArrayLike<number>, batchSize = 5): MserResult {
  if (!(Number.isInteger(batchSize) && batchSize >= 1)) {
    throw new Error(`mser: batchSize must be a positive integer, got ${batchSize}`);
  }
  const m = Math.floor(sequence.length / batchSize);
  const batchMeans: number[] = new Array(m);
  const adder = new Adder();
  for (let j = 0; j < m; j++) {
    adder.reset();
    for (let i = j * batchSize; i < (j + 1) * batchSize; i++) adder.add(sequence[i]);
    batchMeans[j] = adder.value() / batchSize;
  }
  if (m < 2) return { d: 0, batches: m, batchMeans, statistics: [], atLimit: false, truncated: 0 };

  const limit = Math.floor(m / 2);
  const statistics: number[] = new Array(limit + 1);
  // Welford's running mean and sum of squared deviations over Z_j … Z_m, adding j = m, m−1, ….
  let mean = 0;
  let sumSquares = 0;
  for (let j = m - 1; j >= 0; j--) {
    const k = m - j;
    const delta = batchMeans[j] - mean;
    mean += delta / k;
    sumSquares += delta * (batchMeans[j] - mean);
    if (j <= limit) statistics[j] = sumSquares / (k * k);
  }
  let d = 0;
  for (let j = 1; j <= limit; j++) if (statistics[j] < statistics[d]) d = j;
  return { d, batches: m, batchMeans, statistics, atLimit: d === limit, truncated: d * batchSize };
}
