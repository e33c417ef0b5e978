/**
 * Fused one-pass box mean / variance / standard deviation (hand-written: OpenCV has no single
 * call for a local variance, and going through two `boxFilter` calls costs two copies into and
 * out of the WebAssembly heap plus a squared image; this kernel reads the raster in place).
 *
 * Column sums of x and x² over the vertical window are slid down the image (add the entering
 * row, subtract the leaving one); along each row a horizontal running sum over the column sums
 * gives the window sums. Sums are Float64; drift over a 4000-row image stays below 1e-12.
 * The vertical update of a column is fused into the horizontal pass (column x + r is updated
 * just before it enters the window), and each row is split into a left border part, an interior
 * part with direct indices and a right border part, each loop in a small function (V8 optimises
 * small functions early). Operation order per value is unchanged, so the result is identical to
 * the unfused two-pass form.
 * Variance and standard deviation rows run in WebAssembly where available (boxMoments.wat,
 * boxMomentsWasm.ts: the same operations, the vertical update two columns at a time with SIMD;
 * identical output); the JavaScript rows below are the fallback and the reference.
 * Border: reflect-101 (… 2 1 | 0 1 2 …, OpenCV `BORDER_REFLECT_101`, SciPy mode `'mirror'`),
 * valid for 2r + 1 ≤ min(width, height) (checked by the callers).
 */

import { prepareBoxWasm } from './boxMomentsWasm.js';

/** What {@link boxMomentsKernel} writes. */
export const Moment = { Mean: 0, Variance: 1, Std: 2 } as const;
/** One of {@link Moment}. */
export type Moment = (typeof Moment)[keyof typeof Moment];

function reflect101(i: number, n: number): number {
  if (n === 1) return 0;
  let k = i;
  while (k < 0 || k >= n) k = k < 0 ? -k : 2 * (n - 1) - k;
  return k;
}

/**
 * @param src raster data, row-major
 * @param width image width (px)
 * @param height image height (px)
 * @param r half window (px), window side 2r + 1
 * @param what mean, variance (max(0, E[x²] − E[x]²)) or standard deviation
 * @param out output (length width·height), may not alias `src`
 * @returns false when `src` holds a NaN or infinite value (a column sum that ever turns
 *   non-finite stays non-finite, and every row enters the column sums), true otherwise
 */
export function boxMomentsKernel(
  src: Float32Array,
  width: number,
  height: number,
  r: number,
  what: Moment,
  out: Float32Array,
): boolean {
  const W = width;
  const H = height;
  const inv = 1 / ((2 * r + 1) * (2 * r + 1));
  const colS = new Float64Array(W);
  const colQ = new Float64Array(W);
  for (let k = -r; k <= r; k++) initCols(src, reflect101(k, H) * W, colS, colQ, W);
  const wk = what === Moment.Mean ? null : prepareBoxWasm(colS, colQ);
  if (wk) {
    const sq = what === Moment.Std ? 1 : 0;
    for (let y = 0; y < H; y++) {
      const rin = y > 0 ? reflect101(y + r, H) * W : 0;
      const rout = y > 0 ? reflect101(y - r - 1, H) * W : 0;
      wk.rowIn.set(src.subarray(rin, rin + W));
      wk.rowLeave.set(src.subarray(rout, rout + W));
      wk.varRow(wk.colOff, wk.inOff, wk.leaveOff, wk.outOff, W, r, inv, sq);
      out.set(wk.rowOut, y * W);
    }
    const c = wk.cols;
    for (let i = 0; i < c.length; i += 2) if (!Number.isFinite(c[i] + c[i + 1])) return false;
    return true;
  } else {
    for (let y = 0; y < H; y++) {
      // row 0: the column sums already hold the first window; entering = leaving row adds 0
      const rin = y > 0 ? reflect101(y + r, H) * W : 0;
      const rout = y > 0 ? reflect101(y - r - 1, H) * W : 0;
      if (what === Moment.Mean) meanRow(src, rin, rout, colS, out, y * W, W, r, inv);
      else varRow(src, rin, rout, colS, colQ, out, y * W, W, r, inv, what === Moment.Std);
    }
  }
  for (let x = 0; x < W; x++) if (!Number.isFinite(colS[x] + colQ[x])) return false;
  return true;
}

/** Adds one source row to the column sums. */
function initCols(src: Float32Array, row: number, colS: Float64Array, colQ: Float64Array, W: number): void {
  for (let x = 0; x < W; x++) {
    const v = src[row + x];
    colS[x] += v;
    colQ[x] += v * v;
  }
}

/**
 * One output row: the vertical update of column x + r is fused into the horizontal running sum
 * (column j is updated just before it first enters the window, and never again in this row).
 */
