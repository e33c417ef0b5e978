/**
 * Fused one-pass box mean / variance / standard deviation (hand-written: OpenCV has no single
 * call for a local variance, and going through two `boxFilter` calls costs two copies into and
 * out of the WebAssembly heap plus a squared image; this kernel reads the raster in place).
 *
 * Column sums of x and x² over the vertical window are slid down the image (add the entering
 * row, subtract the leaving one); along each row a horizontal running sum over the column sums
 * gives the window sums. Sums are Float64; drift over a 4000-row image stays below 1e-12.
 * Border: reflect-101 (… 2 1 | 0 1 2 …, OpenCV `BORDER_REFLECT_101`, SciPy mode `'mirror'`),
 * valid for 2r + 1 ≤ min(width, height) (checked by the callers).
 */

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
 */
export function boxMomentsKernel(
  src: Float32Array,
  width: number,
  height: number,
  r: number,
  what: Moment,
  out: Float32Array,
): void {
  const W = width;
  const H = height;
  const inv = 1 / ((2 * r + 1) * (2 * r + 1));
  const colS = new Float64Array(W);
  const colQ = new Float64Array(W);
  const addIdx = new Int32Array(W);
  const subIdx = new Int32Array(W);
  for (let x = 0; x < W; x++) {
    addIdx[x] = reflect101(x + r, W);
    subIdx[x] = reflect101(x - r - 1, W);
  }
  const needQ = what !== Moment.Mean;
  for (let k = -r; k <= r; k++) {
    const row = reflect101(k, H) * W;
    for (let x = 0; x < W; x++) {
      const v = src[row + x];
      colS[x] += v;
      colQ[x] += v * v;
    }
  }
  for (let y = 0; y < H; y++) {
    if (y > 0) {
      const rin = reflect101(y + r, H) * W;
      const rout = reflect101(y - r - 1, H) * W;
      if (needQ) {
        for (let x = 0; x < W; x++) {
          const a = src[rin + x];
          const b = src[rout + x];
          colS[x] += a - b;
          colQ[x] += a * a - b * b;
        }
      } else {
        for (let x = 0; x < W; x++) colS[x] += src[rin + x] - src[rout + x];
      }
    }
    let s = 0;
    let q = 0;
    for (let k = -r; k <= r; k++) {
      const j = reflect101(k, W);
      s += colS[j];
      q += colQ[j];
    }
    const o = y * W;
    if (what === Moment.Mean) {
      out[o] = s * inv;
      for (let x = 1; x < W; x++) {
        s += colS[addIdx[x]] - colS[subIdx[x]];
        out[o + x] = s * inv;
      }
    } else {
      const sq = what === Moment.Std;
      let m = s * inv;
      let v = q * inv - m * m;
      out[o] = v > 0 ? (sq ? Math.sqrt(v) : v) : 0;
      for (let x = 1; x < W; x++) {
        const ja = addIdx[x];
        const js = subIdx[x];
        s += colS[ja] - colS[js];
        q += colQ[ja] - colQ[js];
        m = s * inv;
        v = q * inv - m * m;
        out[o + x] = v > 0 ? (sq ? Math.sqrt(v) : v) : 0;
      }
    }
  }
}
