/**
 * Seeded pseudo-random numbers for the whole engine (never Math.random): one interface, two
 * generators, each with a fixed stream.
 *
 * - `mulberry32` (Tommy Ettinger, 2017, public domain; a 32-bit state, full period 2^32): the
 *   default. Used by the bootstrap and the Monte Carlo of the critical distance; its stream is a
 *   published contract — changing it would change published results.
 * - `sfc32` ("small fast counting" generator by Chris Doty-Humphrey, from the PractRand suite, public
 *   domain; 128-bit state), seeded through splitmix32 so nearby seeds give unrelated streams. Used by
 *   the fractograph renderer; its stream decides the bytes of the committed sample images.
 *
 * Neither is cryptographic. Both give the same stream bit for bit on every JavaScript engine because
 * they use only 32-bit integer maths (`Math.imul`, `>>>`). Normal variates use the Box–Muller
 * transform (Box & Muller, Ann. Math. Statist. 29, 1958), both outputs of each pair are used (each
 * generator keeps its own, fixed, way of drawing the two uniforms).
 *
 * Fixed stream contract: for a given seed and algorithm, every method returns the same sequence in
 * every release. `fork(label)` derives an independent sub-stream (it consumes one draw of the parent).
 */

/** The generator behind a stream. */
export type RngAlgorithm = 'mulberry32' | 'sfc32';

/** A seeded random stream. */
export interface Rng {
  /** The generator of this stream. */
  readonly algorithm: RngAlgorithm;
  /** The 32-bit seed this stream started from (unsigned). */
  readonly seed: number;
  /** Uniform float in [0, 1) with 32-bit resolution. */
  nextFloat(): number;
  /** Uniform float in [lo, hi). */
  uniform(lo: number, hi: number): number;
  /** Whole number in [0, n) (n > 0). */
  int(n: number): number;
  /** Standard normal variate N(0, 1) (Box–Muller). */
  normal(): number;
  /** A new independent stream of the same algorithm derived from this one and a label. */
  fork(label: string): Rng;
}

/** FNV-1a 32-bit hash of a label (Fowler, Noll, Vo; public domain), for forked sub-streams. */
function hashLabel(label: string): number {
  let h = 0x811c9dc5;
  for (let i = 0; i < label.length; i++) {
    h ^= label.charCodeAt(i);
    h = Math.imul(h, 0x01000193) >>> 0;
  }
  return h >>> 0;
}

/** splitmix32 (a 32-bit variant of Steele, Lea & Flood's SplitMix, OOPSLA 2014) as a seed expander. */
function splitmix32(state: number): () => number {
  let s = state >>> 0;
  return () => {
    s = (s + 0x9e3779b9) >>> 0;
    let z = s;
    z = Math.imul(z ^ (z >>> 16), 0x85ebca6b) >>> 0;
    z = Math.imul(z ^ (z >>> 13), 0xc2b2ae35) >>> 0;
    return (z ^ (z >>> 16)) >>> 0;
  };
}

/**
 * Standard normal variates by the Box–Muller transform, both outputs of each pair used (the sine one
 * is kept for the next call): r = √(−2 ln u₁), θ = 2π u₂, z₀ = r cos θ, z₁ = r sin θ.
 * @param radial draws u₁ in (0, 1] (first), @param angular draws u₂ in [0, 1) (second)
 */
function boxMuller(radial: () => number, angular: () => number): () => number {
  let spare: number | null = null;
  return () => {
    if (spare !== null) {
      const s = spare;
      spare = null;
      return s;
    }
    const rad = Math.sqrt(-2 * Math.log(radial()));
    const t = 2 * Math.PI * angular();
    spare = rad * Math.sin(t);
    return rad * Math.cos(t);
  };
}

function mulberry32(seed: number): Rng {
  if (!Number.isFinite(seed)) throw new RangeError('seed must be a finite number');
  const seed32 = Math.trunc(seed) >>> 0;
  let state = seed32;
  const nextFloat = (): number => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  return {
    algorithm: 'mulberry32',
    seed: seed32,
    nextFloat,
    uniform: (lo, hi) => lo + (hi - lo) * nextFloat(),
    int: (n) => Math.floor(nextFloat() * n),
    // u1 in (0, 1] so that log(u1) is finite
    normal: boxMuller(() => 1 - nextFloat(), nextFloat),
    fork: (label) => mulberry32((Math.floor(nextFloat() * 4294967296) ^ hashLabel(label)) >>> 0),
  };
}

function sfc32(seed: number): Rng {
  if (!Number.isFinite(seed)) throw new RangeError('seed must be a finite number');
  // the 32-bit integer part, with the fraction mixed in
  const base = (Math.floor(seed) ^ Math.floor((seed - Math.floor(seed)) * 4294967296)) >>> 0;
  const sm = splitmix32(base);
  let a = sm();
  let b = sm();
  let c = sm();
  let d = sm();
  const u32 = (): number => {
    const t = (((a + b) >>> 0) + d) >>> 0;
    d = (d + 1) >>> 0;
    a = b ^ (b >>> 9);
    b = (c + (c << 3)) >>> 0;
    c = ((c << 21) | (c >>> 11)) >>> 0;
    c = (c + t) >>> 0;
    return t;
  };
  for (let i = 0; i < 12; i++) u32();
  const nextFloat = (): number => u32() / 4294967296;
  return {
    algorithm: 'sfc32',
    seed: base,
    nextFloat,
    uniform: (lo, hi) => lo + (hi - lo) * nextFloat(),
    int: (n) => Math.floor(nextFloat() * n),
    normal: boxMuller(() => {
      let u = nextFloat();
      while (u <= 1e-300) u = nextFloat();
      return u;
    }, nextFloat),
    fork: (label) => sfc32((u32() ^ hashLabel(label)) >>> 0),
  };
}

/**
 * Create a seeded stream.
 * @param seed any finite number. mulberry32 uses `trunc(seed) >>> 0`; sfc32 uses the 32-bit integer
 *   part with the fraction mixed in.
 * @param algorithm `'mulberry32'` (default: bootstrap, Monte Carlo) or `'sfc32'` (renderer)
 * @returns a stateful {@link Rng}; two streams with the same seed and algorithm give identical sequences.
 * @throws RangeError for a non-finite seed.
 */
export function createRng(seed: number, algorithm: RngAlgorithm = 'mulberry32'): Rng {
  return algorithm === 'sfc32' ? sfc32(seed) : mulberry32(seed);
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