function varRow(
  src: Float32Array,
  rin: number,
  rout: number,
  colS: Float64Array,
  colQ: Float64Array,
  out: Float32Array,
  o: number,
  W: number,
  r: number,
  inv: number,
  sq: boolean,
): void {
  // columns 0..r hold every column the first window touches (reflect-101, 2r + 1 ≤ W)
  for (let x = 0; x <= r; x++) {
    const a = src[rin + x];
    const b = src[rout + x];
    colS[x] += a - b;
    colQ[x] += a * a - b * b;
  }
  // reflect101(-k) = k, summed in the order of k = -r..r as before
  let s = 0;
  let q = 0;
  for (let k = -r; k <= r; k++) {
    const j = k < 0 ? -k : k;
    s += colS[j];
    q += colQ[j];
  }
  let m = s * inv;
  let v = q * inv - m * m;
  out[o] = v > 0 ? (sq ? Math.sqrt(v) : v) : 0;
  const xl = r < W - 1 - r ? r : W - 1 - r; // left border part: x ≤ r, leaving column reflected
  let x = 1;
  for (; x <= xl; x++) {
    const ja = x + r;
    const a = src[rin + ja];
    const b = src[rout + ja];
    const cs = colS[ja] + (a - b);
    const cq = colQ[ja] + (a * a - b * b);
    colS[ja] = cs;
    colQ[ja] = cq;
    const js = r + 1 - x;
    s += cs - colS[js];
    q += cq - colQ[js];
    m = s * inv;
    v = q * inv - m * m;
    out[o + x] = v > 0 ? (sq ? Math.sqrt(v) : v) : 0;
  }
  // interior: entering x + r and leaving x − r − 1 both inside the row
  const xe = W - 1 - r;
  if (sq) x = interiorStd(src, rin, rout, colS, colQ, out, o, x, xe, r, inv, s, q);
  else x = interiorVar(src, rin, rout, colS, colQ, out, o, x, xe, r, inv, s, q);
  s = carry[0];
  q = carry[1];
  // right border part: entering column reflected (already updated)
  for (; x < W; x++) {
    const ja = 2 * (W - 1) - (x + r);
    const js = x - r - 1;
    s += colS[ja] - colS[js];
    q += colQ[ja] - colQ[js];
    m = s * inv;
    v = q * inv - m * m;
    out[o + x] = v > 0 ? (sq ? Math.sqrt(v) : v) : 0;
  }
}

/** Running sums (s, q) handed back from the interior loops to the right border part. */
const carry = new Float64Array(2);

/** Interior part of a variance row: entering x + r and leaving x − r − 1 inside the row; returns the next x. */
function interiorVar(
  src: Float32Array,
  rin: number,
  rout: number,
  colS: Float64Array,
  colQ: Float64Array,
  out: Float32Array,
  o: number,
  x0: number,
  xe: number,
  r: number,
  inv: number,
  s: number,
  q: number,
): number {
  let x = x0;
  for (; x <= xe; x++) {
    const ja = x + r;
    const js = x - r - 1;
    const a = src[rin + ja];
    const b = src[rout + ja];
    const cs = colS[ja] + (a - b);
    const cq = colQ[ja] + (a * a - b * b);
    colS[ja] = cs;
    colQ[ja] = cq;
    s += cs - colS[js];
    q += cq - colQ[js];
    const m = s * inv;
    const v = q * inv - m * m;
    out[o + x] = v > 0 ? v : 0;
  }
  carry[0] = s;
  carry[1] = q;
  return x;
}

/** As {@link interiorVar}, writing the square root. */
function interiorStd(
  src: Float32Array,
  rin: number,
  rout: number,
  colS: Float64Array,
  colQ: Float64Array,
  out: Float32Array,
  o: number,
  x0: number,
  xe: number,
  r: number,
  inv: number,
  s: number,
  q: number,
): number {
  let x = x0;
  for (; x <= xe; x++) {
    const ja = x + r;
    const js = x - r - 1;
    const a = src[rin + ja];
    const b = src[rout + ja];
    const cs = colS[ja] + (a - b);
    const cq = colQ[ja] + (a * a - b * b);
    colS[ja] = cs;
    colQ[ja] = cq;
    s += cs - colS[js];
    q += cq - colQ[js];
    const m = s * inv;
    const v = q * inv - m * m;
    out[o + x] = v > 0 ? Math.sqrt(v) : 0;
  }
  carry[0] = s;
  carry[1] = q;
  return x;
}

/** One output row of the box mean (same fused scheme as {@link varRow}). */
function meanRow(
  src: Float32Array,
  rin: number,
  rout: number,
  colS: Float64Array,
  out: Float32Array,
  o: number,
  W: number,
  r: number,
  inv: number,
): void {
  for (let x = 0; x <= r; x++) colS[x] += src[rin + x] - src[rout + x];
  let s = 0;
  for (let k = -r; k <= r; k++) s += colS[k < 0 ? -k : k];
  out[o] = s * inv;
  const xl = r < W - 1 - r ? r : W - 1 - r;
  let x = 1;
  for (; x <= xl; x++) {
    const ja = x + r;
    const cs = colS[ja] + (src[rin + ja] - src[rout + ja]);
    colS[ja] = cs;
    s += cs - colS[r + 1 - x];
    out[o + x] = s * inv;
  }
  for (; x <= W - 1 - r; x++) {
    const ja = x + r;
    const cs = colS[ja] + (src[rin + ja] - src[rout + ja]);
    colS[ja] = cs;
    s += cs - colS[x - r - 1];
    out[o + x] = s * inv;
  }
  for (; x < W; x++) {
    s += colS[2 * (W - 1) - (x + r)] - colS[x - r - 1];
    out[o + x] = s * inv;
  }
}
