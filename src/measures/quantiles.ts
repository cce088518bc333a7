import { quantilePosition, quantileSorted, shareAtMost } from "../stats/quantile.js";
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
 * The values are sorted once, in a copy (a Float64Array sorts numerically).
 */
export function observationExtras(
  values: Float64Array,
  quantiles: readonly number[],
  within: readonly number[],
  table: { maxRows: number; edgeRows: number },
): { quantiles?: Record<string, number | null>; within?: Record<string, number | null>; tables: { suffix: string; table: BuiltTable }[] } {
  const out: ReturnType<typeof observationExtras> = { tables: [] };
  if (quantiles.length === 0 && within.length === 0) return out;
  const sorted = Float64Array.from(values).sort();
  const n = sorted.length;
  if (quantiles.length > 0) {
    const q: Record<string, number | null> = {};
    const t = new TableBuilder(QUANTILE_COLUMNS, table.maxRows, table.edgeRows);
    for (const p of quantiles) {
      if (n === 0) {
        q[String(p)] = null;
        t.add([p, 0, null, null, null, null, null, null, null, "no observations"]);
        continue;
      }
      const pos = quantilePosition(n, p);
      const x = quantileSorted(sorted, p);
      q[String(p)] = x;
      const lo = sorted[pos.lo];
      const hi = sorted[pos.hi];
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
      const share = n === 0 ? null : shareAtMost(sorted, x);
      w[String(x)] = share;
      t.add([x, share === null ? 0 : Math.round(share * n), n, share]);
    }
    out.within = w;
    out.tables.push({ suffix: "within", table: t.build() });
  }
  return out;
}
