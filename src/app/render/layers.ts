/**
 * Rendering as a pure function of state: from a document, the tool and the pointer, the shapes each
 * Konva layer draws (image px coordinates), plus the view transform helpers. The React/Konva
 * component only maps these to nodes.
 */
import type { PointPx } from '../../core/index.js';
import { boundaryOf, centreOf, edgeCandidatesOf, outlineOf, type Doc } from '../state/document.js';
import { nearestVertex } from '../state/geometry.js';
import { outlineHandles } from '../state/outline.js';
import type { Tool } from '../state/store.js';

export interface View {
  scale: number;
  x: number;
  y: number;
}

export interface Shapes {
  outline: number[] | null;
  boundary: number[] | null;
  centre: PointPx | null;
  /** Excluded sectors as wedges from the centre (drawn clipped to the outline). */
  sectors: number[][];
  scaleLine: [PointPx, PointPx] | null;
  bar: [PointPx, PointPx] | null;
  /** The boundary point the pointer would pick (boundary tools). */
  hoverVertex: PointPx | null;
  /** Outline handles: centre (moves the outline) and points that reshape it (outline tool). */
  outlineHandles: { centre: PointPx; points: PointPx[] } | null;
  /** The other specimens in the frame (half B, …): outline and boundary as measured, not editable. */
  others: { id: string; outline: number[]; boundary: number[] | null }[];
  /** Closed edges the outline could be (outline tool): ring, label and where it goes, role. */
  edges: EdgeRing[];
}

export interface EdgeRing {
  index: number;
  points: number[];
  label: string;
  at: PointPx;
  role: 'chosen' | 'candidate' | 'rejected';
  /** True when the outline in use is this edge. */
  inUse: boolean;
}

/** Label of an edge: its diameter in mm, and whether the search chose it. */
export function edgeLabel(diameterUm: number, role: string): string {
  return `⌀ ${Number((diameterUm / 1000).toPrecision(4))} mm${role === 'chosen' ? ' (chosen)' : ''}`;
}

/** The edge rings of a document: where each label sits (the ring's point towards 60°, upper right). */
export function edgeRings(doc: Doc): EdgeRing[] {
  const inUse = outlineOf(doc);
  return edgeCandidatesOf(doc).map((c, index) => {
    let at = c.outline[0] ?? c.center;
    let best = -Infinity;
    for (const q of c.outline) {
      const v = 0.5 * (q.x - c.center.x) - 0.866 * (q.y - c.center.y);
      if (v > best) {
        best = v;
        at = q;
      }
    }
    const same = inUse !== null && (c.role === 'chosen' ? doc.outline === null : inUse.length === c.outline.length && inUse.every((q, k) => q.x === c.outline[k].x && q.y === c.outline[k].y));
    return { index, points: flat(c.outline), label: edgeLabel(c.diameterUm, c.role), at, role: c.role, inUse: same };
  });
}

/** Distance from p to a closed polyline (flat x, y list), px. */
export function distanceToRing(points: number[], p: PointPx): number {
  let d = Infinity;
  const n = points.length / 2;
  for (let i = 0; i < n; i++) {
    const ax = points[2 * i];
    const ay = points[2 * i + 1];
    const bx = points[(2 * ((i + 1) % n))];
    const by = points[(2 * ((i + 1) % n)) + 1];
    const vx = bx - ax;
    const vy = by - ay;
    const len2 = vx * vx + vy * vy;
    const t = len2 > 0 ? Math.max(0, Math.min(1, ((p.x - ax) * vx + (p.y - ay) * vy) / len2)) : 0;
    d = Math.min(d, Math.hypot(p.x - ax - t * vx, p.y - ay - t * vy));
  }
  return d;
}

/** The edge ring within `tolPx` of p (the nearest), or −1. */
export function pickEdge(rings: EdgeRing[], p: PointPx, tolPx: number): number {
  let best = -1;
  let bestD = tolPx;
  for (const r of rings) {
    const d = distanceToRing(r.points, p);
    if (d <= bestD) {
      bestD = d;
      best = r.index;
    }
  }
  return best;
}

