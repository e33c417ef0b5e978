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
 *   H = log2 N − (1/N) · S = (T[N] − S) / N,   S = Σ_i T[c_i],   T[c] = c · log2 c,
 *
 * and S is updated in O(1) per count change from the table T
 * (S += T[c + 1] − T[c] when a count goes up, S −= T[c] − T[c − 1] when it goes down).
 *
 * Fixed point: T[c] is stored rounded to a whole number of units 2^−k (in a double), with k
 * the largest value ≤ 40 for which N·log2 N · 2^k < 2^52 (N = window population; k = 40 for
 * windows up to 29×29 px). Every partial sum of S is then a whole number below 2^53, so all sums
 * are exact: the result does not depend on the order of the updates (no drift along a row,
 * deterministic for any loop order), and differs from the exact-arithmetic entropy by < 2^−(k+1)
 * bit (rounding of T, at most N terms, divided by N).
 *
 * Speed: in the image interior two output rows y, y + 1 are slid together with two histograms;
 * their windows share 2r rows, so each shared pixel pair (leaving, entering) is read once and
 * applied to both histograms, and the two independent update chains overlap in the CPU.
 * The exact fixed-point sums make this give the same values as row-by-row processing.
 *
 * The interior loop of a row pair runs in WebAssembly where available (entropy.wat, same
 * operations in the same order, so the output is identical; see entropyWasm.ts); the image
 * borders and hosts without WebAssembly use the JavaScript loop below.
 */
import { finishEntropyWasm, prepareEntropyWasm, type EntropyWasmCall } from './entropyWasm.js';

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
  const { T, inc, invN } = entropyTables(Math.min(2 * r + 1, H) * Math.min(2 * r + 1, W));
  const wasm = W > 2 * r + 1 && H > 2 * r + 1 ? prepareEntropyWasm(bins, W, inc, nBins) : null;
  const hA = wasm ? wasm.hA : new Int32Array(nBins);
  const hB = wasm ? wasm.hB : new Int32Array(nBins);
  const k = new Kernel(bins, W, H, r, inc, T, invN, out);
  // interior columns: leaving column x − r − 1 ≥ 0 and entering column x + r < W
  const x0 = r + 1;
  const x1 = W - 1 - r;
  for (let y = 0; y < H; y++) {
    if (y - r >= 0 && y + 1 + r <= H - 1 && x0 <= x1) {
      const pa = (y - r) * W;
      const pb = (y + r) * W;
      const n = (2 * r + 1) * (2 * r + 1);
      const SA = k.left(hA, pa, pb, y * W);
      const SB = k.left(hB, pa + W, pb + W, (y + 1) * W);
      if (wasm) wasmInteriorPair(wasm, k, pa, x0, x1, SA, SB, T[n], invN[n], y * W);
      else k.interiorPair(hA, hB, pa, x0, x1, SA, SB, T[n], invN[n], y * W);
      k.right(hA, pa, pb, x1 + 1, k.sA, y * W);
      k.right(hB, pa + W, pb + W, x1 + 1, k.sB, (y + 1) * W);
      y++;
    } else {
      const ya = y - r < 0 ? 0 : y - r;
      const yb = y + r > H - 1 ? H - 1 : y + r;
      const S = k.left(hA, ya * W, yb * W, y * W);
      k.right(hA, ya * W, yb * W, x0, S, y * W);
    }
  }
  if (wasm) finishEntropyWasm();
}

