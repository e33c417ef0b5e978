/**
 * Hot loop of the local entropy filter (OpenCV has no such filter, so it is written by hand).
 *
 * Square window of side 2r + 1; only pixels of the window that lie inside the image are counted
 * (the population N shrinks at the edges), which is what scikit-image `filters.rank.entropy` does.
 *
 * Per row the histogram is rebuilt for x = 0, then slid to the right: the leaving column is
 * removed and the entering column added (Huang, Yang & Tang, "A fast two-dimensional median
 * filtering algorithm", IEEE Trans. ASSP 27(1), 1979). The entropy itself is kept incrementally:
 * with counts c_i and population N,
 *
 *   H = log2 N − (1/N) · S,   S = Σ_i c_i · log2 c_i,
 *
 * and S is updated in O(1) per count change from the table T[c] = c·log2 c
 * (S += T[c ± 1] − T[c]). Restarting every row keeps rounding drift below 1e-12 bit.
 */

/**
 * Local Shannon entropy (bits) of bin indices over a (2r+1)² window.
 * @param bins bin index per pixel, row-major, each < `nBins`
 * @param width image width (px)
 * @param height image height (px)
 * @param r half window (px); window side 2r + 1
 * @param nBins number of bins (≤ 256)
 * @param out output, length width·height, entropy in bits
 */
export function entropyKernel(
  bins: Uint8Array,
  width: number,
  height: number,
  r: number,
  nBins: number,
  out: Float32Array,
): void {
  const W = width;
  const H = height;
  const maxN = Math.min(2 * r + 1, H) * Math.min(2 * r + 1, W);
  // inc[c] = T[c+1] − T[c], dec[c] = T[c−1] − T[c], with T[c] = c·log2 c (T[0] = 0)
  const T = new Float64Array(maxN + 2);
  for (let c = 1; c < T.length; c++) T[c] = c * Math.log2(c);
  const inc = new Float64Array(maxN + 1);
  const dec = new Float64Array(maxN + 1);
  for (let c = 0; c <= maxN; c++) inc[c] = T[c + 1] - T[c];
  for (let c = 1; c <= maxN; c++) dec[c] = T[c - 1] - T[c];
  const log2N = new Float64Array(maxN + 1);
  const invN = new Float64Array(maxN + 1);
  for (let n = 1; n <= maxN; n++) {
    log2N[n] = Math.log2(n);
    invN[n] = 1 / n;
  }
  const hist = new Int32Array(nBins);

  for (let y = 0; y < H; y++) {
    const ya = y - r < 0 ? 0 : y - r;
    const yb = y + r > H - 1 ? H - 1 : y + r;
    const rows = yb - ya + 1;
    const pa = ya * W; // offset of the first window row
    const pb = yb * W; // offset of the last window row
    hist.fill(0);
    let S = 0;
    const xe = r < W - 1 ? r : W - 1;
    for (let p = pa; p <= pb; p += W) {
      for (let x = 0; x <= xe; x++) {
        const b = bins[p + x];
        const c = hist[b];
        S += inc[c];
        hist[b] = c + 1;
      }
    }
    let cols = xe + 1;
    let n = rows * cols;
    let e = log2N[n] - S * invN[n];
    const orow = y * W;
    out[orow] = e > 0 ? e : 0;

    for (let x = 1; x < W; x++) {
      const xo = x - r - 1; // leaving column
      const xi = x + r; // entering column
      if (xo >= 0 && xi < W) {
        for (let p = pa; p <= pb; p += W) {
          const bo = bins[p + xo];
          const bi = bins[p + xi];
          if (bo !== bi) {
            let c = hist[bo];
            S += dec[c];
            hist[bo] = c - 1;
            c = hist[bi];
            S += inc[c];
            hist[bi] = c + 1;
          }
        }
      } else {
        if (xo >= 0) {
          for (let p = pa; p <= pb; p += W) {
            const b = bins[p + xo];
            const c = hist[b];
            S += dec[c];
            hist[b] = c - 1;
          }
          cols--;
        }
        if (xi < W) {
          for (let p = pa; p <= pb; p += W) {
            const b = bins[p + xi];
            const c = hist[b];
            S += inc[c];
            hist[b] = c + 1;
          }
          cols++;
        }
        n = rows * cols;
      }
      e = log2N[n] - S * invN[n];
      out[orow + x] = e > 0 ? e : 0;
    }
  }
}
