/**
 * Pure polygon edits used by the boundary tools. Angles follow the project convention:
 * degrees, 0° = +x, counter-clockwise on screen, direction (cos θ, −sin θ) in image coordinates.
 */
import type { PointPx } from '../../core/index.js';

/** Angle of `p` seen from `c`, degrees in [0, 360). */
export function angleDeg(c: PointPx, p: PointPx): number {
  const a = (Math.atan2(-(p.y - c.y), p.x - c.x) * 180) / Math.PI;
  return a < 0 ? a + 360 : a;
}

/** Polygon with vertex `i` moved to `p` (px); a new array, the input is not changed. */
export function moveVertex(poly: readonly PointPx[], i: number, p: PointPx): PointPx[] {
  if (i < 0 || i >= poly.length) return [...poly];
  const out = poly.map((q) => ({ ...q }));
  out[i] = { x: p.x, y: p.y };
  return out;
}

/** Index of the vertex nearest to `p` within `maxDist` px, or -1. */
export function nearestVertex(poly: readonly PointPx[], p: PointPx, maxDist = Infinity): number {
  let best = -1;
  let bd = maxDist;
  poly.forEach((q, i) => {
    const d = Math.hypot(q.x - p.x, q.y - p.y);
    if (d <= bd) {
      bd = d;
      best = i;
    }
  });
  return best;
}

/** Inserts `p` into the edge it is closest to; returns the new polygon and the new vertex index. */
export function insertVertex(poly: readonly PointPx[], p: PointPx): { poly: PointPx[]; index: number } {
  if (poly.length < 2) return { poly: [...poly, { ...p }], index: poly.length };
  let best = 0;
  let bd = Infinity;
  for (let i = 0; i < poly.length; i++) {
    const a = poly[i];
    const b = poly[(i + 1) % poly.length];
    const dx = b.x - a.x;
    const dy = b.y - a.y;
    const L2 = dx * dx + dy * dy;
    const t = L2 > 0 ? Math.max(0, Math.min(1, ((p.x - a.x) * dx + (p.y - a.y) * dy) / L2)) : 0;
    const d = Math.hypot(a.x + t * dx - p.x, a.y + t * dy - p.y);
    if (d < bd) {
      bd = d;
      best = i;
    }
  }
  const out = poly.map((q) => ({ ...q }));
  out.splice(best + 1, 0, { x: p.x, y: p.y });
  return { poly: out, index: best + 1 };
}

/** Smallest absolute difference of two angles, degrees in [0, 180]. */
export function angleGap(a: number, b: number): number {
  const d = Math.abs((((a - b) % 360) + 540) % 360 - 180);
  return d;
}

/**
 * "Add point": the boundary is pulled through `p`. Vertices within ±`spanDeg` of p's angle (seen
 * from the centre `c`) move radially towards p's radius with a raised-cosine weight (1 at p's
 * angle, 0 at ±spanDeg), and `p` itself is inserted. So the rays near p see the new point: a point
 * inserted between two rays alone would change no ray's width.
 */
export function pullBoundaryThrough(poly: readonly PointPx[], c: PointPx, p: PointPx, spanDeg: number): PointPx[] {
  const ap = angleDeg(c, p);
  const rp = Math.hypot(p.x - c.x, p.y - c.y);
  const moved = poly.map((v) => {
    const g = angleGap(angleDeg(c, v), ap);
    if (g >= spanDeg) return { ...v };
    const w = 0.5 * (1 + Math.cos((Math.PI * g) / spanDeg));
    const rv = Math.hypot(v.x - c.x, v.y - c.y);
    if (rv === 0) return { ...v };
    const k = (rv + (rp - rv) * w) / rv;
    return { x: c.x + (v.x - c.x) * k, y: c.y + (v.y - c.y) * k };
  });
  return insertVertex(moved, p).poly;
}

/** Removes vertex `i` (a polygon keeps at least 3 vertices). */
export function removeVertex(poly: readonly PointPx[], i: number): PointPx[] {
  if (poly.length <= 3 || i < 0 || i >= poly.length) return [...poly];
  return poly.filter((_, k) => k !== i).map((q) => ({ ...q }));
}

/**
 * Brush on the rim/core boundary. The rim lies between the outline and the boundary, so
 * `add` (paint rim) pushes boundary vertices whose ray from the centre `c` crosses the brush disk
 * (centre `q`, radius `r` px) inwards to the disk's near edge; `remove` (paint core) pushes them
 * outwards to the disk's far edge. Vertices whose ray misses the disk are unchanged.
 */
export function brushBoundary(poly: readonly PointPx[], c: PointPx, q: PointPx, r: number, mode: 'add' | 'remove'): PointPx[] {
  return poly.map((v) => {
    const dx = v.x - c.x;
    const dy = v.y - c.y;
    const rv = Math.hypot(dx, dy);
    if (rv === 0) return { ...v };
    const ux = dx / rv;
    const uy = dy / rv;
    // ray c + t·u against the disk |x − q| = r
    const wx = q.x - c.x;
    const wy = q.y - c.y;
    const b = wx * ux + wy * uy;
    const disc = b * b - (wx * wx + wy * wy - r * r);
    if (disc < 0) return { ...v };
    const s = Math.sqrt(disc);
    const t1 = Math.max(0, b - s);
    const t2 = b + s;
    if (t2 <= 0) return { ...v };
    if (mode === 'add' && rv > t1 && rv <= t2 + r) return { x: c.x + ux * t1, y: c.y + uy * t1 };
    if (mode === 'remove' && rv < t2 && rv >= t1 - r) return { x: c.x + ux * t2, y: c.y + uy * t2 };
    return { ...v };
  });
}

/** Sector from a drag between two points around the centre (CCW from the first to the second). */
export function sectorFromDrag(c: PointPx, from: PointPx, to: PointPx): [number, number] {
  const a = angleDeg(c, from);
  const b = angleDeg(c, to);
  return [Math.round(a * 10) / 10, Math.round(b * 10) / 10];
}
