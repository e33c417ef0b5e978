/**
 * Results follow inputs: the parameter object of a document, the key that names its inputs, and
 * whether the result shown is current, out of date (and why) or missing.
 */
import { describe, expect, it } from 'vitest';
import { defaultParams } from '../../src/core/pipeline/index.js';
import { newDoc, newSeries, type Doc } from '../../src/app/state/document.js';
import { paramsOf, requestOf, resultStateOf, wantsRecompute } from '../../src/app/state/results.js';
import { measured } from './fixture.js';

describe('parameters of a document', () => {
  it("a document with the file's metadata scale gives core's defaultParams (the command line's defaults)", () => {
    const d = newDoc('d', { name: 'x.png', sha256: '00', widthPx: 10, heightPx: 10, format: 'png', bitDepth: 8, metadataScale: { umPerPxX: 3, umPerPxY: 3, source: 'png-phys' }, metadataNote: null });
    expect(d.scale).toEqual({ source: 'metadata' });
    expect(paramsOf(d, newSeries())).toEqual(defaultParams());
  });

  it('a strain rate without a rate law keeps the strain rate and leaves the material out', async () => {
    const { doc, series } = await measured();
    const withMat: Doc = { ...doc, material: { ...series.material, toughness: { value: 48, sd: null }, strength: { value: 1150, sd: 45 } }, strainRatePerS: 1e-3 };
    const p = paramsOf(withMat, series);
    expect(p.material).toBeNull();
    expect(p.strainRatePerS).toBe(1e-3);
    expect(paramsOf({ ...withMat, strainRatePerS: null }, series).material).toEqual({ toughness: { value: 48, source: 'typed in the app' }, strength: { value: 1150, sd: 45, source: 'typed in the app' } });
  });

  it('a full run never gets the boundary drawn by hand', async () => {
    const { doc, series } = await measured();
    const edited: Doc = { ...doc, boundary: [{ x: 1, y: 1 }, { x: 5, y: 1 }, { x: 3, y: 4 }] };
    expect(paramsOf(edited, series).boundaryPolygon).toHaveLength(3);
    expect(paramsOf(edited, series, { fullRun: true }).boundaryPolygon).toBeNull();
  });
});

describe('state of the result', () => {
  it('none before the first run; current for the inputs it was computed for', async () => {
    const { doc, series } = await measured();
    expect(resultStateOf({ ...doc, base: null, result: null }, series).state).toBe('none');
    expect(resultStateOf(doc, series)).toEqual({ state: 'current', reason: null });
    expect(wantsRecompute(doc, series)).toBeNull();
  });

  it('a new pixel size makes it stale until the recomputed result arrives; the old inputs make it current again', async () => {
    const { doc, series } = await measured();
    const changed: Doc = { ...doc, scale: { source: 'typed', umPerPx: 17 } };
    expect(resultStateOf(changed, series)).toEqual({ state: 'stale', reason: 'Updating…' });
    expect(wantsRecompute(changed, series)?.params.scale.pixelSizeUm).toBe(17);
    // undo: the inputs are the ones of the result again
    expect(requestOf({ ...changed, scale: doc.scale }, series)?.key).toBe(doc.resultKey);
  });

  it('a typed texture window needs a full run: stale with the reason, nothing sent to recompute', async () => {
    const { doc, series } = await measured();
    const s2 = { ...series, settings: { ...series.settings, windowUm: 150 } };
    const rs = resultStateOf(doc, s2);
    expect(rs.state).toBe('stale');
    expect(rs.reason).toMatch(/texture window.*Find boundary/);
    expect(wantsRecompute(doc, s2)).toBeNull();
  });

  it('not measured yet: with a scale known only the button is asked for; without one the panel asks for the scale first', async () => {
    const { doc, series } = await measured();
    expect(resultStateOf({ ...doc, base: null, result: null }, series)).toEqual({ state: 'none', reason: 'Not measured yet: press “Find boundary”.' });
    expect(resultStateOf({ ...doc, base: null, result: null, scale: { source: 'none' } }, series)).toEqual({ state: 'none', reason: null });
    expect(resultStateOf({ ...doc, base: null, result: null, busy: 'analysing' }, series)).toEqual({ state: 'none', reason: 'Measuring…' });
  });

  it('no scale: stale with what to do', async () => {
    const { doc, series } = await measured();
    const rs = resultStateOf({ ...doc, scale: { source: 'none' } }, series);
    expect(rs.state).toBe('stale');
    expect(rs.reason).toMatch(/No scale yet/);
  });

  it('a result the engine refused for these inputs stays stale with its message', async () => {
    const { doc, series } = await measured();
    const changed: Doc = { ...doc, exclude: [[10, 20]] };
    const key = requestOf(changed, series)?.key ?? '';
    const rs = resultStateOf({ ...changed, refused: { key, message: 'the engine failed' } }, series);
    expect(rs).toEqual({ state: 'stale', reason: 'Out of date: the engine failed' });
  });
});
