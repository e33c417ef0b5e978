/**
 * Sub-pixel boundary refinement along rays on a feature that is LINEAR in the area fraction of
 * the two textures (box average of a pointwise energy), and sub-pixel outer-edge refinement on
 * the lightly smoothed intensity.
 *
 * Why: a threshold on a nonlinear windowed feature (std, log-variance, entropy) at the class
 * midpoint is reached when only a small part of the window is rough (with σ_rough = 10·σ_smooth
 * the log-midpoint is reached at ~9 % rough area), which shifts the boundary by ~0.4 window into
 * the rim. The box mean of a pointwise energy e = (I − m₅(I))² is f·E_core + (1 − f)·E_rim for a
 * rough area fraction f of the window, so its midpoint is crossed where f = ½, i.e. on the
 * boundary itself (straight boundary, symmetric window).
 */
import { getCv } from '../cv.js';
import { FractozoneError } from '../errors.js';
import { createRaster, type GrayRaster } from '../image/raster.js';
import type { PointPx } from '../image/geometry.js';
import { buildRayIndex, castRay, rayDirection } from '../measure/geometry.js';
import { rasterToMat } from './cvutil.js';

/**
 * Box-averaged pointwise high-pass energy: e = (I − boxMean_hp(I))², then the box mean of e over
 * `windowPx` (reflect-101 borders). Linear in the area fraction of two locally homogeneous
 * textures inside the window.
 *
 * @param r - gray raster 0..1
 * @param windowPx - side of the averaging window, px (odd is best)
 * @param highPassPx - side of the local mean removed before squaring, px (default 5)
 * @returns energy raster, (gray level)²
 */
export function boxEnergy(r: GrayRaster, windowPx: number, highPassPx = 5): GrayRaster {
  const cv = getCv();
  const w = Math.max(1, Math.round(windowPx));
  const img = rasterToMat(r);
  const m = new cv.Mat();
  try {
    cv.boxFilter(img, m, -1, new cv.Size(highPassPx, highPassPx), new cv.Point(-1, -1), true, cv.BORDER_REFLECT_101);
    cv.subtract(img, m, img);
    cv.multiply(img, img, img);
    cv.boxFilter(img, m, -1, new cv.Size(w, w), new cv.Point(-1, -1), true, cv.BORDER_REFLECT_101);
    return createRaster(r.width, r.height, Float32Array.from(m.data32F as Float32Array));
  } finally {
    img.delete();
    m.delete();
  }
}

/** Bilinear sample of a raster at (x, y) px; clamps at the border. */
function sample(r: GrayRaster, x: number, y: number): number {
  const W = r.width;
  const H = r.height;
  const xc = Math.min(W - 1, Math.max(0, x));
  const yc = Math.min(H - 1, Math.max(0, y));
  const x0 = Math.min(W - 2, Math.floor(xc));
  const y0 = Math.min(H - 2, Math.floor(yc));
  const fx = xc - x0;
  const fy = yc - y0;
  const d = r.data;
  const i = y0 * W + x0;
  return (d[i] * (1 - fx) + d[i + 1] * fx) * (1 - fy) + (d[i + W] * (1 - fx) + d[i + W + 1] * fx) * fy;
}

function median(a: number[]): number {
  if (!a.length) return NaN;
  const s = [...a].sort((p, q) => p - q);
  const n = s.length;
  return n % 2 ? s[(n - 1) / 2] : 0.5 * (s[n / 2 - 1] + s[n / 2]);
}

/** Circular running median of a radius profile (null entries are skipped; they stay null). */
function circularMedian(v: (number | null)[], k: number): (number | null)[] {
  const n = v.length;
  const h = Math.floor(k / 2);
  return v.map((x, i) => {
    if (x === null) return null;
    const w: number[] = [];
    for (let j = -h; j <= h; j++) {
      const y = v[(i + j + n) % n];
      if (y !== null) w.push(y);
    }
    return median(w);
  });
}

