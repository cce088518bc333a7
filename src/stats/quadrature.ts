/**
 * Quadrature rules for the integrals behind the selection constants (Rinott's h and the
 * equicoordinate points of `equicoordinate.ts`): Gauss–Legendre nodes, and grids that integrate
 * against the distribution of a chi-square variable's square root or of a standard normal.
 */

/** Nodes and weights of a rule: Σ weights[i]·f(nodes[i]) approximates an integral or an expectation. */
export interface Rule {
  nodes: Float64Array;
  weights: Float64Array;
}

/**
 * The n-point Gauss–Legendre rule on [−1, 1]: the nodes are the roots of the Legendre polynomial
 * P_n, found by Newton's method from the starting values cos(π(i − 1/4)/(n + 1/2)), with P_n and
 * its derivative from the three-term recurrence (j + 1)P_{j+1} = (2j + 1)xP_j − jP_{j−1};
 * weights 2 / ((1 − x²) P_n′(x)²). Exact for polynomials of degree up to 2n − 1.
 *
 * Reference: G. H. Golub and J. H. Welsch (1969), "Calculation of Gauss Quadrature Rules",
 * Mathematics of Computation 23(106), 221–230 (the rule); the Newton iteration and starting
 * values are those of W. H. Press et al. (2007), "Numerical Recipes", 3rd ed., section 4.6.
 *
 * Example: `gaussLegendre(2)` has nodes ∓1/√3 (∓0.5773502691896257) and weights 1, 1.
 */
export function gaussLegendre(n: number): Rule {
  if (!(Number.isInteger(n) && n >= 1)) throw new Error(`gaussLegendre: n must be a positive integer, got ${n}`);
  const nodes = new Float64Array(n);
  const weights = new Float64Array(n);
  for (let i = 0; i < Math.ceil(n / 2); i++) {
    let x = Math.cos((Math.PI * (i + 0.75)) / (n + 0.5));
    let derivative = 0;
    for (let iteration = 0; iteration < 100; iteration++) {
      let p0 = 1;
      let p1 = x;
      for (let j = 1; j < n; j++) {
        const p2 = ((2 * j + 1) * x * p1 - j * p0) / (j + 1);
        p0 = p1;
        p1 = p2;
      }
      // p1 = P_n(x), p0 = P_{n−1}(x) (for n = 1 the loop is skipped: P_1 = x, P_0 = 1).
      derivative = (n * (x * p1 - p0)) / (x * x - 1);
      const step = p1 / derivative;
      x -= step;
      if (Math.abs(step) <= 1e-16) break;
    }
    nodes[i] = -x;
    nodes[n - 1 - i] = x;
    weights[i] = weights[n - 1 - i] = 2 / ((1 - x * x) * derivative * derivative);
  }
  if (n % 2 === 1) nodes[(n - 1) / 2] = 0;
  return { nodes, weights };
}

/** The composite rule: `panels` equal pieces of [a, b], each with the `points`-point Gauss–Legendre rule. */
export function compositeLegendre(a: number, b: number, panels: number, points: number): Rule {
  const base = gaussLegendre(points);
  const nodes = new Float64Array(panels * points);
  const weights = new Float64Array(panels * points);
  const width = (b - a) / panels;
  for (let p = 0; p < panels; p++) {
    const mid = a + (p + 0.5) * width;
    for (let i = 0; i < points; i++) {
      nodes[p * points + i] = mid + 0.5 * width * base.nodes[i];
      weights[p * points + i] = 0.5 * width * base.weights[i];
    }
  }
  return { nodes, weights };
}

/** How finely the selection constants integrate: panels and points per panel of each grid. */
export interface Resolution {
  panels: number;
  points: number;
}

/** The default resolution: 8 panels of 20 points (160 nodes per dimension). */
export const DEFAULT_RESOLUTION: Resolution = { panels: 8, points: 20 };

/**
 * A rule for expectations over S = √(χ²_ν / ν), the ratio of a sample standard deviation with ν
 * degrees of freedom to the true one: E[g(S)] ≈ Σ weights[i]·g(nodes[i]).
 *
 * With U = χ²_ν/2 ~ Gamma(ν/2, 1) and T = √U, T has density proportional to t^{ν−1}·e^{−t²}, a
 * smooth function (unlike the chi-square density itself near 0 for ν = 1, or the square roots the
 * selection integrands take of it). The composite Gauss–Legendre rule covers
 * T ∈ [√max(0, a − 12√a), √(a + 12√a + 30)], a = ν/2, which leaves out a probability below
 * 1e-13 on either side; the weights are the rule's weights times the density, normalized to sum
 * to 1 (so no gamma function is needed, and the rule integrates a constant exactly). The nodes
 * are returned as S = T·√(2/ν).
 *
 * Example: `chiRatioRule(10)` gives weights summing to 1 and Σ w·s² = 1 (E[χ²_ν/ν] = 1) to about 1e-15.
 */
