/**
 * Rendering as a pure function of state: from a document and the view, the shapes each Konva
 * layer draws (image px coordinates). The React/Konva component only maps these to nodes.
 */
import type { PointPx } from '../../core/pipeline/types.js';
import type { Doc } from '../state/document.js';
import { outlinePolygonOf } from '../state/params.js';

export interface SectorShape {
  index: number;
  from: number;
  to: number;
  /** Wedge polygon (px) from the centre out to beyond the outline. */
  points: number[];
}

export interface OverlayShapes {
  outline: number[] | null;
  boundary: number[] | null;
  center: PointPx | null;
  sectors: SectorShape[];
  scaleLine: [PointPx, PointPx] | null;
  bar: [PointPx, PointPx] | null;
  /** Boundary handles (px) when the boundary tools are active. */
  handles: PointPx[];
  /** Outline handles: centre, +a and +b semi-axis ends. */
  outlineHandles: { center: PointPx; a: PointPx; b: PointPx } | null;
}

const flat = (poly: readonly PointPx[]): number[] => poly.flatMap((p) => [p.x, p.y]);

/** Outline handles (px): centre and the ends of the two semi-axes (angle convention: CCW on screen). */
export function outlineHandlesOf(doc: Doc): OverlayShapes['outlineHandles'] {
  const o = doc.outline;
  if (!o) return null;
  const a = (o.angleDeg * Math.PI) / 180;
  return {
    center: { x: o.cx, y: o.cy },
    a: { x: o.cx + o.rx * Math.cos(a), y: o.cy - o.rx * Math.sin(a) },
    b: { x: o.cx - o.ry * Math.sin(a), y: o.cy - o.ry * Math.cos(a) },
  };
}

/** Shapes of the overlay and handle layers for a document and the active tool (pure). */
export function overlayShapes(doc: Doc, tool: string): OverlayShapes {
  const outlinePoly = outlinePolygonOf(doc);
  const center = doc.outline ? { x: doc.outline.cx, y: doc.outline.cy } : null;
  const reach = doc.outline ? Math.max(doc.outline.rx, doc.outline.ry) * 1.15 : 0;
  const sectors: SectorShape[] = center
    ? doc.exclude.map(([from, to], index) => {
        let span = (to - from) % 360;
        if (span < 0) span += 360;
        const pts: number[] = [center.x, center.y];
        const steps = Math.max(2, Math.ceil(span / 3));
        for (let k = 0; k <= steps; k++) {
          const t = ((from + (span * k) / steps) * Math.PI) / 180;
          pts.push(center.x + reach * Math.cos(t), center.y - reach * Math.sin(t));
        }
        return { index, from, to, points: pts };
      })
    : [];
  const sc = doc.scale;
  const editing = tool === 'vertex' || tool === 'add-vertex' || tool === 'remove-vertex';
  return {
    outline: outlinePoly ? flat(outlinePoly) : null,
    boundary: doc.boundary ? flat(doc.boundary) : null,
    center,
    sectors,
    scaleLine: sc.source === 'two-point' ? [sc.p0, sc.p1] : null,
    bar: sc.source === 'scale-bar' && sc.bar ? [{ x: sc.bar.x0, y: sc.bar.y0 }, { x: sc.bar.x1, y: sc.bar.y1 }] : null,
    handles: editing && doc.boundary ? doc.boundary : [],
    outlineHandles: tool === 'outline' ? outlineHandlesOf(doc) : null,
  };
}

/** Stage transform that fits an image of w×h px into a viewport of vw×vh (with a margin). */
export function fitView(w: number, h: number, vw: number, vh: number): { scale: number; x: number; y: number } {
  const scale = Math.min((vw - 20) / w, (vh - 20) / h);
  const s = Number.isFinite(scale) && scale > 0 ? scale : 1;
  return { scale: s, x: (vw - w * s) / 2, y: (vh - h * s) / 2 };
}

/** Zoom about a screen point: the image point under the cursor stays put. */
export function zoomAt(view: { scale: number; x: number; y: number }, screen: PointPx, factor: number): { scale: number; x: number; y: number } {
  const scale = Math.min(64, Math.max(0.01, view.scale * factor));
  const ix = (screen.x - view.x) / view.scale;
  const iy = (screen.y - view.y) / view.scale;
  return { scale, x: screen.x - ix * scale, y: screen.y - iy * scale };
}
