/**
 * Application state and how edits enter it (pure functions, no React). Documents and the series
 * each keep their own history; undo takes the latest edit of the shown image or of the series, so
 * undoing on one image never changes another image's own inputs.
 */
import type { FeatureName } from '../../core/index.js';
import { newSeries, type Doc, type DocPatch, type Message, type MessageArea, type Series, type SeriesPatch } from './document.js';
import { closeDrag, lastRedoSeq, lastUndoSeq, record, takeRedo, takeUndo, type History, type HistoryMode } from './history.js';

export type Tool = 'pan' | 'vertex' | 'add-vertex' | 'remove-vertex' | 'brush-add' | 'brush-remove' | 'sector' | 'outline' | 'scale-line' | TeachTool;

/** The brushes of teach mode: outside the fracture surface, rim band, core. */
export type TeachTool = 'teach-outside' | 'teach-rim' | 'teach-core';

/** True for a teach-mode brush. */
export function isTeachTool(t: Tool): t is TeachTool {
  return t === 'teach-outside' || t === 'teach-rim' || t === 'teach-core';
}

export interface ViewState {
  tool: Tool;
  /** Brush radius, µm; 0 = automatic (1/40 of the smaller image side). */
  brushRadiusUm: number;
  texture: { feature: FeatureName | null; opacity: number };
  /** Teach mode: the label brushes and the class-map preview are shown. */
  teach: { on: boolean; radiusUm: number; opacity: number };
  showHelp: boolean;
}

export interface AppState {
  docs: Doc[];
  activeId: string | null;
  series: Series;
  view: ViewState;
  /** Order counter of history entries over all histories. */
  seq: number;
  /** Messages not tied to an open image (a file that could not be opened), newest last. */
  notices: string[];
}

/** An edit as actions return it: the new values, and whether (and how) it enters the history. */
export interface Edit<P> {
  label: string;
  patch: P;
  history: HistoryMode;
}

export function initialState(): AppState {
  return {
    docs: [],
    activeId: null,
    series: newSeries(),
    view: { tool: 'vertex', brushRadiusUm: 0, texture: { feature: null, opacity: 0.5 }, teach: { on: false, radiusUm: 0, opacity: 0.45 }, showHelp: false },
    seq: 0,
    notices: [],
  };
}

/** The document shown, or null. */
export function activeDoc(s: AppState): Doc | null {
  return s.docs.find((d) => d.id === s.activeId) ?? null;
}

function mapDoc(s: AppState, id: string, f: (d: Doc) => Doc): AppState {
  return { ...s, docs: s.docs.map((d) => (d.id === id ? f(d) : d)) };
}

/** Applies an edit to one document (recording it in that document's history). */
export function editDoc(s: AppState, id: string, e: Edit<DocPatch>): AppState {
  const seq = s.seq + 1;
  return { ...mapDoc(s, id, (d) => ({ ...d, ...e.patch, history: record(d.history, d, e.patch, e.history, e.label, seq) })), seq };
}

/** Applies an edit to the series (recording it in the series history). */
export function editSeries(s: AppState, e: Edit<SeriesPatch>): AppState {
  const seq = s.seq + 1;
  return { ...s, series: { ...s.series, ...e.patch, history: record(s.series.history, s.series, e.patch, e.history, e.label, seq) }, seq };
}

/** Updates fields the engine derives (result, busy flags); never enters the history. */
export function derive(s: AppState, id: string, patch: DocPatch): AppState {
  return mapDoc(s, id, (d) => ({ ...d, ...patch }));
}

/** Replaces the messages of one area of a document (an empty list clears them). */
export function say(s: AppState, id: string, area: MessageArea, messages: Omit<Message, 'area'>[]): AppState {
  return mapDoc(s, id, (d) => ({ ...d, messages: [...d.messages.filter((m) => m.area !== area), ...messages.map((m) => ({ ...m, area }))] }));
}

/** Adds a message not tied to an image (the last 5 are kept). */
export function notice(s: AppState, text: string): AppState {
  return { ...s, notices: [...s.notices, text].slice(-5) };
}

/** Closes open drags (before undo/redo). */
function closeDrags(s: AppState): AppState {
  const d = activeDoc(s);
  const seq = s.seq + 1;
  let out: AppState = { ...s, seq, series: { ...s.series, history: closeDrag(s.series.history, s.series, seq) } };
  if (d) out = mapDoc(out, d.id, (x) => ({ ...x, history: closeDrag(x.history, x, seq) }));
  return out;
}

/** True when undo has something to take (shown image or series). */
export function canUndo(s: AppState): boolean {
  const d = activeDoc(s);
  return Boolean(s.series.history.undo.length || s.series.history.drag || (d && (d.history.undo.length || d.history.drag)));
}

/** True when redo has something to take. */
export function canRedo(s: AppState): boolean {
  const d = activeDoc(s);
  return Boolean(s.series.history.redo.length || (d && d.history.redo.length));
}

type Take = <P>(h: History<P>, stamp: number) => { patch: P; history: History<P> } | null;

/** Applies `take` (undo or redo) to the history whose last entry is the latest: the shown image's or the series'. */
function travel(s: AppState, take: Take, last: (h: History<DocPatch> | History<SeriesPatch>) => number): AppState {
  const d = activeDoc(s);
  const stamp = s.seq + 1;
  if (d && last(d.history) > last(s.series.history)) {
    const t = take(d.history, stamp);
    return t ? { ...mapDoc(s, d.id, (x) => ({ ...x, ...t.patch, history: t.history })), seq: stamp } : s;
  }
  const t = take(s.series.history, stamp);
  return t ? { ...s, series: { ...s.series, ...t.patch, history: t.history }, seq: stamp } : s;
}

/** Undoes the latest edit of the shown image or of the series. */
export function undo(s: AppState): AppState {
  return travel(closeDrags(s), takeUndo, lastUndoSeq);
}

/** Redoes the latest undone edit of the shown image or of the series. */
export function redo(s: AppState): AppState {
  return travel(s, takeRedo, lastRedoSeq);
}

/** Adds a document and shows it (opening is not an undoable edit). */
export function addDoc(s: AppState, doc: Doc): AppState {
  return { ...s, docs: [...s.docs, doc], activeId: doc.id };
}

/** Closes a document (its history goes with it). */
export function removeDoc(s: AppState, id: string): AppState {
  const docs = s.docs.filter((d) => d.id !== id);
  const i = s.docs.findIndex((d) => d.id === id);
  return { ...s, docs, activeId: s.activeId === id ? (docs[Math.min(i, docs.length - 1)]?.id ?? null) : s.activeId };
}

/** Updates view settings (tool, texture map, help); never enters the history. */
export function setView(s: AppState, v: Partial<ViewState>): AppState {
  return { ...s, view: { ...s.view, ...v } };
}

/** Shows the next (+1) or previous (−1) document, wrapping around. */
export function step(s: AppState, delta: 1 | -1): AppState {
  if (s.docs.length === 0) return s;
  const i = Math.max(0, s.docs.findIndex((d) => d.id === s.activeId));
  return { ...s, activeId: s.docs[(i + delta + s.docs.length) % s.docs.length].id };
}
