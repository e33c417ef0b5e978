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
    // sizes from smaller than the window to ordinary, radii whose window is or is not a power of two
    // span plus one (the doubling's two cases), 3 being the detector's own
    for (const [w, h] of [[53, 37], [5, 4], [1, 9], [40, 1]]) {
      const data = new Float32Array(w * h);
      let s = 12345 + w;
      for (let i = 0; i < data.length; i++) {
        s = (s * 1103515245 + 12345) >>> 0;
        // coarse levels too, so ties occur
        data[i] = i % 3 === 0 ? ((s >>> 8) % 4) / 4 : (s >>> 8) / 16777216;
      }
      for (const radius of [1, 2, 3, 4, 7]) {
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
    }
  });
});

describe('glint suppression on the mask box only (exact shortcut)', () => {
  /** The whole-image form: OpenCV's opening of the whole raster, every pixel visited (the plain algorithm of glints.ts). */
  async function wholeImage(r: { width: number; height: number; data: Float32Array }, mask: Uint8Array): Promise<{ fraction: number; out: Float32Array; grown: Uint8Array | null }> {
    const { getCv } = await import('../../../src/core/cv.js');
    const { rasterToMat, rectMorph } = await import('../../../src/core/segment/cvutil.js');
    const { quantiles } = await import('../../../src/core/segment/quantiles.js');
    const cv = getCv();
    const m = rasterToMat(r);
    const k = cv.getStructuringElement(cv.MORPH_RECT, new cv.Size(7, 7));
    cv.morphologyEx(m, m, cv.MORPH_OPEN, k);
    const o = Float32Array.from(m.data32F as Float32Array);
    m.delete();
    k.delete();
    const { width: W, height: H, data: v } = r;
    const th: number[] = [];
    for (let i = 0; i < v.length; i++) if (mask[i]) th.push(v[i] - o[i]);
    const [med, q25, q75] = quantiles(Float32Array.from(th), [0.5, 0.25, 0.75]);
    const t = Math.max(0.15, med + (8 * (q75 - q25)) / 1.349);
    const specks = new Uint8Array(v.length);
    for (let y = 0; y < H; y++) for (let x = 0; x < W; x++) {
      const i = y * W + x;
      if (!mask[i] || v[i] - o[i] <= t) continue;
      for (let dy = -1; dy <= 1; dy++) for (let dx = -1; dx <= 1; dx++) if (y + dy >= 0 && y + dy < H && x + dx >= 0 && x + dx < W) specks[(y + dy) * W + x + dx] = 1;
    }
    let n = 0;
    for (let i = 0; i < v.length; i++) if (specks[i] && mask[i]) n++;
    const fraction = n / th.length;
    if (fraction < 0.001) return { fraction: 0, out: v, grown: null };
    const near = rectMorph(specks, W, H, 6, 'dilate');
    const tNear = Math.max(0.05, med + (1.5 * (q75 - q25)) / 1.349);
    const out = Float32Array.from(v);
    const replaced = new Uint8Array(v.length);
    for (let i = 0; i < v.length; i++) if (specks[i] || (near[i] && mask[i] && v[i] - o[i] > tNear)) { out[i] = o[i]; replaced[i] = 1; }
    const grown = rectMorph(replaced, W, H, 1, 'dilate');
    for (let i = 0; i < grown.length; i++) if (!mask[i]) grown[i] = 0;
    return { fraction, out, grown };
  }

  it('gives what the whole image gives, with and without glints, the mask off centre and at the frame', async () => {
    for (const [seed, cx, specks] of [[31, 400, 60], [32, 250, 60], [33, 400, 0], [34, 230, 40]] as const) {
      const img = makeDiscImage({ seed, coreStd: 0.03, cx, outerA: 240 });
      const r = img.raster;
      const W = r.width;
      for (let k = 0; k < specks; k++) {
        const a = (k * 6 * Math.PI) / 180;
        const x = Math.round(cx + 210 * Math.cos(a));
        const y = Math.round(300 + 210 * Math.sin(a));
        if (x < 1 || x > W - 2) continue;
        for (let dy = -1; dy <= 1; dy++) for (let dx = -1; dx <= 1; dx++) r.data[(y + dy) * W + x + dx] = Math.min(1, r.data[(y + dy) * W + x + dx] + 0.4);
      }
      const sp = findSpecimen(r);
      const g = suppressGlints(r, sp.mask);
      const ref = await wholeImage(r, sp.mask.data);
      expect(g.fraction).toBe(ref.fraction);
      expect(Array.from(g.raster.data)).toEqual(Array.from(ref.out));
      expect(g.mask === null ? null : Array.from(g.mask)).toEqual(ref.grown === null ? null : Array.from(ref.grown));
      if (specks) expect(g.fraction).toBeGreaterThan(0);
    }
  });
});
