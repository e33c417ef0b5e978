/**
 * Layout of the other objects in the frame — a steel rule along one side and a paper specimen label in
 * a corner — with the checks that they cover neither the specimen (its whole bar) nor the scale bar,
 * and their truth records. Painting: objectPaint.ts.
 */
import { FractozoneError } from '../errors.js';
import type { BarLayout, PlacedSpecimen, SceneLayout } from './layout.js';
import type { ResolvedRenderOptions } from './options.js';
import type { ObjectTruth } from './sceneTruth.js';

/** A point or vector in px (x right, y down). */
export interface Vec {
  readonly x: number;
  readonly y: number;
}

/** The rule: its graduated edge through `e0` along `t`; `n` points into the rule (to the frame side). */
export interface RuleLayout {
  readonly e0: Vec;
  readonly t: Vec;
  readonly n: Vec;
  /** graduation spacing, px, and the position of graduation 0 along t from e0, px */
  readonly gradPx: number;
  readonly offsetPx: number;
  /** µm per px along the rule (mean of x and y pixel sizes) */
  readonly pxUm: number;
  readonly polygon: Vec[];
}

/** The label: a paper rectangle of w × h px centred at `c`, rotated (unit axes u, v). */
export interface LabelLayout {
  readonly c: Vec;
  readonly u: Vec;
  readonly v: Vec;
  readonly w: number;
  readonly h: number;
  /** font pixel size, px */
  readonly fontPx: number;
  readonly lines: readonly string[];
  readonly corners: Vec[];
}

export interface ObjectsLayout {
  readonly rule: RuleLayout | null;
  readonly label: LabelLayout | null;
  readonly truths: ObjectTruth[];
}

const rot = (v: Vec, deg: number): Vec => {
  const a = (deg * Math.PI) / 180;
  return { x: v.x * Math.cos(a) + v.y * Math.sin(a), y: -v.x * Math.sin(a) + v.y * Math.cos(a) };
};
const dot = (a: Vec, b: Vec): number => a.x * b.x + a.y * b.y;
const sub = (a: Vec, b: Vec): Vec => ({ x: a.x - b.x, y: a.y - b.y });
const r2 = (v: number): number => Math.round(v * 100) / 100;

function bad(msg: string): never {
  throw new FractozoneError('BAD_PARAMETER', msg);
}

/** Clip a convex polygon to the half-plane dot(p − e0, n) ≥ 0 (Sutherland–Hodgman, one plane). */
function clipHalfPlane(poly: Vec[], e0: Vec, n: Vec): Vec[] {
  const out: Vec[] = [];
  for (let i = 0; i < poly.length; i++) {
    const a = poly[i];
    const b = poly[(i + 1) % poly.length];
    const da = dot(sub(a, e0), n);
    const db = dot(sub(b, e0), n);
    if (da >= 0) out.push(a);
    if (da >= 0 !== db >= 0) {
      const f = da / (da - db);
      out.push({ x: a.x + f * (b.x - a.x), y: a.y + f * (b.y - a.y) });
    }
  }
  return out;
}

/** Corners of a pixel box (edges at ±0.5 around the inclusive pixel range). */
function boxCorners(b: { x0: number; y0: number; x1: number; y1: number }): Vec[] {
  return [
    { x: b.x0 - 0.5, y: b.y0 - 0.5 },
    { x: b.x1 + 0.5, y: b.y0 - 0.5 },
    { x: b.x1 + 0.5, y: b.y1 + 0.5 },
    { x: b.x0 - 0.5, y: b.y1 + 0.5 },
  ];
}

