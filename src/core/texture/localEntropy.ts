/**
 * Local Shannon entropy of gray levels (roughness as disorder of the local histogram).
 */
import { FractozoneError } from '../errors.js';
import type { PixelBox } from '../image/geometry.js';
import { createRaster, cropRect, type GrayRaster } from '../image/raster.js';
import { entropyKernel } from './kernels/entropyKernel.js';
import type { FeatureDefinition } from './types.js';
import { DEFAULT_WINDOW_RULE } from './window.js';
import { checkRaster, checkWindow, nonFinite } from './validate.js';

export type { PixelBox };

/** Options of {@link localEntropy}. */
export interface LocalEntropyOptions {
  /** Number of histogram bins, 2..256. Default: 256 for 8-bit input, 32 for a 0..1 raster. */
  bins?: number;
  /**
   * Intensity range [lo, hi] spread over the bins (input units: 0..255 for 8-bit, 0..1 for a
   * raster); values outside go to the first / last bin. Overrides `percentiles`.
   */
  range?: readonly [number, number];
  /**
   * Percentiles [lo, hi] (0..100) of the image giving the range. Default for a raster
   * [0.5, 99.5] (robust to specular spots and dark pores); 8-bit input without `range` or
   * `percentiles` uses the full 0..255 scale.
   */
  percentiles?: readonly [number, number];
}

/** Default bins for a 0..1 raster (about 5 bits: enough levels, stable histograms in small windows). */
export const DEFAULT_ENTROPY_BINS = 32;
/** Default robust percentiles for the entropy range of a 0..1 raster. */
export const DEFAULT_ENTROPY_PERCENTILES: readonly [number, number] = [0.5, 99.5];

/**
 * Local Shannon entropy H = −Σ p_i log2 p_i (bits) of the gray-level histogram in the square
 * window of odd side `windowPx` centred on each pixel.
 *
 * Border: only the window pixels inside the image are counted (the window shrinks at the edges),
 * as scikit-image `filters.rank.entropy` does; with 256 bins on 8-bit input the result equals
 * `skimage.filters.rank.entropy(img, np.ones((w, w)))` (checked to 1e-5 bit in the tests).
 *
 * Quantisation: bin b = floor((v − lo) / (hi − lo) · bins), clamped to [0, bins − 1]. 8-bit input
 * without a range: b = floor(v · bins / 256) (identity for 256 bins). A flat image (hi ≤ lo)
 * has entropy 0 everywhere.
 *
 * Speed: sliding histogram with O(1) entropy update per count change; O(windowPx) per pixel.
 *
 * @param input 8-bit gray levels (row-major) or a gray raster (0..1)
 * @param width image width in px (must match a raster's width)
 * @param height image height in px (must match a raster's height)
 * @param windowPx odd window side in px, ≥ 3 (may exceed the image)
 * @param opts bins and intensity range
 * @returns entropy per pixel in bits, 0 ≤ H ≤ log2(min(bins, windowPx²))
 * @see Shannon, "A mathematical theory of communication", Bell Syst. Tech. J. 27, 1948
 * @see Huang, Yang & Tang, IEEE Trans. ASSP 27(1), 1979 (sliding histogram)
 */
export function localEntropy(
  input: Uint8Array | GrayRaster,
  width: number,
  height: number,
  windowPx: number,
  opts: LocalEntropyOptions = {},
): GrayRaster {
  const r = checkWindow(windowPx);
  let bins: Uint8Array;
  let nBins: number;
  if (input instanceof Uint8Array) {
    checkSize(width, height, input.length);
    nBins = checkBins(opts.bins ?? 256);
    bins = quantizeU8(input, nBins, opts);
  } else {
    checkRaster(input);
    if (input.width !== width || input.height !== height) {
      throw new FractozoneError(
        'BAD_PARAMETER',
        `the size given (${width}×${height} px) does not match the raster (${input.width}×${input.height} px)`,
      );
    }
    nBins = checkBins(opts.bins ?? DEFAULT_ENTROPY_BINS);
    bins = opts.range ? quantize(input.data, nBins, opts.range[0], opts.range[1]) : rangeBinsOnce(input, nBins, opts.percentiles ?? DEFAULT_ENTROPY_PERCENTILES);
  }
  const out = new Float32Array(width * height);
  entropyKernel(bins, width, height, r, nBins, out);
  return createRaster(width, height, out);
}

/**
 * {@link localEntropy} of a raster (bins over its own percentile range, as without `range`) only
 * inside `box`; 0 elsewhere. The same values inside the box as on the whole raster: the kernel
 * runs on the box grown by the half window (clamped to the raster), so every window of a box pixel
 * holds the same pixels, the histogram counts are integers and the entropy sums are exact fixed
 * point (kernels/entropyKernel.ts: independent of the order of the updates), and the crop is kept
 * at least one window wide so the fixed-point tables (sized by the window population) are the
 * same. For callers that read the map only inside a region (the specimen: the classification reads
 * its interior only); the 12-MP bench's specimen box is ≈ ½ of the working copy.
 */
