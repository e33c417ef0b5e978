/**
 * Per-pixel features of the pixel classifier, on the working copy (pipeline/frame.ts), at several
 * window sizes given in µm. Each is normalised so that a model trained on one image transfers to the
 * others of a series photographed the same way: brightness is taken relative to the image's median
 * (log scale, so an exposure change cancels), texture relative to the local brightness (as the
 * fixed rules do, texture/registry.ts gain powers), entropy over the image's own 0.5–99.5 % range,
 * orientation coherence is scale-free, and every window is converted with the image's own pixel
 * size.
 *
 * The feature set (its name is {@link PIXEL_FEATURE_SET}; a model records it and refuses another):
 * `brightness` (log of the 3 × 3 mean, minus the image median), then per window w:
 * `brightness@w` (log of the w × w mean, minus the same median), `contrast@w` (log of the local
 * standard deviation over the local mean), `entropy@w` (local Shannon entropy, bits, texture/
 * localEntropy.ts), `gradient@w` (½ log of the mean squared Sobel gradient minus the log of the
 * local mean: gradient strength relative to brightness) and `coherence@w` (orientation
 * coherence of the structure tensor, (λ₁ − λ₂)/(λ₁ + λ₂): 1 along machining marks and
 * striations, 0 for isotropic roughness; Bigün & Granlund, ICCV 1987) and `radiality@w` (the
 * same, signed by the orientation relative to the direction from the specimen centre: +1 for
 * marks running round it, −1 for radial ones). The centre comes from the fixed-rule outline
 * (learn/edgeCandidates.ts `outlineCues`: the silhouette's centre, or the chosen closed edge's when
 * a flank, holder or shadow merged with the silhouette pulls that off); pixels far from it see θ
 * change slowly, so an error of a few px does not matter.
 *
 * Evaluation: only at the pixels asked for ({@link pixelFeaturesAt}): the labelled pixels chosen
 * for training, the grid the forest is evaluated on when applying a model (learn/predict.ts). The
 * window means come from summed-area tables (one pass per summed quantity, then four look-ups per
 * window and pixel; the borders reflect-101 as OpenCV `boxFilter` does, texture/boxMean.ts), the
 * entropy from histograms slid along each row of the requested pixels with the fixed-point tables of
 * the texture kernel (texture/kernels/entropyKernel.ts: the same values bit for bit), and the
 * logarithms and orientation terms are taken at those pixels only. Teaching and applying use this one
 * function, so a pixel gets the same features in both.
 *
 * Adding a feature: DEVELOPERS.md "Pixel classifier".
 */
import { FractozoneError } from '../errors.js';
import type { GrayRaster } from '../image/raster.js';
import { entropyTables } from '../texture/kernels/entropyKernel.js';
import { DEFAULT_ENTROPY_BINS, entropyBins } from '../texture/localEntropy.js';
import { quantile } from '../segment/quantiles.js';
import { outlineCues } from './edgeCandidates.js';
import type { WorkingFrame } from '../pipeline/frame.js';
import type { PointPx } from '../image/geometry.js';

/** Name and version of the feature set; a model made with another set is refused. */
export const PIXEL_FEATURE_SET = 'fractozone.pixel-features/1' as const;

/** The features computed at every window, in this order. */
export const WINDOW_FEATURES = ['brightness', 'contrast', 'entropy', 'gradient', 'coherence', 'radiality'] as const;

/** Feature names of the set for `nWindows` windows, in the order of the feature vector. */
export function pixelFeatureNames(windowsUm: readonly number[]): string[] {
  return ['brightness', ...windowsUm.flatMap((w) => WINDOW_FEATURES.map((f) => `${f}@${formatUm(w)}um`))];
}

function formatUm(v: number): string {
  return String(Math.round(v * 10) / 10);
}

