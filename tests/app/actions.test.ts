/**
 * Actions: small pure functions from the current inputs and the user's input to an edit (a patch
 * and how it enters the history) or a refusal in the app's words.
 */
import { describe, expect, it } from 'vitest';
import { buildRayIndex, castRay } from '../../src/core/measure/geometry.js';
import { recompute } from '../../src/core/pipeline/recompute.js';
import { makeSession } from '../../src/core/session.js';
import { boundaryOf, centreOf, newSeries, outlineOf, type Doc } from '../../src/app/state/document.js';
import { apply, type Change } from '../../src/app/state/actions/types.js';
import { applyScaleBar, setTwoPointScale, setTypedScale } from '../../src/app/state/actions/scale.js';
import { ownMaterial, ownSettings, readSheet, setMaterial, setSettings, setStrainRate } from '../../src/app/state/actions/inputs.js';
import { addBoundaryPoint, addSector, moveBoundaryPoint, removeSector, reshape, resetBoundary, resetOutline, runDone } from '../../src/app/state/actions/edit.js';
import { reopenSession } from '../../src/app/state/actions/session.js';
import { materialProblem } from '../../src/app/state/material.js';
import { addDoc, initialState } from '../../src/app/state/store.js';
import { outlineHandles } from '../../src/app/state/outline.js';
import { paramsOf } from '../../src/app/state/results.js';
import { measured } from './fixture.js';

function patchOf(c: Change): Record<string, unknown> {
  if (!('doc' in c)) throw new Error(`expected an edit of the image, got ${JSON.stringify(c)}`);
  return c.doc.patch;
}

describe('scale actions', () => {
  it('a typed pixel size: positive numbers only, the same value is no change', async () => {
    const { doc } = await measured();
    expect(setTypedScale(doc, 10)).toEqual({ doc: { label: 'pixel size', patch: { scale: { source: 'typed', umPerPx: 10 } }, history: 'commit' } });
    expect(setTypedScale(doc, -1)).toEqual({ refused: expect.stringMatching(/positive number of µm per pixel/), area: 'scale' });
    expect(setTypedScale(doc, null)).toHaveProperty('refused');
    expect(setTypedScale(doc, 8.5)).toEqual({ unchanged: true });
  });

  it('the scale bar: no bar → say so; a bar without its length → only remembered; with it → the scale', async () => {
    const { doc } = await measured();
    expect(applyScaleBar(doc, 500, null)).toEqual({ refused: expect.stringMatching(/No scale bar was found/), area: 'scale' });
    const bar = { x0: 10, y0: 20, x1: 109, y1: 20, lengthPx: 100, thicknessPx: 4, orientation: 'horizontal' as const, polarity: 'light' as const, confidence: 0.9 };
    expect(applyScaleBar(doc, null, bar)).toEqual({ doc: { label: 'scale bar found', patch: { bar }, history: 'none' } });
    expect(patchOf(applyScaleBar(doc, 500, bar))).toEqual({ bar, scale: { source: 'scale-bar', barLengthUm: 500 } });
  });

  it('two points: needs a line and its length', () => {
    expect(setTwoPointScale({ x: 0, y: 0 }, { x: 1, y: 0 }, 100)).toHaveProperty('refused');
    expect(setTwoPointScale({ x: 0, y: 0 }, { x: 100, y: 0 }, null)).toHaveProperty('refused');
    expect(patchOf(setTwoPointScale({ x: 0, y: 0 }, { x: 100, y: 0 }, 500))).toEqual({ scale: { source: 'two-point', p0: { x: 0, y: 0 }, p1: { x: 100, y: 0 }, distanceUm: 500 } });
  });
});

describe('settings and material: the series unless the image has its own', () => {
  it('settings go to the series; after "own", to the image', async () => {
    const { doc, series } = await measured();
    const c = setSettings(doc, series, { nRays: 180 });
    expect('series' in c && c.series.patch.settings?.nRays).toBe(180);
    const own = patchOf(ownSettings(doc, series, true));
    const withOwn: Doc = { ...doc, settings: own.settings as Doc['settings'] };
    expect(patchOf(setSettings(withOwn, series, { nRays: 180 }))).toEqual({ settings: { ...series.settings, nRays: 180 } });
    expect(setSettings(doc, series, { nRays: 3 })).toEqual({ refused: expect.stringMatching(/whole number from 8/), area: 'analysis' });
  });

  it('material: sheet, typed overrides, and what is missing in plain words', async () => {
    const { doc, series } = await measured();
    const mat = { name: 'M', invented: true, fractureToughness: { value: 48, unitWritten: 'MPa*sqrt(m)', source: 's' }, inherentStrength: { value: 1150, unitWritten: 'MPa', source: 's' } };
    const c = readSheet(doc, series, 'm.json', [mat]);
    const form = 'series' in c ? c.series.patch.material : undefined;
    expect(form?.sheet?.chosen).toBe('M');
    if (!form) throw new Error('no material');
    expect(materialProblem(form, null)).toBeNull();
    expect(materialProblem(form, 1e-3)).toMatch(/A strain rate needs a strain-rate law/);
    expect(materialProblem({ ...form, rateLaw: { A: 390, B: null } }, 1e-3)).toMatch(/both A and B/);
    expect(materialProblem({ ...form, rateLaw: { A: 390, B: -0.05 } }, 1e-3)).toBeNull();
    expect(materialProblem({ ...series.material, toughness: { value: 48, sd: null } }, null)).toMatch(/Type both/);
    expect(setMaterial(doc, series, { toughness: { value: -3, sd: null } })).toHaveProperty('refused');
    expect(patchOf(ownMaterial(doc, series, true))).toEqual({ material: series.material });
    expect(setStrainRate(doc, 0)).toHaveProperty('refused');
    expect(patchOf(setStrainRate(doc, 1e3))).toEqual({ strainRatePerS: 1e3 });
  });
});