export function localEntropyInBox(input: GrayRaster, windowPx: number, box: PixelBox, opts: Omit<LocalEntropyOptions, 'range'> = {}): GrayRaster {
  const r = checkWindow(windowPx);
  checkRaster(input);
  const nBins = checkBins(opts.bins ?? DEFAULT_ENTROPY_BINS);
  const { width: W, height: H } = input;
  const bx0 = Math.max(0, Math.floor(box.x0));
  const by0 = Math.max(0, Math.floor(box.y0));
  const bx1 = Math.min(W - 1, Math.ceil(box.x1));
  const by1 = Math.min(H - 1, Math.ceil(box.y1));
  const bins = rangeBinsOnce(input, nBins, opts.percentiles ?? DEFAULT_ENTROPY_PERCENTILES);
  const out = new Float32Array(W * H);
  if (bx1 < bx0 || by1 < by0) return createRaster(W, H, out);
  const [cx0, cx1] = cropSpan(bx0 - r, bx1 + r, W, 2 * r + 1);
  const [cy0, cy1] = cropSpan(by0 - r, by1 + r, H, 2 * r + 1);
  const w = cx1 - cx0 + 1;
  const h = cy1 - cy0 + 1;
  const cb = cropRect(bins, W, cx0, cy0, w, h, new Uint8Array(w * h));
  const co = new Float32Array(w * h);
  entropyKernel(cb, w, h, r, nBins, co);
  for (let y = by0; y <= by1; y++) out.set(co.subarray((y - cy0) * w + bx0 - cx0, (y - cy0) * w + bx1 - cx0 + 1), y * W + bx0);
  return createRaster(W, H, out);
}

/** [a, b] clamped to [0, n − 1] and grown to at least min(side, n) values. */
function cropSpan(a: number, b: number, n: number, side: number): [number, number] {
  let lo = Math.max(0, a);
  let hi = Math.min(n - 1, b);
  const need = Math.min(side, n);
  if (hi - lo + 1 < need) {
    lo = Math.max(0, hi - need + 1);
    hi = Math.min(n - 1, lo + need - 1);
  }
  return [lo, hi];
}

/**
 * The histogram bin of every pixel of a raster as {@link localEntropy} computes it without a
 * `range` option: `nBins` bins over the raster's percentile range.
 *
 * @param r gray raster
 * @param nBins number of bins, 2..256 (default {@link DEFAULT_ENTROPY_BINS})
 * @param percentiles [lo, hi] percentiles of the range (default {@link DEFAULT_ENTROPY_PERCENTILES})
 * @returns bin index per pixel, row-major
 */
export function entropyBins(r: GrayRaster, nBins = DEFAULT_ENTROPY_BINS, percentiles: readonly [number, number] = DEFAULT_ENTROPY_PERCENTILES): Uint8Array {
  checkRaster(r);
  const [lo, hi] = intensityRange(r, percentiles);
  return quantize(r.data, checkBins(nBins), lo, hi);
}

/**
 * The bins over the raster's percentile range, once per raster, bin count and percentiles: the
 * quantisation does not depend on the window, and the parameter range (pipeline/stages/uncertainty.ts)
 * computes the entropy of the same working copy at two more windows (range and quantisation were
 * ≈ 35 % of one entropy map on the 1200-px working copy, CPU profile of the 12-MP bench). Rasters are not changed in place, so the
 * raster names its bins; the bins are only read.
 */
function rangeBinsOnce(r: GrayRaster, nBins: number, percentiles: readonly [number, number]): Uint8Array {
  const key = `${nBins}|${percentiles[0]}|${percentiles[1]}`;
  let known = RANGE_BINS.get(r);
  const hit = known?.get(key);
  if (hit) return hit;
  const [lo, hi] = intensityRange(r, percentiles);
  const bins = quantize(r.data, nBins, lo, hi);
  if (!known) RANGE_BINS.set(r, (known = new Map()));
  known.set(key, bins);
  return bins;
}
const RANGE_BINS = new WeakMap<GrayRaster, Map<string, Uint8Array>>();

/**
 * Intensity range [lo, hi] of a raster between two percentiles, from a 65 536-bin histogram over
 * [min, max] (resolution (max − min)/65 536): lo is the lower edge of the bin holding the sample of
 * rank ⌈p_lo·N⌉, hi the upper edge of the bin holding the sample of rank ⌈p_hi·N⌉.
 *
 * @param r gray raster
 * @param percentiles [lo, hi] in percent, 0 ≤ lo < hi ≤ 100
 * @returns [lo, hi] in the raster's units
 */
