/**
 * Small seeded pseudo-random generator for the renderer (no Math.random anywhere in core).
 * sfc32 ("small fast counting" generator) by Chris Doty-Humphrey, from the PractRand suite
 * (public domain); seeds are expanded with splitmix32 so nearby seeds give unrelated streams.
 */

/** A seeded random stream: `next()` is uniform in [0, 1), `normal()` is standard normal. */
export interface Rng {
  /** Uniform in [0, 1). */
  next(): number;
  /** Uniform in [lo, hi). */
  range(lo: number, hi: number): number;
  /** Integer in [0, n). */
  int(n: number): number;
  /** Standard normal deviate (Box–Muller, Box & Muller 1958). */
  normal(): number;
  /** A new independent stream derived from this one and a label (for stable sub-streams). */
  fork(label: string): Rng;
}

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

function hashLabel(label: string): number {
  // FNV-1a 32-bit
  let h = 0x811c9dc5;
  for (let i = 0; i < label.length; i++) {
    h ^= label.charCodeAt(i);
    h = Math.imul(h, 0x01000193) >>> 0;
  }
  return h >>> 0;
}

/**
 * Create a seeded generator.
 * @param seed any finite number (its 32-bit integer part is used; the fraction is mixed in too)
 * @returns a deterministic stream: the same seed gives the same numbers on every platform.
 */
export function createRng(seed: number): Rng {
  const base = (Math.floor(seed) ^ Math.floor((seed - Math.floor(seed)) * 4294967296)) >>> 0;
  const sm = splitmix32(base);
  let a = sm();
  let b = sm();
  let c = sm();
  let d = sm();
  let spare: number | null = null;
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
  const next = (): number => u32() / 4294967296;
  const rng: Rng = {
    next,
    range: (lo, hi) => lo + (hi - lo) * next(),
    int: (n) => Math.floor(next() * n),
    normal: () => {
      if (spare !== null) {
        const s = spare;
        spare = null;
        return s;
      }
      let u = next();
      while (u <= 1e-300) u = next();
      const v = next();
      const m = Math.sqrt(-2 * Math.log(u));
      spare = m * Math.sin(2 * Math.PI * v);
      return m * Math.cos(2 * Math.PI * v);
    },
    fork: (label) => createRng((u32() ^ hashLabel(label)) >>> 0),
  };
  return rng;
}