/** {@link Kernel.interiorPair} in WebAssembly: same arguments, same results in `k.sA` / `k.sB`. */
function wasmInteriorPair(
  w: EntropyWasmCall,
  k: Kernel,
  pa: number,
  x0: number,
  x1: number,
  SA: number,
  SB: number,
  tN: number,
  iN: number,
  orow: number,
): void {
  const { W, r, out } = k;
  w.interiorPair(
    w.hAOff,
    w.hBOff,
    w.binsOff + pa + x0 - r - 1,
    x1 - x0 + 1,
    2 * r + 1,
    W,
    2 * r * W,
    w.incOff,
    w.outOff + 4 * x0,
    SA,
    SB,
    tN,
    iN,
  );
  out.set(w.outRows.subarray(x0, x1 + 1), orow + x0);
  out.set(w.outRows.subarray(W + x0, W + x1 + 1), orow + W + x0);
  k.sA = w.sOut[0];
  k.sB = w.sOut[1];
}

/** The fixed-point tables of the entropy update (see the module comment). */
export interface EntropyTables {
  /** T[c] = c·log2 c in units 2^−k, c = 0..maxN + 1. */
  T: Float64Array;
  /** inc[c] = T[c + 1] − T[c]: change of S when a count goes c → c + 1 (c → c − 1: −inc[c − 1]). */
  inc: Float64Array;
  /** invN[n] = 1 / (n · 2^k): H = (T[n] − S) · invN[n] for a window of n pixels. */
  invN: Float64Array;
}

/**
 * Tables for windows of at most `maxN` pixels. Any order of count updates with these tables gives
 * the same S (all sums exact), so code that builds histograms differently (learn/features.ts
 * evaluates the entropy only at chosen pixels) gets the kernel's values bit for bit.
 */
export function entropyTables(maxN: number): EntropyTables {
  const SCALE = fixedPointScale(maxN);
  // inc[c] = T[c+1] − T[c] (count c → c + 1); a count c → c − 1 changes S by −inc[c − 1]
  const T = new Float64Array(maxN + 2);
  for (let c = 1; c < T.length; c++) T[c] = Math.round(c * Math.log2(c) * SCALE);
  const inc = new Float64Array(maxN + 1);
  for (let c = 0; c <= maxN; c++) inc[c] = T[c + 1] - T[c];
  // H = log2 N − S/N = (T[N] − S) / N: a flat window gives exactly 0
  const invN = new Float64Array(maxN + 1);
  for (let n = 1; n <= maxN; n++) invN[n] = 1 / (n * SCALE);
  return { T, inc, invN };
}

/** 2^k, k ≤ 40 the largest with N·log2 N · 2^k < 2^52 (all sums of S exact, see above). */
function fixedPointScale(maxN: number): number {
  const sMax = maxN * Math.log2(Math.max(2, maxN)) + 1;
  return 2 ** Math.min(40, 52 - Math.ceil(Math.log2(sMax)));
}

/** Per-call state and the loops (small methods: V8 optimises each loop early and whole). */
class Kernel {
  /** S of histogram A / B after {@link Kernel.interiorPair}. */
  sA = 0;
  sB = 0;
  constructor(
    readonly bins: Uint8Array,
    readonly W: number,
    readonly H: number,
    readonly r: number,
    readonly inc: Float64Array,
    readonly T: Float64Array,
    readonly invN: Float64Array,
    readonly out: Float32Array,
  ) {}

  /** Adds column x of rows pa..pb (offsets) to `hist`; returns the change of S. */
  addCol(hist: Int32Array, pa: number, pb: number, x: number): number {
    const bins = this.bins;
    const inc = this.inc;
    const W = this.W;
    let d = 0;
    for (let p = pa + x; p <= pb + x; p += W) {
      const b = bins[p];
      const c = hist[b];
      d += inc[c];
      hist[b] = c + 1;
    }
    return d;
  }

  /** Removes column x of rows pa..pb from `hist`; returns the change of S. */
  subCol(hist: Int32Array, pa: number, pb: number, x: number): number {
    const bins = this.bins;
    const inc = this.inc;
    const W = this.W;
    let d = 0;
    for (let p = pa + x; p <= pb + x; p += W) {
      const b = bins[p];
      const c = hist[b] - 1;
      d -= inc[c];
      hist[b] = c;
    }
    return d;
  }