/** True when two convex polygons overlap (separating-axis test). */
function convexOverlap(p: Vec[], q: Vec[]): boolean {
  for (const poly of [p, q]) {
    for (let i = 0; i < poly.length; i++) {
      const e = sub(poly[(i + 1) % poly.length], poly[i]);
      const ax = { x: -e.y, y: e.x };
      const pr = (s: Vec[]): [number, number] => [Math.min(...s.map((v) => dot(v, ax))), Math.max(...s.map((v) => dot(v, ax)))];
      const [a0, a1] = pr(p);
      const [b0, b1] = pr(q);
      if (a1 < b0 || b1 < a0) return false;
    }
  }
  return true;
}

/** Distance from a point to a convex polygon (0 inside). */
function distanceToPolygon(pt: Vec, poly: Vec[]): number {
  let inside = true;
  let best = Infinity;
  for (let i = 0; i < poly.length; i++) {
    const a = poly[i];
    const b = poly[(i + 1) % poly.length];
    const e = sub(b, a);
    const cross = e.x * (pt.y - a.y) - e.y * (pt.x - a.x);
    if (cross < 0) inside = false;
    const f = Math.max(0, Math.min(1, dot(sub(pt, a), e) / dot(e, e)));
    best = Math.min(best, Math.hypot(pt.x - a.x - f * e.x, pt.y - a.y - f * e.y));
  }
  return inside ? 0 : best;
}

function barBoxes(bar: BarLayout | null): Vec[][] {
  if (!bar) return [];
  const t = bar.truth;
  const boxes = [boxCorners(t), ...(t.labelBox ? [boxCorners(t.labelBox)] : []), ...(t.plateBox ? [boxCorners(t.plateBox)] : [])];
  return boxes;
}

function layoutRule(o: ResolvedRenderOptions, L: SceneLayout, specimens: readonly PlacedSpecimen[]): RuleLayout | null {
  const r = o.rule;
  if (!r) return null;
  const { width: W, height: H } = L.area;
  const horizontal = r.side === 'top' || r.side === 'bottom';
  const vw = r.visibleUm / (horizontal ? o.umPerPxY : o.umPerPx);
  const base: Record<typeof r.side, { e0: Vec; t: Vec; n: Vec }> = {
    top: { e0: { x: (W - 1) / 2, y: vw - 0.5 }, t: { x: 1, y: 0 }, n: { x: 0, y: -1 } },
    bottom: { e0: { x: (W - 1) / 2, y: H - 0.5 - vw }, t: { x: 1, y: 0 }, n: { x: 0, y: 1 } },
    left: { e0: { x: vw - 0.5, y: (H - 1) / 2 }, t: { x: 0, y: 1 }, n: { x: -1, y: 0 } },
    right: { e0: { x: W - 0.5 - vw, y: (H - 1) / 2 }, t: { x: 0, y: 1 }, n: { x: 1, y: 0 } },
  };
  const b = base[r.side];
  const t = rot(b.t, r.angleDeg);
  const n = rot(b.n, r.angleDeg);
  const pxUm = Math.sqrt(o.umPerPx * o.umPerPxY);
  for (const s of specimens) {
    if (-dot(sub({ x: s.g.cx, y: s.g.cy }, b.e0), n) < s.barRadiusPx + 4) {
      bad(`the steel rule (${r.visibleUm} µm visible on the ${r.side} side) would cover the specimen; make it narrower (visibleUm), tilt it less or use a larger image`);
    }
  }
  const polygon = clipHalfPlane(boxCorners({ x0: 0, y0: 0, x1: W - 1, y1: H - 1 }), b.e0, n);
  for (const box of barBoxes(L.bar)) if (convexOverlap(polygon, box)) bad(`the steel rule on the ${r.side} side would cover the scale bar; put the scale bar in another corner or the rule on another side`);
  return { e0: b.e0, t, n, gradPx: r.graduationUm / pxUm, offsetPx: -(Math.abs(o.seed * 0.6180339887) % 1) * 20 * (r.graduationUm / pxUm), pxUm, polygon };
}

