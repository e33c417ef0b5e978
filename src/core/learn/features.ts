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
 * (segment/specimen.ts), which is concentric with the notch root even where it takes the bar's
 * outer edge; pixels far from it see θ change slowly, so an error of a few px does not matter.
 * Adding a feature: DEVELOPERS.md "Pixel classifier".
 */
import { FractozoneError } from '../errors.js';
import type { GrayRaster } from '../image/raster.js';
import { boxMeanInto } from '../texture/boxMean.js';
import { localEntropy } from '../texture/localEntropy.js';
import { quantile } from '../segment/cvutil.js';
import { findSpecimen } from '../segment/specimen.js';
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

/** Feature maps of one image at working resolution: `maps[k]` is feature `names[k]`. */
export interface PixelFeatures {
  width: number;
  height: number;
  names: string[];
  maps: Float32Array[];
}

/** Odd window side in working px for a window in µm, within 3 px and half the smaller image side. */
export function windowPxAt(windowUm: number, umPerWorkPx: number, width: number, height: number): number {
  const n = windowUm / umPerWorkPx;
  const odd = 2 * Math.floor((n - 1) / 2 + 0.5) + 1;
  const maxOdd = Math.max(3, (Math.floor(Math.min(width, height) / 2) - 1) | 1);
  return Math.min(maxOdd, Math.max(3, odd));
}

/** 3 × 3 Sobel derivatives (reflect-101 borders) of a raster. */
function sobel(r: GrayRaster): { gx: Float32Array; gy: Float32Array } {
  const { width: W, height: H, data: d } = r;
  const gx = new Float32Array(W * H);
  const gy = new Float32Array(W * H);
  for (let y = 0; y < H; y++) {
    const ym = (y === 0 ? Math.min(1, H - 1) : y - 1) * W;
    const yp = (y === H - 1 ? Math.max(0, H - 2) : y + 1) * W;
    const y0 = y * W;
    sobelRow(d, gx, gy, W, ym, y0, yp);
  }
  return { gx, gy };
}

function sobelRow(d: Float32Array, gx: Float32Array, gy: Float32Array, W: number, ym: number, y0: number, yp: number): void {
  for (let x = 0; x < W; x++) {
    const xm = x === 0 ? Math.min(1, W - 1) : x - 1;
    const xp = x === W - 1 ? Math.max(0, W - 2) : x + 1;
    gx[y0 + x] = d[ym + xp] - d[ym + xm] + 2 * (d[y0 + xp] - d[y0 + xm]) + d[yp + xp] - d[yp + xm];
    gy[y0 + x] = d[yp + xm] - d[ym + xm] + 2 * (d[yp + x] - d[ym + x]) + d[yp + xp] - d[ym + xp];
  }
}

/** out[i] = a[i]·b[i]. */
function product(a: Float32Array, b: Float32Array, out: Float32Array): Float32Array {
  for (let i = 0; i < a.length; i++) out[i] = a[i] * b[i];
  return out;
}

/** Median of log(max(v, floor)) over every `step`-th value. */
function medianLog(v: Float32Array, floor: number): number {
  const step = Math.max(1, Math.floor(v.length / 200_000));
  const s = new Float32Array(Math.ceil(v.length / step));
  for (let i = 0, k = 0; i < v.length; i += step, k++) s[k] = Math.log(Math.max(v[i], floor));
  return quantile(s, 0.5);
}

const LOG_FLOOR = 1e-3;

/** brightness: log mean − median log brightness of the image. */
function logRelative(mean: Float32Array, med: number): Float32Array {
  const out = new Float32Array(mean.length);
  for (let i = 0; i < mean.length; i++) out[i] = Math.log(Math.max(mean[i], LOG_FLOOR)) - med;
  return out;
}

/** contrast: ½ log(variance) − log(mean); gradient: ½ log(mean |∇I|²) − log(mean). */
function logRatio(second: Float32Array, mean: Float32Array, subtractSquaredMean: boolean): Float32Array {
  const out = new Float32Array(mean.length);
  for (let i = 0; i < mean.length; i++) {
    const m = mean[i];
    const v = subtractSquaredMean ? second[i] - m * m : second[i];
    out[i] = 0.5 * Math.log(Math.max(v, 0) + 1e-8) - Math.log(Math.max(m, LOG_FLOOR));
  }
  return out;
}

/** Coherence (λ₁ − λ₂)/(λ₁ + λ₂) of the structure tensor [Jxx Jxy; Jxy Jyy]. */
function coherence(jxx: Float32Array, jyy: Float32Array, jxy: Float32Array): Float32Array {
  const out = new Float32Array(jxx.length);
  for (let i = 0; i < jxx.length; i++) {
    const a = jxx[i] - jyy[i];
    const t = jxx[i] + jyy[i];
    out[i] = t > 1e-10 ? Math.sqrt(a * a + 4 * jxy[i] * jxy[i]) / t : 0;
  }
  return out;
}