export function intensityRange(r: GrayRaster, percentiles: readonly [number, number]): [number, number] {
  checkRaster(r);
  const [pl, ph] = percentiles;
  if (!(Number.isFinite(pl) && Number.isFinite(ph) && pl >= 0 && ph <= 100 && pl < ph)) {
    throw new FractozoneError('BAD_PARAMETER', `entropy percentiles must satisfy 0 ≤ low < high ≤ 100, got ${pl} and ${ph}`);
  }
  const d = r.data;
  let mn = Infinity;
  let mx = -Infinity;
  for (let i = 0; i < d.length; i++) {
    const v = d[i];
    if (v < mn) mn = v;
    if (v > mx) mx = v;
  }
  if (!Number.isFinite(mn) || !Number.isFinite(mx)) nonFinite();
  if (mx <= mn) return [mn, mx];
  const K = 65536;
  const h = new Uint32Array(K);
  const f = K / (mx - mn);
  for (let i = 0; i < d.length; i++) {
    const k = Math.floor((d[i] - mn) * f);
    h[k >= K ? K - 1 : k]++;
  }
  const N = d.length;
  const rankLo = Math.max(1, Math.ceil((pl / 100) * N));
  const rankHi = Math.max(1, Math.ceil((ph / 100) * N));
  let cum = 0;
  let kLo = -1;
  let kHi = K - 1;
  for (let k = 0; k < K; k++) {
    cum += h[k];
    if (kLo < 0 && cum >= rankLo) kLo = k;
    if (cum >= rankHi) {
      kHi = k;
      break;
    }
  }
  return [mn + kLo / f, mn + (kHi + 1) / f];
}

function checkSize(width: number, height: number, length: number): void {
  if (!Number.isInteger(width) || !Number.isInteger(height) || width <= 0 || height <= 0 || width * height !== length) {
    throw new FractozoneError('BAD_PARAMETER', `the 8-bit image size ${width}×${height} px does not match its ${length} values`);
  }
}

function checkBins(bins: number): number {
  if (!Number.isInteger(bins) || bins < 2 || bins > 256) {
    throw new FractozoneError('BAD_PARAMETER', `the entropy bin count must be a whole number from 2 to 256, got ${bins}`);
  }
  return bins;
}

function checkRange(lo: number, hi: number): void {
  if (!Number.isFinite(lo) || !Number.isFinite(hi) || hi < lo) {
    throw new FractozoneError('BAD_PARAMETER', `the entropy intensity range must be two finite numbers low ≤ high, got ${lo} and ${hi}`);
  }
}

function quantizeU8(v: Uint8Array, nBins: number, opts: LocalEntropyOptions): Uint8Array {
  if (opts.range === undefined && opts.percentiles === undefined) {
    if (nBins === 256) return v;
    const lut = new Uint8Array(256);
    for (let g = 0; g < 256; g++) lut[g] = Math.floor((g * nBins) / 256);
    const out = new Uint8Array(v.length);
    for (let i = 0; i < v.length; i++) out[i] = lut[v[i]];
    return out;
  }
  let lo: number;
  let hi: number;
  if (opts.range) {
    [lo, hi] = opts.range;
  } else {
    const f = new Float32Array(v.length);
    for (let i = 0; i < v.length; i++) f[i] = v[i];
    [lo, hi] = intensityRange(createRaster(v.length, 1, f), opts.percentiles as [number, number]);
  }
  checkRange(lo, hi);
  const lut = new Uint8Array(256);
  for (let g = 0; g < 256; g++) lut[g] = binOf(g, nBins, lo, hi);
  const out = new Uint8Array(v.length);
  for (let i = 0; i < v.length; i++) out[i] = lut[v[i]];
  return out;
}

function binOf(v: number, nBins: number, lo: number, hi: number): number {
  if (!(hi > lo)) return 0;
  const b = Math.floor(((v - lo) / (hi - lo)) * nBins);
  return b < 0 ? 0 : b >= nBins ? nBins - 1 : b;
}

function quantize(d: Float32Array, nBins: number, lo: number, hi: number): Uint8Array {
  checkRange(lo, hi);
  const out = new Uint8Array(d.length);
  if (!(hi > lo)) {
    for (let i = 0; i < d.length; i++) if (d[i] !== d[i]) nonFinite();
    return out;
  }
  const f = nBins / (hi - lo);
  const top = nBins - 1;
  for (let i = 0; i < d.length; i++) {
    const v = d[i];
    if (v !== v) nonFinite();
    const b = Math.floor((v - lo) * f);
    out[i] = b < 0 ? 0 : b > top ? top : b;
  }
  return out;
}

/** Registry entry: local entropy (raster input, robust range). */
export const localEntropyFeature: FeatureDefinition = {
  name: 'localEntropy',
  unit: 'bit',
  description: 'Shannon entropy of the gray-level histogram in the window',
  linearInAreaFraction: false,
  transform: 'identity',
  gainPower: 0,
  defaultWindow: DEFAULT_WINDOW_RULE,
  compute: (r, o) =>
    localEntropy(r, r.width, r.height, o.windowPx, { bins: o.bins, range: o.range, percentiles: o.percentiles }),
};