/** Options of {@link refineBoundary}. */
export interface RefineBoundaryOptions {
  /** Averaging window of the energy, px (use the texture window). */
  windowPx: number;
  /** Number of rays (default 360). */
  nRays?: number;
  /** Angular sector (degrees) over which the rim and core levels are pooled (default 20°). */
  sectorDeg?: number;
  /** Search half-range around the coarse boundary, in windows (default 1.5). */
  searchWindows?: number;
  /** Running-median length along θ, rays (default 5). */
  medianRays?: number;
  /**
   * 'step' (default): pointwise Sobel energy averaged only TANGENTIALLY (over ± half a window
   * across the ray), then a two-level step fit along the ray. 'box': midpoint crossing of the
   * box-averaged pointwise energy ({@link boxEnergy}). Both are unbiased for a clean texture step;
   * 'step' is also insensitive to a bright/dark line on the boundary (which the box average
   * spreads over a whole window) and to any monotone transform of the feature.
   */
  method?: 'step' | 'box';
  /** Precomputed energy at full resolution: box-averaged for 'box', pointwise for 'step'. */
  energy?: GrayRaster;
}

/** Result of {@link refineBoundary}. */
export interface RefinedBoundary {
  /** Refined boundary, one vertex per ray, px. */
  polygon: PointPx[];
  thetaDeg: number[];
  /** Refined radii from the centre (null where the coarse boundary was missing). */
  radiiPx: (number | null)[];
  coarseRadiiPx: (number | null)[];
  /** Rays on which no midpoint crossing was found (the coarse radius was kept). */
  nFallback: number;
}

/**
 * Refine a coarse rim/core boundary along rays. For each ray θ (project convention) the energy
 * profile E(t) is sampled every 0.5 px (bilinear). Rim level: median of E between 0.75 window
 * outside the coarse boundary and 0.75 window inside the outer edge; core level: median of E
 * between 2 and 0.75 windows inside the coarse boundary; both pooled (median) over the rays of a
 * `sectorDeg` sector, so a slanted rim with changing shading is handled. The boundary is put where
 * E crosses the midpoint (E_rim + E_core)/2 going outward from core to rim, the crossing nearest
 * the coarse boundary within ± searchWindows windows, with linear sub-pixel interpolation; then a
 * circular running median over `medianRays` rays rejects outliers.
 *
 * @param r - gray raster 0..1 (full resolution)
 * @param outer - specimen outer contour, px
 * @param coarse - coarse boundary polygon, px
 * @param center - ray origin, px
 * @param opts - window, rays, sector, precomputed energy
 * @returns the refined polygon and radii
 */