/** Number of reshape handles around the outline. */
export const OUTLINE_HANDLES = 16;
/** Pick distance for handles and points, screen px. */
export const PICK_PX = 10;

const flat = (poly: readonly PointPx[]): number[] => poly.flatMap((p) => [p.x, p.y]);

/** Wedge polygon of the sector [from, to] (degrees, counter-clockwise) out to `reach` px. */
export function wedge(c: PointPx, from: number, to: number, reach: number): number[] {
  let span = (to - from) % 360;
  if (span < 0) span += 360;
  const pts: number[] = [c.x, c.y];
  const steps = Math.max(2, Math.ceil(span / 3));
  for (let k = 0; k <= steps; k++) {
    const t = ((from + (span * k) / steps) * Math.PI) / 180;
    pts.push(c.x + reach * Math.cos(t), c.y - reach * Math.sin(t));
  }
  return pts;
}

/** Largest distance of the polygon's points from c. */
function reachOf(poly: readonly PointPx[], c: PointPx): number {
  let r = 0;
  for (const p of poly) r = Math.max(r, Math.hypot(p.x - c.x, p.y - c.y));
  return r;
}

/** Shapes of the overlay and handle layers (pure). `pointer` is the cursor in image px, `k` image px per screen px. */
export function shapesOf(doc: Doc, tool: Tool, pointer: PointPx | null, k: number): Shapes {
  const outline = outlineOf(doc);
  const boundary = boundaryOf(doc);
  const centre = centreOf(doc);
  const reach = outline && centre ? reachOf(outline, centre) * 1.05 : 0;
  const sc = doc.scale;
  const bar = doc.bar && sc.source === 'scale-bar' ? doc.bar : null;
  const pickBoundary = tool === 'vertex' || tool === 'remove-vertex';
  const i = pickBoundary && boundary && pointer ? nearestVertex(boundary, pointer, PICK_PX * k) : -1;
  return {
    outline: outline ? flat(outline) : null,
    boundary: boundary ? flat(boundary) : null,
    centre,
    sectors: centre ? doc.exclude.map(([a, b]) => wedge(centre, a, b, reach)) : [],
    scaleLine: sc.source === 'two-point' ? [sc.p0, sc.p1] : null,
    bar: bar ? [{ x: bar.x0, y: bar.y0 }, { x: bar.x1, y: bar.y1 }] : null,
    hoverVertex: boundary && i >= 0 ? boundary[i] : null,
    outlineHandles:
      tool === 'outline' && outline && centre ? { centre, points: outlineHandles(outline, centre, OUTLINE_HANDLES).map((h) => h.at) } : null,
    others: ((doc.result ?? doc.base?.result)?.specimens ?? []).slice(1).map((x) => ({
      id: x.id,
      outline: flat(x.specimen.outline),
      boundary: x.band.boundary ? flat(x.band.boundary.polygon) : null,
    })),
    edges: tool === 'outline' ? edgeRings(doc) : [],
  };
}

/** Stage transform that fits an image of w×h px into a viewport of vw×vh (with a margin). */
export function fitView(w: number, h: number, vw: number, vh: number): View {
  const scale = Math.min((vw - 16) / w, (vh - 16) / h);
  const s = Number.isFinite(scale) && scale > 0 ? scale : 1;
  return { scale: s, x: (vw - w * s) / 2, y: (vh - h * s) / 2 };
}

/** Zoom about a screen point: the image point under the cursor stays put. */
export function zoomAt(view: View, screen: PointPx, factor: number): View {
  const scale = Math.min(64, Math.max(0.01, view.scale * factor));
  const ix = (screen.x - view.x) / view.scale;
  const iy = (screen.y - view.y) / view.scale;
  return { scale, x: screen.x - ix * scale, y: screen.y - iy * scale };
}

/** Image px of a screen point. */
export function toImage(view: View, screen: PointPx): PointPx {
  return { x: (screen.x - view.x) / view.scale, y: (screen.y - view.y) / view.scale };
}
