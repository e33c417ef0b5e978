/**
 * Fitting the notch root of the model branch (learn/segment.ts): an ellipse through edge points of
 * which many may be wrong, found by RANSAC over circles, and the geometry of rays against it.
 */
import type { PointPx } from '../image/geometry.js';
import { createRng } from '../random.js';
import { fitEllipseToPoints, type EllipseFit } from '../segment/fit.js';

/** Distance along the ray (centre, direction d) to the ellipse, or null when the ray misses it. */
export function rayToEllipse(e: EllipseFit, centre: PointPx, d: PointPx): number | null {
  const th = (e.angleDeg * Math.PI) / 180;
  const u = { x: Math.cos(th), y: -Math.sin(th) };
  const v = { x: Math.sin(th), y: Math.cos(th) };
  const X0 = (centre.x - e.cx) * u.x + (centre.y - e.cy) * u.y;
  const Y0 = (centre.x - e.cx) * v.x + (centre.y - e.cy) * v.y;
  const dX = d.x * u.x + d.y * u.y;
  const dY = d.x * v.x + d.y * v.y;
  const a2 = e.semiMajorPx ** 2;
  const b2 = e.semiMinorPx ** 2;
  const A = (dX * dX) / a2 + (dY * dY) / b2;
  const B = 2 * ((X0 * dX) / a2 + (Y0 * dY) / b2);
  const C = (X0 * X0) / a2 + (Y0 * Y0) / b2 - 1;
  const disc = B * B - 4 * A * C;
  if (!(disc >= 0)) return null;
  const t = (-B + Math.sqrt(disc)) / (2 * A);
  return t > 0 ? t : null;
}

/** Circle through three points, or null when they are (nearly) on a line. */
function circleThrough(a: PointPx, b: PointPx, c: PointPx): { x: number; y: number; r: number } | null {
  const d = 2 * (a.x * (b.y - c.y) + b.x * (c.y - a.y) + c.x * (a.y - b.y));
  if (Math.abs(d) < 1e-9) return null;
  const a2 = a.x * a.x + a.y * a.y;
  const b2 = b.x * b.x + b.y * b.y;
  const c2 = c.x * c.x + c.y * c.y;
  const x = (a2 * (b.y - c.y) + b2 * (c.y - a.y) + c2 * (a.y - b.y)) / d;
  const y = (a2 * (c.x - b.x) + b2 * (a.x - c.x) + c2 * (b.x - a.x)) / d;
  return { x, y, r: Math.hypot(a.x - x, a.y - y) };
}

/**
 * The notch-root ellipse from edge points of which many may be wrong (a lit notch flank or a holder
 * patch classified as surface, a dark patch of the band classified as outside): RANSAC (Fischler &
 * Bolles, Comm. ACM 24, 1981) with circles through three points, 300 seeded draws, inliers within
 * `tol` px; then an ellipse (OpenCV fitEllipse) through the inliers of the best circle, refitted once
 * through its own inliers.
 */
export function robustEllipse(points: readonly PointPx[], tol: number): EllipseFit | null {
  const n = points.length;
  if (n < 8) return null;
  const rng = createRng(n).fork('outline');
  let best: boolean[] = [];
  let bestN = 0;
  for (let it = 0; it < 300; it++) {
    const c = circleThrough(points[rng.int(n)], points[rng.int(n)], points[rng.int(n)]);
    if (!c) continue;
    const inl = points.map((q) => Math.abs(Math.hypot(q.x - c.x, q.y - c.y) - c.r) <= tol);
    const k = inl.filter(Boolean).length;
    if (k > bestN) {
      bestN = k;
      best = inl;
    }
  }
  if (bestN < 8) return null;
  let use = points.filter((_, k) => best[k]);
  let e = fitEllipseToPoints(use);
  if (e) {
    const fit = e;
    const centre = { x: fit.cx, y: fit.cy };
    const again = points.filter((q) => {
      const d = Math.hypot(q.x - centre.x, q.y - centre.y);
      const r = d > 0 ? rayToEllipse(fit, centre, { x: (q.x - centre.x) / d, y: (q.y - centre.y) / d }) : null;
      return r !== null && Math.abs(d - r) <= tol;
    });
    if (again.length >= 8) {
      use = again;
      e = fitEllipseToPoints(use) ?? e;
    }
  }
  return e;
}

/** Points on an ellipse at `n` equal angles about its centre. */
export function ellipseOutline(e: EllipseFit, n: number): PointPx[] {
  const th = (e.angleDeg * Math.PI) / 180;
  const out: PointPx[] = [];
  for (let k = 0; k < n; k++) {
    const a = (2 * Math.PI * k) / n;
    const X = e.semiMajorPx * Math.cos(a);
    const Y = e.semiMinorPx * Math.sin(a);
    out.push({ x: e.cx + X * Math.cos(th) + Y * Math.sin(th), y: e.cy - X * Math.sin(th) + Y * Math.cos(th) });
  }
  return out;
}

