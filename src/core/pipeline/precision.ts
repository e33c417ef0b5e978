/**
 * The precision at which the result stores its numbers, in one place. Rounding happens when the
 * result is assembled (stages/assemble.ts), with two deliberate uses before that, both so that a
 * result file can be re-computed from its own content:
 * - the band is measured on the geometry as stored (outline and boundary to 0.01 px, centre to
 *   0.001 px), so `remeasure` on a saved result gives exactly the numbers of a full run;
 * - the width is compared with the critical distance as reported (0.001 µm).
 */
import type { BoxPx, PointPx } from '../image/geometry.js';

/** `v` rounded to `d` decimals (non-finite values pass through). */
export function round(v: number, d = 4): number {
  if (!Number.isFinite(v)) return v;
  const f = Math.pow(10, d);
  return Math.round(v * f) / f;
}

/** A stored point: the specimen centre (0.001 px). */
export function storedPoint(p: PointPx): PointPx {
  return { x: round(p.x, 3), y: round(p.y, 3) };
}

/** A stored polygon: outline and boundary vertices (0.01 px). */
export function storedPolygon(pts: readonly PointPx[]): PointPx[] {
  return pts.map((p) => ({ x: round(p.x, 2), y: round(p.y, 2) }));
}

/** A stored box: the scale marks (0.01 px). */
export function storedBox(b: BoxPx): BoxPx {
  return { x: round(b.x, 2), y: round(b.y, 2), w: round(b.w, 2), h: round(b.h, 2) };
}