export function chiRatioRule(nu: number, resolution: Resolution = DEFAULT_RESOLUTION): Rule {
  if (!(nu > 0 && Number.isFinite(nu))) throw new Error(`chiRatioRule: nu must be a finite number greater than 0, got ${nu}`);
  const a = nu / 2;
  const lo = Math.sqrt(Math.max(0, a - 12 * Math.sqrt(a)));
  const hi = Math.sqrt(a + 12 * Math.sqrt(a) + 30);
  const rule = compositeLegendre(lo, hi, resolution.panels, resolution.points);
  const logDensity = Array.from(rule.nodes, (t) => (nu - 1) * Math.log(t) - t * t);
  const top = Math.max(...logDensity);
  let total = 0;
  for (let i = 0; i < rule.nodes.length; i++) {
    rule.weights[i] *= Math.exp(logDensity[i] - top);
    total += rule.weights[i];
  }
  const scale = Math.sqrt(2 / nu);
  for (let i = 0; i < rule.nodes.length; i++) {
    rule.weights[i] /= total;
    rule.nodes[i] *= scale;
  }
  return rule;
}

/**
 * A rule for expectations over a standard normal Z: the composite Gauss–Legendre rule on
 * [−8.5, 8.5] (probability 2e-17 left out) with weights times φ(z), normalized to sum to 1.
 *
 * Example: `normalRule()` gives Σ w·z² = 1 (the variance) to about 1e-15.
 */
export function normalRule(resolution: Resolution = DEFAULT_RESOLUTION): Rule {
  const rule = compositeLegendre(-8.5, 8.5, resolution.panels, resolution.points);
  let total = 0;
  for (let i = 0; i < rule.nodes.length; i++) {
    const z = rule.nodes[i];
    rule.weights[i] *= Math.exp(-0.5 * z * z);
    total += rule.weights[i];
  }
  for (let i = 0; i < rule.nodes.length; i++) rule.weights[i] /= total;
  return rule;
}

/**
 * The x in [lo, ∞) with f(x) = target, for f continuous and increasing with f(lo) < target: the
 * bracket [lo, hi] is widened (hi doubled from lo + 1) until f(hi) ≥ target, then narrowed by the
 * Illinois variant of regula falsi, with a bisection step whenever the secant point would fall
 * too near an end, until the bracket is narrower than `tolerance`·max(1, |x|).
 *
 * Reference: M. Dowell and P. Jarratt (1971), "A modified regula falsi method for computing the
 * root of an equation", BIT 11, 168–174 (the Illinois method).
 *
 * Example: `solveIncreasing((x) => x * x, 2, 0)` gives √2 to about 1e-13.
 */
export function solveIncreasing(f: (x: number) => number, target: number, lo: number, tolerance = 1e-13): number {
  let a = lo;
  let fa = f(a) - target;
  if (!(fa < 0)) throw new Error(`solveIncreasing: f(lo) must lie below the target`);
  let b = lo + 1;
  let fb = f(b) - target;
  for (let i = 0; fb < 0; i++) {
    if (i > 60) throw new Error(`solveIncreasing: no bracket found up to ${b}`);
    a = b;
    fa = fb;
    b = lo + 2 * (b - lo);
    fb = f(b) - target;
  }
  let side = 0;
  for (let i = 0; i < 200 && b - a > tolerance * Math.max(1, Math.abs(b)); i++) {
    let x = b - (fb * (b - a)) / (fb - fa);
    const width = b - a;
    if (!(x > a + 0.01 * width && x < b - 0.01 * width)) x = 0.5 * (a + b);
    const fx = f(x) - target;
    if (fx === 0) return x;
    if (fx < 0) {
      a = x;
      fa = fx;
      if (side === -1) fb /= 2;
      side = -1;
    } else {
      b = x;
      fb = fx;
      if (side === 1) fa /= 2;
      side = 1;
    }
  }
  return 0.5 * (a + b);
}
