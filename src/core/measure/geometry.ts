/**
 * Pure polygon geometry for the band measurement: ray casting from a centre with an angular
 * index (so that 360 rays on a 12-MP contour take a few milliseconds), polygon area, point to
 * polygon distance. No image work here.
 *
 * Angle convention (whole project): degrees, 0° = +x, counter-clockwise as seen on screen;
 * direction vector (cos θ, −sin θ) in image coordinates (x right, y down).
 */

import type { BoxPx, PointPx } from '../image/geometry.js';

/** Direction of angle θ (degrees, project convention) in image coordinates. */
export function rayDirection(thetaDeg: number): PointPx {
  const t = (thetaDeg * Math.PI) / 180;
  return { x: Math.cos(t), y: -Math.sin(t) };
}

/**
 * The polygon of per-ray radii (ray i at 360·i/nRays degrees from `centre`, rayDirection's
 * convention); rays without a radius are left out.
 */
export function polygonOfRadii(radii: readonly (number | null)[], centre: PointPx, nRays: number): PointPx[] {
  const out: PointPx[] = [];
  radii.forEach((r, i) => {
    if (r === null) return;
    const d = rayDirection((360 * i) / nRays);
    out.push({ x: centre.x + r * d.x, y: centre.y + r * d.y });
  });
  return out;
}

/** Angle of point p seen from centre c, degrees in [0, 360), project convention. */
export function angleOf(c: PointPx, p: PointPx): number {
  const a = (Math.atan2(-(p.y - c.y), p.x - c.x) * 180) / Math.PI;
  return a < 0 ? a + 360 : a;
}

/**
 * A polygon prepared for fast ray casting from one centre: every edge is filed under the
 * angular bins (of `binDeg`) it spans as seen from the centre.
 */
export interface RayIndex {
  readonly center: PointPx;
  readonly xs: Float64Array;
  readonly ys: Float64Array;
  readonly binDeg: number;
  readonly bins: Int32Array[];
}

/**
 * Prepare a closed polygon for ray casting from `center`.
 *
 * @param polygon - vertices in px (closed implicitly: last → first)
 * @param center - ray origin in px
 * @param binDeg - angular bin width in degrees (default 0.5°)
 * @returns the index used by {@link castRay}
 */
export function buildRayIndex(polygon: readonly PointPx[], center: PointPx, binDeg = 0.5): RayIndex {
  const n = polygon.length;
  const xs = new Float64Array(n);
  const ys = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    xs[i] = polygon[i].x;
    ys[i] = polygon[i].y;
  }
  const nb = Math.ceil(360 / binDeg);
  const lists: number[][] = Array.from({ length: nb }, () => []);
  const ang = new Float64Array(n);
  for (let i = 0; i < n; i++) ang[i] = angleOf(center, polygon[i]);
  for (let i = 0; i < n; i++) {
    const j = i + 1 === n ? 0 : i + 1;
    let a0 = ang[i];
    let d = ang[j] - a0;
    if (d > 180) d -= 360;
    if (d < -180) d += 360;
    let lo = d >= 0 ? a0 : a0 + d;
    let hi = d >= 0 ? a0 + d : a0;
    lo -= 1e-9;
    hi += 1e-9;
    const b0 = Math.floor(lo / binDeg);
    const b1 = Math.floor(hi / binDeg);
    for (let b = b0; b <= b1; b++) lists[((b % nb) + nb) % nb].push(i);
  }
  return { center, xs, ys, binDeg, bins: lists.map((l) => Int32Array.from(l)) };
}

/**
 * All distances t ≥ 0 (px) at which the ray from the index centre in direction θ crosses the
 * polygon, sorted ascending. Edges are closed (with 1e-9 slack) and hits closer than 1e-7 px are
 * merged, so a ray through a vertex counts once.
 *
 * @param index - from {@link buildRayIndex}
 * @param thetaDeg - ray angle, degrees, project convention
 */
