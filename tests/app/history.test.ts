/** Per-image histories: inverse deltas, drags as one entry, undo on one image never touches another. */
import { describe, expect, it } from 'vitest';
import { newDoc, type Doc, type ImageInfo } from '../../src/app/state/document.js';
import { emptyHistory, record, takeUndo, type History } from '../../src/app/state/history.js';
import { activeDoc, addDoc, canRedo, canUndo, editDoc, editSeries, initialState, redo, undo, type AppState } from '../../src/app/state/store.js';
import type { DocPatch } from '../../src/app/state/document.js';

const image = (name: string): ImageInfo => ({ name, sha256: name, widthPx: 100, heightPx: 80, format: 'png', bitDepth: 8, metadataScale: null, metadataNote: null });

function twoImages(): AppState {
  let s = addDoc(initialState(), newDoc('a', image('a.png')));
  s = addDoc(s, newDoc('b', image('b.png')));
  return s;
}

const docOf = (s: AppState, id: string): Doc => s.docs.find((d) => d.id === id) as Doc;

describe('history of one document', () => {
  it('undo restores the previous values, redo the edit', () => {
    let s = twoImages();
    s = editDoc(s, 'b', { label: 'pixel size', patch: { scale: { source: 'typed', umPerPx: 5 } }, history: 'commit' });
    s = editDoc(s, 'b', { label: 'pixel size', patch: { scale: { source: 'typed', umPerPx: 10 } }, history: 'commit' });
    s = undo(s);
    expect(docOf(s, 'b').scale).toEqual({ source: 'typed', umPerPx: 5 });
    s = undo(s);
    expect(docOf(s, 'b').scale).toEqual({ source: 'none' });
    expect(canUndo(s)).toBe(false);
    s = redo(s);
    expect(docOf(s, 'b').scale).toEqual({ source: 'typed', umPerPx: 5 });
    expect(canRedo(s)).toBe(true);
  });

  it('a drag of many moves is one entry, undone in one step', () => {
    let h: History<DocPatch> = emptyHistory();
    let d = newDoc('a', image('a.png'));
    for (let k = 1; k <= 30; k++) {
      const patch: DocPatch = { exclude: [[0, k]] };
      h = record(h, d, patch, k < 30 ? 'drag' : 'drag-end', 'sector', k);
      d = { ...d, ...patch };
    }
    expect(h.undo).toHaveLength(1);
    expect(h.drag).toBeNull();
    expect(h.undo[0].undo).toEqual({ exclude: [] });
    expect(h.undo[0].redo).toEqual({ exclude: [[0, 30]] });
    expect(takeUndo(h, 99)?.patch).toEqual({ exclude: [] });
  });

  it("'none' edits (engine results) never enter the history", () => {
    let s = twoImages();
    s = editDoc(s, 'a', { label: 'result', patch: { materialError: 'x' }, history: 'none' });
    expect(docOf(s, 'a').history.undo).toHaveLength(0);
  });
});

describe('histories of several documents and the series', () => {
  it('undo on the second image leaves the first image alone', () => {
    let s = twoImages();
    s = { ...s, activeId: 'a' };
    s = editDoc(s, 'a', { label: 'pixel size', patch: { scale: { source: 'typed', umPerPx: 3 } }, history: 'commit' });
    s = { ...s, activeId: 'b' };
    s = editDoc(s, 'b', { label: 'pixel size', patch: { scale: { source: 'typed', umPerPx: 7 } }, history: 'commit' });
    s = undo(s);
    s = undo(s); // nothing more on b: must not reach a's edit
    expect(docOf(s, 'b').scale).toEqual({ source: 'none' });
    expect(docOf(s, 'a').scale).toEqual({ source: 'typed', umPerPx: 3 });
    expect(activeDoc(s)?.id).toBe('b');
  });

  it('undo takes the latest of the shown image and the series', () => {
    let s = twoImages();
    s = editDoc(s, 'b', { label: 'strain rate', patch: { strainRatePerS: 1 }, history: 'commit' });
    s = editSeries(s, { label: 'tolerance', patch: { material: { ...s.series.material, tolerancePct: 10 } }, history: 'commit' });
    s = undo(s);
    expect(s.series.material.tolerancePct).toBe(20);
    expect(docOf(s, 'b').strainRatePerS).toBe(1);
    s = undo(s);
    expect(docOf(s, 'b').strainRatePerS).toBeNull();
    s = redo(s);
    expect(docOf(s, 'b').strainRatePerS).toBe(1);
    expect(s.series.material.tolerancePct).toBe(20);
    s = redo(s);
    expect(s.series.material.tolerancePct).toBe(10);
  });
});
