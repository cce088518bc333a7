/** The Student t quantiles of test/reference/t-quantiles.json, looked up by p and df. */
import { readFileSync } from "node:fs";
import { REFERENCE_DIR } from "../helpers/reference.js";

const file = JSON.parse(readFileSync(REFERENCE_DIR + "t-quantiles.json", "utf8")) as {
  values: { p: number; df: number; quantile: string }[];
};

/** t(p, df) from the reference file (scipy.stats.t.ppf); throws if the pair is not listed. */
export function referenceT(p: number, df: number): number {
  const entry = file.values.find((e) => e.p === p && e.df === df);
  if (!entry) throw new Error(`no reference quantile for p ${p}, df ${df}`);
  return Number(entry.quantile);
}

export const referenceTable = file.values;
