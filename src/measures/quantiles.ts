import { interpolate7, quantilePosition } from "../stats/quantile.js";
import { countAtMost, selectInPlace } from "../stats/select.js";
import { type Cell, TableBuilder, type BuiltTable } from "./table.js";

export const QUANTILE_COLUMNS = [
  "p", "n", "h", "lower_rank", "upper_rank", "lower_value", "upper_value", "fraction", "quantile", "arithmetic",
];
export const WITHIN_COLUMNS = ["threshold", "at_most", "n", "share"];

/**
 * Per-run quantiles (Hyndman and Fan 1996, type 7) and shares within thresholds of one
 * observation measure, each with a calculation table: for every p the sorted observations around
 * its position and the interpolation written out; for every x the count of values at most x.
 *
 * The order statistics are found by selection (Floyd and Rivest 1975) in one copy of the values,
 * taking the quantiles in increasing order so that each selection searches only what is left:
 * expected time linear in n, instead of sorting all n values; the results are the same order
 * statistics a sort would give.
 */
export function observationExtras(
  values: Float64Array,
  quantiles: readonly number[],
  within: readonly number[],
  table: { maxRows: number; edgeRows: number },
): { quantiles?: Record<string, number | null>; within?: Record<string, number | null>; tables: { suffix: string; table: BuiltTable }[] } {
  const out: ReturnType<typeof observationExtras> = { tables: [] };
  if (quantiles.length === 0 && within.length === 0) return out;
  const work = Float64Array.from(values);
  const n = work.length;
  if (quantiles.length > 0) {
    // The order statistics each p needs, selected in increasing order of position.
    const order = new Map<number, number>();
    if (n > 0) {
      const ranks = [...new Set(quantiles.flatMap((p) => { const q = quantilePosition(n, p); return [q.lo, q.hi]; }))].sort((a, b) => a - b);
      let left = 0;
      for (const k of ranks) {
        selectInPlace(work, k, left, n - 1);
        order.set(k, work[k]);
        left = k;
      }
    }
    const q: Record<string, number | null> = {};
    const t = new TableBuilder(QUANTILE_COLUMNS, table.maxRows, table.edgeRows);
    for (const p of quantiles) {
      if (n === 0) {
        q[String(p)] = null;
        t.add([p, 0, null, null, null, null, null, null, null, "no observations"]);
        continue;
      }
      const pos = quantilePosition(n, p);
      const lo = order.get(pos.lo)!;
      const hi = order.get(pos.hi)!;
      const x = interpolate7(lo, hi, pos.fraction);
      q[String(p)] = x;
      const row: Cell[] = [
        p, n, pos.h, pos.lo + 1, pos.hi + 1, lo, hi, pos.fraction, x,
        `h = (${n} - 1) * ${p} = ${pos.h}; x(${pos.lo + 1}) + (x(${pos.hi + 1}) - x(${pos.lo + 1})) * ${pos.fraction} = ${lo} + (${hi} - ${lo}) * ${pos.fraction} = ${x}`,
      ];
      t.add(row);
    }
    out.quantiles = q;
    out.tables.push({ suffix: "quantiles", table: t.build() });
  }
  if (within.length > 0) {
    const w: Record<string, number | null> = {};
    const t = new TableBuilder(WITHIN_COLUMNS, table.maxRows, table.edgeRows);
    for (const x of within) {
      const atMost = countAtMost(values, x);
      const share = n === 0 ? null : atMost / n;
      w[String(x)] = share;
      t.add([x, atMost, n, share]);
    }
    out.within = w;
    out.tables.push({ suffix: "within", table: t.build() });
  }
  return out;
}
