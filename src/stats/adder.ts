/**
 * Neumaier's compensated summation (Kahan–Babuška): a running sum plus a running
 * compensation that collects the low-order bits each addition rounds away.
 *
 * Each `add` forms `t = sum + x` and adds the rounding error of that one addition,
 * `(larger − t) + smaller`, to the compensation; `value()` returns sum + compensation. The error
 * of the result is bounded independently of the number of terms (to first order), unlike the
 * naive left-to-right sum whose error grows with n. Not exactly rounded: use `fsum` when the
 * result must not depend on the order of the terms.
 *
 * Reference: A. Neumaier (1974), "Rundungsfehleranalyse einiger Verfahren zur Summation
 * endlicher Summen", Zeitschrift für Angewandte Mathematik und Mechanik 54, 39–51.
 *
 * Example: adding 1e16, 1, −1e16 gives `value() === 1` (the naive sum gives 0).
 *
 * Infinite terms: once the running sum is not finite, `value()` returns it as it stands.
 */
export class Adder {
  private sum = 0;
  private compensation = 0;

  add(x: number): void {
    const s = this.sum;
    const t = s + x;
    if (Math.abs(s) >= Math.abs(x)) this.compensation += s - t + x;
    else this.compensation += x - t + s;
    this.sum = t;
  }

  value(): number {
    const s = this.sum;
    return Number.isFinite(s) ? s + this.compensation : s;
  }

  reset(): void {
    this.sum = 0;
    this.compensation = 0;
  }
}
