/**
 * A small seeded pseudo-random generator for the invented demo data: mulberry32 (Tommy Ettinger,
 * public domain), 32-bit state, period 2^32. Good enough for examples and tests; not for
 * cryptography. The same seed gives the same stream on every machine.
 */
export class Random {
  private state: number;
  constructor(seed: number) {
    this.state = seed >>> 0;
  }

  /** Uniform on [0, 1). */
  next(): number {
    let t = (this.state = (this.state + 0x6d2b79f5) >>> 0);
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  }

  /** Exponential with the given rate (mean 1 / rate), by inversion. */
  exponential(rate: number): number {
    return -Math.log(1 - this.next()) / rate;
  }
}

/** The generator as a function giving uniform numbers on [0, 1). */
export function uniform(seed: number): () => number {
  const r = new Random(seed);
  return () => r.next();
}
