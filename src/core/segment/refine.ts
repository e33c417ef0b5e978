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
import { buildRayIndex, castRay, rayDirection, type RayIndex } from '../measure/geometry.js';
import { medianOf as median } from '../measure/statistics.js';
import { fillCoreNotches } from './coreNotches.js';
import { POOL_WINDOWS, pooledProfile, poolHalfRays } from './rayPool.js';
import { rasterToMat } from './cvutil.js';
import { boxCrossing, STEP, stepFit, stepLevel } from './stepLevel.js';

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
  return samplePlane(r.data, r.width, r.height, x, y);
}

/** Bilinear sample of a plane (W × H, W, H ≥ 2) at (x, y) px, clamped to the plane. */
export function samplePlane(d: Float32Array, W: number, H: number, x: number, y: number): number {
  const xc = Math.min(W - 1, Math.max(0, x));
  const yc = Math.min(H - 1, Math.max(0, y));
  const x0 = Math.min(W - 2, Math.floor(xc));
  const y0 = Math.min(H - 2, Math.floor(yc));
  const fx = xc - x0;
  const fy = yc - y0;
  const i = y0 * W + x0;
  return (d[i] * (1 - fx) + d[i + 1] * fx) * (1 - fy) + (d[i + W] * (1 - fx) + d[i + W + 1] * fx) * fy;
}