export function refineBoundary(
  r: GrayRaster,
  outer: readonly PointPx[],
  coarse: readonly PointPx[],
  center: PointPx,
  opts: RefineBoundaryOptions,
): RefinedBoundary {
  if (!(opts.windowPx >= 1)) throw new FractozoneError('BAD_PARAMETER', 'The refinement window must be at least 1 px.');
  const nRays = opts.nRays ?? 360;
  const W = opts.windowPx;
  const method = opts.method ?? 'step';
  const E = method === 'box' ? opts.energy ?? boxEnergy(r, W) : r;
  if (E.width !== r.width || E.height !== r.height) throw new FractozoneError('BAD_PARAMETER', 'The energy raster must have the image size.');
  const oIdx = buildRayIndex(outer, center);
  const cIdx = buildRayIndex(coarse, center);
  const step = 0.5;
  const thetas: number[] = [];
  const ro: (number | null)[] = [];
  const rc: (number | null)[] = [];
  const profiles: Float64Array[] = [];
  const rimL: number[] = [];
  const coreL: number[] = [];
  for (let i = 0; i < nRays; i++) {
    const th = (360 * i) / nRays;
    thetas.push(th);
    const ho = castRay(oIdx, th);
    const hc = castRay(cIdx, th);
    const o = ho.length ? ho[ho.length - 1] : null;
    const c = hc.length ? hc[hc.length - 1] : null;
    ro.push(o);
    rc.push(c);
    const d = rayDirection(th);
    const len = o ?? 0;
    const p = new Float64Array(Math.max(1, Math.floor(len / step) + 1));
    if (method === 'box') {
      for (let k = 0; k < p.length; k++) p[k] = sample(E, center.x + k * step * d.x, center.y + k * step * d.y);
    } else if (c !== null) {
      // only the part of the ray that the levels and the search need: intensity variance along
      // an ARC of constant radius (±half a window), log
      const hw = Math.max(1, Math.floor(W / 2));
      const kA = Math.max(1, Math.floor((c - 2.2 * W) / step));
      const th0 = (th * Math.PI) / 180;
      for (let k = kA; k < p.length; k++) {
        const t = k * step;
        let s1 = 0;
        let s2 = 0;
        // arc points at angles th0 + u/t, u = −hw…hw: the direction is rotated by 1/t per step
        // (angle-addition recurrence, 4 trig calls per radius instead of 2·(2hw + 1))
        const cd = Math.cos(1 / t);
        const sd = Math.sin(1 / t);
        let ca = Math.cos(th0 - hw / t);
        let sa = Math.sin(th0 - hw / t);
        for (let u = -hw; u <= hw; u++) {
          const v = sample(E, center.x + t * ca, center.y - t * sa);
          s1 += v;
          s2 += v * v;
          const cn = ca * cd - sa * sd;
          sa = sa * cd + ca * sd;
          ca = cn;
        }
        const nn = 2 * hw + 1;
        p[k] = Math.log(Math.max(s2 / nn - (s1 / nn) ** 2, 0) + 1e-10);
      }
    }
    profiles.push(p);
    let rimV = NaN;
    let coreV = NaN;
    if (o !== null && c !== null) {
      const at = (t0: number, t1: number): number[] => {
        const out: number[] = [];
        for (let k = Math.max(0, Math.ceil(t0 / step)); k <= Math.min(p.length - 1, Math.floor(t1 / step)); k++) out.push(p[k]);
        return out;
      };
      let rs = at(c + 0.75 * W, o - 0.75 * W);
      if (!rs.length) {
        const alt = at(c + 0.25 * W, o - 0.5 * W);
        rs = alt.length ? [Math.min(...alt)] : [];
      }
      rimV = rs.length ? median(rs) : NaN;
      const cs = at(c - 2 * W, c - 0.75 * W);
      coreV = cs.length ? median(cs) : NaN;
    }
    rimL.push(rimV);
    coreL.push(coreV);
  }
  const halfSector = Math.max(0, Math.round(((opts.sectorDeg ?? 20) / 2) * (nRays / 360)));
  const pooled = (arr: number[], i: number): number => {
    const w: number[] = [];
    for (let j = -halfSector; j <= halfSector; j++) {
      const v = arr[(i + j + nRays) % nRays];
      if (Number.isFinite(v)) w.push(v);
    }
    return median(w);
  };
  const search = (opts.searchWindows ?? 1.5) * W;
  const refined: (number | null)[] = [];
  let nFallback = 0;
  for (let i = 0; i < nRays; i++) {
    const c = rc[i];
    const o = ro[i];
    if (c === null || o === null) {
      refined.push(null);
      continue;
    }
    const eR = pooled(rimL, i);
    const eC = pooled(coreL, i);
    if (!(Number.isFinite(eR) && Number.isFinite(eC) && eC > eR)) {
      refined.push(c);
      nFallback++;
      continue;
    }
    // 'box': midpoint of the linear energy levels. 'step': the profile is a log-variance (robust
    // to outliers); the level is the mean of two midpoints — of the log-variances (geometric mean
    // of the variances) and of the standard deviations mapped back to log-variance. Across a fuzzy
    // boundary where the two textures blend as b·core + (1 − b)·rim the variance is
    // b²V_c + (1 − b)²V_r: the log midpoint is reached before b = ½ (towards the rim), the std
    // midpoint after it (towards the core). Measured on two independent synthetic generators
    // (src/core/render and scripts/fixtures/make_external_fractographs.py) the first sat 0.6 px
    // rimward / ~0.1 px, the second 0.2 px / 0.7 px coreward; their mean stays within ~0.3 px on both.
    const logMid = 0.5 * (eR + eC);
    const stdMid = 2 * Math.log(0.5 * (Math.exp(eR / 2) + Math.exp(eC / 2)));
    const mid = method === 'box' ? 0.5 * (eR + eC) : 0.5 * (logMid + stdMid);
    const p = profiles[i];
    const k0 = Math.max(1, Math.floor(Math.max(0, c - search) / step));
    const k1 = Math.min(p.length - 1, Math.ceil(Math.min(o - 0.5 * W, c + search) / step));
    let best: number | null = null;
    if (method === 'box') {
      for (let k = k0; k <= k1; k++) {
        const a = p[k - 1] - mid;
        const b = p[k] - mid;
        if (a >= 0 && b < 0) {
          const t = (k - 1 + a / (a - b)) * step;
          if (best === null || Math.abs(t - c) < Math.abs(best - c)) best = t;
        }
      }
    } else if (k1 > k0) {
      // two-level step fit with the levels fixed: cost(b) = const + 2(Lc − Lr)·Σ_{t<b}(mid − q(t)),
      // so b is the argmin of the running sum of (mid − q); sub-sample position by linear
      // interpolation of the midpoint crossing next to it
      let run = 0;
      let minRun = 0;
      let kMin = k0;
      for (let k = k0; k <= k1; k++) {
        run += mid - p[k];
        if (run < minRun) {
          minRun = run;
          kMin = k + 1;
        }
      }
      if (kMin > k0 && kMin <= k1) {
        const a = p[kMin - 1] - mid;
        const b = p[kMin] - mid;
        const frac = a > 0 && b < 0 ? a / (a - b) : 0.5;
        best = (kMin - 1 + frac) * step;
      }
    }
    if (best === null) {
      nFallback++;
      refined.push(c);
    } else refined.push(best);
  }
  const smooth = circularMedian(refined, opts.medianRays ?? 5);
  const polygon: PointPx[] = [];
  smooth.forEach((rad, i) => {
    if (rad === null) return;
    const d = rayDirection(thetas[i]);
    polygon.push({ x: center.x + rad * d.x, y: center.y + rad * d.y });
  });
  return { polygon, thetaDeg: thetas, radiiPx: smooth, coarseRadiiPx: rc, nFallback };
}

