/**
 * Glint suppression (segment/glints.ts): bright specks on a smooth rim are replaced by their
 * surroundings; an image without them is returned untouched (the same raster object), so it is
 * measured exactly as before. Truth: the specks are drawn at known places on a synthetic disc.
 */
import { describe, expect, it } from 'vitest';
import { findSpecimen, suppressGlints } from '../../../src/core/segment/index.js';
import { makeDiscImage } from '../../helpers/discImages.js';

describe('glint suppression', () => {
  it('leaves an image without glints untouched', () => {
    const img = makeDiscImage({ seed: 21 });
    const sp = findSpecimen(img.raster);
    const g = suppressGlints(img.raster, sp.mask);
    expect(g.fraction).toBe(0);
    expect(g.raster).toBe(img.raster);
    expect(g.mask).toBeNull();
  });

  it('replaces bright specks on the rim by the level around them, and nothing far from them', () => {
    // a core of fine white-noise roughness (σ 0.03): its own top-hat stays far below the specks
    const img = makeDiscImage({ seed: 22, coreStd: 0.03 });
    const r = img.raster;
    const W = r.width;
    const specks: [number, number][] = [];
    // 3 × 3 px specks of +0.4 on the rim band (radius 200 px of a 240 px disc, boundary at 180 px)
    for (let k = 0; k < 60; k++) {
      const a = (k * 6 * Math.PI) / 180;
      const x = Math.round(400 + 210 * Math.cos(a));
      const y = Math.round(300 + 210 * Math.sin(a));
      specks.push([x, y]);
      for (let dy = -1; dy <= 1; dy++) for (let dx = -1; dx <= 1; dx++) r.data[(y + dy) * W + x + dx] = Math.min(1, r.data[(y + dy) * W + x + dx] + 0.4);
    }
    const sp = findSpecimen(r);
    const before = Float32Array.from(r.data);
    const g = suppressGlints(r, sp.mask);
    expect(g.fraction).toBeGreaterThan(0.001);
    for (const [x, y] of specks) {
      // the rim level is 0.55 ± 0.01 (makeDiscImage defaults): the speck is gone
      expect(Math.abs(g.raster.data[y * W + x] - 0.55)).toBeLessThan(0.05);
    }
    // the core (radius < 150 px) is not touched
    let changedInCore = 0;
    for (let y = 200; y < 400; y++) for (let x = 300; x < 500; x++) if (g.raster.data[y * W + x] !== before[y * W + x]) changedInCore++;
    expect(changedInCore).toBe(0);
    // the input raster is not modified
    expect(r.data).toEqual(before);
    // the mask of unknown texture covers every speck and its 1-px border, and nothing in the core
    const m = g.mask!;
    for (const [x, y] of specks) for (let dy = -2; dy <= 2; dy++) for (let dx = -2; dx <= 2; dx++) expect(m[(y + dy) * W + x + dx]).toBe(1);
    let maskedInCore = 0;
    for (let y = 200; y < 400; y++) for (let x = 300; x < 500; x++) maskedInCore += m[y * W + x];
    expect(maskedInCore).toBe(0);
  });
});

describe('grey opening with a square (the glint detector)', () => {
  it('equals OpenCV MORPH_OPEN with MORPH_RECT (reference), borders included', async () => {
    const { getCv } = await import('../../../src/core/cv.js');
    const { rasterToMat } = await import('../../../src/core/segment/cvutil.js');
    const { openRect } = await import('../../../src/core/segment/glints.js');
    const cv = getCv();
    const w = 53;
    const h = 37;
    const data = new Float32Array(w * h);
    let s = 12345;
    for (let i = 0; i < data.length; i++) {
      s = (s * 1103515245 + 12345) >>> 0;
      data[i] = (s >>> 8) / 16777216;
    }
    for (const radius of [1, 2, 4]) {
      const m = rasterToMat({ width: w, height: h, data });
      const k = cv.getStructuringElement(cv.MORPH_RECT, new cv.Size(2 * radius + 1, 2 * radius + 1));
      try {
        cv.morphologyEx(m, m, cv.MORPH_OPEN, k);
        expect(Array.from(openRect({ width: w, height: h, data }, radius))).toEqual(Array.from(m.data32F as Float32Array));
      } finally {
        m.delete();
        k.delete();
      }
    }
  });
});