/** Odd window side in working px for a window in µm, within 3 px and half the smaller image side. */
export function windowPxAt(windowUm: number, umPerWorkPx: number, width: number, height: number): number {
  const n = windowUm / umPerWorkPx;
  const odd = 2 * Math.floor((n - 1) / 2 + 0.5) + 1;
  const maxOdd = Math.max(3, (Math.floor(Math.min(width, height) / 2) - 1) | 1);
  return Math.min(maxOdd, Math.max(3, odd));
}

/**
 * The five summed-area tables in one pass over the image: of I, I², and of gx², gy², gx·gy with
 * (gx, gy) the 3 × 3 Sobel derivatives (reflect-101 borders). Each table is (W + 1) × (H + 1) in
 * double precision: S[(y + 1)(W + 1) + x + 1] = Σ over x' ≤ x, y' ≤ y. The squares and products
 * are rounded to float32 first, as the per-pixel maps this replaces stored them.
 */
function summedTables(r: GrayRaster): Sums {
  const { width: W, height: H, data: d } = r;
  const W1 = W + 1;
  const n1 = W1 * (H + 1);
  const t = { data: new Float64Array(n1), sq: new Float64Array(n1), gxx: new Float64Array(n1), gyy: new Float64Array(n1), gxy: new Float64Array(n1) };
  for (let y = 0; y < H; y++) {
    const ym = (y === 0 ? Math.min(1, H - 1) : y - 1) * W;
    const yp = (y === H - 1 ? Math.max(0, H - 2) : y + 1) * W;
    summedRow(d, W, ym, y * W, yp, (y + 1) * W1 + 1, W1, t.data, t.sq, t.gxx, t.gyy, t.gxy);
  }
  return { W, H, ...t };
}

function summedRow(d: Float32Array, W: number, ym: number, y0: number, yp: number, o: number, W1: number, sd: Float64Array, ssq: Float64Array, sxx: Float64Array, syy: Float64Array, sxy: Float64Array): void {
  let rd = 0;
  let rsq = 0;
  let rxx = 0;
  let ryy = 0;
  let rxy = 0;
  for (let x = 0; x < W; x++) {
    const xm = x === 0 ? Math.min(1, W - 1) : x - 1;
    const xp = x === W - 1 ? Math.max(0, W - 2) : x + 1;
    const v = d[y0 + x];
    // Sobel, rounded to float32 as the maps were
    const gx = Math.fround(d[ym + xp] - d[ym + xm] + 2 * (d[y0 + xp] - d[y0 + xm]) + d[yp + xp] - d[yp + xm]);
    const gy = Math.fround(d[yp + xm] - d[ym + xm] + 2 * (d[yp + x] - d[ym + x]) + d[yp + xp] - d[ym + xp]);
    rd += v;
    rsq += Math.fround(v * v);
    rxx += Math.fround(gx * gx);
    ryy += Math.fround(gy * gy);
    rxy += Math.fround(gx * gy);
    const k = o + x;
    sd[k] = sd[k - W1] + rd;
    ssq[k] = ssq[k - W1] + rsq;
    sxx[k] = sxx[k - W1] + rxx;
    syy[k] = syy[k - W1] + ryy;
    sxy[k] = sxy[k - W1] + rxy;
  }
}

/**
 * Up to three index ranges [lo, hi] (inclusive, into 0..N − 1) covering c − h..c + h with
 * reflect-101 borders (… 2 1 | 0 1 2 …), h ≤ N − 1: the part inside, and the mirrored parts.
 * Written into `r` as lo0, hi0, lo1, hi1, …; returns the number of ranges.
 */
function reflectRanges(c: number, h: number, N: number, r: Int32Array): number {
  let k = 0;
  r[0] = c - h < 0 ? 0 : c - h;
  r[1] = c + h > N - 1 ? N - 1 : c + h;
  k = 1;
  if (c - h < 0) {
    r[2 * k] = 1;
    r[2 * k + 1] = h - c;
    k++;
  }
  if (c + h > N - 1) {
    r[2 * k] = 2 * (N - 1) - (c + h);
    r[2 * k + 1] = N - 2;
    k++;
  }
  return k;
}