/** Reflect-101 index into [0, n) (OpenCV BORDER_REFLECT_101: … 2 1 | 0 1 2 … n−2 | n−1 n−2 …). */
function reflect101(i: number, n: number): number {
  if (n === 1) return 0;
  while (i < 0 || i >= n) i = i < 0 ? -i : 2 * n - 2 - i;
  return i;
}

/**
 * Bilinear sampler of the Gaussian-smoothed raster, evaluated only where it is read: the same
 * values as cv.GaussianBlur(σ, kernel side round(8σ + 1) | 1, BORDER_REFLECT_101) followed by a
 * bilinear sample, without blurring (and copying) the whole image. Smoothed pixels are computed
 * on demand and cached; the outer-edge refinement reads ~10⁴ of them instead of 12·10⁶.
 */
function localGaussian(r: GrayRaster, sigma: number): (x: number, y: number) => number {
  const W = r.width;
  const H = r.height;
  const d = r.data;
  const ks = Math.round(sigma * 8 + 1) | 1;
  const h = (ks - 1) / 2;
  const k = new Float64Array(ks);
  let ksum = 0;
  for (let i = 0; i < ks; i++) ksum += k[i] = Math.exp(-((i - h) * (i - h)) / (2 * sigma * sigma));
  for (let i = 0; i < ks; i++) k[i] /= ksum;
  const cache = new Map<number, number>();
  const xs = new Int32Array(ks);
  const pix = (x: number, y: number): number => {
    const key = y * W + x;
    const c = cache.get(key);
    if (c !== undefined) return c;
    for (let i = 0; i < ks; i++) xs[i] = reflect101(x + i - h, W);
    let v = 0;
    for (let j = 0; j < ks; j++) {
      const row = reflect101(y + j - h, H) * W;
      let s = 0;
      for (let i = 0; i < ks; i++) s += k[i] * d[row + xs[i]];
      v += k[j] * s;
    }
    v = Math.fround(v);
    cache.set(key, v);
    return v;
  };
  return (x: number, y: number): number => {
    const xc = Math.min(W - 1, Math.max(0, x));
    const yc = Math.min(H - 1, Math.max(0, y));
    const x0 = Math.max(0, Math.min(W - 2, Math.floor(xc)));
    const y0 = Math.max(0, Math.min(H - 2, Math.floor(yc)));
    const x1 = Math.min(W - 1, x0 + 1);
    const y1 = Math.min(H - 1, y0 + 1);
    const fx = xc - x0;
    const fy = yc - y0;
    return (pix(x0, y0) * (1 - fx) + pix(x1, y0) * fx) * (1 - fy) + (pix(x0, y1) * (1 - fx) + pix(x1, y1) * fx) * fy;
  };
}

