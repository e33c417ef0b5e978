/**
 * Teach mode's state: strokes become label values (disc brushes along polylines, later strokes on
 * top), a stroke is one undoable edit, the classes still missing are named, and choosing a model
 * for the series makes every measured result wait for a new full run.
 */
import { describe, expect, it } from 'vitest';
import { apply } from '../../src/app/state/actions/types.js';
import { clearLabels, extendLabelStroke, startLabelStroke, useModelForSeries } from '../../src/app/state/actions/teach.js';
import { classesPainted, missingClasses, rasteriseStrokes } from '../../src/app/state/labels.js';
import { activeDoc, addDoc, initialState, undo } from '../../src/app/state/store.js';
import { needsFullRun, paramsOf } from '../../src/app/state/results.js';
import { measured } from './fixture.js';

describe('strokes → label values', () => {
  it('a dot paints a disc of its radius; a segment paints a capsule', () => {
    const dot = rasteriseStrokes([{ cls: 2, radiusPx: 2, points: [{ x: 5, y: 5 }] }], 11, 11);
    // pixels within 2 px of (5, 5): 13 (the disc of radius 2 on the integer grid)
    expect(dot.reduce((n, v) => n + (v === 2 ? 1 : 0), 0)).toBe(13);
    expect(dot[5 * 11 + 7]).toBe(2);
    expect(dot[5 * 11 + 8]).toBe(0);
    const seg = rasteriseStrokes([{ cls: 1, radiusPx: 1, points: [{ x: 1, y: 3 }, { x: 8, y: 3 }] }], 10, 7);
    // the row y = 3 from x 0..9, rows 2 and 4 from x 1..8
    expect(seg.reduce((n, v) => n + v, 0)).toBe(10 + 8 + 8);
  });

  it('a later stroke paints over an earlier one; strokes outside the image are clipped', () => {
    const r = rasteriseStrokes(
      [
        { cls: 3, radiusPx: 3, points: [{ x: 4, y: 4 }] },
        { cls: 1, radiusPx: 1, points: [{ x: 4, y: 4 }] },
        { cls: 2, radiusPx: 2, points: [{ x: -10, y: -10 }, { x: -5, y: -5 }] },
      ],
      9,
      9,
    );
    expect(r[4 * 9 + 4]).toBe(1);
    expect(r[4 * 9 + 7]).toBe(3);
    expect(r.includes(2)).toBe(false);
  });
});

describe('teach actions', () => {
  it('a stroke is one history entry; undo removes it whole', async () => {
    const { doc, series } = await measured();
    let s = addDoc({ ...initialState(), series }, doc);
    const d = () => activeDoc(s) ?? doc;
    s = apply(s, doc.id, startLabelStroke(d(), 3, { x: 100, y: 100 }, 4), 'teach');
    for (const x of [103, 106, 107, 120]) s = apply(s, doc.id, extendLabelStroke(d(), { x, y: 100 }, 'drag'), 'teach');
    s = apply(s, doc.id, extendLabelStroke(d(), { x: 121, y: 100 }, 'drag-end'), 'teach');
    // points closer than 0.35 radius to the last one are skipped (107 after 106)
    expect(d().labels).toEqual([{ cls: 3, radiusPx: 4, points: [100, 103, 106, 120].map((x) => ({ x, y: 100 })) }]);
    expect(d().history.undo).toHaveLength(1);
    expect(classesPainted(d().labels)).toEqual(new Set([3]));
    expect(missingClasses(s.docs)).toEqual([1, 2]);
    s = undo(s);
    expect(d().labels).toEqual([]);
    expect(clearLabels(d())).toEqual({ refused: 'There are no strokes on this image.', area: 'edit' });
    expect(startLabelStroke(d(), 1, { x: 0, y: 0 }, 0)).toHaveProperty('refused');
  });

  it('measuring with a model is a series input: it enters the parameters and asks for a full run', async () => {
    const { doc, series } = await measured();
    expect(needsFullRun(doc, series)).toBeNull();
    const c = useModelForSeries(series, { name: 'm.model.json', sha256: 'c'.repeat(64), text: '{}' });
    if (!('series' in c)) throw new Error('expected a series edit');
    const withModel = { ...series, ...c.series.patch };
    expect(paramsOf(doc, withModel).modelSha256).toBe('c'.repeat(64));
    expect(needsFullRun(doc, withModel)).toMatch(/measured with a taught model/);
    expect(useModelForSeries(withModel, { name: 'other name', sha256: 'c'.repeat(64), text: '{}' })).toEqual({ unchanged: true });
    expect(paramsOf(doc, series).modelSha256).toBeUndefined();
  });
});