export function castRay(index: RayIndex, thetaDeg: number): number[] {
  const { xs, ys, center } = index;
  const n = xs.length;
  const th = ((thetaDeg % 360) + 360) % 360;
  const nb = index.bins.length;
  const b = Math.floor(th / index.binDeg) % nb;
  const d = rayDirection(th);
  const hits: number[] = [];
  const list = index.bins[b];
  for (let k = 0; k < list.length; k++) {
    const i = list[k];
    const j = i + 1 === n ? 0 : i + 1;
    const ex = xs[j] - xs[i];
    const ey = ys[j] - ys[i];
    const denom = d.x * ey - d.y * ex;
    if (Math.abs(denom) < 1e-15) continue;
    const wx = xs[i] - center.x;
    const wy = ys[i] - center.y;
    const t = (wx * ey - wy * ex) / denom;
    const s = (wx * d.y - wy * d.x) / denom;
    if (s >= -1e-9 && s <= 1 + 1e-9 && t >= 0) hits.push(t);
  }
  hits.sort((p, q) => p - q);
  // a ray through a vertex hits both adjacent edges: merge hits closer than 1e-7 px
  const out: number[] = [];
  for (const h of hits) if (!out.length || h - out[out.length - 1] > 1e-7) out.push(h);
  return out;
}

/** Signed polygon area by the shoelace formula, px² (absolute value returned). */
export function polygonArea(polygon: readonly PointPx[]): number {
  let s = 0;
  const n = polygon.length;
  for (let i = 0; i < n; i++) {
    const p = polygon[i];
    const q = polygon[(i + 1) % n];
    s += p.x * q.y - q.x * p.y;
  }
  return Math.abs(s) / 2;
}

/**
 * Shortest distance from p to the polygon's edges, in µm when anisotropic scales are given
 * (each edge is scaled by (sx, sy) before the distance is taken).
 *
 * @param p - point, px
 * @param polygon - closed polygon, px
 * @param sx - µm per px along x (1 → result in px)
 * @param sy - µm per px along y
 * @param skipEdge - optional predicate: edges for which it returns true are ignored
 */
export function distanceToPolygon(
  p: PointPx,
  polygon: readonly PointPx[],
  sx = 1,
  sy = 1,
  skipEdge?: (i: number) => boolean,
): number {
  let best = Infinity;
  const n = polygon.length;
  for (let i = 0; i < n; i++) {
    if (skipEdge && skipEdge(i)) continue;
    const a = polygon[i];
    const b = polygon[(i + 1) % n];
    const ax = (a.x - p.x) * sx;
    const ay = (a.y - p.y) * sy;
    const ex = (b.x - a.x) * sx;
    const ey = (b.y - a.y) * sy;
    const d2 = segmentDistance2(ax, ay, ex, ey);
    if (d2 < best) best = d2;
  }
  return Math.sqrt(best);
}

/**
 * Squared distance from the origin to the segment a → a + e (a = segment start relative to the
 * point, e = segment vector); the closest point's parameter is clamped to [0, 1].
 */
export function segmentDistance2(ax: number, ay: number, ex: number, ey: number): number {
  const ee = ex * ex + ey * ey;
  let t = ee > 0 ? -(ax * ex + ay * ey) / ee : 0;
  t = t < 0 ? 0 : t > 1 ? 1 : t;
  const dx = ax + t * ex;
  const dy = ay + t * ey;
  return dx * dx + dy * dy;
}

/** True when (x, y) lies in one of the axis-aligned boxes (x, y, w, h; px) grown by `margin`. */
export function inBoxes(
  boxes: readonly BoxPx[],
  x: number,
  y: number,
  margin = 0,
): boolean {
  for (const b of boxes) {
    if (x >= b.x - margin && x <= b.x + b.w + margin && y >= b.y - margin && y <= b.y + b.h + margin) return true;
  }
  return false;
}
