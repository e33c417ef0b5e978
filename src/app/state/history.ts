/**
 * Undo/redo with inverse deltas, one history per document (and one for the series). An entry keeps
 * the values of the edited fields after the edit (redo) and before it (undo). A drag is one entry:
 * edits with `history: 'drag'` change the state without an entry and remember the values from
 * before the drag; `'drag-end'` closes it as a single entry. State is immutable, so entries keep
 * references instead of copies.
 */

export interface HistoryEntry<P> {
  label: string;
  /** Order of the edit among all histories (undo takes the latest over the document and series). */
  seq: number;
  redo: P;
  undo: P;
}

export interface History<P> {
  undo: HistoryEntry<P>[];
  redo: HistoryEntry<P>[];
  /** Open drag: its label and the values before it started. */
  drag: { label: string; before: P } | null;
}

/** How an edit enters the history. */
export type HistoryMode = 'commit' | 'drag' | 'drag-end' | 'none';

export const HISTORY_LIMIT = 200;

export function emptyHistory<P>(): History<P> {
  return { undo: [], redo: [], drag: null };
}

/** The current values of the patch's fields. */
export function pick<T extends object, P extends Partial<T>>(target: T, patch: P): P {
  const out: Partial<T> = {};
  for (const k of Object.keys(patch) as (keyof T)[]) out[k] = target[k];
  return out as P;
}

function push<P>(h: History<P>, e: HistoryEntry<P>): History<P> {
  const undo = [...h.undo, e];
  if (undo.length > HISTORY_LIMIT) undo.shift();
  return { undo, redo: [], drag: null };
}

/**
 * Records an edit of `patch` on `target` (before it is applied).
 * @param seq - the order number for a new entry
 */
export function record<T extends object, P extends Partial<T>>(h: History<P>, target: T, patch: P, mode: HistoryMode, label: string, seq: number): History<P> {
  if (mode === 'none') return h;
  if (mode === 'commit') {
    const closed = h.drag ? closeDrag(h, target, seq) : h;
    return push(closed, { label, seq, undo: pick(target, patch), redo: patch });
  }
  const before = h.drag ? { ...pick(target, patch), ...h.drag.before } : pick(target, patch);
  const open = { ...h, drag: { label: h.drag?.label ?? label, before } };
  if (mode === 'drag') return open;
  // drag-end: the entry's redo values are the patch applied over the drag's current values
  return push(h, { label: open.drag.label, seq, undo: before, redo: { ...pick(target, before), ...patch } });
}

/** Closes an open drag as one entry (none if nothing changed). */
export function closeDrag<T extends object, P extends Partial<T>>(h: History<P>, target: T, seq: number): History<P> {
  if (!h.drag) return h;
  const redo = pick(target, h.drag.before);
  const changed = (Object.keys(redo) as (keyof P)[]).some((k) => redo[k] !== h.drag?.before[k]);
  if (!changed) return { ...h, drag: null };
  return push(h, { label: h.drag.label, seq, undo: h.drag.before, redo });
}

/** Sequence number of the entry undo would take (after closing a drag), or −1. */
export function lastUndoSeq<P>(h: History<P>): number {
  if (h.drag) return Number.MAX_SAFE_INTEGER;
  return h.undo.length ? h.undo[h.undo.length - 1].seq : -1;
}

/** Sequence number of the entry redo would take, or −1. */
export function lastRedoSeq<P>(h: History<P>): number {
  return h.redo.length ? h.redo[h.redo.length - 1].seq : -1;
}

/**
 * Takes the last entry off the undo stack onto the redo stack.
 * @returns the patch to apply and the new history, or null when there is nothing to undo
 */
export function takeUndo<P>(h: History<P>, stamp: number): { patch: P; history: History<P> } | null {
  const e = h.undo[h.undo.length - 1];
  if (!e) return null;
  return { patch: e.undo, history: { undo: h.undo.slice(0, -1), redo: [...h.redo, { ...e, seq: stamp }], drag: null } };
}

/** Takes the last undone entry back onto the undo stack; null when there is nothing to redo. */
export function takeRedo<P>(h: History<P>, stamp: number): { patch: P; history: History<P> } | null {
  const e = h.redo[h.redo.length - 1];
  if (!e) return null;
  return { patch: e.redo, history: { undo: [...h.undo, { ...e, seq: stamp }], redo: h.redo.slice(0, -1), drag: null } };
}