/**
 * Radiality: coherence × cos 2(φ − θ), φ the dominant gradient orientation (cos 2φ ∝ Jxx − Jyy,
 * sin 2φ ∝ 2Jxy), θ the direction from the centre: +1 for marks running round the centre
 * (turning marks on a notch flank: the gradient points radially), −1 for radial marks
 * (striations, ridges), 0 for isotropic texture.
 */
function radiality(jxx: Float32Array, jyy: Float32Array, jxy: Float32Array, cos2t: Float32Array, sin2t: Float32Array): Float32Array {
  const out = new Float32Array(jxx.length);
  for (let i = 0; i < jxx.length; i++) {
    const t = jxx[i] + jyy[i];
    out[i] = t > 1e-10 ? ((jxx[i] - jyy[i]) * cos2t[i] + 2 * jxy[i] * sin2t[i]) / t : 0;
  }
  return out;
}

/** cos 2θ and sin 2θ of the direction from the centre at every pixel (y down). */
function radialDirections(W: number, H: number, c: { x: number; y: number }): { cos2t: Float32Array; sin2t: Float32Array } {
  const cos2t = new Float32Array(W * H);
  const sin2t = new Float32Array(W * H);
  for (let y = 0; y < H; y++) {
    for (let x = 0; x < W; x++) {
      const dx = x - c.x;
      const dy = y - c.y;
      const r2 = dx * dx + dy * dy;
      if (r2 < 1e-9) continue;
      cos2t[y * W + x] = (dx * dx - dy * dy) / r2;
      sin2t[y * W + x] = (2 * dx * dy) / r2;
    }
  }
  return { cos2t, sin2t };
}

/**
 * Computes the feature maps of the set on a working copy.
 *
 * @param work - working copy (gray 0..1)
 * @param umPerWorkPx - pixel size of the working copy, µm per px
 * @param windowsUm - the windows, µm (each becomes an odd px side ≥ 3 on this image)
 * @param center - the specimen centre, working px (for the radiality)
 * @returns the maps in the order of {@link pixelFeatureNames}
 */
export function computePixelFeatures(work: GrayRaster, umPerWorkPx: number, windowsUm: readonly number[], center: { x: number; y: number }): PixelFeatures {
  const { width: W, height: H, data } = work;
  if (W < 8 || H < 8) throw new FractozoneError('BAD_PARAMETER', `the image (${W}×${H} px working copy) is too small for the pixel classifier`);
  const n = W * H;
  const tmp = new Float32Array(n);
  const box = (src: Float32Array, w: number): Float32Array => {
    const out = new Float32Array(n);
    boxMeanInto(src, W, H, w, out);
    return out;
  };
  const fine = box(data, 3);
  const med = medianLog(fine, LOG_FLOOR);
  const maps: Float32Array[] = [logRelative(fine, med)];
  const sq = product(data, data, new Float32Array(n));
  const { gx, gy } = sobel(work);
  const gxx = product(gx, gx, new Float32Array(n));
  const gyy = product(gy, gy, new Float32Array(n));
  const gxy = product(gx, gy, new Float32Array(n));
  const { cos2t, sin2t } = radialDirections(W, H, center);
  for (const wUm of windowsUm) {
    const w = windowPxAt(wUm, umPerWorkPx, W, H);
    const mean = box(data, w);
    const second = box(sq, w);
    const jxx = box(gxx, w);
    const jyy = box(gyy, w);
    const jxy = box(gxy, w);
    for (let i = 0; i < n; i++) tmp[i] = jxx[i] + jyy[i];
    maps.push(
      logRelative(mean, med),
      logRatio(second, mean, true),
      localEntropy(work, W, H, w).data,
      logRatio(tmp, mean, false),
      coherence(jxx, jyy, jxy),
      radiality(jxx, jyy, jxy, cos2t, sin2t),
    );
  }
  return { width: W, height: H, names: pixelFeatureNames(windowsUm), maps };
}

/** The feature vector of pixel i into x. */
export function featureVector(f: PixelFeatures, i: number, x: Float32Array | Float64Array): void {
  for (let k = 0; k < f.maps.length; k++) x[k] = f.maps[k][i];
}

/**
 * The centre the radiality is measured from: the centre of the fixed-rule outline of the working
 * copy (segment/specimen.ts), or the image centre when that finds no specimen.
 */
export function featureCentre(frame: WorkingFrame): PointPx {
  try {
    const s = findSpecimen(frame.work, { excludeBoxes: frame.workMarks });
    return { x: s.circle.cx, y: s.circle.cy };
  } catch (e) {
    if ((e as { code?: string }).code !== 'NO_SPECIMEN') throw e;
    return { x: (frame.work.width - 1) / 2, y: (frame.work.height - 1) / 2 };
  }
}