/** Summed-area tables of the quantities whose window means the features need. */
interface Sums {
  W: number;
  H: number;
  data: Float64Array;
  sq: Float64Array;
  gxx: Float64Array;
  gyy: Float64Array;
  gxy: Float64Array;
}

/** Scratch for the border ranges of {@link boxSums}. */
const RX = new Int32Array(6);
const RY = new Int32Array(6);

/**
 * Window sums (side 2h + 1, reflect-101 borders) at (x, y) of the five tables into out[0..4]
 * (data, sq, gxx, gyy, gxy).
 */
function boxSums(s: Sums, x: number, y: number, h: number, out: Float64Array): void {
  const W1 = s.W + 1;
  if (x - h >= 0 && y - h >= 0 && x + h < s.W && y + h < s.H) {
    const a = (y - h) * W1 + x - h;
    const b = a + 2 * h + 1;
    const c = (y + h + 1) * W1 + x - h;
    const d = c + 2 * h + 1;
    out[0] = s.data[d] - s.data[b] - s.data[c] + s.data[a];
    out[1] = s.sq[d] - s.sq[b] - s.sq[c] + s.sq[a];
    out[2] = s.gxx[d] - s.gxx[b] - s.gxx[c] + s.gxx[a];
    out[3] = s.gyy[d] - s.gyy[b] - s.gyy[c] + s.gyy[a];
    out[4] = s.gxy[d] - s.gxy[b] - s.gxy[c] + s.gxy[a];
    return;
  }
  const nx = reflectRanges(x, h, s.W, RX);
  const ny = reflectRanges(y, h, s.H, RY);
  out.fill(0, 0, 5);
  const tables = [s.data, s.sq, s.gxx, s.gyy, s.gxy];
  for (let j = 0; j < ny; j++) {
    for (let i = 0; i < nx; i++) {
      const a = RY[2 * j] * W1 + RX[2 * i];
      const b = RY[2 * j] * W1 + RX[2 * i + 1] + 1;
      const c = (RY[2 * j + 1] + 1) * W1 + RX[2 * i];
      const d = (RY[2 * j + 1] + 1) * W1 + RX[2 * i + 1] + 1;
      for (let t = 0; t < 5; t++) out[t] += tables[t][d] - tables[t][b] - tables[t][c] + tables[t][a];
    }
  }
}

/** Window mean (side 2h + 1, reflect-101) of one table at (x, y). */
function boxMeanAt(S: Float64Array, W: number, H: number, x: number, y: number, h: number): number {
  const W1 = W + 1;
  const area = (2 * h + 1) * (2 * h + 1);
  if (x - h >= 0 && y - h >= 0 && x + h < W && y + h < H) {
    const a = (y - h) * W1 + x - h;
    const c = (y + h + 1) * W1 + x - h;
    return Math.fround((S[c + 2 * h + 1] - S[a + 2 * h + 1] - S[c] + S[a]) / area);
  }
  const nx = reflectRanges(x, h, W, RX);
  const ny = reflectRanges(y, h, H, RY);
  let sum = 0;
  for (let j = 0; j < ny; j++) {
    for (let i = 0; i < nx; i++) {
      sum += S[(RY[2 * j + 1] + 1) * W1 + RX[2 * i + 1] + 1] - S[RY[2 * j] * W1 + RX[2 * i + 1] + 1] - S[(RY[2 * j + 1] + 1) * W1 + RX[2 * i]] + S[RY[2 * j] * W1 + RX[2 * i]];
    }
  }
  return Math.fround(sum / area);
}

/** Median over every `step`-th pixel of log(max(3 × 3 mean, floor)): the image's reference brightness. */
function medianLog(S: Float64Array, W: number, H: number, floor: number): number {
  const n = W * H;
  const step = Math.max(1, Math.floor(n / 200_000));
  const s = new Float32Array(Math.ceil(n / step));
  for (let i = 0, k = 0; i < n; i += step, k++) s[k] = Math.log(Math.max(boxMeanAt(S, W, H, i % W, Math.floor(i / W), 1), floor));
  return quantile(s, 0.5);
}

