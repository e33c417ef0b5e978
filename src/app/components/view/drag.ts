/**
 * What the pointer does with each tool, as plain functions: a press starts a drag (or makes one
 * edit), moves continue it, the release ends it. Edits are actions (see state/actions); a drag's
 * edits are one history entry. No React here.
 */
import type { PointPx } from '../../../core/index.js';
import { boundaryOf, centreOf, outlineOf, type Doc } from '../../state/document.js';
import { nearestVertex, sectorFromDrag } from '../../state/geometry.js';
import { outlineHandles } from '../../state/outline.js';
import type { Tool } from '../../state/store.js';
import type { LabelClass } from '../../state/document.js';
import { extendLabelStroke, startLabelStroke } from '../../state/actions/teach.js';
import type { HistoryMode } from '../../state/history.js';
import type { Change } from '../../state/actions/types.js';
import { addBoundaryPoint, addSector, brush, chooseEdge, moveBoundaryPoint, moveOutline, removeBoundaryPoint, reshape } from '../../state/actions/edit.js';
import { edgeRings, OUTLINE_HANDLES, pickEdge, PICK_PX, type View } from '../../render/layers.js';

export type Drag =
  | { kind: 'pan'; from: PointPx; view: View }
  | { kind: 'vertex'; index: number }
  | { kind: 'brush'; mode: 'rim' | 'core' }
  | { kind: 'label' }
  | { kind: 'sector'; from: PointPx; to: PointPx }
  | { kind: 'line'; from: PointPx; to: PointPx }
  | { kind: 'outline-move'; start: PointPx[]; from: PointPx }
  | { kind: 'outline-reshape'; start: PointPx[]; centre: PointPx; index: number };

export interface PointerContext {
  doc: Doc;
  tool: Tool;
  /** Pointer in image px and on the screen. */
  p: PointPx;
  screen: PointPx;
  view: View;
  brushRadiusPx: number;
  /** Radius of the teach brushes, image px. */
  labelRadiusPx: number;
  nRays: number;
}

/** The label class each teach brush paints. */
export const TEACH_CLASS: Record<'teach-outside' | 'teach-rim' | 'teach-core', LabelClass> = { 'teach-outside': 1, 'teach-rim': 2, 'teach-core': 3 };

/** Angular reach of one reshape handle: a little more than the spacing of the handles. */
const RESHAPE_SPAN_DEG = (360 / OUTLINE_HANDLES) * 1.25;

function outlinePress(c: PointerContext): Drag | null {
  const outline = outlineOf(c.doc);
  const centre = centreOf(c.doc);
  if (!outline || !centre) return null;
  const k = 1 / c.view.scale;
  if (Math.hypot(c.p.x - centre.x, c.p.y - centre.y) <= PICK_PX * k) return { kind: 'outline-move', start: outline, from: c.p };
  for (const h of outlineHandles(outline, centre, OUTLINE_HANDLES)) {
    if (Math.hypot(c.p.x - h.at.x, c.p.y - h.at.y) <= PICK_PX * k) return { kind: 'outline-reshape', start: outline, centre, index: h.index };
  }
  return null;
}

/** A press: the drag it starts and/or the edit it makes at once. */
export function press(c: PointerContext): { drag: Drag | null; change: Change | null } {
  const pan: Drag = { kind: 'pan', from: c.screen, view: c.view };
  const k = 1 / c.view.scale;
  switch (c.tool) {
    case 'pan':
      return { drag: pan, change: null };
    case 'vertex': {
      const b = boundaryOf(c.doc);
      const i = b ? nearestVertex(b, c.p, PICK_PX * k) : -1;
      return { drag: i >= 0 ? { kind: 'vertex', index: i } : pan, change: null };
    }
    case 'add-vertex':
      return { drag: null, change: addBoundaryPoint(c.doc, c.p, c.nRays) };
    case 'remove-vertex':
      return { drag: null, change: removeBoundaryPoint(c.doc, c.p, PICK_PX * k) };
    case 'brush-add':
    case 'brush-remove': {
      const mode = c.tool === 'brush-add' ? 'rim' : 'core';
      return { drag: { kind: 'brush', mode }, change: brush(c.doc, c.p, c.brushRadiusPx, mode, 'drag') };
    }
    case 'sector':
      return { drag: centreOf(c.doc) ? { kind: 'sector', from: c.p, to: c.p } : null, change: null };
    case 'scale-line':
      return { drag: { kind: 'line', from: c.p, to: c.p }, change: null };
    case 'outline': {
      const handle = outlinePress(c);
      if (handle) return { drag: handle, change: null };
      // one click on a dashed ring takes that edge as the outline
      const i = pickEdge(edgeRings(c.doc), c.p, (PICK_PX / 2) * k);
      return i >= 0 ? { drag: null, change: chooseEdge(c.doc, i) } : { drag: pan, change: null };
    }
    case 'teach-outside':
    case 'teach-rim':
    case 'teach-core':
      return { drag: { kind: 'label' }, change: startLabelStroke(c.doc, TEACH_CLASS[c.tool], c.p, c.labelRadiusPx) };
  }
}

/** The edit a drag makes at pointer position `p` (`history` 'drag' while moving, 'drag-end' at release). */
export function dragEdit(d: Drag, c: PointerContext, history: HistoryMode): Change | null {
  switch (d.kind) {
    case 'vertex':
      return moveBoundaryPoint(c.doc, d.index, c.p, history);
    case 'brush':
      return brush(c.doc, c.p, c.brushRadiusPx, d.mode, history);
    case 'label':
      return extendLabelStroke(c.doc, c.p, history);
    case 'outline-move':
      return moveOutline(d.start, c.p.x - d.from.x, c.p.y - d.from.y, history);
    case 'outline-reshape':
      return reshape(d.start, d.centre, d.index, c.p, RESHAPE_SPAN_DEG, history);
    default:
      return null;
  }
}

/** The edit a finished sector drag makes, or null. */
export function sectorEdit(d: Drag, doc: Doc): Change | null {
  const centre = centreOf(doc);
  if (d.kind !== 'sector' || !centre) return null;
  if (Math.hypot(d.to.x - d.from.x, d.to.y - d.from.y) < 1) return null;
  const [a, b] = sectorFromDrag(centre, d.from, d.to);
  return addSector(doc, a, b);
}

/** What the pointer would do here, for the line under the image. */
export function hint(tool: Tool, doc: Doc): string {
  const measured = doc.base !== null;
  switch (tool) {
    case 'pan':
      return 'drag to pan, wheel to zoom';
    case 'vertex':
      return measured ? 'drag a boundary point; drag elsewhere to pan' : 'find the boundary first';
    case 'add-vertex':
      return measured ? 'click where the boundary should pass' : 'find the boundary first';
    case 'remove-vertex':
      return measured ? 'click a boundary point to remove it' : 'find the boundary first';
    case 'brush-add':
      return 'paint over core that belongs to the rim';
    case 'brush-remove':
      return 'paint over rim that belongs to the core';
    case 'sector':
      return 'drag around the centre to leave a sector out';
    case 'outline':
      return measured ? `drag the centre to move the outline, a handle to reshape it${doc.base?.result.specimen.edgeSearch?.candidates.length ? '; click a dashed ring to take that edge' : ''}` : 'find the boundary first';
    case 'scale-line':
      return 'drag along a known length (type it in the scale panel)';
    case 'teach-outside':
      return 'paint over background, holder or notch flank: outside the fracture surface';
    case 'teach-rim':
      return 'paint over the smooth rim band';
    case 'teach-core':
      return 'paint over the rough core';
  }
}