function layoutLabel(o: ResolvedRenderOptions, L: SceneLayout, specimens: readonly PlacedSpecimen[], rule: RuleLayout | null): LabelLayout | null {
  const l = o.label;
  if (!l) return null;
  const { width: W, height: H } = L.area;
  const lines = l.text.split('\n');
  const fontPx = l.letterUm / Math.sqrt(o.umPerPx * o.umPerPxY);
  const cols = Math.max(...lines.map((s) => Array.from(s).length)) * 6 - 1;
  const w = (cols + 8) * fontPx;
  const h = (lines.length * 9 - 2 + 8) * fontPx;
  const u = rot({ x: 1, y: 0 }, l.angleDeg);
  const v = rot({ x: 0, y: 1 }, l.angleDeg);
  const hx = (w / 2) * Math.abs(u.x) + (h / 2) * Math.abs(v.x);
  const hy = (w / 2) * Math.abs(u.y) + (h / 2) * Math.abs(v.y);
  const m = Math.max(4, Math.round(Math.min(W, H) * 0.03));
  const left = l.corner === 'tl' || l.corner === 'bl';
  const top = l.corner === 'tl' || l.corner === 'tr';
  // keep clear of a rule along an adjacent side
  const ys = rule ? rule.polygon.map((q) => q.y) : [];
  const xs = rule ? rule.polygon.map((q) => q.x) : [];
  const side = o.rule ? o.rule.side : null;
  const x0 = side === 'left' ? Math.max(...xs) : 0;
  const x1 = side === 'right' ? Math.min(...xs) : W - 1;
  const y0 = side === 'top' ? Math.max(...ys) : 0;
  const y1 = side === 'bottom' ? Math.min(...ys) : H - 1;
  const c = { x: left ? x0 + m + hx : x1 - m - hx, y: top ? y0 + m + hy : y1 - m - hy };
  const corners = [
    [-1, -1],
    [1, -1],
    [1, 1],
    [-1, 1],
  ].map(([a, b]) => ({ x: c.x + (a * w * u.x) / 2 + (b * h * v.x) / 2, y: c.y + (a * w * u.y) / 2 + (b * h * v.y) / 2 }));
  if (hx * 2 > W || hy * 2 > H) bad(`the specimen label (${r2(w)} × ${r2(h)} px) does not fit in the image; make the letters smaller (letterUm)`);
  for (const s of specimens) {
    if (distanceToPolygon({ x: s.g.cx, y: s.g.cy }, corners) < s.barRadiusPx + 4) bad(`the specimen label in corner ${l.corner} would cover the specimen; make the letters smaller (letterUm), use another corner or a larger image`);
  }
  for (const box of barBoxes(L.bar)) if (convexOverlap(corners, box)) bad(`the specimen label in corner ${l.corner} would cover the scale bar; put one of them in another corner`);
  if (rule && convexOverlap(corners, rule.polygon)) bad(`the specimen label in corner ${l.corner} would lie on the steel rule; put it in another corner`);
  return { c, u, v, w, h, fontPx, lines, corners };
}

/** Lay out and check the rule and the label; BAD_PARAMETER when one would cover the specimen or the scale bar. */
export function layoutObjects(o: ResolvedRenderOptions, L: SceneLayout): ObjectsLayout {
  const rule = layoutRule(o, L, L.specimens);
  const label = layoutLabel(o, L, L.specimens, rule);
  const truths: ObjectTruth[] = [];
  const pts = (p: Vec[]): Vec[] => p.map((q) => ({ x: r2(q.x), y: r2(q.y) }));
  if (rule && o.rule) truths.push({ kind: 'rule', polygonPx: pts(rule.polygon), angleDeg: o.rule.angleDeg, graduationPx: Math.round(rule.gradPx * 1e4) / 1e4, graduationUm: o.rule.graduationUm });
  if (label && o.label) truths.push({ kind: 'label', polygonPx: pts(label.corners), angleDeg: o.label.angleDeg, text: o.label.text });
  return { rule, label, truths };
}