/** Circular running median of a radius profile (null entries are skipped; they stay null). */
export function circularMedian(v: (number | null)[], k: number): (number | null)[] {
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
  /**
   * Where the level sits between its two candidates (see {@link stepLevel}): 'mean' (default),
   * 'log' (the log-variance midpoint, one end of the level's tolerance) or 'std' (the
   * standard-deviation midpoint, the other end); for 'box' the ends are the midpoint ∓
   * `BOX_LEVEL_TOLERANCE` (stepLevel.ts) of the step. The ends are used for the parameter range.
   */
  level?: 'mean' | 'log' | 'std';
  /**
   * Pixels whose intensity says nothing about the texture (1; e.g. glints replaced by their
   * surroundings, segment/glints.ts), at the raster's size: left out of the arc variances; where
   * too few are left the profile has a gap, which the levels skip and the step fit does not count.
   */
  missing?: Uint8Array | null;
  /**
   * 'step' only: the step is fitted to the median profile of the rays whose arcs lie within ± this
   * many windows of arc length (segment/rayPool.ts; 0: each ray's own profile). Default
   * {@link POOL_WINDOWS}, and 0 where pixels are `missing` (see there).
   */
  poolWindows?: number;
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


/** One ray: its angle, the outer and coarse boundary radii (px) and the sampled profile. */
interface RayProfile {
  th: number;
  o: number | null;
  c: number | null;
  /** Profile sampled every {@link STEP} px from the centre (log arc variance for 'step', energy for 'box'). */
  p: Float64Array;
}

/**
 * Log intensity variance along an ARC of constant radius (±half a window) at each radius of the
 * ray, only where the levels and the search need it (from 2.2 windows inside the coarse boundary).
 */
function arcVarianceProfile(E: GrayRaster, center: PointPx, th: number, c: number, p: Float64Array, W: number, missing: Uint8Array | null): void {
  const hw = Math.max(1, Math.floor(W / 2));
  const kA = Math.max(1, Math.floor((c - 2.2 * W) / STEP));
  const th0 = (th * Math.PI) / 180;
  for (let k = kA; k < p.length; k++) {
    const t = k * STEP;
    let s1 = 0;
    let s2 = 0;
    // arc points at angles th0 + u/t, u = −hw…hw: the direction is rotated by 1/t per step
    // (angle-addition recurrence, 4 trig calls per radius instead of 2·(2hw + 1))
    const cd = Math.cos(1 / t);
    const sd = Math.sin(1 / t);
    let ca = Math.cos(th0 - hw / t);
    let sa = Math.sin(th0 - hw / t);
    let nn = 0;
    for (let u = -hw; u <= hw; u++) {
      const x = center.x + t * ca;
      const y = center.y - t * sa;
      if (!missing || !missingAt(missing, E.width, E.height, x, y)) {
        const v = sample(E, x, y);
        s1 += v;
        s2 += v * v;
        nn++;
      }
      const cn = ca * cd - sa * sd;
      sa = sa * cd + ca * sd;
      ca = cn;
    }
    p[k] = nn >= Math.max(MIN_ARC_SAMPLES, MIN_ARC_SHARE * (2 * hw + 1)) ? Math.log(Math.max(s2 / nn - (s1 / nn) ** 2, 0) + 1e-10) : NaN;
  }
}

/**
 * With pixels left out ({@link RefineBoundaryOptions.missing}), an arc's variance needs at least
 * MIN_ARC_SAMPLES samples and MIN_ARC_SHARE of the arc (our choice; on the four glint scenes of
 * the scene set ⅓ instead of ½ moved the mean width by −0.7 to +0.8 %).
 */
const MIN_ARC_SAMPLES = 3;
const MIN_ARC_SHARE = 0.5;

/** Whether the pixel nearest (x, y) is flagged (outside the raster: no). */
function missingAt(m: Uint8Array, W: number, H: number, x: number, y: number): boolean {
  const xi = Math.round(x);
  const yi = Math.round(y);
  return xi >= 0 && yi >= 0 && xi < W && yi < H && m[yi * W + xi] === 1;
}

/** The outer and coarse boundary radii of one ray (px), null where the ray misses a polygon. */
function rayRadii(oIdx: RayIndex, cIdx: RayIndex, th: number): { o: number | null; c: number | null } {
  const ho = castRay(oIdx, th);
  const hc = castRay(cIdx, th);
  return { o: ho.length ? ho[ho.length - 1] : null, c: hc.length ? hc[hc.length - 1] : null };
}

function rayProfile(E: GrayRaster, o: number | null, c: number | null, center: PointPx, th: number, W: number, method: 'step' | 'box', missing: Uint8Array | null): RayProfile {
  const d = rayDirection(th);
  const len = o ?? 0;
  const p = new Float64Array(Math.max(1, Math.floor(len / STEP) + 1));
  if (method === 'box') {
    for (let k = 0; k < p.length; k++) p[k] = sample(E, center.x + k * STEP * d.x, center.y + k * STEP * d.y);
  } else {
    // radii without an arc variance are unknown (NaN), not 0: the step fit pools neighbouring rays
    p.fill(NaN);
    if (c !== null) arcVarianceProfile(E, center, th, c, p, W, missing);
  }
  return { th, o, c, p };
}

/**
 * Rim level: median of the profile between 0.75 window outside the coarse boundary and 0.75 window
 * inside the outer edge (a narrow band: the lowest value nearer the edges); core level: median
 * between 2 and 0.75 windows inside the coarse boundary. NaN where the ray has no such part.
 */
function rayLevels(r: RayProfile, W: number): [number, number] {
  const { o, c, p } = r;
  if (o === null || c === null) return [NaN, NaN];
  const at = (t0: number, t1: number): number[] => {
    const out: number[] = [];
    for (let k = Math.max(0, Math.ceil(t0 / STEP)); k <= Math.min(p.length - 1, Math.floor(t1 / STEP)); k++) if (!Number.isNaN(p[k])) out.push(p[k]);
    return out;
  };
  let rs = at(c + 0.75 * W, o - 0.75 * W);
  if (!rs.length) {
    const alt = at(c + 0.25 * W, o - 0.5 * W);
    rs = alt.length ? [Math.min(...alt)] : [];
  }
  const cs = at(c - 2 * W, c - 0.75 * W);
  return [rs.length ? median(rs) : NaN, cs.length ? median(cs) : NaN];
}

function orElse(v: number, alt: number): number {
  return Number.isFinite(v) ? v : alt;
}

/** Median over the rays within ±halfSector of ray i (circular), of the finite values. */
function pooled(arr: readonly number[], i: number, halfSector: number): number {
  const n = arr.length;
  const w: number[] = [];
  for (let j = -halfSector; j <= halfSector; j++) {
    const v = arr[(i + j + n) % n];
    if (Number.isFinite(v)) w.push(v);
  }
  return median(w);
}

/** The rays' profiles and pooled levels: everything of a refinement but the level and the search. */
interface PreparedRays {
  rays: RayProfile[];
  /** Rim and core levels pooled over the sector around each ray (NaN where the ray has no band). */
  rimPooled: number[];
  corePooled: number[];
}

/** One preparation and what it was made from (compared by identity, the outer outline by value). */
interface PreparedEntry {
  r: GrayRaster;
  E: GrayRaster;
  outer: readonly PointPx[];
  cx: number;
  cy: number;
  key: string;
  prepared: PreparedRays;
}

/**
 * Preparations by coarse boundary: the boundary of one classification is refined at three levels
 * (the measurement and the two ends of its tolerance, pipeline/stages/uncertainty.ts) on the same
 * rays, and only the level differs; the profiles are sampled once (≈ ⅔ of the three refinements'
 * time). The stored profiles are only read.
 */
const PREPARED = new WeakMap<readonly PointPx[], PreparedEntry[]>();

function sameOutline(a: readonly PointPx[], b: readonly PointPx[]): boolean {
  if (a === b) return true;
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) if (a[i].x !== b[i].x || a[i].y !== b[i].y) return false;
  return true;
}

