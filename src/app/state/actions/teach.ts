/**
 * Teach mode: painting label strokes (a stroke is one history entry, like a drag), clearing them,
 * and choosing the model the series is measured with.
 */
import type { PointPx } from '../../../core/index.js';
import type { Doc, LabelClass, ModelInUse, Series } from '../document.js';
import type { HistoryMode } from '../history.js';
import { extendsStroke, LABEL_NAMES } from '../labels.js';
import { docEdit, refuse, seriesEdit, unchanged, type Change } from './types.js';

/** Starts a stroke of class `cls` at `p` with radius `radiusPx` (a drag: ends with {@link extendLabelStroke} 'drag-end'). */
export function startLabelStroke(doc: Doc, cls: LabelClass, p: PointPx, radiusPx: number): Change {
  if (!(radiusPx > 0)) return refuse('edit', 'The brush needs a radius above 0.');
  return docEdit(`paint ${LABEL_NAMES[cls].toLowerCase()}`, { labels: [...doc.labels, { cls, radiusPx, points: [{ x: p.x, y: p.y }] }] }, 'drag');
}

/** Continues the last stroke to `p`. */
export function extendLabelStroke(doc: Doc, p: PointPx, history: HistoryMode): Change {
  const last = doc.labels[doc.labels.length - 1];
  if (!last) return unchanged;
  if (!extendsStroke(last, p)) return history === 'drag-end' ? docEdit('paint', { labels: doc.labels }, 'drag-end') : unchanged;
  const labels = [...doc.labels.slice(0, -1), { ...last, points: [...last.points, { x: p.x, y: p.y }] }];
  return docEdit('paint', { labels }, history);
}

/** Removes every stroke of the image. */
export function clearLabels(doc: Doc): Change {
  if (doc.labels.length === 0) return refuse('edit', 'There are no strokes on this image.');
  return docEdit('clear strokes', { labels: [] });
}

/** Measures every image with `model` (null: with the fixed rules again). */
export function useModelForSeries(series: Series, model: ModelInUse | null): Change {
  if ((series.model?.sha256 ?? null) === (model?.sha256 ?? null)) return unchanged;
  return seriesEdit(model ? `measure with model ${model.name}` : 'measure without a model', { model });
}