const LOG_FLOOR = 1e-3;

/**
 * Local entropy (bits) at the pixels `index` (texture/localEntropy.ts semantics: window of side
 * 2r + 1 shrunk to the image, `nBins` bins) into out[k·F + f]. Consecutive pixels on one row share
 * a histogram slid from one to the next; the exact fixed-point sums make the values those of the
 * full-image kernel whatever the order.
 */
function entropyAt(bins: Uint8Array, W: number, H: number, r: number, nBins: number, index: Int32Array, out: Float32Array, F: number, f: number): void {
  const { T, inc, invN } = entropyTables(Math.min(2 * r + 1, H) * Math.min(2 * r + 1, W));
  const hist = new Int32Array(nBins);
  let S = 0;
  let row = -1;
  let c0 = 0;
  let c1 = -1;
  let pa = 0; // offsets of the window's first and last rows
  let pb = -W;
  for (let k = 0; k < index.length; k++) {
    const i = index[k];
    const y = Math.floor(i / W);
    const x = i - y * W;
    const n0 = x - r < 0 ? 0 : x - r;
    const n1 = x + r > W - 1 ? W - 1 : x + r;
    let from = c1 + 1;
    // slide when that changes fewer columns than a rebuild reads
    if (y !== row || n0 < c0 || 2 * (n0 - c0) > n1 - n0 + 1) {
      row = y;
      pa = (y - r < 0 ? 0 : y - r) * W;
      pb = (y + r > H - 1 ? H - 1 : y + r) * W;
      hist.fill(0);
      S = 0;
      from = n0;
    } else {
      for (let c = c0; c < n0; c++) {
        for (let p = pa + c; p <= pb + c; p += W) {
          const b = bins[p];
          const cnt = hist[b] - 1;
          S -= inc[cnt];
          hist[b] = cnt;
        }
      }
    }
    for (let c = from; c <= n1; c++) {
      for (let p = pa + c; p <= pb + c; p += W) {
        const b = bins[p];
        const cnt = hist[b];
        S += inc[cnt];
        hist[b] = cnt + 1;
      }
    }
    c0 = n0;
    c1 = n1;
    const n = ((pb - pa) / W + 1) * (n1 - n0 + 1);
    const e = (T[n] - S) * invN[n];
    out[k * F + f] = e > 0 ? e : 0;
  }
}

/** Evaluates the feature set at chosen pixels of one image; the per-image tables are made once. */
export interface FeatureSampler {
  /** Features per pixel ({@link pixelFeatureNames}). */
  readonly nFeatures: number;
  /**
   * The feature vectors of pixels `index` (y·width + x), row-major, in the order of `index`;
   * fastest in ascending order (the entropy histograms slide along rows).
   */
  at(index: Int32Array): Float32Array;
}

/**
 * Prepares the evaluation of the feature set on a working copy: the summed-area tables, the
 * image's median log brightness and its entropy bins.
 *
 * @param work - working copy (gray 0..1)
 * @param umPerWorkPx - pixel size of the working copy, µm per px
 * @param windowsUm - the windows, µm (each becomes an odd px side ≥ 3 on this image)
 * @param center - the specimen centre, working px (for the radiality)
 */
export function featureSampler(work: GrayRaster, umPerWorkPx: number, windowsUm: readonly number[], center: { x: number; y: number }): FeatureSampler {
  const { width: W, height: H } = work;
  if (W < 8 || H < 8) throw new FractozoneError('BAD_PARAMETER', `the image (${W}×${H} px working copy) is too small for the pixel classifier`);
  const F = 1 + WINDOW_FEATURES.length * windowsUm.length;
  const sums = summedTables(work);
  const med = medianLog(sums.data, W, H, LOG_FLOOR);
  const halves = windowsUm.map((wUm) => (windowPxAt(wUm, umPerWorkPx, W, H) - 1) / 2);
  const bins = entropyBins(work);
  return {
    nFeatures: F,
    at(index: Int32Array): Float32Array {
      const out = new Float32Array(index.length * F);
      windowFeatures(sums, med, halves, center, index, out, F);
      for (let w = 0; w < halves.length; w++) entropyAt(bins, W, H, halves[w], DEFAULT_ENTROPY_BINS, index, out, F, 1 + w * WINDOW_FEATURES.length + 2);
      return out;
    },
  };
}

