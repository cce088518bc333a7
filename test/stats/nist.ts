/** The NIST StRD univariate datasets in test/reference, read for the tests. */
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { REFERENCE_DIR } from "../helpers/reference.js";

export const NIST_DIR = REFERENCE_DIR + "nist-strd-univariate";

export interface NistDataset {
  dataset: string;
  n: number;
  /** Certified values as written in the NIST header. */
  mean: string;
  sd: string;
  lag1_autocorrelation: string;
  certified_exact: boolean;
  /** The data values as written (decimal strings). */
  text: string[];
  /** The data values parsed to doubles. */
  values: number[];
}

export function nistDatasets(): NistDataset[] {
  const certified = JSON.parse(readFileSync(join(NIST_DIR, "certified.json"), "utf8")) as Omit<
    NistDataset,
    "text" | "values"
  >[];
  return certified.map((c) => {
    const text = readFileSync(join(NIST_DIR, `${c.dataset}.txt`), "utf8")
      .split("\n")
      .map((line) => line.trim())
      .filter((line) => line !== "");
    return { ...c, text, values: text.map(Number) };
  });
}

/** |a − b| / |b|, or |a − b| when b = 0. */
export function relativeError(a: number, b: number): number {
  return b === 0 ? Math.abs(a - b) : Math.abs(a - b) / Math.abs(b);
}
