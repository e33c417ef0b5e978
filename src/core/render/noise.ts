/**
 * Noise kernels for the renderer (hot loops; plain typed arrays, no closures per pixel).
 * - Gradient noise: Perlin, "Improving noise", ACM TOG 21(3) 2002 (quintic fade), here with
 *   per-lattice random unit gradients from a seeded table instead of Perlin's 12 fixed ones.
 * - Cellular noise F1 (distance to the nearest jittered feature point): Worley, "A cellular texture
 *   basis function", SIGGRAPH 1996.
 */
import type { Rng } from '../random.js';

const N = 256;
const MASK = 255;

/** Lattice tables for one noise layer. */
export interface NoiseTable {
  /** permutation, doubled (length 512) */
  readonly perm: Uint16Array;
  /** gradient x / y per hash (unit vectors) */
  readonly gx: Float32Array;
  readonly gy: Float32Array;
  /** feature-point jitter per hash, 0..1 */
  readonly jx: Float32Array;
  readonly jy: Float32Array;
}

/** Build one seeded noise table. */
export function makeNoiseTable(rng: Rng): NoiseTable {
  const p = new Uint16Array(2 * N);
  for (let i = 0; i < N; i++) p[i] = i;
  for (let i = N - 1; i > 0; i--) {
    const j = rng.int(i + 1);
    const t = p[i];
    p[i] = p[j];
    p[j] = t;
  }
  for (let i = 0; i < N; i++) p[N + i] = p[i];
  const gx = new Float32Array(N);
  const gy = new Float32Array(N);
  const jx = new Float32Array(N);
  const jy = new Float32Array(N);
  for (let i = 0; i < N; i++) {
    const a = rng.nextFloat() * 2 * Math.PI;
    gx[i] = Math.cos(a);
    gy[i] = Math.sin(a);
    jx[i] = 0.1 + 0.8 * rng.nextFloat();
    jy[i] = 0.1 + 0.8 * rng.nextFloat();
  }
  return { perm: p, gx, gy, jx, jy };
}

/**
 * 2-D gradient noise at (x, y) in lattice units; result roughly in −0.7..0.7, zero at lattice points.
 */
export function gradientNoise(t: NoiseTable, x: number, y: number): number {
  const xf = Math.floor(x);
  const yf = Math.floor(y);
  const fx = x - xf;
  const fy = y - yf;
  const xi = xf & MASK;
  const yi = yf & MASK;
  const p = t.perm;
  const h00 = p[p[xi] + yi];
  const h10 = p[p[xi + 1] + yi];
  const h01 = p[p[xi] + yi + 1];
  const h11 = p[p[xi + 1] + yi + 1];
  const gx = t.gx;
  const gy = t.gy;
  const n00 = gx[h00] * fx + gy[h00] * fy;
  const n10 = gx[h10] * (fx - 1) + gy[h10] * fy;
  const n01 = gx[h01] * fx + gy[h01] * (fy - 1);
  const n11 = gx[h11] * (fx - 1) + gy[h11] * (fy - 1);
  const u = fx * fx * fx * (fx * (fx * 6 - 15) + 10);
  const v = fy * fy * fy * (fy * (fy * 6 - 15) + 10);
  const a = n00 + u * (n10 - n00);
  const b = n01 + u * (n11 - n01);
  return a + v * (b - a);
}

/**
 * Fractal sum of gradient noise ("fBm"): Σ gain^k · noise(2^k · p), octave k rotated by a fixed
 * irrational angle to hide lattice alignment. Octaves are dropped once their wavelength falls below
 * `minWavelength` (same unit as x, y) — finer detail would only alias at the pixel size.
 * @param x,y position in units of the base wavelength... (pass x/λ, y/λ)
 * @param octaves maximum number of octaves
 * @param gain amplitude ratio between octaves (0.5 ≈ fractal dimension 2.5 surface)
 * @param minWavelength smallest wavelength kept, in base-wavelength units
 */
export function fbm(t: NoiseTable, x: number, y: number, octaves: number, gain: number, minWavelength: number): number {
  let sum = 0;
  let amp = 1;
  let f = 1;
  let px = x;
  let py = y;
  const c = 0.8775825618903728; // cos 0.5 rad
  const s = 0.479425538604203; // sin 0.5 rad
  for (let k = 0; k < octaves; k++) {
    if (1 / f < minWavelength) break;
    sum += amp * gradientNoise(t, px + k * 17.13, py - k * 9.71);
    const nx = (c * px - s * py) * 2;
    const ny = (s * px + c * py) * 2;
    px = nx;
    py = ny;
    amp *= gain;
    f *= 2;
  }
  return sum;
}

/**
 * Cellular noise F1: distance from (x, y) to the nearest feature point (one jittered point per unit
 * cell), in cell units (0 at a point, up to about 0.9 at cell corners).
 */
export function cellF1(t: NoiseTable, x: number, y: number): number {
  const xf = Math.floor(x);
  const yf = Math.floor(y);
  const p = t.perm;
  let best = 1e9;
  for (let j = -1; j <= 1; j++) {
    const cy = yf + j;
    const cyi = cy & MASK;
    for (let i = -1; i <= 1; i++) {
      const cx = xf + i;
      const h = p[p[cx & MASK] + cyi];
      const dx = cx + t.jx[h] - x;
      const dy = cy + t.jy[h] - y;
      const d = dx * dx + dy * dy;
      if (d < best) best = d;
    }
  }
  return Math.sqrt(best);
}

/**
 * The lattice hash (0..255) of the cell whose jittered feature point is nearest to (x, y) (the cell of
 * a Worley pattern, Worley 1996): a stable random label per cell, e.g. for flat facets.
 */
export function cellNearest(t: NoiseTable, x: number, y: number): number {
  const xf = Math.floor(x);
  const yf = Math.floor(y);
  const p = t.perm;
  let best = 1e9;
  let bestH = 0;
  for (let j = -1; j <= 1; j++) {
    const cy = yf + j;
    const cyi = cy & MASK;
    for (let i = -1; i <= 1; i++) {
      const cx = xf + i;
      const h = p[p[cx & MASK] + cyi];
      const dx = cx + t.jx[h] - x;
      const dy = cy + t.jy[h] - y;
      const d = dx * dx + dy * dy;
      if (d < best) {
        best = d;
        bestH = h;
      }
    }
  }
  return bestH;
}
