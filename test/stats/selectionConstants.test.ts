import jstat from "jstat";
import { describe, expect, it } from "vitest";
import { equicoordinateProbability, equicoordinateT } from "../../src/stats/equicoordinate.js";
import { normalCdf, normalPdf } from "../../src/stats/normal.js";
import { chiRatioRule, gaussLegendre, normalRule, solveIncreasing } from "../../src/stats/quadrature.js";
import { rinottH, rinottProbability } from "../../src/stats/rinott.js";
import { tQuantile } from "../../src/stats/tQuantile.js";
import { mulberry32, normals } from "./random.js";

/** Three standard errors of a binomial proportion p over r trials: the Monte Carlo band. */
const band = (p: number, r: number) => 3 * Math.sqrt((p * (1 - p)) / r);

/** S = √(χ²_ν/ν) drawn as the root mean square of ν standard normals. */
function chiRatio(nu: number, z: () => number): number {
  let s = 0;
  for (let i = 0; i < nu; i++) {
    const x = z();
    s += x * x;
  }
  return Math.sqrt(s / nu);
}

describe("normalCdf", () => {
  it("normalCdf agrees with jstat's normal distribution function to 1e-14 on [−8, 8]", () => {
    // reference: jstat normal.cdf (an independent implementation, via erfc)
    for (let x = -8; x <= 8; x += 0.37) expect(Math.abs(normalCdf(x) - jstat.normal.cdf(x, 0, 1))).toBeLessThanOrEqual(1e-14);
  });

  it("normalCdf at the 0.975 and 0.95 quantiles gives 0.975 and 0.95; normalPdf(0) is 1/√(2π)", () => {
    // reference: the normal quantiles 1.959963984540054 and 1.6448536269514722 (from memory; jstat normal.inv agrees)
    expect(Math.abs(normalCdf(1.959963984540054) - 0.975)).toBeLessThanOrEqual(4.5e-16);
    expect(Math.abs(normalCdf(1.6448536269514722) - 0.95)).toBeLessThanOrEqual(4.5e-16);
    expect(normalCdf(0)).toBe(0.5);
    expect(Math.abs(normalPdf(0) - 1 / Math.sqrt(2 * Math.PI))).toBeLessThanOrEqual(1e-16);
  });
});

describe("quadrature", () => {
  it("gaussLegendre(2) has nodes ∓1/√3 and weights 1; gaussLegendre(4) integrates x⁶ over [−1, 1] exactly", () => {
    // formula: Gauss–Legendre with n points is exact to degree 2n − 1 (Golub and Welsch 1969); ∫x⁶ = 2/7
    const two = gaussLegendre(2);
    expect(Math.abs(two.nodes[1] - 1 / Math.sqrt(3))).toBeLessThanOrEqual(2.3e-16);
    expect(two.nodes[0]).toBe(-two.nodes[1]);
    expect(Math.abs(two.weights[0] - 1)).toBeLessThanOrEqual(1e-15);
    const four = gaussLegendre(4);
    let sum = 0;
    for (let i = 0; i < 4; i++) sum += four.weights[i] * four.nodes[i] ** 6;
    expect(Math.abs(sum - 2 / 7)).toBeLessThanOrEqual(1e-15);
  });

  it.each([1, 4, 19, 99])("chiRatioRule(%s) gives E[S²] = 1 and E[S⁴] = (ν + 2)/ν", (nu) => {
    // formula: E[χ²_ν] = ν, E[(χ²_ν)²] = ν(ν + 2)
    const { nodes, weights } = chiRatioRule(nu);
    let m2 = 0;
    let m4 = 0;
    for (let i = 0; i < nodes.length; i++) {
      m2 += weights[i] * nodes[i] ** 2;
      m4 += weights[i] * nodes[i] ** 4;
    }
    expect(Math.abs(m2 - 1)).toBeLessThanOrEqual(1e-12);
    expect(Math.abs(m4 - (nu + 2) / nu)).toBeLessThanOrEqual(1e-12);
  });

  it("normalRule gives E[Z²] = 1 and E[Z⁴] = 3", () => {
    // formula: the moments of the standard normal
    const { nodes, weights } = normalRule();
    let m2 = 0;
    let m4 = 0;
    for (let i = 0; i < nodes.length; i++) {
      m2 += weights[i] * nodes[i] ** 2;
      m4 += weights[i] * nodes[i] ** 4;
    }
    expect(Math.abs(m2 - 1)).toBeLessThanOrEqual(1e-13);
    expect(Math.abs(m4 - 3)).toBeLessThanOrEqual(1e-12);
  });

  it("solveIncreasing((x) => x², 2, 0) gives √2", () => {
    // formula
    expect(Math.abs(solveIncreasing((x) => x * x, 2, 0) - Math.SQRT2)).toBeLessThanOrEqual(1e-12);
  });
});