  /** Writes entropy from S for a window of `n` pixels. */
  put(i: number, S: number, n: number): void {
    const e = (this.T[n] - S) * this.invN[n];
    this.out[i] = e > 0 ? e : 0;
  }

  /**
   * Rebuilds `hist` for the window rows pa..pb (offsets) at x = 0 and slides it over the left
   * border part x < r + 1 (no column leaves), writing row `orow`; returns S at x = min(r, W − 1).
   */
  left(hist: Int32Array, pa: number, pb: number, orow: number): number {
    const { W, r } = this;
    const rows = (pb - pa) / W + 1;
    hist.fill(0);
    let S = 0;
    const xe = r < W - 1 ? r : W - 1;
    for (let x = 0; x <= xe; x++) S += this.addCol(hist, pa, pb, x);
    let cols = xe + 1;
    this.put(orow, S, rows * cols);
    for (let x = 1; x <= r && x < W; x++) {
      if (x + r < W) {
        S += this.addCol(hist, pa, pb, x + r);
        cols++;
      }
      this.put(orow + x, S, rows * cols);
    }
    return S;
  }

  /** Slides `hist` (state at x = xs − 1, xs ≥ r + 1) from x = xs to the row end, writing row `orow`. */
  right(hist: Int32Array, pa: number, pb: number, xs: number, S: number, orow: number): void {
    const { W, r } = this;
    const rows = (pb - pa) / W + 1;
    for (let x = xs; x < W; x++) {
      S += this.subCol(hist, pa, pb, x - r - 1);
      if (x + r < W) S += this.addCol(hist, pa, pb, x + r);
      const cols = (x + r < W ? x + r : W - 1) - (x - r) + 1;
      this.put(orow + x, S, rows * cols);
    }
  }

  /**
   * Interior x0..x1 of two full-height rows: histogram A covers the 2r + 1 rows from offset pa,
   * histogram B the same rows shifted down by one. Rows 1..2r are read once for both. Final
   * S values go to {@link Kernel.sA} / {@link Kernel.sB}.
   */
  interiorPair(
    hA: Int32Array,
    hB: Int32Array,
    pa: number,
    x0: number,
    x1: number,
    SA: number,
    SB: number,
    tN: number,
    iN: number,
    orow: number,
  ): void {
    const { bins, inc, out, W, r } = this;
    const w = 2 * r + 1;
    const span = 2 * r * W;
    for (let x = x0; x <= x1; x++) {
      const q0 = pa + x - r - 1;
      // top row: A only
      let bo = bins[q0];
      let bi = bins[q0 + w];
      let co = hA[bo] - 1;
      hA[bo] = co;
      let a0 = inc[co];
      let ci = hA[bi];
      hA[bi] = ci + 1;
      let a1 = inc[ci];
      // bottom row: B only
      const qb = q0 + span + W;
      bo = bins[qb];
      bi = bins[qb + w];
      co = hB[bo] - 1;
      hB[bo] = co;
      let b0 = inc[co];
      ci = hB[bi];
      hB[bi] = ci + 1;
      let b1 = inc[ci];
      // shared rows
      const q1 = q0 + span;
      for (let p = q0 + W; p <= q1; p += W) {
        bo = bins[p];
        bi = bins[p + w];
        co = hA[bo] - 1;
        hA[bo] = co;
        a0 += inc[co];
        ci = hA[bi];
        hA[bi] = ci + 1;
        a1 += inc[ci];
        co = hB[bo] - 1;
        hB[bo] = co;
        b0 += inc[co];
        ci = hB[bi];
        hB[bi] = ci + 1;
        b1 += inc[ci];
      }
      SA += a1 - a0;
      SB += b1 - b0;
      let e = (tN - SA) * iN;
      out[orow + x] = e > 0 ? e : 0;
      e = (tN - SB) * iN;
      out[orow + W + x] = e > 0 ? e : 0;
    }
    this.sA = SA;
    this.sB = SB;
  }
}
