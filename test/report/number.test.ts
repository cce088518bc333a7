import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { formatNumber, formatPercent, MISSING, SIGNIFICANT_DIGITS } from "../../src/report/number.js";

describe("formatNumber", () => {
  it("formatNumber rounds to 4 significant digits and drops trailing zeros", () => {
    // Expected strings computed by hand from the rule in docs/report.md.
    expect(formatNumber(2.34567)).toBe("2.346");
    expect(formatNumber(2.5)).toBe("2.5");
    expect(formatNumber(0.000123456)).toBe("0.0001235");
    expect(formatNumber(-0.04)).toBe("-0.04");
    expect(formatNumber(181)).toBe("181");
  });

  it("formatNumber keeps every whole-number digit of large values", () => {
    // Computed by hand: 4 significant digits would drop integer digits, the rule never does.
    expect(formatNumber(12345.67)).toBe("12346");
    expect(formatNumber(1234567)).toBe("1234567");
    expect(formatNumber(-9999.5)).toBe("-10000");
  });

  it("formatNumber uses scientific notation only outside [1e-6, 1e15)", () => {
    // Rule bounds from docs/report.md.
    expect(formatNumber(3e-9)).toBe("3e-9");
    expect(formatNumber(1.23456e20)).toBe("1.235e20");
    expect(formatNumber(0.000001)).toBe("0.000001");
  });

  it("formatNumber shows a missing value (null, NaN, infinity) as a dash and zero as 0", () => {
    expect(formatNumber(null)).toBe(MISSING);
    expect(formatNumber(Number.NaN)).toBe(MISSING);
    expect(formatNumber(Infinity)).toBe(MISSING);
    expect(formatNumber(-0)).toBe("0");
  });

  it("formatNumber is within half a unit of the 4th significant digit and plain for ordinary magnitudes (property)", () => {
    // Property of the rule: |shown − x| <= 0.5 · 10^(e − 3), e = floor(log10 |x|), and at most 0.5 for |x| >= 1000.
    fc.assert(
      fc.property(fc.double({ min: -1e12, max: 1e12, noNaN: true }).filter((x) => Math.abs(x) >= 1e-6), (x) => {
        const s = formatNumber(x);
        expect(s).not.toMatch(/e/);
        const e = Math.floor(Math.log10(Math.abs(x)));
        const unit = Math.abs(x) >= 10 ** (SIGNIFICANT_DIGITS - 1) ? 1 : 10 ** (e - SIGNIFICANT_DIGITS + 1);
        expect(Math.abs(Number(s) - x)).toBeLessThanOrEqual(unit * 0.5000001 + Math.abs(x) * 1e-12);
      }),
    );
  });
});

describe("formatPercent", () => {
  it("formatPercent applies the same rule to share × 100", () => {
    // Computed by hand: 0.04213 → 4.213 %.
    expect(formatPercent(0.04213)).toBe("4.213 %");
    expect(formatPercent(0.95)).toBe("95 %");
    expect(formatPercent(null)).toBe(MISSING);
  });
});