describe('geometry edits', () => {
  it('moving a point of the automatic boundary makes a corrected one; reset returns to the automatic one', async () => {
    const { doc } = await measured();
    const auto = boundaryOf(doc);
    const moved = patchOf(moveBoundaryPoint(doc, 0, { x: 1, y: 2 }, 'drag')) as { boundary: { x: number; y: number }[] };
    expect(moved.boundary[0]).toEqual({ x: 1, y: 2 });
    expect(moved.boundary.slice(1)).toEqual(auto?.slice(1));
    expect(resetBoundary(doc)).toHaveProperty('refused');
    expect(patchOf(resetBoundary({ ...doc, boundary: moved.boundary }))).toEqual({ boundary: null });
  });

  it('"Add point" between two rays changes the widths of the rays there', async () => {
    const { doc, series } = await measured();
    const c = centreOf(doc);
    const b = boundaryOf(doc);
    if (!c || !b) throw new Error('no boundary');
    // a point at 45.5° (between the 45° and 46° rays), 25 px inside the boundary there
    const t = (45.5 * Math.PI) / 180;
    const r0 = Math.max(...castRay(buildRayIndex(b, c), 45.5));
    const p = { x: c.x + (r0 - 25) * Math.cos(t), y: c.y - (r0 - 25) * Math.sin(t) };
    const pulled = patchOf(addBoundaryPoint(doc, p, 360)).boundary as { x: number; y: number }[];
    // the boundary passes through p: a ray cast at p's angle hits it at |p − c|
    expect(Math.max(...castRay(buildRayIndex(pulled, c), 45.5))).toBeCloseTo(r0 - 25, 6);
    const width = (d: Doc, angle: number): number => {
      const o = d.base ? recompute(d.base.result, paramsOf(d, series)) : null;
      if (!o || o.kind !== 'result') throw new Error('no result');
      return o.result.band.profile.find((q) => q.angleDeg === angle)?.widthUm ?? NaN;
    };
    const edited: Doc = { ...doc, boundary: pulled };
    for (const angle of [45, 46]) expect(width(edited, angle) - width(doc, angle)).toBeGreaterThan(20 * 8.5 * 0.5);
  });

  it('sectors in and out', async () => {
    const { doc } = await measured();
    expect(addSector(doc, 10, 10.2)).toHaveProperty('refused');
    const d2: Doc = { ...doc, exclude: patchOf(addSector(doc, 350, 10)).exclude as [number, number][] };
    expect(d2.exclude).toEqual([[350, 10]]);
    expect(patchOf(removeSector(d2, 0))).toEqual({ exclude: [] });
  });

  it('outline: reset to the circle fit, reshape with a handle (neighbours follow, far points stay)', async () => {
    const { doc } = await measured();
    const circle = patchOf(resetOutline(doc, 'circle')).outline as { x: number; y: number }[];
    const fit = doc.base?.result.specimen.circle;
    if (!fit) throw new Error('no fit');
    for (const p of circle) expect(Math.hypot(p.x - fit.cx, p.y - fit.cy)).toBeCloseTo(fit.radiusPx, 6);
    const d2: Doc = { ...doc, outline: circle };
    const c = centreOf(d2);
    const start = outlineOf(d2);
    if (!c || !start) throw new Error('no outline');
    const h = outlineHandles(start, c, 16)[0]; // the handle at 0°
    const to = { x: h.at.x + 20, y: h.at.y };
    const shaped = patchOf(reshape(start, c, h.index, to, 28, 'drag-end')).outline as { x: number; y: number }[];
    expect(shaped[h.index]).toEqual(to);
    const moved = shaped.map((p, i) => Math.hypot(p.x - start[i].x, p.y - start[i].y));
    expect(moved.filter((m) => m > 1e-9).length).toBeGreaterThan(20); // a bend, not a spike
    expect(moved[(h.index + 180) % start.length]).toBe(0);
    expect(patchOf(resetOutline(d2, 'found'))).toEqual({ outline: null });
  });

  it('a new full run replaces the base and drops corrections', async () => {
    const { doc } = await measured();
    const base = doc.base;
    if (!base) throw new Error('no base');
    const run = { id: 2, result: base.result };
    expect(patchOf(runDone({ ...doc, boundary: [] }, run))).toEqual({ base: run, boundary: null, outline: null });
  });
});

describe('reopening a session', () => {
  it('gives the image the inputs the session was saved with (one history entry)', async () => {
    const { doc, series } = await measured();
    const edited: Doc = { ...doc, exclude: [[80, 100]], strainRatePerS: 1, material: { ...series.material, toughness: { value: 40, sd: 2 }, strength: { value: 1000, sd: null } } };
    const session = makeSession({ file: 'x.png', sha256: doc.image.sha256, widthPx: 900, heightPx: 700 }, paramsOf(edited, series), null, true);
    const c = reopenSession(doc, series, session, 'x.session.json', null);
    let s = addDoc(initialState(), doc);
    s = apply({ ...s, series }, doc.id, c, 'session');
    const back = s.docs[0];
    expect(paramsOf(back, s.series)).toEqual(paramsOf(edited, series));
    expect(back.history.undo).toHaveLength(1);
    expect(back.settings).toBeNull(); // the series settings again: they were the same
    expect(newSeries().material.toughness).toBeNull();
  });
});
