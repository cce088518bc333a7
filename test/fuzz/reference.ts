/**
 * A slow, obviously-correct reference for the statistics of CONTRACT.md sections 2–4, written
 * from the contract's words and nothing else (no code of src/ is used, except that the t
 * quantile comes from jstat). It works on a generated study model (studyGen.ts), not on files.
 *
 * - A level is a right-continuous step function: its value at x is the value of the last row
 *   (file order breaks ties) with time <= x, else `initial`. Over the window [c, end] the
 *   breakpoints are c, end and every row time strictly between; each stretch between two
 *   consecutive breakpoints has the level at its left end (section 3: ties leave zero-length
 *   intervals of area 0, the last one's value holds on).
 * - Rows after `end` do not exist for any measure (section 3). Observations and counts need
 *   time >= c; levels take rows before c as history.
 * - Utilization with a constant capacity K: area(busy) / (K · T).
 * - Entity level: initial + (enters at or before x) - (leaves at or before x).
 * - Entity durations: for each leave inside [c, end], its time minus its entity's enter time;
 *   entities with an enter at or before `end` and no leave at or before `end` are censored.
 * - Across runs: mean, sd (n - 1), half-width t(1 - α/2, n - 1) · sd / √n (section 4). The t
 *   quantile has closed forms for 1 and 2 degrees of freedom (Cauchy: tan(π(p - 1/2)); df 2:
 *   (2p - 1) / sqrt(2p(1 - p))), used here; for more it comes from src/stats/tQuantile.ts, which
 *   test/stats/tQuantile.test.ts checks against published tables. (jstat's studentt.inv is off
 *   by about 2e-8 relative at df 2 and 3, too coarse for a 1e-9 comparison.)
 */
import { tQuantile } from "../../src/stats/tQuantile.js";
import type { GenRun, GenStudy, Row } from "./studyGen.js";

/** Neumaier's compensated sum, so the reference itself does not lose digits on long sums. */
export function sum(xs: Iterable<number>): number {
  let s = 0;
  let c = 0;
  for (const x of xs) {
    const t = s + x;
    c += Math.abs(s) >= Math.abs(x) ? s - t + x : x - t + s;
    s = t;
  }
  return s + c;
}

export interface LevelRef {
  area: number;
  mean: number;
  sd: number;
  min: number;
  max: number;
  final: number;
  duration: number;
  /** Σ |v| · d: the scale of the area, for the absolute tolerance. */
  scale: number;
  /** max |v| over the window. */
  vmax: number;
}

/** Time-weighted statistics of the step function `levelAt` over [c, end] (contract section 4). */
export function levelRef(levelAt: (x: number) => number, times: number[], c: number, end: number): LevelRef {
  const points = [...new Set([c, end, ...times.filter((t) => t > c && t < end)])].sort((a, b) => a - b);
  const pieces: { v: number; d: number }[] = [];
  for (let i = 0; i + 1 < points.length; i++) pieces.push({ v: levelAt(points[i]), d: points[i + 1] - points[i] });
  const T = end - c;
  const area = sum(pieces.map((p) => p.v * p.d));
  const mean = area / T;
  const sd = Math.sqrt(Math.max(0, sum(pieces.map((p) => p.d * (p.v - mean) ** 2)) / T));
  return {
    area,
    mean,
    sd,
    min: Math.min(...pieces.map((p) => p.v)),
    max: Math.max(...pieces.map((p) => p.v)),
    final: levelAt(end),
    duration: T,
    scale: sum(pieces.map((p) => Math.abs(p.v) * p.d)),
    vmax: Math.max(...pieces.map((p) => Math.abs(p.v))),
  };
}

/** The step function of a series level: last row (file order) with time <= x, else initial. */
function seriesLevel(rows: Row[], initial: number): (x: number) => number {
  return (x) => {
    let v = initial;
    for (const r of rows) if (r.time <= x) v = r.value as number;
    return v;
  };
}

export interface ObservationRef {
  n: number;
  mean: number | null;
  sd: number | null;
  min: number | null;
  max: number | null;
  quantiles: Record<string, number | null>;
  /** max |x|, for the absolute tolerance. */
  scale: number;
}

/** Sample statistics with divisor n - 1 and Hyndman–Fan type 7 quantiles. */
export function observationRef(values: number[], ps: readonly number[]): ObservationRef {
  const n = values.length;
  const sorted = [...values].sort((a, b) => a - b);
  const quantiles: Record<string, number | null> = {};
  for (const p of ps) {
    if (n === 0) quantiles[String(p)] = null;
    else {
      const h = (n - 1) * p;
      const lo = Math.floor(h);
      const hi = Math.min(lo + 1, n - 1);
      quantiles[String(p)] = sorted[lo] + (h - lo) * (sorted[hi] - sorted[lo]);
    }
  }
  if (n === 0) return { n, mean: null, sd: null, min: null, max: null, quantiles, scale: 0 };
  const mean = sum(values) / n;
  const sd = n < 2 ? null : Math.sqrt(sum(values.map((x) => (x - mean) ** 2)) / (n - 1));
  return { n, mean, sd, min: sorted[0], max: sorted[n - 1], quantiles, scale: Math.max(...values.map(Math.abs)) };
}

