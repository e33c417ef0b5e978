import { describe, expect, it } from 'vitest';
import { newDoc } from '../../src/app/state/document.js';
import { addDoc, canUndo, edit, initialState, needsRemeasure, redo, undo, activeDoc } from '../../src/app/state/store.js';
import { moveVertex } from '../../src/app/state/geometry.js';
import { commandForKey, run } from '../../src/app/state/commands.js';

const square = [
  { x: 10, y: 10 },
  { x: 20, y: 10 },
  { x: 20, y: 20 },
  { x: 10, y: 20 },
];

function start() {
  const d = newDoc({ id: 'a', name: 'a.png', sha256: '00', widthPx: 100, heightPx: 80 });
  let s = addDoc(initialState(), d);
  s = edit(s, 'a', { boundary: square }, 'silent');
  return s;
}

describe('inverse-delta history', () => {
  it('undo restores the previous value and redo re-applies the edit', () => {
    let s = start();
    s = edit(s, 'a', { boundary: moveVertex(square, 0, { x: 5, y: 5 }) }, 'commit', 'move point');
    expect(activeDoc(s)!.boundary![0]).toEqual({ x: 5, y: 5 });
    s = undo(s);
    expect(activeDoc(s)!.boundary![0]).toEqual({ x: 10, y: 10 });
    s = redo(s);
    expect(activeDoc(s)!.boundary![0]).toEqual({ x: 5, y: 5 });
    expect(s.redo).toHaveLength(0);
  });

  it('a drag of many moves is ONE history entry, undone in one step', () => {
    let s = start();
    for (let k = 1; k <= 50; k++) s = edit(s, 'a', { boundary: moveVertex(activeDoc(s)!.boundary!, 2, { x: 20 + k, y: 20 + k }) }, 'transient', 'drag point');
    s = edit(s, 'a', { boundary: moveVertex(activeDoc(s)!.boundary!, 2, { x: 99, y: 70 }) }, 'end', 'drag point');
    expect(s.undo).toHaveLength(1);
    expect(s.drag).toBeNull();
    s = undo(s);
    expect(activeDoc(s)!.boundary![2]).toEqual({ x: 20, y: 20 });
    expect(canUndo(s)).toBe(false);
  });

  it('a new edit clears the redo stack; silent edits never enter the history', () => {
    let s = start();
    expect(s.undo).toHaveLength(0);
    s = edit(s, 'a', { exclude: [[10, 20]] });
    s = undo(s);
    s = edit(s, 'a', { exclude: [[30, 40]] });
    expect(s.redo).toHaveLength(0);
    s = edit(s, 'a', { result: { x: 1 } }, 'silent');
    expect(s.undo).toHaveLength(1);
  });

  it('history keeps copies: mutating the edited array later does not change the entry', () => {
    let s = start();
    const poly = square.map((p) => ({ ...p }));
    s = edit(s, 'a', { boundary: poly });
    poly[0].x = 1234;
    s = undo(s);
    s = redo(s);
    expect(activeDoc(s)!.boundary![0].x).toBe(10);
  });

  it('keyboard Ctrl+Z dispatches undo and V selects the point tool', () => {
    let s = start();
    s = edit(s, 'a', { exclude: [[0, 10]] });
    const c = commandForKey({ key: 'z', ctrlKey: true });
    expect(c?.name).toBe('undo');
    s = c!.perform(s);
    expect(activeDoc(s)!.exclude).toEqual([]);
    s = run(s, 'tool-brush-add');
    expect(s.view.tool).toBe('brush-add');
    expect(commandForKey({ key: 'v' })!.perform(s).view.tool).toBe('vertex');
  });

  it('needsRemeasure is true for boundary edits and false for result-only updates', () => {
    let s = start();
    const before = activeDoc(s)!;
    s = edit(s, 'a', { boundary: moveVertex(square, 1, { x: 25, y: 8 }) });
    expect(needsRemeasure(before, activeDoc(s)!)).toBe(true);
    const mid = activeDoc(s)!;
    s = edit(s, 'a', { result: { a: 1 } }, 'silent');
    expect(needsRemeasure(mid, activeDoc(s)!)).toBe(false);
  });
});
