import { describe, expect, it } from 'vitest';
import { findSpecimen } from '../../../src/core/segment/index.js';
import { createRaster } from '../../../src/core/image/raster.js';
import { makeDiscImage } from '../../helpers/discImages.js';

describe('findSpecimen', () => {
  it('finds a disc on a dark background with a dark pit inside and a bright label plate', () => {
    const img = makeDiscImage({ width: 800, height: 600, outerA: 230, seed: 5 });
    const d = img.raster.data;
    // dark pit (macro-crack) inside the core: must be filled
    for (let y = 280; y < 300; y++) for (let x = 380; x < 440; x++) d[y * 800 + x] = 0.05;
    // bright scale-bar plate in the corner: must not be the specimen
    for (let y = 540; y < 590; y++) for (let x = 620; x < 790; x++) d[y * 800 + x] = 0.95;
    const s = findSpecimen(img.raster);
    expect(s.background).toBe('dark');
    expect(s.touchesFrame).toBe(false);
    // circle fit on pixel-centre contour: radius ≈ R − 0.5 px (contour = outermost inside pixels)
    expect(Math.abs(s.circle.cx - img.cx)).toBeLessThan(0.3);
    expect(Math.abs(s.circle.cy - img.cy)).toBeLessThan(0.3);
    expect(Math.abs(s.circle.radiusPx - 230)).toBeLessThan(1.2);
    expect(s.circle.rmsResidualPx).toBeLessThan(0.8);
    // area of a disc: πR² (pit filled, plate excluded)
    expect(Math.abs(s.areaPx / (Math.PI * 230 * 230) - 1)).toBeLessThan(0.01);
    expect(s.mask.data[290 * 800 + 400]).toBe(1);
    expect(s.mask.data[560 * 800 + 700]).toBe(0);
  });

  it('bright background and an ellipse with known orientation', () => {
    // ellipse with a = 260 along x, b = 200 along y: major axis at 0°
    const img = makeDiscImage({ width: 800, height: 600, outerA: 260, outerB: 200, background: 0.9, rimMean: 0.45, coreMean: 0.4, seed: 9 });
    const s = findSpecimen(img.raster);
    expect(s.background).toBe('bright');
    expect(Math.abs(s.ellipse.semiMajorPx - 260)).toBeLessThan(1.5);
    expect(Math.abs(s.ellipse.semiMinorPx - 200)).toBeLessThan(1.5);
    const a = s.ellipse.angleDeg;
    expect(Math.min(a, 180 - a)).toBeLessThan(1);
    expect(s.ellipse.rmsResidualPx).toBeLessThan(s.circle.rmsResidualPx);
  });

  it('ellipse orientation follows the project convention (counter-clockwise on screen)', () => {
    // rotated ellipse drawn directly: major axis at +30° (up-right on screen)
    const W = 600, H = 500, cx = 300, cy = 250, A = 200, B = 120, th = (30 * Math.PI) / 180;
    const data = new Float32Array(W * H).fill(0.1);
    for (let y = 0; y < H; y++) for (let x = 0; x < W; x++) {
      const dx = x - cx, dy = -(y - cy);
      const u = dx * Math.cos(th) + dy * Math.sin(th);
      const v = -dx * Math.sin(th) + dy * Math.cos(th);
      if ((u / A) ** 2 + (v / B) ** 2 <= 1) data[y * W + x] = 0.7;
    }
    const s = findSpecimen(createRaster(W, H, data));
    expect(Math.abs(s.ellipse.angleDeg - 30)).toBeLessThan(1);
  });

  it('frame-cut specimen: frame points excluded from the fit', () => {
    const img = makeDiscImage({ width: 800, height: 600, cx: 230, cy: 300, outerA: 260, seed: 2 });
    const s = findSpecimen(img.raster);
    expect(s.touchesFrame).toBe(true);
    expect(s.frameContactFraction).toBeGreaterThan(0.05);
    expect(Math.abs(s.circle.cx - 230)).toBeLessThan(1);
    expect(Math.abs(s.circle.radiusPx - 260)).toBeLessThan(1.5);
  });

  it('refuses an empty image', () => {
    expect(() => findSpecimen(createRaster(100, 100, new Float32Array(10000).fill(0.3)))).toThrow(/contrast/);
  });
});
