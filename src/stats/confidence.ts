/**
 * The probability of the two-sided t quantile for a confidence level: p = 1 − α/2 with
 * α = 1 − confidence. Example: `twoSidedP(0.95)` gives 0.975.
 *
 * Throws a plain `Error` (a programming error: the manifest edge validates the level) when the
 * confidence is not strictly between 0 and 1.
 */
export function twoSidedP(confidence: number): number {
  if (!(confidence > 0 && confidence < 1)) {
    throw new Error(`confidence must lie strictly between 0 and 1, got ${confidence}`);
  }
  const alpha = 1 - confidence;
  return 1 - alpha / 2;
}
