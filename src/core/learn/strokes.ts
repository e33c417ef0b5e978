/**
 * Label strokes from a known geometry: thin arcs of outside, rim band and core drawn around a centre
 * from the outer-edge and boundary radii by angle — what a person marks with a few brush strokes,
 * made from a measured (and corrected) result or from the truth of a rendered image. Each arc keeps
 * a safety margin from the edges it follows, so a stroke never crosses into the wrong class.
 */
import { MAX_LABEL, type LabelRaster } from './labels.js';

/** One arc: label value, radius as a function of the angle, angular range. */
interface Arc {
  label: number;
  radius: (deg: number) => number | null;
  fromDeg: number;
  toDeg: number;
}

/** The geometry strokes are drawn from (px, project angle convention: 0° = +x, counter-clockwise, y down). */
export interface StrokeGeometry {
  width: number;
  height: number;
  center: { x: number; y: number };
  /** Outer edge (notch root) radius at angles 0..359°, px. */
  outerRadiusPx: readonly number[];
  /** Rim/core boundary radius at angles 0..359°, px (null where there is no band). */
  boundaryRadiusPx: readonly (number | null)[];
}

/** Options of {@link strokeLabels}. */
export interface StrokeOptions {
  /** Stroke width, px (default 2). */
  widthPx?: number;
  /** Distance of the strokes from the edges they follow, px (default 3). */
  marginPx?: number;
  /** Arc length of each stroke, degrees (default 18). */
  arcDeg?: number;
  /** Start angles of the strokes, degrees (default 20, 140, 260: three strokes per class line). */
  startsDeg?: readonly number[];
}

function interp(v: readonly (number | null)[], deg: number): number | null {
  const d = ((deg % 360) + 360) % 360;
  const i = Math.floor(d);
  const a = v[i % 360];
  const b = v[(i + 1) % 360];
  if (a === null || b === null) return null;
  return a + (b - a) * (d - i);
}

/** The arcs: outside just beyond the edge, a little and far out; rim just inside the edge, in the middle and just outside the boundary; core just inside the boundary and half way in. */
function arcs(g: StrokeGeometry, m: number, arcDeg: number, starts: readonly number[]): Arc[] {
  const ro = (deg: number): number | null => interp(g.outerRadiusPx, deg);
  const rb = (deg: number): number | null => interp(g.boundaryRadiusPx, deg);
  const lines: [number, (deg: number) => number | null][] = [
    [1, (d) => (ro(d) ?? NaN) + m],
    [1, (d) => (ro(d) ?? NaN) * 1.15 + m],
    [1, (d) => (ro(d) ?? NaN) * 1.6 + m],
    [2, (d) => { const o = ro(d); const b = rb(d); return o === null || b === null || o - b < 2 * m ? null : o - m; }],
    [2, (d) => { const o = ro(d); const b = rb(d); return o === null || b === null ? null : (o + b) / 2; }],
    [2, (d) => { const o = ro(d); const b = rb(d); return o === null || b === null || o - b < 2 * m ? null : b + m; }],
    [3, (d) => { const b = rb(d); return b === null || b < 2 * m ? null : b - m; }],
    [3, (d) => { const b = rb(d); return b === null ? null : b * 0.5; }],
  ];
  const out: Arc[] = [];
  lines.forEach(([label, radius], k) => {
    for (const s of starts) out.push({ label, radius, fromDeg: s + 13 * k, toDeg: s + 13 * k + arcDeg });
  });
  return out;
}

/**
 * A label raster with thin arcs of the three classes.
 *
 * @param g - image size, centre and radii by angle
 * @param opts - stroke width, margin, arc length and start angles
 */
export function strokeLabels(g: StrokeGeometry, opts: StrokeOptions = {}): LabelRaster {
  const half = (opts.widthPx ?? 2) / 2;
  const data = new Uint8Array(g.width * g.height);
  for (const a of arcs(g, opts.marginPx ?? 3, opts.arcDeg ?? 18, opts.startsDeg ?? [20, 140, 260])) {
    const rMax = Math.max(...g.outerRadiusPx) * 1.6 + 10;
    const step = 0.5 / rMax; // radians: ≤ 0.5 px along the arc
    for (let t = (a.fromDeg * Math.PI) / 180; t <= (a.toDeg * Math.PI) / 180; t += step) {
      const r = a.radius((t * 180) / Math.PI);
      if (r === null || !Number.isFinite(r) || r <= 0) continue;
      for (let dr = -half; dr <= half; dr += 0.5) {
        const x = Math.round(g.center.x + (r + dr) * Math.cos(t));
        const y = Math.round(g.center.y - (r + dr) * Math.sin(t));
        if (x >= 0 && y >= 0 && x < g.width && y < g.height && a.label <= MAX_LABEL) data[y * g.width + x] = a.label;
      }
    }
  }
  return { width: g.width, height: g.height, data };
}