function preparedRays(
  r: GrayRaster, E: GrayRaster, outer: readonly PointPx[], coarse: readonly PointPx[], center: PointPx,
  nRays: number, W: number, method: 'step' | 'box', sectorDeg: number, missing: Uint8Array | null, make: () => PreparedRays,
): PreparedRays {
  const key = `${nRays}|${W}|${method}|${sectorDeg}|${missing ? 'm' : ''}`;
  const list = PREPARED.get(coarse) ?? [];
  const hit = list.find((e) => e.r === r && e.E === E && e.key === key && e.cx === center.x && e.cy === center.y && sameOutline(e.outer, outer));
  if (hit) return hit.prepared;
  const prepared = make();
  list.push({ r, E, outer: outer.map((q) => ({ x: q.x, y: q.y })), cx: center.x, cy: center.y, key, prepared });
  PREPARED.set(coarse, list);
  return prepared;
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
  const sectorDeg = opts.sectorDeg ?? 20;
  const { rays, rimPooled, corePooled } = preparedRays(r, E, outer, coarse, center, nRays, W, method, sectorDeg, opts.missing ?? null, () => {
    const oIdx = buildRayIndex(outer, center);
    const cIdx = buildRayIndex(coarse, center);
    const radii = Array.from({ length: nRays }, (_, i) => rayRadii(oIdx, cIdx, (360 * i) / nRays));
    const coarseC = fillCoreNotches(radii.map((q) => q.c), radii.map((q) => q.o), W);
    const rays = radii.map((q, i) => rayProfile(E, q.o, coarseC[i], center, (360 * i) / nRays, W, method, method === 'step' ? opts.missing ?? null : null));
    const levels = rays.map((ray) => rayLevels(ray, W));
    const rimL = levels.map((l) => l[0]);
    const coreL = levels.map((l) => l[1]);
    const halfSector = Math.max(0, Math.round((sectorDeg / 2) * (nRays / 360)));
    const has = (i: number): boolean => rays[i].c !== null && rays[i].o !== null;
    // with gaps, a sector can have no rim level at all: then the median over all rays
    const rimAll = opts.missing ? median(rimL.filter(Number.isFinite)) : NaN;
    return {
      rays,
      rimPooled: rays.map((_, i) => (has(i) ? orElse(pooled(rimL, i, halfSector), rimAll) : NaN)),
      corePooled: rays.map((_, i) => (has(i) ? pooled(coreL, i, halfSector) : NaN)),
    };
  });
  const search = (opts.searchWindows ?? 1.5) * W;
  const poolWindows = method === 'step' ? opts.poolWindows ?? (opts.missing ? 0 : POOL_WINDOWS) : 0;
  const profiles = rays.map((ray) => ray.p);
  const refined: (number | null)[] = [];
  let nFallback = 0;
  for (let i = 0; i < nRays; i++) {
    const { c, o, p } = rays[i];
    if (c === null || o === null) {
      refined.push(null);
      continue;
    }
    const eR = rimPooled[i];
    const eC = corePooled[i];
    let best: number | null = null;
    if (Number.isFinite(eR) && Number.isFinite(eC) && eC > eR) {
      const mid = stepLevel(eR, eC, method, opts.level);
      const k0 = Math.max(1, Math.floor(Math.max(0, c - search) / STEP));
      const k1 = Math.min(p.length - 1, Math.ceil(Math.min(o - 0.5 * W, c + search) / STEP));
      const half = poolHalfRays(poolWindows, W, nRays, c);
      best = method === 'box' ? boxCrossing(p, mid, k0, k1, c) : stepFit(pooledProfile(profiles, i, half, k0, k1), mid, k0, k1);
    }
    if (best === null) nFallback++;
    refined.push(best ?? c);
  }
  const smooth = circularMedian(refined, opts.medianRays ?? 5);
  const polygon: PointPx[] = [];
  smooth.forEach((rad, i) => {
    if (rad === null) return;
    const d = rayDirection(rays[i].th);
    polygon.push({ x: center.x + rad * d.x, y: center.y + rad * d.y });
  });
  return { polygon, thetaDeg: rays.map((ray) => ray.th), radiiPx: smooth, coarseRadiiPx: rays.map((ray) => ray.c), nFallback };
}