describe("rinottH", () => {
  it("rinottH(2, 20, 0.95) lies within 0.001 of the printed 2.453", () => {
    // reference: for k = 2 Rinott's h equals Dudewicz and Dalal's h1 (given the variances, the
    // difference of the two means is normal in both); printed table of h1 for P* = 0.95, n0 = 20,
    // k = 2 in A. M. Law (2015), "Simulation Modeling and Analysis", 5th ed., table for section 10.4
    // (from memory; ours is 2.45247, so the printed value may be rounded up, as tables of such
    // constants often are to stay conservative; the check below by an independent integral is tighter)
    expect(Math.abs(rinottH(2, 20, 0.95).h - 2.453)).toBeLessThan(0.001);
  });

  it.each([[5, 0.95], [10, 0.95], [20, 0.9], [40, 0.99]])(
    "rinottH(2, %s, %s) solves P(T₁ − T₂ ≤ h) = P* for two independent t variables",
    (n0, pcs) => {
      // formula: at k = 2, Rinott's equation is P(Z·√(1/S₁² + 1/S₂²) ≤ h) = P*, the distribution of
      // T₁ − T₂ with T_i ~ t(n0 − 1) independent (Dudewicz and Dalal 1975). The left side is
      // computed independently as ∫ F_t(t + h) f_t(t) dt with jstat's t density and distribution
      // function, trapezoid rule on [−60, 60] with step 0.005.
      const nu = n0 - 1;
      const h = rinottH(2, n0, pcs).h;
      let sum = 0;
      const step = 0.005;
      for (let t = -60; t <= 60; t += step) sum += jstat.studentt.cdf(t + h, nu) * jstat.studentt.pdf(t, nu) * step;
      expect(Math.abs(sum - pcs)).toBeLessThanOrEqual(2e-5);
    },
  );

  it("rinottH for a large n0 approaches the known-variance value √2·Φ⁻¹(P*^(1/(k−1)))", () => {
    // formula: as n0 → ∞ both S → 1 and the equation becomes Φ(h/√2)^(k−1) = P* (Rinott 1978)
    for (const k of [2, 5, 10]) {
      const limit = Math.SQRT2 * jstat.normal.inv(0.95 ** (1 / (k - 1)), 0, 1);
      const h = rinottH(k, 100000, 0.95).h;
      expect(h).toBeGreaterThan(limit);
      expect((h - limit) / limit).toBeLessThanOrEqual(1e-4);
    }
  });

  it("rinottH grows with k and P* and shrinks as n0 grows", () => {
    // common practice: more scenarios or a higher P* need more runs; more first-stage runs estimate the variances better
    expect(rinottH(3, 10, 0.95).h).toBeGreaterThan(rinottH(2, 10, 0.95).h);
    expect(rinottH(2, 10, 0.99).h).toBeGreaterThan(rinottH(2, 10, 0.95).h);
    expect(rinottH(2, 20, 0.95).h).toBeLessThan(rinottH(2, 10, 0.95).h);
  });

  it("rinottH keeps its value to 1e-9 relative when the quadrature resolution doubles", () => {
    // common practice: a converged quadrature does not move when refined
    for (const [k, n0] of [[4, 10], [10, 20]]) {
      const { h } = rinottH(k, n0, 0.95);
      const fine = solveIncreasing((x) => rinottProbability(x, k, n0, { panels: 16, points: 20 }), 0.95, 0);
      expect(Math.abs(h - fine) / h).toBeLessThanOrEqual(1e-9);
    }
  });

  it("rinottH(4, 10, 0.95) gives the probability 0.95 by Monte Carlo, within a binomial band", () => {
    // formula: Rinott's equation read as a probability: given S_Y, the k − 1 events
    // Z_j ≤ h·S_j·S_Y/√(S_j² + S_Y²) are independent, so P(all k − 1) is the left side.
    // Monte Carlo with 40 000 seeded draws; band 3 standard errors (common practice).
    const k = 4;
    const n0 = 10;
    const { h } = rinottH(k, n0, 0.95);
    const z = normals(mulberry32(17));
    const draws = 40000;
    let hits = 0;
    for (let r = 0; r < draws; r++) {
      const sy = chiRatio(n0 - 1, z);
      let all = true;
      for (let j = 0; j < k - 1; j++) {
        const sx = chiRatio(n0 - 1, z);
        if (z() > (h * sx * sy) / Math.sqrt(sx * sx + sy * sy)) all = false;
      }
      if (all) hits++;
    }
    expect(Math.abs(hits / draws - 0.95)).toBeLessThanOrEqual(band(0.95, draws));
  });

  it("rinottH throws on k < 2, n0 < 2 and P* outside (1/k, 1)", () => {
    // common practice: programming errors are thrown
    for (const [k, n0, p] of [[1, 10, 0.95], [3, 1, 0.95], [3, 10, 0.3], [3, 10, 1], [2.5, 10, 0.95]]) {
      expect(() => rinottH(k, n0, p)).toThrow(Error);
    }
  });
});

