/**
 * What an action returns: an edit of one document or of the series (new values plus how it enters
 * the history), or a refusal in the app's words for the panel it came from. Actions are small pure
 * functions of the current state and the user's input; they never touch the UI or the engine.
 */
import type { DocPatch, MessageArea, SeriesPatch } from '../document.js';
import type { HistoryMode } from '../history.js';
import { derive, editDoc, editSeries, say, type AppState, type Edit } from '../store.js';

export type Change = { doc: Edit<DocPatch> } | { series: Edit<SeriesPatch> } | { refused: string; area: MessageArea } | { unchanged: true };

export const docEdit = (label: string, patch: DocPatch, history: HistoryMode = 'commit'): Change => ({ doc: { label, patch, history } });
export const seriesEdit = (label: string, patch: SeriesPatch, history: HistoryMode = 'commit'): Change => ({ series: { label, patch, history } });
export const refuse = (area: MessageArea, text: string): Change => ({ refused: text, area });
export const unchanged: Change = { unchanged: true };

/**
 * Applies an action's outcome to the state for document `docId`: the edit enters the right
 * history and clears the messages of its area; a refusal becomes an error message in its area.
 */
export function apply(s: AppState, docId: string, c: Change, area: MessageArea): AppState {
  if ('unchanged' in c) return s;
  if ('refused' in c) return say(s, docId, c.area, [{ level: 'error', text: c.refused }]);
  const next = 'doc' in c ? editDoc(s, docId, c.doc) : editSeries(s, c.series);
  const cleared = say(next, docId, area, []);
  // a new edit makes an earlier refusal of the engine obsolete
  return 'doc' in c ? derive(cleared, docId, { refused: null }) : cleared;
}

/** The same change without a history entry (inputs an app sets up itself, e.g. for the bundled sample). */
export function quiet(c: Change): Change {
  if ('doc' in c) return { doc: { ...c.doc, history: 'none' } };
  if ('series' in c) return { series: { ...c.series, history: 'none' } };
  return c;
}

/** A positive finite number from a text field, or null. */
export function positiveNumber(v: number | null): number | null {
  return v !== null && Number.isFinite(v) && v > 0 ? v : null;
}
