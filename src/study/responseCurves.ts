import type { Study } from "../manifest/types.js";
import type { CurveGroup, CurvePoint, ResponseCurve, Results } from "../outcome/index.js";
import type { BuiltTable } from "../measures/table.js";
import { readSummary } from "./readings.js";
import { intervalTablePath, safeName, type TableFile, tableFile } from "./tables.js";

/**
 * Response curves: each measure against each factor that takes at least two values among the
 * scenarios, the other factors held fixed.
 *
 *   scenarios' factor values ──▶ per factor f: scenarios grouped by the values of the other
 *   factors ──▶ in each group of ≥ 2 scenarios, one point per scenario at its value of f, in
 *   ascending value of f (ties in scenario order) ──▶ per measure, each point is the interval the
 *   scenario's summary row shows (readSummary: across runs, or its batch means)
 *
 * No model is fitted: a point is exactly its scenario's summary, nothing between two factor
 * values is estimated. Groups are in ascending order of the other factors' values, compared
 * factor by factor in the study's order. A scenario whose combination of the other factors has
 * no second value of f is on no curve of f and is named in `alone`.
 */
export function responseCurves(study: Study, results: Results): ResponseCurve[] {
  if (study.factors.length === 0) return [];
  const curves: ResponseCurve[] = [];
  const valuesOf = study.scenarios.map((sc) => new Map(sc.factors.map((f) => [f.name, f.value])));
  for (const factor of study.factors) {
    const others = study.factors.filter((f) => f !== factor);
    const distinct = new Set(valuesOf.map((v) => v.get(factor)));
    if (distinct.size < 2) continue;
    const byOthers = new Map<string, number[]>();
    valuesOf.forEach((v, i) => {
      const k = JSON.stringify(others.map((o) => v.get(o)));
      byOthers.set(k, [...(byOthers.get(k) ?? []), i]);
    });
    const lists = [...byOthers.values()];
    const kept = lists.filter((l) => l.length >= 2);
    const alone = lists.filter((l) => l.length < 2).flat().map((i) => study.scenarios[i].name);
    const compare = (a: number[], b: number[]) => {
      for (const o of others) {
        const d = (valuesOf[a[0]].get(o) as number) - (valuesOf[b[0]].get(o) as number);
        if (d !== 0) return d;
      }
      return 0;
    };
    kept.sort(compare);
    for (const name of study.measureNames) {
      const groups: CurveGroup[] = kept.map((members) => {
        const order = [...members].sort((a, b) => (valuesOf[a].get(factor) as number) - (valuesOf[b].get(factor) as number) || a - b);
        return {
          fixed: Object.fromEntries(others.map((o) => [o, valuesOf[members[0]].get(o) as number])),
          points: order.map((i) => pointOf(results, i, name, valuesOf[i].get(factor) as number)),
        };
      });
      curves.push(alone.length > 0 ? { measure: name, factor, groups, alone } : { measure: name, factor, groups });
    }
  }
  return curves;
}

/** Scenario `i`'s summary interval of `measure`, as a point at `value`. */
function pointOf(results: Results, i: number, measure: string, value: number): CurvePoint {
  const sr = results.scenarios[i];
  const r = readSummary(sr, measure, sr.summary[measure], []);
  const point: CurvePoint = { scenario: sr.name, value, mean: r.mean, ci_low: r.ci_low, ci_high: r.ci_high, n: r.values };
  if (r.method === "batch-means") point.interval_method = "batch-means";
  return point;
}

/**
 * `tables/response.curves/<measure>.<factor>.csv`. The folder's name holds a `.`, which no
 * scenario's part (`safeName`) ever does, so it never meets a scenario's folder; neither part of
 * the file name holds a `.`, so the split between measure and factor is never in doubt.
 */
export function curveTablePath(measure: string, factor: string): string {
  return `tables/response.curves/${safeName(measure)}.${safeName(factor)}.csv`;
}

export const CURVE_COLUMNS = ["group", "scenario", "factor_value", "n", "mean", "ci_low", "ci_high", "interval_method", "interval_table"];

/** The other factors' values of a group in words: "service_rate = 0.5, lanes = 2" ("" with one factor). */
export function fixedText(fixed: Record<string, number>, format: (v: number) => string = String): string {
  return Object.entries(fixed).map(([k, v]) => `${k} = ${format(v)}`).join(", ");
}

/**
 * A response curve as a table: one row per point, with the group it belongs to, its interval
 * (the scenario's summary, copied) and the file of that interval's arithmetic.
 */
export function curveTable(curve: ResponseCurve): BuiltTable {
  const rows: (number | string | null)[][] = [];
  for (const g of curve.groups) {
    for (const p of g.points) {
      rows.push([
        fixedText(g.fixed), p.scenario, p.value, p.n, p.mean, p.ci_low, p.ci_high, p.interval_method ?? "across-runs",
        intervalTablePath(p.scenario, curve.measure, "value"),
      ]);
    }
  }
  return { columns: CURVE_COLUMNS, rowsTotal: rows.length, rows, shortened: false };
}

/** The table file of a curve, indexed like every calculation table (kind "response-curve"). */
export function curveTableFile(curve: ResponseCurve): TableFile {
  const f = tableFile({ scenario: "", run: null, measure: curve.measure, kind: "response-curve" }, curveTablePath(curve.measure, curve.factor), curveTable(curve));
  return { csv: f.csv, record: { ...f.record, curve: { factor: curve.factor } } };
}