describe("equicoordinateT", () => {
  // reference: C. W. Dunnett (1955), JASA 50, one-sided table of the many-to-one constant at 0.95
  // (from memory, 2 decimals), rows ν = 5, 10, 20, ∞, columns m = 1 … 9 comparisons
  const dunnett: [number, number[]][] = [
    [5, [2.02, 2.44, 2.68, 2.85, 2.98, 3.08, 3.16, 3.24, 3.3]],
    [10, [1.81, 2.15, 2.34, 2.47, 2.56, 2.64, 2.7, 2.76, 2.81]],
    [20, [1.72, 2.03, 2.19, 2.3, 2.39, 2.46, 2.51, 2.56, 2.6]],
    [Infinity, [1.64, 1.92, 2.06, 2.16, 2.23, 2.29, 2.34, 2.38, 2.42]],
  ];
  it.each(dunnett)("equicoordinateT(m, %s, 0.95) agrees with Dunnett's one-sided table to its 2 decimals", (nu, row) => {
    // table above; a printed 2-decimal entry is within 0.005 of the value (ν = 20, m = 1:
    // t(0.95, 20) = 1.7247 prints as 1.72 in that table, so truncation is allowed too)
    row.forEach((printed, i) => {
      const g = equicoordinateT(i + 1, nu, 0.95).value;
      expect(g - printed).toBeGreaterThan(-0.005);
      expect(g - printed).toBeLessThan(0.0075);
    });
  });

  it("equicoordinateProbability at g = 0 is 1/(m + 1) for every ν", () => {
    // formula: with correlation 1/2, P(all Z_i ≤ 0) = E[Φ(−Z₀)^m] = E[U^m] = 1/(m + 1), U uniform
    for (const m of [2, 4, 9]) for (const nu of [3, 30, Infinity]) {
      expect(Math.abs(equicoordinateProbability(0, m, nu) - 1 / (m + 1))).toBeLessThanOrEqual(1e-13);
    }
  });

  it("equicoordinateT with one coordinate is the t quantile, and the m = 1 integral agrees with it", () => {
    // formula: T₁ is Student's t with ν degrees of freedom
    expect(equicoordinateT(1, 12, 0.95).value).toBe(tQuantile(0.95, 12));
    expect(Math.abs(equicoordinateProbability(tQuantile(0.95, 12), 1, 12) - 0.95)).toBeLessThanOrEqual(1e-12);
  });

  it("equicoordinateT(3, 8, 0.9) gives the probability 0.9 by Monte Carlo, within a binomial band", () => {
    // formula: T_i = (Z₀ + W_i)/√2 / S has correlation 1/2; 40 000 seeded draws, 3 standard errors
    const { value: g } = equicoordinateT(3, 8, 0.9);
    const z = normals(mulberry32(5));
    const draws = 40000;
    let hits = 0;
    for (let r = 0; r < draws; r++) {
      const z0 = z();
      const s = chiRatio(8, z);
      let all = true;
      for (let i = 0; i < 3; i++) if ((z0 + z()) / Math.SQRT2 > g * s) all = false;
      if (all) hits++;
    }
    expect(Math.abs(hits / draws - 0.9)).toBeLessThanOrEqual(band(0.9, draws));
  });
});