/** Every feature but the entropy at the pixels `index` into out (F per pixel). */
function windowFeatures(sums: Sums, med: number, halves: readonly number[], center: { x: number; y: number }, index: Int32Array, out: Float32Array, F: number): void {
  const { W, H } = sums;
  const m = new Float64Array(5);
  for (let k = 0; k < index.length; k++) {
    const i = index[k];
    const y = Math.floor(i / W);
    const x = i - y * W;
    const o = k * F;
    out[o] = Math.log(Math.max(boxMeanAt(sums.data, W, H, x, y, 1), LOG_FLOOR)) - med;
    // direction from the centre: cos 2θ, sin 2θ (float32, as the maps were)
    const dx = x - center.x;
    const dy = y - center.y;
    const r2 = dx * dx + dy * dy;
    const cos2t = r2 < 1e-9 ? 0 : Math.fround((dx * dx - dy * dy) / r2);
    const sin2t = r2 < 1e-9 ? 0 : Math.fround((2 * dx * dy) / r2);
    for (let w = 0; w < halves.length; w++) {
      const h = halves[w];
      boxSums(sums, x, y, h, m);
      const inv = 1 / ((2 * h + 1) * (2 * h + 1));
      const mean = Math.fround(m[0] * inv);
      const second = Math.fround(m[1] * inv);
      const jxx = Math.fround(m[2] * inv);
      const jyy = Math.fround(m[3] * inv);
      const jxy = Math.fround(m[4] * inv);
      const logMean = Math.log(Math.max(mean, LOG_FLOOR));
      const v = second - mean * mean;
      const t = jxx + jyy;
      const a = jxx - jyy;
      const b = o + 1 + w * WINDOW_FEATURES.length;
      out[b] = logMean - med; // brightness
      out[b + 1] = 0.5 * Math.log(Math.max(v, 0) + 1e-8) - logMean; // contrast
      // b + 2: entropy (entropyAt)
      out[b + 3] = 0.5 * Math.log(Math.max(Math.fround(t), 0) + 1e-8) - logMean; // gradient
      out[b + 4] = t > 1e-10 ? Math.sqrt(a * a + 4 * jxy * jxy) / t : 0; // coherence
      out[b + 5] = t > 1e-10 ? (a * cos2t + 2 * jxy * sin2t) / t : 0; // radiality
    }
  }
}

/**
 * The feature vectors of chosen pixels of a working copy ({@link featureSampler} for one list).
 *
 * @param work - working copy (gray 0..1)
 * @param umPerWorkPx - pixel size of the working copy, µm per px
 * @param windowsUm - the windows, µm (each becomes an odd px side ≥ 3 on this image)
 * @param center - the specimen centre, working px (for the radiality)
 * @param index - the pixels (y·width + x); fastest in ascending order (histograms slide along rows)
 * @returns row-major features, {@link pixelFeatureNames} per pixel, in the order of `index`
 */
export function pixelFeaturesAt(work: GrayRaster, umPerWorkPx: number, windowsUm: readonly number[], center: { x: number; y: number }, index: Int32Array): Float32Array {
  return featureSampler(work, umPerWorkPx, windowsUm, center).at(index);
}

/**
 * The centre the radiality is measured from: the centre of the fixed-rule outline of the working
 * copy (learn/edgeCandidates.ts `outlineCues`), or the image centre when that finds no specimen.
 */
export function featureCentre(frame: WorkingFrame): PointPx {
  return outlineCues(frame).centre;
}
