/**
 * Small seeded pseudo-random number generator for the measurement statistics (bootstrap).
 * Core code never uses Math.random: results must be reproducible from a seed.
 */

/**
 * Create a seeded uniform generator on [0, 1) (mulberry32, a 32-bit state mixer; public-domain
 * algorithm by Tommy Ettinger). Same seed → same sequence on every platform.
 *
 * @param seed - any integer (taken modulo 2³²)
 * @returns a function returning the next uniform number in [0, 1)
 */
export function seededUniform(seed: number): () => number {
  let a = (Math.trunc(seed) >>> 0) || 0x9e3779b9;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}
