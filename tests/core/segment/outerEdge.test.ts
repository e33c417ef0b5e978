/**
 * Sub-pixel outer edge (src/core/segment/outerEdge.ts) on synthetic discs whose true radius comes
 * from the disc geometry (tests/helpers/discImages.ts).
 */
import { describe, expect, it } from 'vitest';
import { findSpecimen, refineOuterEdge } from '../../../src/core/segment/index.js';
import { makeDiscImage } from '../../helpers/discImages.js';

describe('refineOuterEdge', () => {
  it('puts the edge of a disc within 0.3 px of the true radius on every ray (geometry truth)', () => {
    const img = makeDiscImage({ seed: 12 });
    const sp = findSpecimen(img.raster);
    const c = { x: img.cx, y: img.cy };
    const r = refineOuterEdge(img.raster, sp.contour, c, { nRays: 360 });
    expect(r.polygon.length).toBe(360);
    const errs = r.radiiPx.map((rad, i) => (rad === null ? NaN : rad - img.outerRadiusAt(i)));
    const finite = errs.filter(Number.isFinite);
    expect(finite.length).toBe(360);
    const meanErr = finite.reduce((a, b) => a + b, 0) / finite.length;
    expect(Math.abs(meanErr)).toBeLessThan(0.3);
  });

  it('a dark groove past the edge (a notch root seen end on under a light from above): the edge is the step into it', () => {
    // rim 0.55 inside R = 200 px, a groove 0.10 for 2 px (the root fillet turned away from the
    // light), then a flank 0.45 nearly as bright as the rim out to R + 30, background 0.08; pixel
    // values are 4 × 4-supersampled area means. The midpoint between the rim and the flank (0.50)
    // is crossed ≈ 1.2 px inside R on the fall into the groove; between the rim and the groove's
    // floor it is the step itself (within 0.5 px; the σ = 1 smoothing raises the floor of so
    // narrow a groove, which pulls the level ≈ 0.3 px inward)
    const n = 500;
    const cx = 250.3;
    const cy = 249.6;
    const R = 200;
    const level = (rad: number): number => (rad < R ? 0.55 : rad < R + 2 ? 0.1 : rad < R + 30 ? 0.45 : 0.08);
    const data = new Float32Array(n * n);
    for (let y = 0; y < n; y++) {
      for (let x = 0; x < n; x++) {
        let s = 0;
        for (let j = 0; j < 4; j++) for (let i = 0; i < 4; i++) s += level(Math.hypot(x - 0.375 + i / 4 - cx, y - 0.375 + j / 4 - cy));
        data[y * n + x] = s / 16;
      }
    }
    const raster = { width: n, height: n, data };
    const contour = Array.from({ length: 720 }, (_, i) => {
      const t = (i * Math.PI) / 360;
      return { x: cx + (R - 0.5) * Math.cos(t), y: cy - (R - 0.5) * Math.sin(t) };
    });
    const r = refineOuterEdge(raster, contour, { x: cx, y: cy }, { nRays: 360 });
    const errs = r.radiiPx.map((rad) => rad! - R);
    const meanErr = errs.reduce((a, b) => a + b, 0) / errs.length;
    expect(r.nFallback).toBe(0);
    expect(Math.abs(meanErr)).toBeLessThan(0.5);
    for (const e of errs) expect(Math.abs(e)).toBeLessThan(0.7);
  });

  it('falls back to the contour radius + 0.5 px where there is no edge to find (flat image)', () => {
    const img = makeDiscImage({ seed: 12 });
    const flat = { ...img.raster, data: new Float32Array(img.raster.data.length).fill(0.5) };
    const sp = findSpecimen(img.raster);
    const r = refineOuterEdge(flat, sp.contour, { x: img.cx, y: img.cy }, { nRays: 90 });
    expect(r.nFallback).toBe(90);
    // the contour runs through the outermost pixel centres of the specimen mask (a staircase, up to
    // √2 px off a circle along diagonals): + 0.5 px stays within 1.5 px of the true edge
    for (let i = 0; i < 90; i++) expect(Math.abs(r.radiiPx[i]! - img.outerRadiusAt(i * 4))).toBeLessThan(1.5);
  });

  it('takes a ray back to its neighbours when the traced contour has a spike there (contour noise)', () => {
    const img = makeDiscImage({ seed: 12 });
    const sp = findSpecimen(img.raster);
    const c = { x: img.cx, y: img.cy };
    const clean = refineOuterEdge(img.raster, sp.contour, c, { nRays: 360 });
    expect(clean.nSpikes).toBe(0);
    // a thin protrusion 12 px out of the contour at 40°: the ray through it sees the tip as the
    // farthest contour hit, and without the check its edge would be searched ±4 px around the tip
    const th = (40 * Math.PI) / 180;
    const dir = { x: Math.cos(th), y: -Math.sin(th) };
    let k = 0;
    for (let i = 1; i < sp.contour.length; i++) {
      const a = sp.contour[i];
      const b = sp.contour[k];
      const ang = (p: { x: number; y: number }) => Math.abs(Math.atan2(-(p.y - c.y), p.x - c.x) - th);
      if (ang(a) < ang(b)) k = i;
    }
    const base = sp.contour[k];
    const r0 = Math.hypot(base.x - c.x, base.y - c.y);
    const tip = { x: c.x + (r0 + 12) * dir.x, y: c.y + (r0 + 12) * dir.y };
    const spiked = [...sp.contour.slice(0, k + 1), tip, ...sp.contour.slice(k)];
    const r = refineOuterEdge(img.raster, spiked, c, { nRays: 360 });
    expect(r.nSpikes).toBeGreaterThanOrEqual(1);
    expect(Math.abs(r.radiiPx[40]! - img.outerRadiusAt(40))).toBeLessThan(0.3);
    // every other ray is where it was on the clean contour, to the bit
    let same = 0;
    for (let i = 0; i < 360; i++) if (r.radiiPx[i] === clean.radiiPx[i]) same++;
    expect(same).toBeGreaterThanOrEqual(357);
  });
});

