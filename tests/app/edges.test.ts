/**
 * Edge candidates and the section diameter: one click takes a candidate's outline (one undoable
 * edit; the search's own choice means "as found"), the diameter is typed in mm and sent in µm, and a
 * change of it asks for a full run (core's rule).
 */
import { describe, expect, it } from 'vitest';
import type { PointPx } from '../../src/core/index.js';
import { apply } from '../../src/app/state/actions/types.js';
import { chooseEdge } from '../../src/app/state/actions/edit.js';
import { setSectionDiameter } from '../../src/app/state/actions/scale.js';
import { activeDoc, addDoc, initialState, undo } from '../../src/app/state/store.js';
import { needsFullRun, paramsOf } from '../../src/app/state/results.js';
import { edgeRings, pickEdge } from '../../src/app/render/layers.js';
import type { Doc, EdgeCandidate } from '../../src/app/state/document.js';
import { measured } from './fixture.js';

const ring = (cx: number, cy: number, r: number): PointPx[] => Array.from({ length: 72 }, (_, i) => ({ x: cx + r * Math.cos((i * Math.PI) / 36), y: cy - r * Math.sin((i * Math.PI) / 36) }));

/** The measured document with an edge search of two candidates (the base run's own outline chosen). */
async function withEdges(): Promise<Doc> {
  const { doc } = await measured();
  const base = doc.base;
  if (!base) throw new Error('no base run');
  const sp = base.result.specimen;
  const cand = (role: EdgeCandidate['role'], r: number, outline: PointPx[]): EdgeCandidate => ({ diameterUm: 2 * r * 8.5, diameterPx: 2 * r, center: sp.center, prominence: 2, coverage: 0.9, roundnessPx: 1, role, note: role, outline });
  const edgeSearch = { rule: 'outermost-rough-edge', outlineFromSilhouette: false, candidates: [cand('chosen', sp.radiusPx, sp.outline), cand('candidate', sp.radiusPx * 0.8, ring(sp.center.x, sp.center.y, sp.radiusPx * 0.8))] };
  const result = { ...base.result, specimen: { ...sp, edgeSearch } };
  return { ...doc, base: { ...base, result }, result };
}

describe('edge candidates', () => {
  it('one click takes a candidate as the outline; the chosen one is "as found"; undo brings the old one back', async () => {
    const doc = await withEdges();
    let s = addDoc(initialState(), doc);
    const d = () => activeDoc(s) as Doc;
    const c1 = doc.base?.result.specimen.edgeSearch?.candidates[1];
    s = apply(s, doc.id, chooseEdge(d(), 1), 'edit');
    expect(d().outline).toEqual(c1?.outline);
    expect(d().history.undo.at(-1)?.label).toMatch(/^outline: edge ⌀ \d/);
    expect(edgeRings(d()).map((r) => r.inUse)).toEqual([false, true]);
    s = apply(s, doc.id, chooseEdge(d(), 0), 'edit');
    expect(d().outline).toBeNull();
    expect(edgeRings(d()).map((r) => r.inUse)).toEqual([true, false]);
    expect(chooseEdge(d(), 0)).toEqual({ unchanged: true });
    s = undo(s);
    expect(d().outline).toEqual(c1?.outline);
    expect(chooseEdge(d(), 5)).toHaveProperty('refused');
  });

  it('a click picks the ring within reach, the nearest one', async () => {
    const doc = await withEdges();
    const sp = doc.base?.result.specimen;
    if (!sp) throw new Error('no specimen');
    const rings = edgeRings(doc);
    expect(rings[1].label).toBe(`⌀ ${Number(((2 * sp.radiusPx * 0.8 * 8.5) / 1000).toPrecision(4))} mm`);
    expect(rings[0].label).toMatch(/\(chosen\)$/);
    const r = sp.radiusPx * 0.8;
    expect(pickEdge(rings, { x: sp.center.x + r + 2, y: sp.center.y }, 5)).toBe(1);
    expect(pickEdge(rings, { x: sp.center.x + r - 20, y: sp.center.y }, 5)).toBe(-1);
  });
});

describe('section diameter', () => {
  it('typed in mm, sent in µm; empty clears it; a change needs a full run', async () => {
    const { doc, series } = await measured();
    const c = setSectionDiameter(doc, 5.1);
    if (!('doc' in c)) throw new Error('expected an edit');
    expect(c.doc.patch).toEqual({ sectionDiameterUm: 5100 });
    const d2 = { ...doc, sectionDiameterUm: 5100 };
    expect(paramsOf(d2, series).sectionDiameterUm).toBe(5100);
    expect(paramsOf(doc, series).sectionDiameterUm).toBeUndefined();
    expect(needsFullRun(d2, series)).toMatch(/section diameter/);
    expect(setSectionDiameter(d2, 5.1)).toEqual({ unchanged: true });
    expect(setSectionDiameter(d2, null)).toEqual({ doc: { label: 'no section diameter', patch: { sectionDiameterUm: null }, history: 'commit' } });
    expect(setSectionDiameter(d2, -2)).toHaveProperty('refused');
  });
});
