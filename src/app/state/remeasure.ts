/**
 * Re-measure controller: after an edit of the boundary, outline, sectors, scale or material, asks
 * the engine for a fast re-measure (no re-segmentation) with the edited polygon. Latest edit wins:
 * a request that comes back after a newer one was sent is dropped.
 */
import type { MeasureParams, PointPx } from '../../core/pipeline/types.js';
import type { Doc } from './document.js';
import { outlinePolygonOf, paramsOf } from './params.js';

export interface RemeasureRequest {
  docId: string;
  params: MeasureParams;
  geometry?: { outerPolygon?: PointPx[]; center?: PointPx };
}

export type RemeasureFn = (req: RemeasureRequest) => Promise<{ result: Record<string, unknown> }>;

/** The request for a document (boundary polygon always sent: re-measure never re-segments). */
export function remeasureRequestOf(doc: Doc): RemeasureRequest {
  const params = paramsOf(doc, { withBoundary: true });
  const req: RemeasureRequest = { docId: doc.id, params };
  if (doc.outlineEdited && doc.outline) {
    const outerPolygon = outlinePolygonOf(doc);
    if (outerPolygon) req.geometry = { outerPolygon, center: { x: doc.outline.cx, y: doc.outline.cy } };
  }
  return req;
}

/**
 * Re-measure dispatcher around an engine call `fn`; `onResult` / `onError` receive only the answer
 * to the latest request per document.
 */
export function createRemeasurer(fn: RemeasureFn, onResult: (docId: string, result: Record<string, unknown>) => void, onError: (docId: string, e: Error) => void) {
  const latest = new Map<string, number>();
  let counter = 0;
  return {
    /** Sends the request for `doc`; results of superseded requests are ignored. */
    request(doc: Doc): Promise<void> {
      const ticket = ++counter;
      latest.set(doc.id, ticket);
      const req = remeasureRequestOf(doc);
      return fn(req).then(
        (r) => {
          if (latest.get(doc.id) === ticket) onResult(doc.id, r.result);
        },
        (e: Error) => {
          if (latest.get(doc.id) === ticket) onError(doc.id, e);
        },
      );
    },
  };
}
