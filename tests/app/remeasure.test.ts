import { describe, expect, it } from 'vitest';
import { newDoc } from '../../src/app/state/document.js';
import { addDoc, activeDoc, edit, initialState } from '../../src/app/state/store.js';
import { moveVertex } from '../../src/app/state/geometry.js';
import { createRemeasurer, remeasureRequestOf, type RemeasureRequest } from '../../src/app/state/remeasure.js';
import { paramsOf } from '../../src/app/state/params.js';
import { defaultParams } from '../../src/core/pipeline/params.js';

const poly = [
  { x: 40, y: 50 },
  { x: 50, y: 40 },
  { x: 60, y: 50 },
  { x: 50, y: 60 },
];

describe('edit → re-measure', () => {
  it('re-measure is called with the edited polygon, not the automatic one', async () => {
    let s = addDoc(initialState(), newDoc({ id: 'd', name: 'd.png', sha256: 'ff', widthPx: 100, heightPx: 100 }));
    s = edit(s, 'd', { boundary: poly }, 'silent');
    s = edit(s, 'd', { boundary: moveVertex(poly, 1, { x: 50, y: 30 }), boundaryEdited: true }, 'commit');
    const calls: RemeasureRequest[] = [];
    const results: Record<string, unknown>[] = [];
    const r = createRemeasurer(
      async (req) => {
        calls.push(req);
        return { result: { n: calls.length } };
      },
      (_id, res) => results.push(res),
      () => undefined,
    );
    await r.request(activeDoc(s)!);
    expect(calls).toHaveLength(1);
    expect(calls[0].params.boundaryPolygon?.[1]).toEqual({ x: 50, y: 30 });
    expect(calls[0].params.boundaryPolygon).toHaveLength(4);
    expect(results).toEqual([{ n: 1 }]);
  });

  it('a late reply of a superseded request is dropped (latest edit wins)', async () => {
    const doc = { ...newDoc({ id: 'd', name: 'd.png', sha256: 'ff', widthPx: 100, heightPx: 100 }), boundary: poly };
    const resolvers: ((v: { result: Record<string, unknown> }) => void)[] = [];
    const seen: unknown[] = [];
    const r = createRemeasurer(
      (_req) => new Promise((res) => resolvers.push(res)),
      (_id, res) => seen.push(res),
      () => undefined,
    );
    const p1 = r.request(doc);
    const p2 = r.request(doc);
    resolvers[1]({ result: { v: 2 } });
    resolvers[0]({ result: { v: 1 } });
    await Promise.all([p1, p2]);
    expect(seen).toEqual([{ v: 2 }]);
  });

  it('sectors and the typed scale reach the parameter object', () => {
    const doc = { ...newDoc({ id: 'd', name: 'd.png', sha256: 'ff', widthPx: 10, heightPx: 10 }), boundary: poly, exclude: [[350, 10]] as [number, number][] };
    doc.scale = { source: 'typed', umPerPx: 2.5 };
    const req = remeasureRequestOf(doc);
    expect(req.params.exclude).toEqual([[350, 10]]);
    expect(req.params.scale.pixelSizeUm).toBe(2.5);
  });

  it("a document with a metadata scale gives core's defaultParams (same numbers as the CLI)", () => {
    const doc = newDoc({ id: 'd', name: 'd.png', sha256: 'ff', widthPx: 10, heightPx: 10 });
    doc.scale = { source: 'metadata', umPerPx: 3 };
    expect(paramsOf(doc)).toEqual(defaultParams());
  });
});
