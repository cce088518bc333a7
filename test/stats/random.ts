/**
 * Seeded random numbers for the tests: mulberry32 (a 32-bit generator by Tommy Ettinger, public
 * domain) and standard normals by the Box–Muller transform (Box and Muller 1958, "A Note on the
 * Generation of Random Normal Deviates", Annals of Mathematical Statistics 29(2), 610–611).
 */
import { uniform as demoUniform } from "../../src/demo/random.js";

/** Uniform numbers in [0, 1) from a 32-bit seed (the demo generator's mulberry32). */
export const mulberry32 = demoUniform;

/** Standard normal numbers (mean 0, sd 1) from a uniform source, two per Box–Muller pair. */
export function normals(uniform: () => number): () => number {
  let spare: number | null = null;
  return () => {
    if (spare !== null) {
      const z = spare;
      spare = null;
      return z;
    }
    const u = 1 - uniform(); // in (0, 1]: log(u) is finite
    const v = uniform();
    const r = Math.sqrt(-2 * Math.log(u));
    spare = r * Math.sin(2 * Math.PI * v);
    return r * Math.cos(2 * Math.PI * v);
  };
}

/** A shuffled copy (Fisher–Yates). */
export function shuffled<T>(values: readonly T[], uniform: () => number): T[] {
  const out = values.slice();
  for (let i = out.length - 1; i > 0; i--) {
    const j = Math.floor(uniform() * (i + 1));
    [out[i], out[j]] = [out[j], out[i]];
  }
  return out;
}

/** Numbers of widely mixed magnitudes and signs (10^-12 … 10^12), for summation tests. */
export function mixedMagnitudes(count: number, uniform: () => number): number[] {
  return Array.from({ length: count }, () => {
    const sign = uniform() < 0.5 ? -1 : 1;
    return sign * uniform() * 10 ** Math.floor(uniform() * 25 - 12);
  });
}
