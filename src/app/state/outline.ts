/**
 * The specimen outline as the user corrects it: reset to the fitted circle or ellipse of the
 * measurement (which removes spikes of the found edge), move it whole, or reshape it with handles
 * that bend the nearby part of the edge. Pure polygon functions, px, project angle convention
 * (degrees, 0° = +x, counter-clockwise on screen).
 */
import type { MeasureResult, PointPx } from '../../core/index.js';
import { angleDeg, angleGap } from './geometry.js';

/** Points of a circle, counter-clockwise on screen from 0°. */
export function circlePolygon(cx: number, cy: number, r: number, n = 360): PointPx[] {
  return Array.from({ length: n }, (_, i) => {
    const t = (2 * Math.PI * i) / n;
    return { x: cx + r * Math.cos(t), y: cy - r * Math.sin(t) };
  });
}

/** Points of an ellipse with semi-axes a (along angleDeg) and b, counter-clockwise on screen. */
export function ellipsePolygon(cx: number, cy: number, a: number, b: number, angleDegIn: number, n = 360): PointPx[] {
  const th = (angleDegIn * Math.PI) / 180;
  const ca = Math.cos(th);
  const sa = Math.sin(th);
  return Array.from({ length: n }, (_, i) => {
    const t = (2 * Math.PI * i) / n;
    const u = a * Math.cos(t);
    const v = b * Math.sin(t);
    return { x: cx + u * ca - v * sa, y: cy - (u * sa + v * ca) };
  });
}

/** The fitted circle or ellipse of a measurement as an outline polygon (px). */
export function fittedOutline(r: MeasureResult, kind: 'circle' | 'ellipse', n = 360): PointPx[] {
  const sp = r.specimen;
  if (kind === 'circle') return circlePolygon(sp.circle.cx, sp.circle.cy, sp.circle.radiusPx, n);
  const u = r.scale.umPerPx;
  return ellipsePolygon(sp.ellipse.cx, sp.ellipse.cy, sp.ellipse.semiMajorUm / u, sp.ellipse.semiMinorUm / u, sp.ellipse.angleDeg, n);
}

/** The polygon moved by (dx, dy) px. */
export function translatePolygon(poly: readonly PointPx[], dx: number, dy: number): PointPx[] {
  return poly.map((p) => ({ x: p.x + dx, y: p.y + dy }));
}

/** Handles on the outline: the vertex nearest to each of `count` evenly spaced angles from the centre. */
export function outlineHandles(poly: readonly PointPx[], c: PointPx, count = 16): { angleDeg: number; index: number; at: PointPx }[] {
  if (poly.length === 0) return [];
  const angles = poly.map((p) => angleDeg(c, p));
  return Array.from({ length: count }, (_, k) => {
    const a = (360 * k) / count;
    let best = 0;
    for (let i = 1; i < poly.length; i++) if (angleGap(angles[i], a) < angleGap(angles[best], a)) best = i;
    return { angleDeg: a, index: best, at: poly[best] };
  });
}

/**
 * Reshapes the outline: vertex `index` goes to `to`, and the vertices within ±`spanDeg` of its
 * angle follow with a raised-cosine weight (1 at the handle, 0 at ±spanDeg), so the edge bends
 * smoothly instead of getting a spike.
 */
export function reshapeOutline(poly: readonly PointPx[], c: PointPx, index: number, to: PointPx, spanDeg: number): PointPx[] {
  const h = poly[index];
  if (!h) return [...poly];
  const dx = to.x - h.x;
  const dy = to.y - h.y;
  const ah = angleDeg(c, h);
  return poly.map((p) => {
    const g = angleGap(angleDeg(c, p), ah);
    if (g >= spanDeg) return { ...p };
    const w = 0.5 * (1 + Math.cos((Math.PI * g) / spanDeg));
    return { x: p.x + dx * w, y: p.y + dy * w };
  });
}
