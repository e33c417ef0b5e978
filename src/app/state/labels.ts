/**
 * Teach-mode strokes as label values (pure, no DOM): painting strokes into a label raster of the
 * image's size (0 unlabelled, 1 outside, 2 rim band, 3 core — core's `LabelRaster` values), the
 * classes a set of strokes covers, and the default brush radius.
 */
import type { PointPx } from '../../core/index.js';
import type { Doc, LabelClass, LabelStroke } from './document.js';

/** Colours of the label classes (strokes and class map): outside blue, rim band amber, core violet. */
export const LABEL_COLOURS: Record<LabelClass, [number, number, number]> = { 1: [42, 166, 255], 2: [255, 176, 32], 3: [180, 140, 255] };

/** Names of the label classes as the app shows them. */
export const LABEL_NAMES: Record<LabelClass, string> = { 1: 'Outside', 2: 'Rim band', 3: 'Core' };

/** Paints a disc of radius r (px) centred at (cx, cy) with value v. */
function disc(out: Uint8Array, w: number, h: number, cx: number, cy: number, r: number, v: number): void {
  const r2 = r * r;
  const y0 = Math.max(0, Math.ceil(cy - r));
  const y1 = Math.min(h - 1, Math.floor(cy + r));
  for (let y = y0; y <= y1; y++) {
    const dy = y - cy;
    const half = Math.sqrt(Math.max(0, r2 - dy * dy));
    const x0 = Math.max(0, Math.ceil(cx - half));
    const x1 = Math.min(w - 1, Math.floor(cx + half));
    if (x1 >= x0) out.fill(v, y * w + x0, y * w + x1 + 1);
  }
}

/**
 * The label raster of a set of strokes on a w × h image: every pixel within a stroke's radius of its
 * polyline takes the stroke's class; later strokes paint over earlier ones.
 */
export function rasteriseStrokes(strokes: readonly LabelStroke[], w: number, h: number): Uint8Array {
  const out = new Uint8Array(w * h);
  for (const s of strokes) {
    const r = Math.max(0.5, s.radiusPx);
    const step = Math.max(0.5, r / 2);
    const pts = s.points;
    if (pts.length === 1) disc(out, w, h, pts[0].x, pts[0].y, r, s.cls);
    for (let i = 1; i < pts.length; i++) {
      const a = pts[i - 1];
      const b = pts[i];
      const n = Math.max(1, Math.ceil(Math.hypot(b.x - a.x, b.y - a.y) / step));
      for (let k = 0; k <= n; k++) disc(out, w, h, a.x + ((b.x - a.x) * k) / n, a.y + ((b.y - a.y) * k) / n, r, s.cls);
    }
  }
  return out;
}

/** Which classes the strokes cover. */
export function classesPainted(strokes: readonly LabelStroke[]): Set<LabelClass> {
  return new Set(strokes.filter((s) => s.points.length > 0).map((s) => s.cls));
}

/** The classes no stroke of any image covers yet, in label order. */
export function missingClasses(docs: readonly Doc[]): LabelClass[] {
  const have = new Set(docs.flatMap((d) => [...classesPainted(d.labels)]));
  return ([1, 2, 3] as LabelClass[]).filter((c) => !have.has(c));
}

/** Default teach-brush radius (px) when none is typed: 1/150 of the smaller image side, at least 2 px. */
export function defaultLabelRadiusPx(widthPx: number, heightPx: number): number {
  return Math.max(2, Math.round(Math.min(widthPx, heightPx) / 150));
}

/** A new point is added to a stroke only when it is this far (fraction of the radius) from the last one. */
export const STROKE_SPACING = 0.35;

/** Whether `p` is far enough from the stroke's last point to be added. */
export function extendsStroke(s: LabelStroke, p: PointPx): boolean {
  const last = s.points[s.points.length - 1];
  return !last || Math.hypot(p.x - last.x, p.y - last.y) >= STROKE_SPACING * s.radiusPx;
}
