/**
 * Edits of the measured geometry: boundary points, brush, excluded sectors, the specimen outline,
 * and the outcome of a full run. Drags pass `history: 'drag'` while moving and `'drag-end'` at
 * release, so a drag is one history entry.
 */
import type { PointPx } from '../../../core/index.js';
import { boundaryOf, centreOf, edgeCandidatesOf, type Analysis, type Doc } from '../document.js';
import type { HistoryMode } from '../history.js';
import { brushBoundary, moveVertex, nearestVertex, pullBoundaryThrough, removeVertex } from '../geometry.js';
import { fittedOutline, reshapeOutline, translatePolygon } from '../outline.js';
import { docEdit, refuse, unchanged, type Change } from './types.js';

const NEEDS_RUN = 'Find the boundary first (“Find boundary”), then correct it.';

/** Moves boundary vertex `i` to `p`. */
export function moveBoundaryPoint(doc: Doc, i: number, p: PointPx, history: HistoryMode): Change {
  const b = boundaryOf(doc);
  if (!b) return refuse('edit', NEEDS_RUN);
  return docEdit('move point', { boundary: moveVertex(b, i, p) }, history);
}

/** "Add point": the boundary is pulled through `p` over ±3 ray spacings, so the rays there see it. */
export function addBoundaryPoint(doc: Doc, p: PointPx, nRays: number): Change {
  const b = boundaryOf(doc);
  const c = centreOf(doc);
  if (!b || !c) return refuse('edit', NEEDS_RUN);
  return docEdit('add point', { boundary: pullBoundaryThrough(b, c, p, (3 * 360) / Math.max(8, nRays)) });
}

/** Removes the boundary vertex nearest to `p` (within `tolPx`). */
export function removeBoundaryPoint(doc: Doc, p: PointPx, tolPx: number): Change {
  const b = boundaryOf(doc);
  if (!b) return refuse('edit', NEEDS_RUN);
  const i = nearestVertex(b, p, tolPx);
  if (i < 0) return refuse('edit', 'Click on a boundary point to remove it.');
  if (b.length <= 3) return refuse('edit', 'A boundary keeps at least 3 points.');
  return docEdit('remove point', { boundary: removeVertex(b, i) });
}

/** Brush at `q` with radius `r` px: paint rim (the boundary moves inwards) or core (outwards). */
export function brush(doc: Doc, q: PointPx, r: number, mode: 'rim' | 'core', history: HistoryMode): Change {
  const b = boundaryOf(doc);
  const c = centreOf(doc);
  if (!b || !c) return refuse('edit', NEEDS_RUN);
  return docEdit(mode === 'rim' ? 'paint rim' : 'paint core', { boundary: brushBoundary(b, c, q, r, mode === 'rim' ? 'add' : 'remove') }, history);
}

/** Back to the automatic boundary of the last full run. */
export function resetBoundary(doc: Doc): Change {
  if (!doc.boundary) return refuse('edit', 'The boundary is the automatic one already.');
  return docEdit('automatic boundary', { boundary: null });
}

/** Excludes the sector [from, to] (degrees, counter-clockwise, wrap allowed). */
export function addSector(doc: Doc, from: number, to: number): Change {
  const span = (((to - from) % 360) + 360) % 360;
  if (span < 0.5) return refuse('edit', 'Drag around the centre to exclude a sector.');
  return docEdit('exclude sector', { exclude: [...doc.exclude, [from, to]] });
}

/** Takes excluded sector `i` back into the measurement. */
export function removeSector(doc: Doc, i: number): Change {
  if (!doc.exclude[i]) return refuse('edit', 'There is no such sector.');
  return docEdit('remove sector', { exclude: doc.exclude.filter((_, k) => k !== i) });
}

/** The outline replaced by the measurement's circle or ellipse fit, or back to the edge found. */
export function resetOutline(doc: Doc, kind: 'circle' | 'ellipse' | 'found'): Change {
  const r = doc.result ?? doc.base?.result;
  if (!r || !doc.base) return refuse('edit', 'Find the boundary first: the outline comes with the measurement.');
  if (kind === 'found') return doc.outline ? docEdit('outline as found', { outline: null }) : refuse('edit', 'The outline is the one found already.');
  return docEdit(kind === 'circle' ? 'outline: circle fit' : 'outline: ellipse fit', { outline: fittedOutline(doc.base.result, kind) });
}

/** The outline replaced by closed edge `i` the measurement found (its candidates); the chosen one is "as found". */
export function chooseEdge(doc: Doc, i: number): Change {
  const c = edgeCandidatesOf(doc)[i];
  if (!c || c.outline.length < 3) return refuse('edit', 'There is no such edge: find the boundary first.');
  const mm = Number((c.diameterUm / 1000).toPrecision(4));
  if (c.role === 'chosen') return doc.outline ? docEdit(`outline: edge ⌀ ${mm} mm`, { outline: null }) : unchanged;
  return docEdit(`outline: edge ⌀ ${mm} mm`, { outline: c.outline.map((p) => ({ x: p.x, y: p.y })) });
}

/** Moves the whole outline by (dx, dy) px from `start` (the outline when the drag began). */
export function moveOutline(start: PointPx[], dx: number, dy: number, history: HistoryMode): Change {
  return docEdit('move outline', { outline: translatePolygon(start, dx, dy) }, history);
}

/** Reshapes the outline from `start`: vertex `index` to `to`, neighbours within ±spanDeg follow. */
export function reshape(start: PointPx[], centre: PointPx, index: number, to: PointPx, spanDeg: number, history: HistoryMode): Change {
  return docEdit('reshape outline', { outline: reshapeOutline(start, centre, index, to, spanDeg) }, history);
}

/**
 * A full run came back: it becomes the base of every later result; corrections made by hand on the
 * previous run are dropped (undo brings them back with the previous run).
 */
export function runDone(doc: Doc, run: Analysis): Change {
  return docEdit('find boundary', { base: run, boundary: null, outline: null });
}
