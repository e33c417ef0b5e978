/**
 * Scan-line removal (segment/scanLines.ts): an image without scan lines is returned untouched (the
 * same raster object, so it is measured exactly as before); line offsets added at known values are
 * found and removed. Truth: the offsets are drawn from a seeded generator and added to a synthetic disc.
 */
import { describe, expect, it } from 'vitest';
import { createRaster } from '../../../src/core/image/raster.js';
import { removeScanLines, SCAN_LINE_RATIO } from '../../../src/core/segment/scanLines.js';
import { makeDiscImage } from '../../helpers/discImages.js';

/** Deterministic normal deviates (Box–Muller on a small LCG). */
function normals(n: number, seed: number): Float64Array {
  let s = seed >>> 0;
  const u = (): number => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return (s + 0.5) / 4294967296;
  };
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) out[i] = Math.sqrt(-2 * Math.log(u())) * Math.cos(2 * Math.PI * u());
  return out;
}

describe('scan-line removal', () => {
  it('leaves an image without scan lines untouched', () => {
    const img = makeDiscImage({ seed: 31, coreStd: 0.03 });
    const s = removeScanLines(img.raster);
    expect(s.removed).toBe(false);
    expect(s.raster).toBe(img.raster);
    expect(s.ratio).toBeLessThan(SCAN_LINE_RATIO / 2);
  });

  it('finds line offsets (σ 0.02) and removes their line-to-line part', () => {
    const img = makeDiscImage({ seed: 32, coreStd: 0.03 });
    const { width: W, height: H } = img.raster;
    const sigma = 0.02;
    const off = normals(H, 7);
    const striped = Float32Array.from(img.raster.data);
    for (let y = 0; y < H; y++) for (let x = 0; x < W; x++) striped[y * W + x] += sigma * off[y];
    const s = removeScanLines(createRaster(W, H, striped));
    expect(s.removed).toBe(true);
    expect(s.ratio).toBeGreaterThan(SCAN_LINE_RATIO);
    // what is removed is the offsets less their mean over ±15 lines: σ·√(30/31) ≈ 0.0197
    expect(s.offsetSigma).toBeGreaterThan(0.8 * sigma);
    expect(s.offsetSigma).toBeLessThan(1.2 * sigma);
    // residual per line: the mean difference from the clean image (away from the clamp at 0 and 1)
    const res = new Float64Array(H);
    for (let y = 0; y < H; y++) {
      let d = 0;
      let n = 0;
      for (let x = 0; x < W; x++) {
        const c = img.raster.data[y * W + x];
        if (c < 0.1 || c > 0.9) continue;
        d += s.raster.data[y * W + x] - c;
        n++;
      }
      res[y] = n ? d / n : 0;
    }
    // the line-to-line steps (what reads as texture) go from σ·√2 ≈ 0.028 to a tenth of it or less;
    // the slow part left (the running mean of the offsets, σ/√31 ≈ 0.0036) is indistinguishable from shading
    let step2 = 0;
    let all2 = 0;
    for (let y = 1; y < H; y++) step2 += (res[y] - res[y - 1]) ** 2;
    for (let y = 0; y < H; y++) all2 += res[y] ** 2;
    expect(Math.sqrt(step2 / (H - 1))).toBeLessThan(0.1 * sigma * Math.SQRT2);
    expect(Math.sqrt(all2 / H)).toBeLessThan(0.3 * sigma);
  });
});
