/**
 * Application state and its inverse-delta history (pure functions, no React).
 *
 * Every document edit is a patch (a subset of Doc fields). Entering the history stores the patch
 * and its inverse (the previous values of the same fields); undo applies the inverse, redo the patch.
 * A drag is one entry: `edit(..., 'transient')` updates the state without history and remembers the
 * values from before the drag; `edit(..., 'end')` closes it as a single entry.
 */
import type { Doc } from './document.js';

export type DocPatch = Partial<Omit<Doc, 'id'>>;

export interface HistoryEntry {
  docId: string;
  label: string;
  /** Values after the edit (redo) and before it (undo), same keys. */
  redo: DocPatch;
  undo: DocPatch;
}

export type Tool = 'pan' | 'vertex' | 'add-vertex' | 'remove-vertex' | 'brush-add' | 'brush-remove' | 'sector' | 'scale-line' | 'outline';

export interface ViewState {
  tool: Tool;
  brushRadiusUm: number;
  overlayFeature: string | null;
  overlayWindowUm: number;
  overlayOpacity: number;
  showHelp: boolean;
}

export interface AppState {
  docs: Doc[];
  activeId: string | null;
  undo: HistoryEntry[];
  redo: HistoryEntry[];
  /** Open drag: the values before it started (for its single history entry). */
  drag: { docId: string; label: string; before: DocPatch } | null;
  view: ViewState;
}

export const HISTORY_LIMIT = 200;

/** Empty state: no documents, empty history, point tool. */
export function initialState(): AppState {
  return {
    docs: [],
    activeId: null,
    undo: [],
    redo: [],
    drag: null,
    view: { tool: 'vertex', brushRadiusUm: 0, overlayFeature: null, overlayWindowUm: 0, overlayOpacity: 0.5, showHelp: false },
  };
}

/** The document shown, or null. */
export function activeDoc(s: AppState): Doc | null {
  return s.docs.find((d) => d.id === s.activeId) ?? null;
}

function clone<T>(v: T): T {
  return v === undefined ? v : (structuredClone(v) as T);
}

/** The current values of the patch's fields (deep copies). */
export function pick(doc: Doc, keys: readonly string[]): DocPatch {
  const out: Record<string, unknown> = {};
  for (const k of keys) out[k] = clone((doc as unknown as Record<string, unknown>)[k]);
  return out as DocPatch;
}

function applyPatch(s: AppState, docId: string, patch: DocPatch): AppState {
  return { ...s, docs: s.docs.map((d) => (d.id === docId ? { ...d, ...clone(patch) } : d)) };
}

function pushEntry(s: AppState, e: HistoryEntry): AppState {
  const undo = [...s.undo, e];
  if (undo.length > HISTORY_LIMIT) undo.shift();
  return { ...s, undo, redo: [] };
}

/**
 * Applies a patch to a document.
 * - 'commit': one history entry now.
 * - 'transient': no history; the first transient edit of a drag records the values before it.
 * - 'end': applies the patch and closes the drag as ONE entry (before = values at drag start).
 * - 'silent': no history at all (engine results, status fields).
 */
export function edit(s: AppState, docId: string, patch: DocPatch, mode: 'commit' | 'transient' | 'end' | 'silent' = 'commit', label = 'edit'): AppState {
  const doc = s.docs.find((d) => d.id === docId);
  if (!doc) return s;
  const keys = Object.keys(patch);
  if (mode === 'silent') return applyPatch(s, docId, patch);
  if (mode === 'commit') {
    if (s.drag) s = endDrag(s);
    const undo = pick(doc, keys);
    return pushEntry(applyPatch(s, docId, patch), { docId, label, undo, redo: clone(patch) });
  }
  if (mode === 'transient') {
    let drag = s.drag;
    if (!drag || drag.docId !== docId) drag = { docId, label, before: pick(doc, keys) };
    else {
      const missing = keys.filter((k) => !(k in drag!.before));
      if (missing.length) drag = { ...drag, before: { ...drag.before, ...pick(doc, missing) } };
    }
    return { ...applyPatch(s, docId, patch), drag };
  }
  // end
  const applied = applyPatch(s, docId, patch);
  return endDrag(applied.drag ? applied : { ...applied, drag: { docId, label, before: pick(doc, keys) } });
}

/** Closes an open drag as one history entry (no entry if nothing changed). */
export function endDrag(s: AppState): AppState {
  const drag = s.drag;
  if (!drag) return s;
  const doc = s.docs.find((d) => d.id === drag.docId);
  const cleared = { ...s, drag: null };
  if (!doc) return cleared;
  const keys = Object.keys(drag.before);
  const redo = pick(doc, keys);
  if (JSON.stringify(redo) === JSON.stringify(drag.before)) return cleared;
  return pushEntry(cleared, { docId: drag.docId, label: drag.label, undo: drag.before, redo });
}

/** True when there is something to undo (including an open drag). */
export function canUndo(s: AppState): boolean {
  return s.undo.length > 0 || s.drag !== null;
}
/** True when there is something to redo. */
export function canRedo(s: AppState): boolean {
  return s.redo.length > 0;
}

/** Undo the last entry (closing an open drag first): applies its inverse delta. */
export function undo(s: AppState): AppState {
  s = endDrag(s);
  const e = s.undo[s.undo.length - 1];
  if (!e) return s;
  const next = applyPatch(s, e.docId, e.undo);
  return { ...next, activeId: e.docId, undo: s.undo.slice(0, -1), redo: [...s.redo, e] };
}

/** Redo the last undone entry: applies its delta again. */
export function redo(s: AppState): AppState {
  const e = s.redo[s.redo.length - 1];
  if (!e) return s;
  const next = applyPatch(s, e.docId, e.redo);
  return { ...next, activeId: e.docId, redo: s.redo.slice(0, -1), undo: [...s.undo, e] };
}

/** Adds a document and shows it (opening is not an undoable edit). */
export function addDoc(s: AppState, doc: Doc): AppState {
  return { ...s, docs: [...s.docs, doc], activeId: doc.id };
}

/** Closes a document and drops its history entries. */
export function removeDoc(s: AppState, docId: string): AppState {
  const docs = s.docs.filter((d) => d.id !== docId);
  return {
    ...s,
    docs,
    activeId: s.activeId === docId ? (docs[0]?.id ?? null) : s.activeId,
    undo: s.undo.filter((e) => e.docId !== docId),
    redo: s.redo.filter((e) => e.docId !== docId),
    drag: s.drag?.docId === docId ? null : s.drag,
  };
}

/** Updates view settings (tool, overlay, help); never enters the history. */
export function setView(s: AppState, v: Partial<ViewState>): AppState {
  return { ...s, view: { ...s.view, ...v } };
}

/** Shows the next (+1) or previous (−1) document of the list, wrapping around. */
export function step(s: AppState, delta: 1 | -1): AppState {
  if (s.docs.length === 0) return s;
  const i = Math.max(0, s.docs.findIndex((d) => d.id === s.activeId));
  const j = (i + delta + s.docs.length) % s.docs.length;
  return { ...s, activeId: s.docs[j].id };
}

/** Fields whose change needs a re-measure (fast path, no re-segmentation). */
export const MEASURE_FIELDS = ['boundary', 'outline', 'exclude', 'scale', 'material', 'settings'] as const;

/** True when a re-measure is needed between two versions of a document. */
export function needsRemeasure(before: Doc | undefined, after: Doc): boolean {
  if (!after.boundary) return false;
  if (!before) return true;
  return MEASURE_FIELDS.some((k) => before[k] !== after[k]);
}
