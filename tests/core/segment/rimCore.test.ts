import { describe, expect, it } from 'vitest';
import { classifyRimCore, findSpecimen, refineBoundary } from '../../../src/core/segment/index.js';
import { measureBand } from '../../../src/core/measure/index.js';
import { makeDiscImage, testLocalStd } from '../../helpers/discImages.js';
import { runStages } from '../../helpers/stages.js';

const W = 15;

describe('rim/core on synthetic discs (truth from the disc geometry)', () => {
  it('equal mean brightness, vignetting, ellipse, wavy boundary: within 2 %', () => {
    const cases = [
      makeDiscImage({ rimMean: 0.5, coreMean: 0.5, seed: 1 }),
      makeDiscImage({ vignette: 0.5, seed: 2 }),
      makeDiscImage({ outerA: 260, outerB: 210, seed: 3 }),
      makeDiscImage({ boundaryAt: (t) => 170 + 10 * Math.sin((3 * t * Math.PI) / 180), seed: 4 }),
    ];
    for (const img of cases) {
      const r = runStages(img.raster, 2, { windowPx: W, maps: [{ name: 'localStd', raster: testLocalStd(img.raster, W) }], bootstrap: 0 });
      expect(r.classification.rimCore.detected).toBe(true);
      expect(Math.abs(r.band!.stats.mean / (2 * img.meanWidthPx) - 1)).toBeLessThan(0.02);
    }
  });

  it('no smooth rim → detected false with a reason, no number', () => {
    const img = makeDiscImage({ rimStd: 0.1, coreStd: 0.1, seed: 5 });
    const sp = findSpecimen(img.raster);
    const rc = classifyRimCore(sp, [testLocalStd(img.raster, W)], { windowPx: W });
    expect(rc.detected).toBe(false);
    expect(rc.reason).toMatch(/no smooth rim/);
    // through the stages the feature is divided by the local brightness, so rim and core must
    // have the same mean too to be the same texture
    const same = makeDiscImage({ rimStd: 0.1, coreStd: 0.1, rimMean: 0.5, coreMean: 0.5, seed: 5 });
    const r = runStages(same.raster, 1, { windowPx: W, maps: [{ name: 'localStd', raster: testLocalStd(same.raster, W) }] });
    expect(r.boundary.detected).toBe(false);
    expect(r.boundary.reason).toMatch(/not separable/);
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
    const sp = findSpecimen(img.raster);
    const rc = classifyRimCore(sp, [{ width: w2, height: h2, data: d }], { windowPx: W });
    expect(rc.featureScale).toBe(2);
    const c = { x: sp.circle.cx, y: sp.circle.cy };
    const refined = refineBoundary(img.raster, sp.contour, rc.boundary!, c, { windowPx: W });
    const band = measureBand({ outer: sp.contour, boundary: refined.polygon, center: c, umPerPx: 1, bootstrap: 0 });
    // the contour runs through the centres of the outermost specimen pixels, half a pixel inside the edge
    expect(Math.abs((band.stats.mean + 0.5) / img.meanWidthPx - 1)).toBeLessThan(0.02);
  });

  it('refuses mismatched features', () => {
    const img = makeDiscImage({ width: 200, height: 150, outerA: 60, seed: 9 });
    const sp = findSpecimen(img.raster);
    expect(() => classifyRimCore(sp, [], { windowPx: 9 })).toThrow(/feature/);
    expect(() => classifyRimCore(sp, [{ width: 37, height: 150, data: new Float32Array(37 * 150) }], { windowPx: 9, featureScale: 1 })).toThrow(/size/);
  });
});
