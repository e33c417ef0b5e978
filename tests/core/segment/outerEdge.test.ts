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
});