export interface RunRef {
  c: number;
  end: number;
  T: number;
  level: LevelRef;
  util: LevelRef & { value: number; capacityArea: number };
  count: { n: number; rate: number };
  obs: ObservationRef;
  inside: LevelRef & { entered: number; left: number; insideAtEnd: number };
  stay: ObservationRef & { censored: number };
  afterEnd: number;
  /** max |time| in the run, the scale of durations. */
  tmax: number;
}

/** The window of a run: start, end and c = max(start, warm-up) (contract section 3). */
export function windowOf(study: GenStudy, s: number, run: GenRun): { start: number; end: number; c: number } {
  const sc = study.scenarios[s];
  const start = run.start ?? sc.start ?? 0;
  const end = (run.end ?? sc.end) as number;
  const w = sc.warmup !== undefined ? sc.warmup : study.warmup;
  const c = w !== undefined && w !== null && w > start ? w : start;
  return { start, end, c };
}

/** Every statistic of one run of the generated study, from the contract. */
export function runRef(study: GenStudy, s: number, run: GenRun): RunRef {
  const { c, end } = windowOf(study, s, run);
  const T = end - c;
  const S = study.series;
  const inWindow = run.rows.filter((r) => r.time <= end);
  const of = (name: string) => inWindow.filter((r) => r.series === name);
  const measured = new Set([S.level, S.obs, S.count, S.busy, S.enter, S.leave]);
  const afterEnd = run.rows.filter((r) => r.time > end && measured.has(r.series)).length;

  const levelRows = of(S.level);
  const level = levelRef(seriesLevel(levelRows, study.initial), levelRows.map((r) => r.time), c, end);

  const busyRows = of(S.busy);
  const busy = levelRef(seriesLevel(busyRows, study.busyInitial), busyRows.map((r) => r.time), c, end);
  const capacityArea = study.capacity * T;
  const util = { ...busy, value: busy.area / capacityArea, capacityArea };

  const countN = of(S.count).filter((r) => r.time >= c).length;
  const obs = observationRef(of(S.obs).filter((r) => r.time >= c).map((r) => r.value as number), study.quantiles);

  const enters = of(S.enter);
  const leaves = of(S.leave);
  const insideAt = (x: number) => study.initial + enters.filter((r) => r.time <= x).length - leaves.filter((r) => r.time <= x).length;
  const insideLevel = levelRef(insideAt, [...enters, ...leaves].map((r) => r.time), c, end);
  const enteredAt = new Map(enters.map((r) => [r.entity as string, r.time]));
  const durations = leaves.filter((r) => r.time >= c).map((r) => r.time - (enteredAt.get(r.entity as string) as number));
  const leftIds = new Set(leaves.map((r) => r.entity));
  const stay = { ...observationRef(durations, study.quantiles), censored: enters.filter((r) => !leftIds.has(r.entity)).length };

  return {
    c,
    end,
    T,
    level,
    util,
    count: { n: countN, rate: countN / T },
    obs,
    inside: {
      ...insideLevel,
      entered: enters.filter((r) => r.time >= c).length,
      left: leaves.filter((r) => r.time >= c).length,
      insideAtEnd: enters.length - leaves.length,
    },
    stay,
    afterEnd,
    tmax: Math.max(0, ...run.rows.map((r) => Math.abs(r.time)), Math.abs(end), Math.abs(c)),
  };
}

/** The t quantile: closed forms for df 1 and 2, else src/stats/tQuantile.ts. */
export function tRef(p: number, df: number): number {
  if (df === 1) return Math.tan(Math.PI * (p - 0.5));
  if (df === 2) return (2 * p - 1) / Math.sqrt(2 * p * (1 - p));
  return tQuantile(p, df);
}

export interface SummaryRef {
  n: number;
  mean: number | null;
  sd: number | null;
  half_width: number | null;
  ci_low: number | null;
  ci_high: number | null;
  scale: number;
}

/** Across-run summary of the per-run values (null values left out), contract section 4. */
export function summaryRef(values: (number | null)[], confidence: number): SummaryRef {
  const xs = values.filter((v): v is number => v !== null);
  const n = xs.length;
  const scale = n === 0 ? 0 : Math.max(...xs.map(Math.abs));
  if (n === 0) return { n, mean: null, sd: null, half_width: null, ci_low: null, ci_high: null, scale };
  const mean = sum(xs) / n;
  if (n === 1) return { n, mean, sd: null, half_width: null, ci_low: null, ci_high: null, scale };
  const sd = Math.sqrt(sum(xs.map((x) => (x - mean) ** 2)) / (n - 1));
  const t = tRef(1 - (1 - confidence) / 2, n - 1);
  const hw = (t * sd) / Math.sqrt(n);
  return { n, mean, sd, half_width: hw, ci_low: mean - hw, ci_high: mean + hw, scale };
}
