/**
 * Small seeded pseudo-random numbers for the whole engine (never Math.random).
 *
 * Generator: mulberry32 (Tommy Ettinger, 2017, public domain; a 32-bit state, full period 2^32).
 * It is not cryptographic and not meant for huge simulations, but it is tiny, fast and gives the
 * same stream bit for bit on every JavaScript engine because it uses only 32-bit integer maths
 * (`Math.imul`, `>>>`). Normal variates use the Box–Muller transform (Box & Muller, Ann. Math.
 * Statist. 29, 1958), both outputs of each pair are used.
 *
 * Fixed stream contract: for a given seed, `nextFloat()` returns the same sequence in every release.
 * Changing the algorithm would change published Monte Carlo results and is a breaking change.
 */

/** A seeded random stream. */
export interface Rng {
  /** The seed this stream started from (unsigned 32-bit). */
  readonly seed: number;
  /** Uniform float in [0, 1) with 32-bit resolution. */
  nextFloat(): number;
  /** Uniform float in [lo, hi). */
  uniform(lo: number, hi: number): number;
  /** Standard normal variate N(0, 1) (Box–Muller). */
  normal(): number;
}

/**
 * Create a mulberry32 stream.
 * @param seed any finite number; it is reduced to an unsigned 32-bit integer (`seed >>> 0`).
 * @returns a stateful {@link Rng}; two streams with the same seed give identical sequences.
 */
export function createRng(seed: number): Rng {
  if (!Number.isFinite(seed)) throw new RangeError('seed must be a finite number');
  const seed32 = Math.trunc(seed) >>> 0;
  let state = seed32;
  let spare: number | null = null;
  const nextFloat = (): number => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  return {
    seed: seed32,
    nextFloat,
    uniform: (lo, hi) => lo + (hi - lo) * nextFloat(),
    normal: () => {
      if (spare !== null) {
        const s = spare;
        spare = null;
        return s;
      }
      // u1 in (0, 1] so that log(u1) is finite
      const u1 = 1 - nextFloat();
      const u2 = nextFloat();
      const rad = Math.sqrt(-2 * Math.log(u1));
      spare = rad * Math.sin(2 * Math.PI * u2);
      return rad * Math.cos(2 * Math.PI * u2);
    },
  };
}

/**
 * Percentile of an ascending-sorted array with linear interpolation between order statistics
 * (Hyndman & Fan 1996 definition 7, the default of R `quantile` and NumPy `percentile`).
 * @param sorted values sorted ascending (not checked), at least one element
 * @param p percentile in [0, 100]
 */
export function percentileSorted(sorted: ArrayLike<number>, p: number): number {
  const n = sorted.length;
  if (n === 0) throw new RangeError('percentile of an empty array');
  if (!(p >= 0 && p <= 100)) throw new RangeError('percentile must be in [0, 100]');
  const h = (n - 1) * (p / 100);
  const lo = Math.floor(h);
  const hi = Math.min(n - 1, lo + 1);
  return sorted[lo] + (h - lo) * (sorted[hi] - sorted[lo]);
}