/** Options of {@link refineOuterEdge}. */
export interface RefineOuterOptions {
  nRays?: number;
  /** Gaussian σ of the intensity smoothing, px (default 1). */
  sigmaPx?: number;
  /** Half-range of the search around the contour, px (default 4). */
  searchPx?: number;
}

/**
 * Sub-pixel outer edge along rays: the lightly smoothed intensity is sampled along each ray around
 * the contour radius; inside / outside levels are the medians over 3–7 px on either side; the
 * edge is the midpoint crossing nearest the contour (linear interpolation). When no crossing is
 * found the contour radius + 0.5 px is used (the contour runs through the centres of the outermost
 * specimen pixels, half a pixel inside the edge).
 *
 * @param r - gray raster 0..1
 * @param contour - specimen outer contour, px
 * @param center - ray origin, px
 * @param opts - rays, smoothing, search range
 * @returns polygon with one vertex per ray (px), radii, and the number of fallbacks
 */
export function refineOuterEdge(
  r: GrayRaster,
  contour: readonly PointPx[],
  center: PointPx,
  opts: RefineOuterOptions = {},
): { polygon: PointPx[]; radiiPx: (number | null)[]; nFallback: number } {
  const nRays = opts.nRays ?? 360;
  const sig = opts.sigmaPx ?? 1;
  const search = opts.searchPx ?? 4;
  const sm = localGaussian(r, sig);
  const idx = buildRayIndex(contour, center);
  const radii: (number | null)[] = [];
  const polygon: PointPx[] = [];
  let nFallback = 0;
  for (let i = 0; i < nRays; i++) {
    const th = (360 * i) / nRays;
    const h = castRay(idx, th);
    if (!h.length) {
      radii.push(null);
      continue;
    }
    const c = h[h.length - 1];
    const d = rayDirection(th);
    const at = (t: number): number => sm(center.x + t * d.x, center.y + t * d.y);
    const ins: number[] = [];
    const outs: number[] = [];
    for (let t = 3; t <= 7; t += 0.5) {
      ins.push(at(c - t));
      outs.push(at(c + t));
    }
    const lin = median(ins);
    const lout = median(outs);
    const mid = 0.5 * (lin + lout);
    let best: number | null = null;
    const x = center.x + (c + 2) * d.x;
    const y = center.y + (c + 2) * d.y;
    const inFrame = x >= 0 && y >= 0 && x <= r.width - 1 && y <= r.height - 1;
    if (inFrame && Math.abs(lin - lout) > 1e-3) {
      let prev = at(c - search) - mid;
      for (let t = c - search + 0.25; t <= c + search + 1e-9; t += 0.25) {
        const v = at(t) - mid;
        if ((prev >= 0 && v < 0) || (prev <= 0 && v > 0)) {
          const tc = t - 0.25 + 0.25 * (prev / (prev - v));
          if (best === null || Math.abs(tc - c - 0.5) < Math.abs(best - c - 0.5)) best = tc;
        }
        prev = v;
      }
    }
    if (best === null) {
      nFallback++;
      best = inFrame ? c + 0.5 : c;
    }
    radii.push(best);
    polygon.push({ x: center.x + best * d.x, y: center.y + best * d.y });
  }
  return { polygon, radiiPx: radii, nFallback };
}
