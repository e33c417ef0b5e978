/**
 * Sub-pixel outer edge of the specimen along rays, on the lightly smoothed intensity (the midpoint
 * crossing between the inside and outside levels nearest the traced contour; between the inside and
 * the floor of a dark groove where one lies just outside the edge).
 */
import type { PointPx } from '../image/geometry.js';
import type { GrayRaster } from '../image/raster.js';
import { buildRayIndex, castRay, polygonOfRadii, rayDirection } from '../measure/geometry.js';
import { medianOf as median } from '../measure/statistics.js';
import { circularMedian } from './refine.js';

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
): { polygon: PointPx[]; radiiPx: (number | null)[]; nFallback: number; nSpikes: number } {
  const nRays = opts.nRays ?? 360;
  const sig = opts.sigmaPx ?? 1;
  const search = opts.searchPx ?? 4;
  const sm = localGaussian(r, sig);
  const idx = buildRayIndex(contour, center);
  const radii: (number | null)[] = [];
  let nFallback = 0;
  const along = (th: number): ((t: number) => number) => {
    const d = rayDirection(th);
    return (t: number): number => sm(center.x + t * d.x, center.y + t * d.y);
  };
  const inFrameAt = (th: number, t: number): boolean => {
    const d = rayDirection(th);
    const x = center.x + t * d.x;
    const y = center.y + t * d.y;
    return x >= 0 && y >= 0 && x <= r.width - 1 && y <= r.height - 1;
  };
  for (let i = 0; i < nRays; i++) {
    const th = (360 * i) / nRays;
    const h = castRay(idx, th);
    if (!h.length) {
      radii.push(null);
      continue;
    }
    const c = h[h.length - 1];
    const inFrame = inFrameAt(th, c + 2);
    let best = inFrame ? crossingNear(along(th), c, search) : null;
    if (best === null) {
      nFallback++;
      best = inFrame ? c + 0.5 : c;
    }
    radii.push(best);
  }
  // A ray whose edge stands more than SPIKE_PX off the running median of its neighbours followed a
  // spike of the traced contour (a noise blob on the silhouette; independent sem.tif: +14 px and
  // +6 px on single rays): its crossing is looked for again around that median, or the median is taken.
  const med = circularMedian(radii, SPIKE_RAYS);
  let nSpikes = 0;
  for (let i = 0; i < nRays; i++) {
    const ri = radii[i];
    const m = med[i];
    if (ri === null || m === null || Math.abs(ri - m) <= SPIKE_PX) continue;
    const th = (360 * i) / nRays;
    const again = inFrameAt(th, m + 1.5) ? crossingNear(along(th), m - 0.5, search) : null;
    radii[i] = again !== null && Math.abs(again - m) <= SPIKE_PX ? again : m;
    nSpikes++;
  }
  return { polygon: polygonOfRadii(radii, center, nRays), radiiPx: radii, nFallback, nSpikes };
}

/** Rays of the running median a ray's edge is checked against, and the largest distance from it, px. */
const SPIKE_RAYS = 7;
const SPIKE_PX = 2;

/**
 * A dark groove just outside the edge: depth below the darker of the inside and outside levels, at
 * least this share of their difference and at least {@link GROOVE_MIN_DEPTH}.
 */
const GROOVE_DEPTH_SHARE = 0.25;
/** Least depth of a groove, intensity 0..1 (5 grey levels of 255; several times the noise left after σ = 1 smoothing). */
const GROOVE_MIN_DEPTH = 0.02;

/**
 * The floor of a dark groove between the edge and the outside level, or null. A notch root seen end
 * on: past the edge the root fillet turns away from a light from above (dark), then the notch flank
 * faces the camera again and can be nearly as bright as the rim. The outside level 3–7 px out is then
 * the flank's, and the midpoint between it and the rim is crossed early on the fall into the groove:
 * ≈ 1.1–1.35 px inside the root on four scenes of our renderer lit from 60–85° (mean over the rays).
 * With a groove the edge is the step into it, so the level is the midpoint between the rim and the
 * groove's floor (the lowest smoothed value from 1 px inside to 4 px outside c). A shadow or a dark
 * background beside the edge is a groove too and changes little (its floor is about the outside level).
 */
function grooveFloor(at: (t: number) => number, c: number, lin: number, lout: number): number | null {
  let floor = Infinity;
  for (let t = c - 1; t <= c + 4 + 1e-9; t += 0.25) floor = Math.min(floor, at(t));
  const depth = Math.min(lin, lout) - floor;
  return depth >= GROOVE_DEPTH_SHARE * Math.abs(lin - lout) && depth >= GROOVE_MIN_DEPTH ? floor : null;
}

/**
 * The midpoint crossing nearest c + 0.5 along one ray within ±search px of c, or null: inside and
 * outside levels are the medians of the smoothed intensity 3–7 px either side of c; where a dark
 * groove lies between them ({@link grooveFloor}) the level is the midpoint between the inside and the
 * groove's floor.
 */
function crossingNear(at: (t: number) => number, c: number, search: number): number | null {
  const ins: number[] = [];
  const outs: number[] = [];
  for (let t = 3; t <= 7; t += 0.5) {
    ins.push(at(c - t));
    outs.push(at(c + t));
  }
  const lin = median(ins);
  const lout = median(outs);
  const groove = grooveFloor(at, c, lin, lout);
  const mid = groove === null ? 0.5 * (lin + lout) : 0.5 * (lin + groove);
  let best: number | null = null;
  if (Math.abs(lin - lout) > 1e-3 || groove !== null) {
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
  return best;
}
