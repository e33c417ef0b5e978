/**
 * The per-pixel loops and small mask helpers of the rim/core classification (rimCore.ts), each in a
 * function of its own: V8 optimises each one as a whole (inside one long function every loop would
 * first run unoptimised, then be OSR-compiled and deoptimised again at the next unseen statement).
 */
import type { PixelBox } from '../image/geometry.js';
import { createMask, type Mask } from '../image/raster.js';
import { maskToMat, matToMask, morphDisc } from './cvutil.js';

/** Downsample the specimen mask to feature resolution by sampling at feature-pixel centres. */
export function maskAtScale(mask: Mask, fw: number, fh: number, s: number): Mask {
  const out = createMask(fw, fh);
  if (s === 1 && fw === mask.width && fh === mask.height) {
    out.data.set(mask.data); // every feature px centre is a mask px centre
    return out;
  }
  for (let v = 0; v < fh; v++) {
    const y = Math.min(mask.height - 1, Math.max(0, Math.round((v + 0.5) * s - 0.5)));
    for (let u = 0; u < fw; u++) {
      const x = Math.min(mask.width - 1, Math.max(0, Math.round((u + 0.5) * s - 0.5)));
      out.data[v * fw + u] = mask.data[y * mask.width + x];
    }
  }
  return out;
}

export function erodeMask(m: Mask, r: number): Mask {
  const mm = maskToMat(m);
  try {
    morphDisc(mm, 'erode', r);
    return matToMask(mm);
  } finally {
    mm.delete();
  }
}
export function dilateMask(m: Mask, r: number): Mask {
  const mm = maskToMat(m);
  try {
    morphDisc(mm, 'dilate', r);
    return matToMask(mm);
  } finally {
    mm.delete();
  }
}

/**
 * Mean and sample variance. The two sums are loops of their own, and {@link splitSums} has no branch
 * in its loop: optimised on the fly (on-stack replacement) while only one loop or one branch had run,
 * V8 dropped back to the interpreter at the other one on every call of the classification (seen with
 * `node --trace-deopt`: the same optimised code deoptimised ≈ 12 times per process). Same
 * additions in the same order as before.
 */
export function meanVar(vals: ArrayLike<number>): [number, number] {
  const n = vals.length;
  if (!n) return [NaN, NaN];
  const m = sumOf(vals) / n;
  return [m, sumSqDev(vals, m) / Math.max(1, n - 1)];
}

function sumOf(vals: ArrayLike<number>): number {
  let s = 0;
  for (let i = 0; i < vals.length; i++) s += vals[i];
  return s;
}

/** Σ (v − m)². */
function sumSqDev(vals: ArrayLike<number>, m: number): number {
  let q = 0;
  for (let i = 0; i < vals.length; i++) {
    const d = vals[i] - m;
    q += d * d;
  }
  return q;
}

/** Clamp of the per-feature robust z-score before combining (robust σ units). */
export const Z_CLAMP = 4;

/** Indices of the non-zero entries (the count and the fill are loops of their own: see {@link meanVar}). */
export function indicesOf(m: Uint8Array): Int32Array {
  const idx = new Int32Array(countSet(m));
  fillIndices(m, idx);
  return idx;
}

function countSet(m: Uint8Array): number {
  let c = 0;
  for (let i = 0; i < m.length; i++) c += m[i] !== 0 ? 1 : 0;
  return c;
}

function fillIndices(m: Uint8Array, idx: Int32Array): void {
  for (let i = 0, k = 0; i < m.length; i++) if (m[i]) idx[k++] = i;
}

/**
 * [Σ v > t, count v > t, Σ v ≤ t] (NaN goes to the last). Without branches (see {@link meanVar}):
 * adding 0 leaves a sum that started at +0 unchanged (it can never be −0), so the sums are those of
 * the branching form. The sums go to a small Float64Array: a returned array literal [sa, na, sb]
 * changed its elements kind between calls (a count, then doubles), and V8 threw the optimised loop
 * away at that store on nearly every call (≈ 70 deopts per process here and in rimCoreSectors.ts `radialSums`,
 * `--trace-deopt`). The count is an integer, exact in a double.
 */
