import { describe, expect, it } from 'vitest';
import { classifyRimCore, findSpecimen, refineBoundary, segmentAndMeasure } from '../../../src/core/segment/index.js';
import { measureBand } from '../../../src/core/measure/index.js';
import { makeDiscImage, testLocalStd } from '../../helpers/discImages.js';

const W = 15;

describe('rim/core on synthetic discs (truth from the disc geometry)', () => {
  it('bias test: a threshold on the nonlinear log-std under-estimates the width; the refinement removes it', () => {
    // std_rough = 10·std_smooth; truth width 60 px (outer 240, boundary 180)
    const img = makeDiscImage({ rimStd: 0.01, coreStd: 0.1, seed: 21 });
    const f = testLocalStd(img.raster, W);
    const coarse = segmentAndMeasure(img.raster, 1, [f], { windowPx: W, bootstrap: 0, noRefine: true });
    const fine = segmentAndMeasure(img.raster, 1, [f], { windowPx: W, bootstrap: 0 });
    const errCoarse = coarse.band!.stats.mean - img.meanWidthPx;
    const errFine = fine.band!.stats.mean - img.meanWidthPx;
    // expected coarse bias ≈ −0.4 window (see refine.ts header): at least −0.25 window here
    expect(errCoarse).toBeLessThan(-0.25 * W);
    expect(Math.abs(errFine)).toBeLessThan(0.1 * W);
    expect(Math.abs(errFine / img.meanWidthPx)).toBeLessThan(0.02);
    // both refinement methods are unbiased on a clean texture step
    const sp = fine.specimen;
    const c = { x: sp.circle.cx, y: sp.circle.cy };
    const box = refineBoundary(img.raster, sp.contour, fine.rimCore.boundary!, c, { windowPx: W, method: 'box' });
    const band = measureBand({ outer: fine.outerPolygon, boundary: box.polygon, center: c, umPerPx: 1, bootstrap: 0 });
    expect(Math.abs(band.stats.mean / img.meanWidthPx - 1)).toBeLessThan(0.02);
  });

  it('equal mean brightness, vignetting, ellipse, wavy boundary: within 2 %', () => {
    const cases = [
      makeDiscImage({ rimMean: 0.5, coreMean: 0.5, seed: 1 }),
      makeDiscImage({ vignette: 0.5, seed: 2 }),
      makeDiscImage({ outerA: 260, outerB: 210, seed: 3 }),
      makeDiscImage({ boundaryAt: (t) => 170 + 10 * Math.sin((3 * t * Math.PI) / 180), seed: 4 }),
    ];
    for (const img of cases) {
      const r = segmentAndMeasure(img.raster, 2, [testLocalStd(img.raster, W)], { windowPx: W, bootstrap: 0 });
      expect(r.rimCore.detected).toBe(true);
      expect(Math.abs(r.band!.stats.mean / (2 * img.meanWidthPx) - 1)).toBeLessThan(0.02);
    }
  });

  it('no smooth rim → detected false with a reason, no number', () => {
    const img = makeDiscImage({ rimStd: 0.1, coreStd: 0.1, seed: 5 });
    const sp = findSpecimen(img.raster);
    const rc = classifyRimCore(sp, [testLocalStd(img.raster, W)], { windowPx: W });
    expect(rc.detected).toBe(false);
    expect(rc.reason).toMatch(/no smooth rim/);
    const r = segmentAndMeasure(img.raster, 1, [testLocalStd(img.raster, W)], { windowPx: W });
    expect(r.band).toBeNull();
  });

  it('reports separability: strong for a clear band, weaker for a low-contrast one', () => {
    const strong = makeDiscImage({ rimStd: 0.01, coreStd: 0.1, seed: 6 });
    const weak = makeDiscImage({ rimStd: 0.05, coreStd: 0.1, seed: 6 });
    const a = classifyRimCore(findSpecimen(strong.raster), [testLocalStd(strong.raster, W)], { windowPx: W });
    const b = classifyRimCore(findSpecimen(weak.raster), [testLocalStd(weak.raster, W)], { windowPx: W });
    expect(a.detected).toBe(true);
    expect(a.separability.fisher).toBeGreaterThan(b.separability.fisher);
    expect(a.separability.overlap).toBeLessThan(0.05);
    // core fraction ≈ (180/240)² = 0.5625 (geometry)
    expect(Math.abs(a.separability.coreFraction - 0.5625)).toBeLessThan(0.05);
  });

  it('accepts downsampled features with a scale factor', () => {
    const img = makeDiscImage({ seed: 8 });
    const f = testLocalStd(img.raster, W);
    // 2× downsampled feature (average of 2×2 blocks)
    const w2 = img.raster.width / 2, h2 = img.raster.height / 2;
    const d = new Float32Array(w2 * h2);
    for (let y = 0; y < h2; y++) for (let x = 0; x < w2; x++) {
      const i = 2 * y * img.raster.width + 2 * x;
      d[y * w2 + x] = 0.25 * (f.data[i] + f.data[i + 1] + f.data[i + img.raster.width] + f.data[i + img.raster.width + 1]);
    }
    const r = segmentAndMeasure(img.raster, 1, [{ width: w2, height: h2, data: d }], { windowPx: W, bootstrap: 0 });
    expect(r.rimCore.featureScale).toBe(2);
    expect(Math.abs(r.band!.stats.mean / img.meanWidthPx - 1)).toBeLessThan(0.02);
  });

  it('refuses mismatched features', () => {
    const img = makeDiscImage({ width: 200, height: 150, outerA: 60, seed: 9 });
    const sp = findSpecimen(img.raster);
    expect(() => classifyRimCore(sp, [], { windowPx: 9 })).toThrow(/feature/);
    expect(() => classifyRimCore(sp, [{ width: 37, height: 150, data: new Float32Array(37 * 150) }], { windowPx: 9, featureScale: 1 })).toThrow(/size/);
  });
});
