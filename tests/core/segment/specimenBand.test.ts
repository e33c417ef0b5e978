/**
 * The silhouette's edge band (segment/specimen.ts `decideBand`, morphologies on the grown bounding
 * box only) against the same decision on the whole image, and the shared σ = 1 smoothing
 * (segment/smooth.ts) against the in-place `cv.GaussianBlur` the band used before (issue 16).
 */
import { describe, expect, it } from 'vitest';
import { getCv } from '../../../src/core/cv.js';
import { rectMorph, setBox } from '../../../src/core/segment/cvutil.js';
import { decideBand } from '../../../src/core/segment/specimen.js';
import { gaussian1 } from '../../../src/core/segment/smooth.js';
import { createRaster } from '../../../src/core/image/raster.js';

function lcg(seed: number): () => number {
  let s = seed >>> 0;
  return () => ((s = (Math.imul(s, 1664525) + 1013904223) >>> 0) / 2 ** 32);
}

/** The whole-image form the band had before. */
function wholeBand(up: Uint8Array, W: number, H: number, band: number, d: Float32Array, level: number, bright: boolean, ou: Uint8Array | null): Uint8Array {
  const a = rectMorph(up, W, H, band, 'erode');
  const b = rectMorph(up, W, H, band, 'dilate');
  const out = new Uint8Array(W * H);
  for (let i = 0; i < out.length; i++) {
    if (a[i]) out[i] = 1;
    else if (b[i] && !(ou && ou[i])) out[i] = (d[i] > level) !== bright ? 1 : 0;
  }
  return out;
}

describe('decideBand', () => {
  for (const [W, H, band, seed, where] of [
    [90, 70, 6, 1, 'centre'],
    [80, 60, 12, 2, 'corner'], // set pixels on the frame: the grown box is clipped
    [60, 90, 3, 3, 'spots'],
    [40, 30, 25, 4, 'centre'], // band larger than the image
  ] as const) {
    it(`equals the whole-image decision (${W}×${H}, band ${band}, ${where})`, () => {
      const rnd = lcg(seed);
      const up = new Uint8Array(W * H);
      const discs = where === 'spots' ? [[20, 30, 4], [45, 70, 6], [33, 50, 2]] : where === 'corner' ? [[5, 8, 25], [70, 55, 10]] : [[W / 2, H / 2, 0.3 * Math.min(W, H)]];
      for (const [cx, cy, r] of discs) for (let y = 0; y < H; y++) for (let x = 0; x < W; x++) if ((x - cx) ** 2 + (y - cy) ** 2 < r * r) up[y * W + x] = 255;
      const d = Float32Array.from({ length: W * H }, () => rnd());
      const ou = Uint8Array.from({ length: W * H }, () => (rnd() < 0.1 ? 1 : 0));
      for (const bright of [false, true]) {
        for (const others of [null, ou]) {
          const ref = wholeBand(up, W, H, band, d, 0.5, bright, others);
          const out = new Uint8Array(W * H);
          const box = setBox(up, W, H);
          expect(box).not.toBeNull();
          if (box) decideBand(up, W, H, box, band, d, 0.5, bright, others, out);
          expect(Array.from(out)).toEqual(Array.from(ref));
          expect(out.some((v) => v === 1)).toBe(true);
        }
      }
    });
  }
});

describe('gaussian1', () => {
  it('equals an in-place cv.GaussianBlur (σ = 1, reflect-101) of a copy, and is computed once per raster', () => {
    const cv = getCv();
    const rnd = lcg(7);
    const W = 73;
    const H = 41;
    const r = createRaster(W, H, Float32Array.from({ length: W * H }, () => rnd()));
    const m = new cv.Mat(H, W, cv.CV_32F);
    try {
      (m.data32F as Float32Array).set(r.data);
      cv.GaussianBlur(m, m, new cv.Size(0, 0), 1, 1, cv.BORDER_REFLECT_101);
      const g = gaussian1(r);
      expect(Array.from(g)).toEqual(Array.from(m.data32F as Float32Array));
      expect(gaussian1(r)).toBe(g);
    } finally {
      m.delete();
    }
  });
});