export function splitSums(vals: Float32Array, t: number): Float64Array {
  const out = new Float64Array(3);
  splitSumsInto(vals, t, out);
  return out;
}

function splitSumsInto(vals: Float32Array, t: number, out: Float64Array): void {
  let sa = 0;
  let na = 0;
  let sb = 0;
  for (let k = 0; k < vals.length; k++) {
    const v = vals[k];
    const above = v > t;
    sa += above ? v : 0;
    na += above ? 1 : 0;
    sb += above ? 0 : v;
  }
  out[0] = sa;
  out[1] = na;
  out[2] = sb;
}

/** a[i] = 0 where b[i] = 0. */
export function andMask(a: Uint8Array, b: Uint8Array): void {
  for (let i = 0; i < a.length; i++) if (!b[i]) a[i] = 0;
}

/**
 * Core / rim sample values (transition zone left out) and the core / specimen pixel counts. The
 * buffers hold one value more than the interior: every value is stored at both write positions and
 * only the counts say which stores count (no branch in the loop, so V8 does not optimise it before
 * one of the branches has run and drop back to the interpreter when it does; `--trace-deopt`).
 * The same values in the same order as the branching form. Only the rows and columns of `box` (the
 * specimen mask's bounding box: spec is 0 outside it, so nothing there is counted or taken).
 */
export function splitClasses(
  spec: Uint8Array, core: Uint8Array, interior: Uint8Array, coreIn: Uint8Array, coreOut: Uint8Array,
  comb: Float32Array, cvBuf: Float32Array, rvBuf: Float32Array, width: number, box: PixelBox,
): [number, number, number, number] {
  let nCv = 0;
  let nRv = 0;
  let nCore = 0;
  let nSpec = 0;
  const { x0, y0, x1, y1 } = box;
  for (let y = y0; y <= y1; y++) {
    for (let i = y * width + x0, e = y * width + x1; i <= e; i++) {
      const s = spec[i] !== 0 ? 1 : 0;
      const inner = s & (interior[i] !== 0 ? 1 : 0);
      const isCv = inner & (coreIn[i] !== 0 ? 1 : 0);
      const isRv = inner & (1 - isCv) & (coreOut[i] !== 0 ? 0 : 1);
      nSpec += s;
      nCore += s & (core[i] !== 0 ? 1 : 0);
      const v = comb[i];
      cvBuf[nCv] = v;
      rvBuf[nRv] = v;
      nCv += isCv;
      nRv += isRv;
    }
  }
  return [nCv, nRv, nCore, nSpec];
}

/** Normalised histogram of v over [lo, hi] into h (bins clamped at both ends). */
export function histogramInto(v: Float32Array, lo: number, hi: number, h: Float64Array): void {
  const nb = h.length;
  for (let k = 0; k < v.length; k++) {
    const b = Math.min(nb - 1, Math.max(0, Math.floor(((v[k] - lo) / (hi - lo || 1)) * nb)));
    h[b] += 1 / v.length;
  }
}

/** out[k] = src[idx[k]]. */
export function gather(src: Float32Array, idx: Int32Array, out: Float32Array): void {
  for (let k = 0; k < idx.length; k++) out[k] = src[idx[k]];
}

/** a[i] −= p·b[i]. */
export function subtractScaled(a: Float32Array, p: number, b: Float64Array): void {
  for (let i = 0; i < a.length; i++) a[i] -= p * b[i];
}

/** comb[i] += clamp((lg[i] − med)/spread, ±Z_CLAMP)/nF. */
export function addClampedZ(lg: Float32Array, med: number, spread: number, nF: number, comb: Float32Array): void {
  for (let i = 0; i < lg.length; i++) {
    const z = (lg[i] - med) / spread;
    comb[i] += (z < -Z_CLAMP ? -Z_CLAMP : z > Z_CLAMP ? Z_CLAMP : z) / nF;
  }
}

